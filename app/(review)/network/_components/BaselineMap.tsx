"use client";
// The current network's map. The first raster of a version makes the server build the coverage
// engine (seconds), so this asks for the opening layer itself and shows the map area as
// "preparing" until it arrives; the map then finds that layer in the browser's cache. The same
// layer sets the RSRP colour range, so that a network whose signal sits above or below the usual
// display range still shows its gradient instead of one saturated colour.
import { useEffect, useState } from "react";
import { decodeMapRaster } from "@/lib/io/mapRaster";
import { GridMap } from "../../_components/GridMap";
import { rsrpDomainOf } from "../../_components/mapColours";
import type { MapSiteDto } from "../../_components/types";

export interface BaselineMapProps {
  /** Template with "{layer}" and "{floor}", as GridMap takes it. */
  rasterUrl: string;
  floors: number[];
  sites: MapSiteDto[];
  version: number;
  height?: number;
}

type Warmup = { state: "preparing"; seconds: number } | { state: "ready"; rsrpDomainDbm?: [number, number] } | { state: "failed"; message: string };

export function BaselineMap({ rasterUrl, floors, sites, version, height = 600 }: BaselineMapProps) {
  const [warmup, setWarmup] = useState<Warmup>({ state: "preparing", seconds: 0 });
  const [attempt, setAttempt] = useState(0);
  const openingFloor = floors.includes(0) ? 0 : (floors[0] ?? 0);

  useEffect(() => {
    let cancelled = false;
    const started = Date.now();
    setWarmup({ state: "preparing", seconds: 0 });
    const timer = setInterval(() => {
      if (!cancelled) setWarmup((w) => (w.state === "preparing" ? { state: "preparing", seconds: Math.floor((Date.now() - started) / 1000) } : w));
    }, 1000);
    const url = rasterUrl.replaceAll("{layer}", "rsrp-before").replaceAll("{floor}", String(openingFloor));
    fetch(url, { credentials: "same-origin" })
      .then(async (response) => {
        if (!response.ok) {
          const body = (await response.json().catch(() => null)) as { error?: { message?: string } } | null;
          throw new Error(body?.error?.message ?? `HTTP ${response.status}`);
        }
        const raster = decodeMapRaster(await response.arrayBuffer());
        if (!cancelled) setWarmup({ state: "ready", rsrpDomainDbm: rsrpDomainOf(raster.values) });
      })
      .catch((error: unknown) => {
        if (!cancelled) setWarmup({ state: "failed", message: error instanceof Error ? error.message : String(error) });
      })
      .finally(() => clearInterval(timer));
    return () => {
      cancelled = true;
      clearInterval(timer);
    };
  }, [rasterUrl, openingFloor, attempt]);

  if (warmup.state === "ready") {
    return (
      <GridMap
        rasterUrl={rasterUrl}
        floors={floors}
        sites={sites}
        compare={false}
        initialLayer="rsrp"
        height={height}
        {...(warmup.rsrpDomainDbm ? { rsrpDomainDbm: warmup.rsrpDomainDbm } : {})}
      />
    );
  }
  return (
    <div className="gridmap-stage map-placeholder" style={{ height }} data-testid="map-placeholder">
      {warmup.state === "preparing" ? (
        <div className="map-placeholder-body" role="status">
          <span className="map-spinner" aria-hidden />
          <strong>Preparing the coverage model of version {version}…</strong>
          <span className="muted">
            The first map of a version computes path loss for every cell; this takes a few seconds{warmup.seconds > 0 ? ` (${warmup.seconds} s so far)` : ""}.
          </span>
        </div>
      ) : (
        <div className="map-placeholder-body" role="alert">
          <strong>The map could not be prepared.</strong>
          <span className="muted">{warmup.message}</span>
          <button type="button" className="secondary" onClick={() => setAttempt((n) => n + 1)}>
            Try again
          </button>
        </div>
      )}
    </div>
  );
}
