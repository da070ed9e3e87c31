"use client";
// The map and the worst-grid table side by side in state: choosing a grid in the table centres the map on it.
// Exists because a server page cannot hold that state, nor pass the onSelect function to the table.
import { useState } from "react";
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

export function ImpactMapSection({ map, worstGrids, worstGridTotal, clusterNames }: ImpactMapSectionProps) {
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
