"use client";
// The coverage map: one layer of one floor drawn on a canvas in the network's own local metres (no map
// tiles), with the sites and their cells on top. Rasters arrive in the lib/io/mapRaster wire format; each is
// painted once into an offscreen canvas and then only scaled and moved, so panning 300,000 grids stays cheap.
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { decodeMapRaster, deltaLayer, MAP_RASTER_NO_DATA, type DecodedMapRaster, type MapRasterLayer } from "@/lib/io/mapRaster";
import {
  LAYER_LABELS,
  DEFAULT_RSRP_DOMAIN_DBM,
  DEFAULT_SINR_DOMAIN_DB,
  cellColour,
  cellScale,
  continuousScale,
  deltaDomain,
  rasterPixels,
  rasterValueAt,
  rsrpDomainOf,
  type MapLayerKind,
  type MapScale,
} from "./mapColours";
import { fixed, floorLabel, signed } from "./format";
import {
  SITE_DOT_RADIUS_PX,
  WEDGE_HALF_WIDTH_DEG,
  pickAt,
  shownAzimuthDeg,
  wedgeRadiusPx,
  type MapPick,
  type MapStage,
} from "./mapPicking";
import { announceMapDrawn } from "./mapDrawn";
import type { MapFocusDto, MapSiteDto } from "./types";

export type { MapStage } from "./mapPicking";

export interface GridMapProps {
  /**
   * Where to fetch a raster. A function, or — because a server component cannot pass functions to a client
   * component — a template string with "{layer}" and "{floor}" placeholders, e.g. "/api/requests/7/map/{layer}/{floor}".
   */
  rasterUrl: ((layer: MapRasterLayer, floor: number) => string) | string;
  /** Floors to offer, 0 = outdoor. */
  floors: number[];
  sites?: MapSiteDto[];
  /** Centre and zoom here and draw a marker (e.g. the worst grid picked in the table). */
  focus?: MapFocusDto | null;
  /** false: a single network state — only the "-before" layers are fetched, no before/after toggle and no delta. Default true. */
  compare?: boolean;
  initialLayer?: MapLayerKind;
  initialStage?: MapStage;
  /** Canvas height, CSS pixels (default 520). */
  height?: number;
  /**
   * Colour ranges; defaults DEFAULT_RSRP_DOMAIN_DBM / DEFAULT_SINR_DOMAIN_DB. The delta range follows the data.
   * RSRP "data": the range of the first RSRP layer shown (rsrpDomainOf), then kept for every layer, floor and
   * state, so that their colours stay comparable.
   */
  rsrpDomainDbm?: [number, number] | "data";
  sinrDomainDb?: [number, number];
  /**
   * A still picture for print (the PDF impact report): no layer, floor or zoom controls and no pointer readout.
   * Either way the canvas carries data-ready="true" once a raster is drawn, so a headless browser knows when to print.
   */
  printMode?: boolean;
  /**
   * Cells can be picked on the map: a click on a cell's wedge calls this with the cell's code, a click on a
   * site's dot lists the site's cells to pick from. Cells whose `changed` is true are drawn highlighted, so a
   * parent marks the picked ones there. Without it the map only pans, zooms and reads values.
   */
  onPickCell?: (cellCode: string) => void;
  /** Status shown while a layer loads (default "Loading layer…"). */
  loadingLabel?: string;
}

interface View {
  /** World point at the canvas centre, metres. */
  cx: number;
  cy: number;
  /** CSS pixels per metre. */
  s: number;
}

