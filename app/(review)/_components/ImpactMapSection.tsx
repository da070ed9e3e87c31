"use client";
// The map and the worst-grid table side by side in state: choosing a grid in the table centres the map on it.
// Exists because a server page cannot hold that state, nor pass the onSelect function to the table.
import { useState } from "react";
import { preload } from "react-dom";
import { GridMap, type GridMapProps } from "./GridMap";
import { WorstGridsTable } from "./WorstGridsTable";
import type { MapFocusDto, WorstGridDto } from "./types";

export interface ImpactMapSectionProps {
  /** GridMap props; rasterUrl must be the template string form here (server → client). */
  map: Omit<GridMapProps, "focus" | "rasterUrl"> & { rasterUrl: string };
  worstGrids: WorstGridDto[];
  worstGridTotal?: number;
  clusterNames?: Record<string, string>;
}

/**
 * The raster URLs GridMap fetches first, by GridMap's own defaults (layer "rsrp", stage "after", floor 0 or
 * the lowest offered; "delta" needs both RSRP states; compare=false only the "-before" layers).
 */
export function initialRasterUrls(map: ImpactMapSectionProps["map"]): string[] {
  const compare = map.compare ?? true;
  const kind = map.initialLayer && (compare || map.initialLayer !== "delta") ? map.initialLayer : "rsrp";
  const stage = compare ? (map.initialStage ?? "after") : "before";
  const floor = map.floors.includes(0) ? 0 : (map.floors[0] ?? 0);
  const layers = kind === "delta" ? ["rsrp-before", "rsrp-after"] : [`${kind}-${stage}`];
  return layers.map((layer) => map.rasterUrl.replaceAll("{layer}", encodeURIComponent(layer)).replaceAll("{floor}", String(floor)));
}

export function ImpactMapSection({ map, worstGrids, worstGridTotal, clusterNames }: ImpactMapSectionProps) {
  // A preload hint in the page's head: the browser fetches the first raster while it still loads and runs the
  // page's scripts, and GridMap's fetch (mode cors, same-origin credentials, as crossOrigin "anonymous") takes it.
  for (const url of initialRasterUrls(map)) preload(url, { as: "fetch", crossOrigin: "anonymous" });
  const [focus, setFocus] = useState<MapFocusDto | null>(null);
  const [selected, setSelected] = useState<number | null>(null);
  return (
    <>
      <GridMap {...map} focus={focus} />
      <h3>Grids that get worse</h3>
      <WorstGridsTable
        grids={worstGrids}
        total={worstGridTotal}
        clusterNames={clusterNames}
        selectedGridIndex={selected}
        onSelect={(grid) => {
          setSelected(grid.gridIndex);
          setFocus({ x: grid.x, y: grid.y, floor: grid.floor });
        }}
      />
    </>
  );
}
