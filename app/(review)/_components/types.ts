// Plain-JSON props of the review components. Pages build these from lib/ results; nothing here holds a typed
// array, a Date or a class instance, so every value crosses the server → client boundary unchanged.
import type { ImpactReport, WorstGrid } from "@/lib/radio/impact";
import type { RequestState } from "@/lib/changes/rules";

/** Mirrors lib/radio/kpi KpiSummary. Ratios are 0..1; RSRP in dBm, SINR in dB; null where the area has no value. */
export interface KpiSummaryDto {
  gridCount: number;
  coverageRatio: number | null;
  overlapRatio: number | null;
  interferenceRatio: number | null;
  meanBestRsrpDbm: number | null;
  p5BestRsrpDbm: number | null;
  p50BestRsrpDbm: number | null;
  p95BestRsrpDbm: number | null;
  meanSinrDb: number | null;
  p5SinrDb: number | null;
  p50SinrDb: number | null;
  p95SinrDb: number | null;
  weighted: {
    totalWeight: number;
    coverageRatio: number | null;
    overlapRatio: number | null;
    interferenceRatio: number | null;
    meanBestRsrpDbm: number | null;
    meanSinrDb: number | null;
  } | null;
}

/** Mirrors lib/radio/impact KpiDelta: after − before, null where either side is null. */
export type KpiDeltaDto = { [K in Exclude<keyof KpiSummaryDto, "weighted">]: number | null } & {
  weighted: { [K in keyof NonNullable<KpiSummaryDto["weighted"]>]: number | null } | null;
};

export interface KpiComparisonDto {
  before: KpiSummaryDto;
  after: KpiSummaryDto;
  delta: KpiDeltaDto;
}

/** Mirrors the network / clusters / cells fields of lib/radio/impact ImpactReport. */
export interface ImpactSummaryDto {
  network: KpiComparisonDto;
  clusters: (KpiComparisonDto & { clusterId: string; clusterName: string })[];
  cells: { cellId: string; bestServerAreaBeforeM2: number; bestServerAreaAfterM2: number; deltaM2: number }[];
}

export type WorstGridReasonDto = "coverage-lost" | "overlap-lost" | "interference-lost" | "rsrp-drop";

/** Mirrors lib/radio/impact WorstGrid; null RSRP / SINR stands for "no cell reaches the grid". */
export interface WorstGridDto {
  gridIndex: number;
  x: number;
  y: number;
  floor: number;
  clusterId: string | null;
  servingCellBefore: string | null;
  servingCellAfter: string | null;
  bestRsrpBeforeDbm: number | null;
  bestRsrpAfterDbm: number | null;
  sinrBeforeDb: number | null;
  sinrAfterDb: number | null;
  overlapOthersBefore: number;
  overlapOthersAfter: number;
  reasons: WorstGridReasonDto[];
}

/** One row of the change-request list. */
export interface RequestRowDto {
  id: string;
  number: number;
  title: string;
  state: RequestState;
  authorName: string;
  clusters: string[];
  cellCount: number;
  /** Another request on the same cells was approved or implemented after this one was simulated. */
  stale: boolean;
  /** Numbers of the open requests touching the same cells. */
  conflictWith: number[];
  /** ISO 8601. */
  updatedAt: string;
  createdAt: string;
}

/** One value of a cell parameter through time (the temporal record), ISO 8601 bounds, validTo null = still valid. */
export interface ParameterPointDto {
  validFrom: string;
  validTo: string | null;
  value: number | string;
  requestNumber: number | null;
  requestTitle: string | null;
}

/** A site and its cells as drawn on the map, local metres, azimuth clockwise from north. */
export interface MapSiteDto {
  code: string;
  x: number;
  y: number;
  cells: {
    code: string;
    azimuthDeg: number;
    /** Azimuth before the change when it differs; the map points the wedge here while showing "before". */
    azimuthBeforeDeg?: number;
    changed: boolean;
  }[];
}

/** Where the map should centre, local metres; floor 0 = outdoor. */
export interface MapFocusDto {
  x: number;
  y: number;
  floor: number;
}

// Compile-time guards: the engine's output must stay assignable to the DTOs, so a field added or renamed in
// lib/radio breaks the build here instead of silently vanishing from the screen.
type Assignable<T extends U, U> = T;
export type ImpactReportFitsDto = Assignable<Pick<ImpactReport, "network" | "clusters" | "cells">, ImpactSummaryDto>;
export type WorstGridFitsDto = Assignable<WorstGrid, WorstGridDto>;
export type DtoFitsImpactReport = Assignable<ImpactSummaryDto, Pick<ImpactReport, "network" | "clusters" | "cells">>;
export type DtoFitsWorstGrid = Assignable<WorstGridDto, WorstGrid>;