interface Extent {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

const MAX_SCALE_PX_PER_M = 40;
/** Width of ground a focus zoom shows, metres. */
const FOCUS_SPAN_M = 240;

function resolveUrl(rasterUrl: GridMapProps["rasterUrl"], layer: MapRasterLayer, floor: number): string {
  if (typeof rasterUrl === "function") return rasterUrl(layer, floor);
  return rasterUrl.replaceAll("{layer}", encodeURIComponent(layer)).replaceAll("{floor}", String(floor));
}

async function fetchRaster(url: string): Promise<DecodedMapRaster> {
  const response = await fetch(url, { credentials: "same-origin" });
  if (!response.ok) throw new Error(`Could not load the map layer (HTTP ${response.status}).`);
  return decodeMapRaster(await response.arrayBuffer());
}

function extentOf(raster: DecodedMapRaster | null, sites: MapSiteDto[]): Extent | null {
  if (raster) {
    const { originX, originY, cellSize, width, height } = raster.header;
    return { minX: originX, minY: originY, maxX: originX + width * cellSize, maxY: originY + height * cellSize };
  }
  if (sites.length === 0) return null;
  const xs = sites.map((s) => s.x), ys = sites.map((s) => s.y);
  const pad = 50;
  return { minX: Math.min(...xs) - pad, minY: Math.min(...ys) - pad, maxX: Math.max(...xs) + pad, maxY: Math.max(...ys) + pad };
}

function fitView(extent: Extent, width: number, height: number): View {
  const s = 0.95 * Math.min(width / (extent.maxX - extent.minX), height / (extent.maxY - extent.minY));
  return { cx: (extent.minX + extent.maxX) / 2, cy: (extent.minY + extent.maxY) / 2, s: Number.isFinite(s) && s > 0 ? s : 1 };
}

/** Display form of a raw raster value of the layer. */
function describeValue(kind: MapLayerKind, raw: number, cellCodes: string[] | undefined): string {
  switch (kind) {
    case "rsrp":
      return fixed(raw / 100, 1, "dBm");
    case "sinr":
      return fixed(raw / 100, 1, "dB");
    case "delta":
      return signed(raw / 100, 2, "dB");
    case "cell":
      return `cell ${cellCodes?.[raw] ?? `#${raw}`}`;
  }
}

function cssVar(element: Element, name: string, fallback: string): string {
  const value = getComputedStyle(element).getPropertyValue(name).trim();
  return value || fallback;
}

export function GridMap({
  rasterUrl,
  floors,
  sites = [],
  focus = null,
  compare = true,
  initialLayer = "rsrp",
  initialStage = "after",
  height = 520,
  rsrpDomainDbm: rsrpDomainChoice = DEFAULT_RSRP_DOMAIN_DBM,
  sinrDomainDb = DEFAULT_SINR_DOMAIN_DB,
  printMode = false,
  onPickCell,
  loadingLabel = "Loading layer…",
}: GridMapProps) {
  const layerChoices: MapLayerKind[] = compare ? ["rsrp", "sinr", "cell", "delta"] : ["rsrp", "sinr", "cell"];
  const [kind, setKind] = useState<MapLayerKind>(layerChoices.includes(initialLayer) ? initialLayer : "rsrp");
  const [stageChoice, setStage] = useState<MapStage>(initialStage);
  const stage: MapStage = compare ? stageChoice : "before";
  const [floor, setFloor] = useState<number>(() => (floors.includes(0) ? 0 : (floors[0] ?? 0)));
  const [raster, setRaster] = useState<DecodedMapRaster | null>(null);
  const [loading, setLoading] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [readout, setReadout] = useState<string>("");
  const [dataRsrpDomain, setDataRsrpDomain] = useState<[number, number] | null>(null);
  const rsrpDomainDbm = rsrpDomainChoice === "data" ? (dataRsrpDomain ?? DEFAULT_RSRP_DOMAIN_DBM) : rsrpDomainChoice;
  /** The site whose cells are listed for picking, and where (canvas CSS pixels) the list opens. */
  const [chooser, setChooser] = useState<{ siteCode: string; cellCodes: string[]; px: number; py: number } | null>(null);

  const stageRef = useRef<HTMLDivElement>(null);
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const imageRef = useRef<HTMLCanvasElement | null>(null);
  const rasterRef = useRef<DecodedMapRaster | null>(null);
  const viewRef = useRef<View>({ cx: 0, cy: 0, s: 1 });
  const sizeRef = useRef({ width: 0, height });
  const fittedRef = useRef(false);
  const frameRef = useRef(0);
  const cacheRef = useRef(new Map<string, Promise<DecodedMapRaster>>());
  const dragRef = useRef<{ x: number; y: number; cx: number; cy: number; moved: boolean } | null>(null);
  // Props the drawing reads, kept in a ref so that draw() stays stable and can run from animation frames.
  const drawPropsRef = useRef({ sites, focus, floor, stage });
  drawPropsRef.current = { sites, focus, floor, stage };

  // ---- which rasters the current choice needs; the effect keys on the URL strings, so a parent passing a
  // fresh rasterUrl function on every render does not refetch
  const needed: MapRasterLayer[] = kind === "delta" ? ["rsrp-before", "rsrp-after"] : [`${kind}-${stage}` as MapRasterLayer];
  const urls = needed.map((layer) => ({ layer, url: resolveUrl(rasterUrl, layer, floor) }));
  const urlKey = urls.map((u) => u.url).join("\n");

  useEffect(() => {
    let cancelled = false;
    setLoading(true);
    setError(null);
    const load = ({ layer, url }: { layer: MapRasterLayer; url: string }) => {
      let promise = cacheRef.current.get(url);
      if (!promise) {
        promise = fetchRaster(url).then((r) => {
          if (r.header.layer !== layer || r.header.floor !== floor) {
            throw new Error(`The server sent layer ${r.header.layer} of ${floorLabel(r.header.floor)} for ${layer} of ${floorLabel(floor)}.`);
          }
          return r;
        });
        // a failed load is not cached, so choosing the layer again retries
        promise.catch(() => cacheRef.current.delete(url));
        cacheRef.current.set(url, promise);
      }
      return promise;
    };
    Promise.all(urls.map(load))
      .then(([first, second]) => {
        if (cancelled) return;
        // set in the same turn as the raster, so that its first paint already has the range
        if (rsrpDomainChoice === "data" && first.header.layer.startsWith("rsrp-")) {
          setDataRsrpDomain((known) => known ?? rsrpDomainOf(first.values) ?? DEFAULT_RSRP_DOMAIN_DBM);
        }
        if (!second) return setRaster(first);
        const a = first.header, b = second.header;
        if (a.width !== b.width || a.height !== b.height || a.originX !== b.originX || a.originY !== b.originY || a.cellSize !== b.cellSize) {
          throw new Error("The before and after rasters do not cover the same grid.");
        }
        const values = deltaLayer(first.values, second.values);
        let min = Infinity, max = -Infinity;
        for (let i = 0; i < values.length; i++) {
          const v = values[i];
          if (v === MAP_RASTER_NO_DATA) continue;
          if (v < min) min = v;
          if (v > max) max = v;
        }
        const present = min !== Infinity;
        setRaster({ header: { ...a, layer: "rsrp-delta", min: present ? min / 100 : null, max: present ? max / 100 : null }, values });
      })
      .catch((e: unknown) => {
        if (!cancelled) setError(e instanceof Error ? e.message : String(e));
      })
      .finally(() => {
        if (!cancelled) setLoading(false);
      });
    return () => {
      cancelled = true;
    };
  }, [urlKey]); // urlKey stands for urls and floor

  const displayedKind: MapLayerKind | null = raster
    ? raster.header.layer === "rsrp-delta" ? "delta" : (raster.header.layer.split("-")[0] as MapLayerKind)
    : null;

  const scale: MapScale | null = useMemo(() => {
    if (!raster || !displayedKind) return null;
    if (displayedKind === "cell") return cellScale();
    if (displayedKind === "delta") return continuousScale("delta", deltaDomain(raster.header.min, raster.header.max));
    return continuousScale(displayedKind, displayedKind === "rsrp" ? rsrpDomainDbm : sinrDomainDb);
    // domains by value: a parent's inline array literal must not repaint the raster on every render
  }, [raster, displayedKind, rsrpDomainDbm[0], rsrpDomainDbm[1], sinrDomainDb[0], sinrDomainDb[1]]);

  // ---- drawing
  const draw = useCallback(() => {
    frameRef.current = 0;
    const canvas = canvasRef.current;
    const ctx = canvas?.getContext("2d");
    if (!canvas || !ctx) return;
    const { width, height: h } = sizeRef.current;
    const dpr = window.devicePixelRatio || 1;
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    ctx.clearRect(0, 0, width, h);
    const view = viewRef.current;
    // world (x east, y north) → canvas CSS pixels (y down): the flip happens here and in rasterPixels
    const sx = (x: number) => width / 2 + (x - view.cx) * view.s;
    const sy = (y: number) => h / 2 - (y - view.cy) * view.s;
    const ink = cssVar(canvas, "--ink", "#1c2830");
    const accent = cssVar(canvas, "--accent", "#0e6b6b");
    const worse = cssVar(canvas, "--worse", "#b0281c");

    // ---- raster
    const r = rasterRef.current, image = imageRef.current;
    if (r && image) {
      const { originX, originY, cellSize, width: w, height: rh } = r.header;
      const left = sx(originX), top = sy(originY + rh * cellSize);
      const dw = w * cellSize * view.s, dh = rh * cellSize * view.s;
      ctx.imageSmoothingEnabled = false;
      ctx.drawImage(image, left, top, dw, dh);
      ctx.strokeStyle = "rgba(28, 40, 48, 0.35)";
      ctx.lineWidth = 1;
      ctx.strokeRect(left, top, dw, dh);
    }
    // set on the element directly: React does not own these attributes, and draw() runs outside renders.
    // data-view is the drawn view (centre in local metres, CSS pixels per metre), for tests and tools that
    // need to find a place on the map.
    canvas.dataset.ready = r && image ? "true" : "false";
    if (r && image) announceMapDrawn();
    canvas.dataset.view = JSON.stringify({ cx: view.cx, cy: view.cy, s: view.s });

    // ---- sites and their cells
    const { sites: siteList, focus: target, floor: shownFloor, stage: shownStage } = drawPropsRef.current;
    ctx.font = "600 11px system-ui, sans-serif";
    ctx.textBaseline = "middle";
    const labels: { text: string; x: number; y: number }[] = [];
    for (const site of siteList) {
      const px = sx(site.x), py = sy(site.y);
      if (px < -60 || py < -60 || px > width + 60 || py > h + 60) continue;
      for (const cell of site.cells) {
        const azimuth = shownAzimuthDeg(cell, shownStage);
        // azimuth is clockwise from north; canvas angles are clockwise from east (y down), hence − 90°
        const centre = ((azimuth - 90) * Math.PI) / 180;
        const half = (WEDGE_HALF_WIDTH_DEG * Math.PI) / 180;
        const radius = wedgeRadiusPx(cell);
        ctx.beginPath();
        ctx.moveTo(px, py);
        ctx.arc(px, py, radius, centre - half, centre + half);
        ctx.closePath();
        if (cell.changed) {
          ctx.fillStyle = "rgba(255, 255, 255, 0.55)";
          ctx.fill();
          ctx.globalAlpha = 0.55;
          ctx.fillStyle = accent;
          ctx.fill();
          ctx.globalAlpha = 1;
          ctx.lineWidth = 2.5;
          ctx.strokeStyle = accent;
          ctx.stroke();
          const lx = px + Math.cos(centre) * (radius + 12), ly = py + Math.sin(centre) * (radius + 12);
          labels.push({ text: cell.code, x: lx, y: ly });
        } else {
          ctx.fillStyle = "rgba(255, 255, 255, 0.45)";
          ctx.fill();
          ctx.lineWidth = 1;
          ctx.strokeStyle = "rgba(28, 40, 48, 0.75)";
          ctx.stroke();
        }
      }
      ctx.beginPath();
      ctx.arc(px, py, SITE_DOT_RADIUS_PX, 0, 2 * Math.PI);
      ctx.fillStyle = ink;
      ctx.fill();
      ctx.lineWidth = 1.5;
      ctx.strokeStyle = "#fff";
      ctx.stroke();
      if (view.s >= 1.5) labels.push({ text: site.code, x: px + 6, y: py + 10 });
    }
    // labels last, with a white halo, so wedges never hide them
    ctx.lineJoin = "round";
    for (const label of labels) {
      const textWidth = ctx.measureText(label.text).width;
      const x = label.x - textWidth / 2;
      ctx.lineWidth = 3;
      ctx.strokeStyle = "rgba(255, 255, 255, 0.9)";
      ctx.strokeText(label.text, x, label.y);
      ctx.fillStyle = ink;
      ctx.fillText(label.text, x, label.y);
    }

    // ---- focus marker
    if (target && target.floor === shownFloor) {
      const fx = sx(target.x), fy = sy(target.y);
      const cell = r ? r.header.cellSize * view.s : 0;
      ctx.lineWidth = 4;
      ctx.strokeStyle = "#fff";
      ctx.beginPath();
      ctx.arc(fx, fy, 11, 0, 2 * Math.PI);
      ctx.stroke();
      ctx.lineWidth = 2;
      ctx.strokeStyle = worse;
      ctx.stroke();
      ctx.beginPath();
      ctx.moveTo(fx - 17, fy); ctx.lineTo(fx - 6, fy);
      ctx.moveTo(fx + 6, fy); ctx.lineTo(fx + 17, fy);
      ctx.moveTo(fx, fy - 17); ctx.lineTo(fx, fy - 6);
      ctx.moveTo(fx, fy + 6); ctx.lineTo(fx, fy + 17);
      ctx.stroke();
      if (cell >= 6) ctx.strokeRect(fx - cell / 2, fy - cell / 2, cell, cell);
    }

    // ---- scale bar: the largest 1-2-5 length under 120 px
    const target120 = 120 / view.s;
    const magnitude = 10 ** Math.floor(Math.log10(target120));
    const length = [5, 2, 1].map((k) => k * magnitude).find((m) => m <= target120) ?? magnitude;
    const barPx = length * view.s;
    const bx = 12, by = h - 14;
    ctx.lineWidth = 4;
    ctx.strokeStyle = "rgba(255, 255, 255, 0.85)";
    ctx.beginPath(); ctx.moveTo(bx, by); ctx.lineTo(bx + barPx, by); ctx.stroke();
    ctx.lineWidth = 2;
    ctx.strokeStyle = ink;
    ctx.beginPath(); ctx.moveTo(bx, by - 4); ctx.lineTo(bx, by); ctx.lineTo(bx + barPx, by); ctx.lineTo(bx + barPx, by - 4); ctx.stroke();
    const text = length >= 1000 ? `${length / 1000} km` : `${length} m`;
    ctx.lineWidth = 3;
    ctx.strokeStyle = "rgba(255, 255, 255, 0.9)";
    ctx.strokeText(text, bx + barPx + 6, by - 2);
    ctx.fillStyle = ink;
    ctx.fillText(text, bx + barPx + 6, by - 2);
    // north arrow: y grows north, so up is north
    ctx.fillText("N ↑", width - 34, 14);
  }, []);

  const scheduleDraw = useCallback(() => {
    if (!frameRef.current) frameRef.current = requestAnimationFrame(draw);
  }, [draw]);

  useEffect(() => () => cancelAnimationFrame(frameRef.current), []);

  const extentRef = useRef<Extent | null>(null);
  extentRef.current = extentOf(raster, sites);

  const fit = useCallback(() => {
    const extent = extentRef.current;
    const { width, height: h } = sizeRef.current;
    if (!extent || width === 0) return;
    viewRef.current = fitView(extent, width, h);
    scheduleDraw();
  }, [scheduleDraw]);

  const clampScale = useCallback((s: number) => {
    const extent = extentRef.current;
    const { width, height: h } = sizeRef.current;
    const min = extent && width > 0 ? fitView(extent, width, h).s / 8 : 1e-4;
    return Math.min(MAX_SCALE_PX_PER_M, Math.max(min, s));
  }, []);

  const zoomAt = useCallback((px: number, py: number, factor: number) => {
    const { width, height: h } = sizeRef.current;
    const v = viewRef.current;
    const wx = v.cx + (px - width / 2) / v.s;
    const wy = v.cy - (py - h / 2) / v.s;
    const s = clampScale(v.s * factor);
    viewRef.current = { s, cx: wx - (px - width / 2) / s, cy: wy + (py - h / 2) / s };
    scheduleDraw();
  }, [clampScale, scheduleDraw]);

  // ---- paint the raster once into an offscreen canvas
  useEffect(() => {
    rasterRef.current = raster;
    if (!raster || !scale) {
      imageRef.current = null;
      scheduleDraw();
      return;
    }
    const { width, height: h } = raster.header;
    const image = document.createElement("canvas");
    image.width = width;
    image.height = h;
    const ctx = image.getContext("2d");
    if (ctx) {
      const data = ctx.createImageData(width, h);
      rasterPixels(raster.values, width, h, scale, data.data);
      ctx.putImageData(data, 0, 0);
    }
    imageRef.current = image;
    if (!fittedRef.current && sizeRef.current.width > 0) {
      fittedRef.current = true;
      fit();
    }
    scheduleDraw();
  }, [raster, scale, fit, scheduleDraw]);

  // ---- canvas size follows its box (device pixels for sharp lines)
  useEffect(() => {
    const box = stageRef.current, canvas = canvasRef.current;
    if (!box || !canvas) return;
    const resize = () => {
      const width = box.clientWidth;
      const dpr = window.devicePixelRatio || 1;
      sizeRef.current = { width, height };
      canvas.width = Math.round(width * dpr);
      canvas.height = Math.round(height * dpr);
      canvas.style.width = `${width}px`;
      canvas.style.height = `${height}px`;
      if (!fittedRef.current && extentRef.current && width > 0) {
        fittedRef.current = true;
        fit();
      }
      draw();
    };
    resize();
    const observer = new ResizeObserver(resize);
    observer.observe(box);
    return () => observer.disconnect();
  }, [height, draw, fit]);

  // ---- wheel zoom needs a non-passive listener to keep the page from scrolling
  useEffect(() => {
    const canvas = canvasRef.current;
    if (!canvas) return;
    const onWheel = (event: WheelEvent) => {
      event.preventDefault();
      const rect = canvas.getBoundingClientRect();
      const pixels = event.deltaMode === 1 ? event.deltaY * 16 : event.deltaMode === 2 ? event.deltaY * 400 : event.deltaY;
      zoomAt(event.clientX - rect.left, event.clientY - rect.top, Math.exp(-pixels * 0.0015));
    };
    canvas.addEventListener("wheel", onWheel, { passive: false });
    return () => canvas.removeEventListener("wheel", onWheel);
  }, [zoomAt]);

  // ---- focus: switch floor, centre, zoom in
  const focusKey = focus ? `${focus.x},${focus.y},${focus.floor}` : "";
  useEffect(() => {
    if (!focus) return scheduleDraw();
    if (floors.includes(focus.floor)) setFloor(focus.floor);
    const { width, height: h } = sizeRef.current;
    const wanted = width > 0 ? Math.min(width, h) / FOCUS_SPAN_M : viewRef.current.s;
    viewRef.current = { cx: focus.x, cy: focus.y, s: clampScale(Math.max(viewRef.current.s, wanted)) };
    fittedRef.current = true;
    scheduleDraw();
  }, [focusKey]); // focusKey stands for focus

  // sites, stage or floor change what the overlay shows
  useEffect(() => scheduleDraw(), [sites, stage, floor, scheduleDraw]);

  // ---- pointer: drag to pan, hover to read
  const toWorld = (event: React.PointerEvent<HTMLCanvasElement>) => {
    const rect = event.currentTarget.getBoundingClientRect();
    const px = event.clientX - rect.left, py = event.clientY - rect.top;
    const { width, height: h } = sizeRef.current;
    const v = viewRef.current;
    return { px, py, x: v.cx + (px - width / 2) / v.s, y: v.cy - (py - h / 2) / v.s };
  };
  const onPointerDown = (event: React.PointerEvent<HTMLCanvasElement>) => {
    if (event.button !== 0) return;
    event.currentTarget.setPointerCapture(event.pointerId);
    dragRef.current = { x: event.clientX, y: event.clientY, cx: viewRef.current.cx, cy: viewRef.current.cy, moved: false };
  };
  /** The site or cell under a canvas point, when cells can be picked. */
  const pickUnder = (px: number, py: number): MapPick | null => {
    if (!onPickCell) return null;
    const { width, height: h } = sizeRef.current;
    return pickAt(drawPropsRef.current.sites, { ...viewRef.current, width, height: h }, px, py, drawPropsRef.current.stage);
  };
  const isPicked = (cellCode: string) => sites.some((site) => site.cells.some((c) => c.code === cellCode && c.changed));
  const onPointerMove = (event: React.PointerEvent<HTMLCanvasElement>) => {
    const drag = dragRef.current;
    if (drag) {
      const dx = event.clientX - drag.x, dy = event.clientY - drag.y;
      if (Math.abs(dx) + Math.abs(dy) > 2) drag.moved = true;
      const s = viewRef.current.s;
      viewRef.current = { s, cx: drag.cx - dx / s, cy: drag.cy + dy / s };
      scheduleDraw();
      return;
    }
    const { px, py, x, y } = toWorld(event);
    const pick = pickUnder(px, py);
    // a pointing hand over what a click picks; the stylesheet's grab hand elsewhere
    event.currentTarget.style.cursor = pick ? "pointer" : "";
    if (pick) {
      return setReadout(
        pick.kind === "cell"
          ? `Cell ${pick.cellCode}: click to ${isPicked(pick.cellCode) ? "take it out of" : "add it to"} the request`
          : `Site ${pick.siteCode}: click to list its ${pick.cellCodes.length === 1 ? "cell" : `${pick.cellCodes.length} cells`}`,
      );
    }
    const r = rasterRef.current;
    const at = `x ${x.toFixed(0)} m, y ${y.toFixed(0)} m`;
    if (!r || !displayedKind) return setReadout(at);
    const raw = rasterValueAt(r, x, y);
    setReadout(`${at} · ${floorLabel(r.header.floor)} · ${raw === null ? "no grid" : describeValue(displayedKind, raw, r.header.cellCodes)}`);
  };
  const endDrag = (event: React.PointerEvent<HTMLCanvasElement>) => {
    if (dragRef.current && event.currentTarget.hasPointerCapture(event.pointerId)) event.currentTarget.releasePointerCapture(event.pointerId);
    dragRef.current = null;
  };
  // a press that did not pan is a click: pick the cell or list the site's cells
  const onPointerUp = (event: React.PointerEvent<HTMLCanvasElement>) => {
    const drag = dragRef.current;
    endDrag(event);
    if (!drag || drag.moved || !onPickCell) return;
    const { px, py } = toWorld(event);
    const pick = pickUnder(px, py);
    if (pick?.kind === "cell") {
      setChooser(null);
      onPickCell(pick.cellCode);
    } else if (pick?.kind === "site") {
      setChooser({ siteCode: pick.siteCode, cellCodes: pick.cellCodes, px, py });
    } else {
      setChooser(null);
    }
  };
  const onKeyDown = (event: React.KeyboardEvent<HTMLCanvasElement>) => {
    const v = viewRef.current;
    const step = 60 / v.s;
    const { width, height: h } = sizeRef.current;
    const moves: Record<string, [number, number]> = { ArrowLeft: [-step, 0], ArrowRight: [step, 0], ArrowUp: [0, step], ArrowDown: [0, -step] };
    if (event.key in moves) {
      const [dx, dy] = moves[event.key];
      viewRef.current = { ...v, cx: v.cx + dx, cy: v.cy + dy };
      scheduleDraw();
    } else if (event.key === "+" || event.key === "=") zoomAt(width / 2, h / 2, 1.5);
    else if (event.key === "-") zoomAt(width / 2, h / 2, 1 / 1.5);
    else if (event.key === "0") fit();
    else return;
    event.preventDefault();
  };

  const { width: currentWidth, height: currentHeight } = sizeRef.current;
  const zoomCentre = (factor: number) => zoomAt((currentWidth || 0) / 2, currentHeight / 2, factor);

  return (
    <div className={printMode ? "gridmap gridmap-print" : "gridmap"}>
      {!printMode && <div className="tools gridmap-tools">
        <div className="segmented" role="group" aria-label="Map layer">
          {layerChoices.map((choice) => (
            <button key={choice} type="button" aria-pressed={kind === choice} onClick={() => setKind(choice)}>
              {choice === "delta" ? "RSRP change" : LAYER_LABELS[choice]}
            </button>
          ))}
        </div>
        {compare && (
          <div className="segmented" role="group" aria-label="Network state">
            {(["before", "after"] as const).map((s) => (
              <button key={s} type="button" aria-pressed={stage === s} disabled={kind === "delta"} onClick={() => setStage(s)}>
                {s === "before" ? "Before" : "After"}
              </button>
            ))}
          </div>
        )}
        <select aria-label="Floor" value={floor} onChange={(e) => setFloor(Number(e.target.value))}>
          {floors.map((f) => (
            <option key={f} value={f}>{floorLabel(f)}</option>
          ))}
        </select>
        <div className="segmented" role="group" aria-label="Zoom">
          <button type="button" onClick={() => zoomCentre(1.5)} aria-label="Zoom in">+</button>
          <button type="button" onClick={() => zoomCentre(1 / 1.5)} aria-label="Zoom out">−</button>
          <button type="button" onClick={fit}>Fit</button>
        </div>
      </div>}
      <div className="gridmap-stage" ref={stageRef} style={{ height }}>
        <canvas
          ref={canvasRef}
          data-testid="grid-map"
          tabIndex={0}
          role="img"
          aria-label={`${LAYER_LABELS[kind]}${kind === "delta" || !compare ? "" : `, ${stage}`}, ${floorLabel(floor)}. Drag to pan, wheel or + and − to zoom, 0 to fit.${onPickCell ? " Click a cell’s wedge to choose it, or a site’s dot to list its cells; the cells table chooses them by keyboard." : ""}`}
          onPointerDown={onPointerDown}
          onPointerMove={onPointerMove}
          onPointerUp={onPointerUp}
          onPointerCancel={endDrag}
          onPointerLeave={() => !dragRef.current && setReadout("")}
          onKeyDown={onKeyDown}
        />
        {/* over the map's corner rather than in the tool row, so that nothing moves when it goes */}
        {loading && !printMode && (
          <div className="gridmap-status" role="status">
            <span className="map-spinner" aria-hidden />
            {loadingLabel}
          </div>
        )}
        {error && <div className="banner bad gridmap-error" role="alert">{error}</div>}
        {chooser && onPickCell && (
          <SiteCellChooser
            site={sites.find((site) => site.code === chooser.siteCode)}
            cellCodes={chooser.cellCodes}
            at={chooser}
            stage={stage}
            stageWidth={currentWidth}
            stageHeight={height}
            onPick={onPickCell}
            onClose={() => {
              setChooser(null);
              canvasRef.current?.focus();
            }}
          />
        )}
      </div>
      <div className="gridmap-footer">
        {scale && raster && displayedKind ? <MapLegend kind={displayedKind} scale={scale} raster={raster} /> : <span className="muted">No layer loaded.</span>}
        {!printMode && <div className="gridmap-readout" aria-live="polite">{readout || "Point at the map to read a grid."}</div>}
      </div>
    </div>
  );
}

/** The cells of one site as buttons, opened by a click on the site's dot: each toggles its cell. */
function SiteCellChooser({
  site,
  cellCodes,
  at,
  stage,
  stageWidth,
  stageHeight,
  onPick,
  onClose,
}: {
  site: MapSiteDto | undefined;
  cellCodes: string[];
  at: { px: number; py: number };
  stage: MapStage;
  stageWidth: number;
  stageHeight: number;
  onPick: (cellCode: string) => void;
  onClose: () => void;
}) {
  const boxRef = useRef<HTMLDivElement>(null);
  // keyboard users land in the list; Escape or the close button returns them to the map
  useEffect(() => boxRef.current?.querySelector("button")?.focus(), [site?.code]);
  if (!site) return null;
  const cells = site.cells.filter((c) => cellCodes.includes(c.code));
  const boxWidth = 210, boxHeight = 44 + cells.length * 32;
  // open beside the dot, kept inside the map
  const left = Math.max(8, Math.min(at.px + 14, stageWidth - boxWidth - 8));
  const top = Math.max(8, Math.min(at.py - 12, stageHeight - boxHeight - 8));
  return (
    <div
      ref={boxRef}
      className="gridmap-chooser"
      role="group"
      aria-label={`Cells of site ${site.code}`}
      data-testid="map-cell-chooser"
      style={{ left, top, width: boxWidth }}
      onKeyDown={(event) => {
        if (event.key === "Escape") {
          event.preventDefault();
          onClose();
        }
      }}
    >
      <div className="gridmap-chooser-head">
        <strong>Site {site.code}</strong>
        <button type="button" className="gridmap-chooser-close" aria-label="Close the list" onClick={onClose}>
          ×
        </button>
      </div>
      {cells.map((cell) => (
        <button key={cell.code} type="button" className="gridmap-chooser-cell" aria-pressed={cell.changed} onClick={() => onPick(cell.code)}>
          <span className="gridmap-chooser-mark" aria-hidden>{cell.changed ? "✓" : "+"}</span>
          <span>{cell.code}</span>
          <span className="muted">az {Number(shownAzimuthDeg(cell, stage).toFixed(1))}°</span>
        </button>
      ))}
    </div>
  );
}

function MapLegend({ kind, scale, raster }: { kind: MapLayerKind; scale: MapScale; raster: DecodedMapRaster }) {
  const cellsShown = useMemo(() => {
    if (scale.kind !== "categorical") return [];
    const seen = new Set<number>();
    const values = raster.values;
    for (let i = 0; i < values.length; i++) if (values[i] !== MAP_RASTER_NO_DATA) seen.add(values[i]);
    return [...seen].sort((a, b) => a - b);
  }, [raster, scale.kind]);

  const noGrid = (
    <span className="gridmap-legend-item">
      <span className="gridmap-swatch gridmap-swatch-none" aria-hidden /> no grid on this floor
    </span>
  );

  if (scale.kind === "categorical") {
    const codes = raster.header.cellCodes ?? [];
    const limit = 24;
    return (
      <div className="gridmap-legend" aria-label="Legend">
        <strong>Serving cell</strong>
        {cellsShown.slice(0, limit).map((index) => (
          <span key={index} className="gridmap-legend-item">
            <span className="gridmap-swatch" style={{ background: cellColour(index) }} aria-hidden />
            {codes[index] ?? `#${index}`}
          </span>
        ))}
        {cellsShown.length > limit && <span className="muted">+{cellsShown.length - limit} more</span>}
        {noGrid}
        <span className="muted">Ten colours, repeating; point at a grid for its cell.</span>
      </div>
    );
  }

  const stops = Array.from({ length: 11 }, (_, i) => `${scale.interpolate(i / 10)} ${i * 10}%`).join(", ");
  const ticks = Array.from({ length: 5 }, (_, i) => scale.lo + ((scale.hi - scale.lo) * i) / 4);
  const digits = Number.isInteger(scale.lo) && Number.isInteger(scale.hi) && (scale.hi - scale.lo) % 4 === 0 ? 0 : 1;
  const { min, max } = raster.header;
  return (
    <div className="gridmap-legend" aria-label="Legend">
      <strong>
        {LAYER_LABELS[kind]}, {scale.unit}
      </strong>
      <div className="gridmap-ramp">
        <div className="gridmap-ramp-bar" style={{ background: `linear-gradient(to right, ${stops})` }} aria-hidden />
        <div className="gridmap-ramp-ticks">
          {ticks.map((t, i) => (
            <span key={i}>
              {i === 0 ? "≤ " : i === ticks.length - 1 ? "≥ " : ""}
              {kind === "delta" ? signed(t, digits) : fixed(t, digits)}
            </span>
          ))}
        </div>
        {kind === "delta" && (
          <div className="gridmap-ramp-ticks muted">
            <span>weaker after</span>
            <span>stronger after</span>
          </div>
        )}
      </div>
      {noGrid}
      <span className="muted">
        on this floor: {min === null || max === null ? "no values" : `${fixed(min, 1)} … ${fixed(max, 1)} ${scale.unit}`}
      </span>
      {kind === "sinr" && <span className="muted">SINR per resource element: noise of one subcarrier.</span>}
    </div>
  );
}
