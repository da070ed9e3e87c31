// Where the map draws a site's dot and its cells' wedges, and which of them lies under a pointer. Pure (no
// DOM), so that the drawing in GridMap and the picking agree by construction and the picking is unit-tested.
import type { MapSiteDto } from "./types";

// Slim, long wedges point the way a cell faces; wide ones on a three-sector site would read
// as a hazard sign rather than as directions.
export const WEDGE_RADIUS_PX = 30;
export const WEDGE_HALF_WIDTH_DEG = 11;
/** Changed (or chosen) cells are drawn this much longer, so they stand out. */
export const HIGHLIGHT_WEDGE_SCALE = 1.25;
export const SITE_DOT_RADIUS_PX = 3.5;

/** A press this close to a site's dot picks the site (its list of cells), CSS pixels. */
const SITE_PICK_RADIUS_PX = 8;
/** Wedges are slim: a press this far off a wedge's edge, in degrees and in pixels past its tip, still picks it. */
const WEDGE_PICK_MARGIN_DEG = 10;
const WEDGE_PICK_MARGIN_PX = 8;

export type MapStage = "before" | "after";

/** The drawn view: world point at the canvas centre (local metres), CSS pixels per metre, canvas size in CSS pixels. */
export interface ScreenView {
  cx: number;
  cy: number;
  s: number;
  width: number;
  height: number;
}

/** A cell's wedge, or a site whose cells are to be listed (all of them, or those whose wedges overlap there). */
export type MapPick = { kind: "cell"; siteCode: string; cellCode: string } | { kind: "site"; siteCode: string; cellCodes: string[] };

type MapCell = MapSiteDto["cells"][number];

/** The azimuth a wedge is drawn at: where the cell points in the stage shown. */
export function shownAzimuthDeg(cell: MapCell, stage: MapStage): number {
  return stage === "before" ? (cell.azimuthBeforeDeg ?? cell.azimuthDeg) : cell.azimuthDeg;
}

export function wedgeRadiusPx(cell: MapCell): number {
  return cell.changed ? WEDGE_RADIUS_PX * HIGHLIGHT_WEDGE_SCALE : WEDGE_RADIUS_PX;
}

/** World (x east, y north, metres) → canvas CSS pixels (y down). */
export function toScreen(view: ScreenView, x: number, y: number): { px: number; py: number } {
  return { px: view.width / 2 + (x - view.cx) * view.s, py: view.height / 2 - (y - view.cy) * view.s };
}

/** Smallest angle between two bearings, degrees, 0..180. */
function angularDistanceDeg(a: number, b: number): number {
  const d = Math.abs((((a - b) % 360) + 360) % 360);
  return d > 180 ? 360 - d : d;
}

/**
 * What a press at canvas point (px, py) picks: a site when it lands on the site's dot; else the cell whose
 * wedge (with a margin, since wedges are slim) it lands on, the nearest in angle winning; cells of one site
 * drawn on top of each other (same azimuth, e.g. two carriers) give their site with just those cells.
 * Null when the press is on neither.
 */
export function pickAt(sites: readonly MapSiteDto[], view: ScreenView, px: number, py: number, stage: MapStage): MapPick | null {
  let nearestSite: { site: MapSiteDto; distance: number } | null = null;
  let best: { site: MapSiteDto; cell: MapCell; off: number; distance: number } | null = null;
  const reach = WEDGE_RADIUS_PX * HIGHLIGHT_WEDGE_SCALE + WEDGE_PICK_MARGIN_PX;
  for (const site of sites) {
    const centre = toScreen(view, site.x, site.y);
    const dx = px - centre.px, dy = py - centre.py;
    const distance = Math.hypot(dx, dy);
    if (distance <= SITE_PICK_RADIUS_PX) {
      if (!nearestSite || distance < nearestSite.distance) nearestSite = { site, distance };
      continue;
    }
    if (distance > reach) continue;
    // bearing of the press from the site, clockwise from north (screen y grows downwards)
    const bearing = (Math.atan2(dx, -dy) * 180) / Math.PI;
    for (const cell of site.cells) {
      if (distance > wedgeRadiusPx(cell) + WEDGE_PICK_MARGIN_PX) continue;
      const off = angularDistanceDeg(bearing, shownAzimuthDeg(cell, stage));
      if (off > WEDGE_HALF_WIDTH_DEG + WEDGE_PICK_MARGIN_DEG) continue;
      if (!best || off < best.off || (off === best.off && distance < best.distance)) best = { site, cell, off, distance };
    }
  }
  if (nearestSite) return { kind: "site", siteCode: nearestSite.site.code, cellCodes: nearestSite.site.cells.map((c) => c.code) };
  if (!best) return null;
  // cells of the same site drawn over the picked wedge: the press cannot tell them apart, so list them
  const azimuth = shownAzimuthDeg(best.cell, stage);
  const stacked = best.site.cells.filter((c) => angularDistanceDeg(shownAzimuthDeg(c, stage), azimuth) < WEDGE_HALF_WIDTH_DEG);
  if (stacked.length > 1) return { kind: "site", siteCode: best.site.code, cellCodes: stacked.map((c) => c.code) };
  return { kind: "cell", siteCode: best.site.code, cellCode: best.cell.code };
}
