"use client";
// The request builder's map: the network as it stands, every cell as a wedge. A click on a wedge puts the
// cell in the request or takes it out, exactly as its box in the cells table does; a click on a site's dot
// lists the site's cells. The chosen cells are drawn highlighted with their names.
import { use } from "react";
import { GridMap } from "../../_components/GridMap";
import type { MapSiteDto } from "../../_components/types";

/** Where the builder's map gets its layers; null when the server could not prepare them. */
export interface BuilderMapInfo {
  rasterUrl: string;
  floors: number[];
  version: number;
}

export interface BuilderMapProps {
  /** From the server page, resolved inside a Suspense boundary so that the form does not wait for it. */
  info: Promise<BuilderMapInfo | null>;
  sites: MapSiteDto[];
  onPickCell: (cellCode: string) => void;
  height: number;
}

export function BuilderMap({ info, sites, onPickCell, height }: BuilderMapProps) {
  const map = use(info);
  if (!map) {
    return (
      <div className="gridmap-stage map-placeholder" style={{ height }}>
        <div className="map-placeholder-body" role="status">
          <strong>The map could not be prepared.</strong>
          <span className="muted">Choose the cells in the table.</span>
        </div>
      </div>
    );
  }
  return (
    <GridMap
      rasterUrl={map.rasterUrl}
      floors={map.floors}
      sites={sites}
      compare={false}
      height={height}
      rsrpDomainDbm="data"
      onPickCell={onPickCell}
      loadingLabel={`Preparing the coverage of version ${map.version}; cells can be chosen meanwhile`}
    />
  );
}
