// Map layers of a stored simulation: one floor of one per-grid layer laid out on the
// horizontal plane and encoded in the compact binary map format (lib/io/mapRaster.ts).
// The grid is rebuilt from the scenario the simulation ran on (it is deterministic) and
// kept for the last few network versions, so paging through floors costs no rebuild.
import type { Prisma } from "../db/open";
import { latestVersionNumber, loadScenario } from "../db/networks/data";
import { loadRaster, simulationTarget } from "../db/simulations";
import { bytesToInt16 } from "../db/rasterBytes";
import { buildGrid, type Grid } from "../radio/grid";
import {
  deltaLayer,
  encodeMapRaster,
  floorLayer,
  floorsOf,
  quantiseCellIndex,
  quantiseCentiDb,
  type MapRasterHeaderLayer,
} from "../io/mapRaster";
import { DomainError } from "../changes/errors";
import type { Scenario } from "../radio/scenario";
import { getEngine } from "./engineCache";
import { engineKey } from "./runSimulation";
import { cdfsOf, readMapSummary, type SimulationCdfs } from "./mapSummary";

export type { SimulationCdfs } from "./mapSummary";

const STORED: Record<Exclude<MapRasterHeaderLayer, "rsrp-delta">, string> = {
  "rsrp-before": "before.bestRsrp",
  "rsrp-after": "after.bestRsrp",
  "sinr-before": "before.sinr",
  "sinr-after": "after.sinr",
  "cell-before": "before.server",
  "cell-after": "after.server",
};

export const MAP_LAYER_NAMES = [...Object.keys(STORED), "rsrp-delta"] as MapRasterHeaderLayer[];

/** A site and its cells as the map draws them (the shape of the review components' MapSiteDto). */
export interface MapSite {
  code: string;
  x: number;
  y: number;
  cells: { code: string; azimuthDeg: number; changed: boolean }[];
}

interface GridEntry {
  grid: Grid;
  cellCodes: string[];
  floors: number[];
  sites: MapSite[];
}

function sitesOf(scenario: Scenario): MapSite[] {
  return scenario.sites.map((site) => ({
    code: site.id,
    x: site.x,
    y: site.y,
    cells: scenario.cells.filter((c) => c.siteId === site.id).map((c) => ({ code: c.id, azimuthDeg: c.azimuthDeg, changed: false })),
  }));
}

const CAPACITY = 3;
const grids = new Map<string, Promise<GridEntry>>();

async function gridOf(prisma: Prisma, networkId: string, version: number): Promise<GridEntry> {
  const key = `${networkId}@${version}`;
  let entry = grids.get(key);
  if (!entry) {
    entry = loadScenario(prisma, networkId, { version }).then((scenario) => {
      const grid = buildGrid(scenario);
      return { grid, cellCodes: scenario.cells.map((c) => c.id), floors: floorsOf(grid), sites: sitesOf(scenario) };
    });
    grids.set(key, entry);
    entry.catch(() => grids.delete(key));
    while (grids.size > CAPACITY) grids.delete(grids.keys().next().value as string);
  }
  return entry;
}

/** A finished simulation's network and version (and, with `summary`, its stored summary). */
async function simulationContext(prisma: Prisma, simulationId: string, options: { summary?: boolean } = {}) {
  const sim = await simulationTarget(prisma, simulationId, options);
  if (!sim) throw new DomainError("not_found", `simulation ${simulationId} not found`);
  if (sim.status !== "done") {
    throw new DomainError("illegal_transition", `simulation ${simulationId} is ${sim.status}; its maps exist once it is done`);
  }
  return sim;
}

async function storedLayer(prisma: Prisma, simulationId: string, layer: string, count: number): Promise<Int16Array> {
  const raster = await loadRaster(prisma, simulationId, layer);
  if (!raster) throw new DomainError("not_found", `simulation ${simulationId} has no layer ${layer}`);
  const values = bytesToInt16(raster.data);
  if (values.length !== count) throw new RangeError(`simulation ${simulationId} layer ${layer}: ${values.length} values for ${count} grids`);
  return values;
}

/** simulationContext with the map summary the job stored (null for simulations stored before it existed). */
async function summaryContext(prisma: Prisma, simulationId: string) {
  const sim = await simulationContext(prisma, simulationId, { summary: true });
  return { ...sim, map: readMapSummary(sim.summary) };
}

/**
 * The floors (0 = outdoor) and plane geometry of a simulation's grid, for the map's controls: from the
 * summary the job stored (mapSummary.ts), else from the grid rebuilt (simulations stored before that).
 */
export async function mapGeometry(prisma: Prisma, simulationId: string) {
  const { networkId, baseVersion, map } = await summaryContext(prisma, simulationId);
  if (map) return { floors: map.floors, ...map.plane };
  const { grid, floors } = await gridOf(prisma, networkId, baseVersion);
  const { originX, originY, cellSize, width, height } = grid.plane;
  return { floors, originX, originY, cellSize, width, height };
}

/** One floor of one layer as map-raster bytes. */
export async function mapRasterBytes(
  prisma: Prisma,
  simulationId: string,
  layer: MapRasterHeaderLayer,
  floor: number,
): Promise<Uint8Array> {
  if (!MAP_LAYER_NAMES.includes(layer)) {
    throw new DomainError("invalid", `layer: unknown map layer "${layer}"; one of ${MAP_LAYER_NAMES.join(", ")}`, { field: "layer" });
  }
  if (!Number.isInteger(floor) || floor < 0) throw new DomainError("invalid", `floor: must be a whole number ≥ 0, got ${floor}`, { field: "floor" });
  const { networkId, baseVersion } = await simulationContext(prisma, simulationId);
  const { grid, cellCodes } = await gridOf(prisma, networkId, baseVersion);
  const planeSize = grid.plane.width * grid.plane.height;
  let perGrid: Int16Array;
  if (layer === "rsrp-delta") {
    const [before, after] = await Promise.all([
      storedLayer(prisma, simulationId, STORED["rsrp-before"], grid.count),
      storedLayer(prisma, simulationId, STORED["rsrp-after"], grid.count),
    ]);
    perGrid = deltaLayer(before, after);
  } else {
    perGrid = await storedLayer(prisma, simulationId, STORED[layer], grid.count);
  }
  const values = floorLayer(grid, planeSize, perGrid, floor);
  const isIndex = layer.startsWith("cell-");
  const { originX, originY, cellSize, width, height } = grid.plane;
  return encodeMapRaster(
    { layer, floor, width, height, originX, originY, cellSize, encoding: isIndex ? "index" : "centi-db", ...(isIndex ? { cellCodes } : {}) },
    values,
  );
}

/**
 * Cumulative distributions of best RSRP and SINR over every grid, before and after: kept in the summary by
 * the job, else computed from the stored layers (the same cdfsOf on the same values).
 */
export async function simulationCdfs(prisma: Prisma, simulationId: string): Promise<SimulationCdfs> {
  const { networkId, baseVersion, map } = await summaryContext(prisma, simulationId);
  if (map) return map.cdfs;
  const { grid } = await gridOf(prisma, networkId, baseVersion);
  const [bestRsrpBefore, bestRsrpAfter, sinrBefore, sinrAfter] = await Promise.all(
    ["before.bestRsrp", "after.bestRsrp", "before.sinr", "after.sinr"].map((layer) => storedLayer(prisma, simulationId, layer, grid.count)),
  );
  return cdfsOf({ bestRsrpBefore, bestRsrpAfter, sinrBefore, sinrAfter });
}

// ---------------------------------------------------------------- the network as it stands

/** The layers of the current network's map: one state, so only the "-before" (baseline) layers. */
export type BaselineMapLayer = "rsrp-before" | "sinr-before" | "cell-before";
export const BASELINE_MAP_LAYERS: readonly BaselineMapLayer[] = ["rsrp-before", "sinr-before", "cell-before"];

/** Floors (0 = outdoor) and sites of the network's latest version, for the map's controls and overlay. */
export async function baselineMapInfo(prisma: Prisma, networkId: string): Promise<{ version: number; floors: number[]; sites: MapSite[] }> {
  const version = await latestVersionNumber(prisma, networkId);
  const { floors, sites } = await gridOf(prisma, networkId, version);
  return { version, floors, sites };
}

/**
 * One floor of one baseline layer of the network's latest version as map-raster bytes. The
 * engine comes from the same cache (and key) as the simulations, so the first map of a
 * version pays the cold build and later maps and simulations of that version do not.
 */
export async function baselineMapRasterBytes(
  prisma: Prisma,
  networkId: string,
  layer: BaselineMapLayer,
  floor: number,
): Promise<Uint8Array> {
  if (!BASELINE_MAP_LAYERS.includes(layer)) {
    throw new DomainError("invalid", `layer: unknown map layer "${layer}"; one of ${BASELINE_MAP_LAYERS.join(", ")}`, { field: "layer" });
  }
  if (!Number.isInteger(floor) || floor < 0) throw new DomainError("invalid", `floor: must be a whole number ≥ 0, got ${floor}`, { field: "floor" });
  const version = await latestVersionNumber(prisma, networkId);
  const scenario = await loadScenario(prisma, networkId, { version });
  const engine = await getEngine(engineKey(networkId, version, scenario), scenario, () => {});
  const { grid } = engine;
  const perGrid = engine.baseline.kpis.perGrid;
  const quantised =
    layer === "rsrp-before"
      ? quantiseCentiDb(perGrid.bestRsrpDbm)
      : layer === "sinr-before"
        ? quantiseCentiDb(perGrid.sinrDb)
        : quantiseCellIndex(perGrid.bestCell);
  const planeSize = grid.plane.width * grid.plane.height;
  const values = floorLayer(grid, planeSize, quantised, floor);
  const isIndex = layer === "cell-before";
  const { originX, originY, cellSize, width, height } = grid.plane;
  return encodeMapRaster(
    {
      layer,
      floor,
      width,
      height,
      originX,
      originY,
      cellSize,
      encoding: isIndex ? "index" : "centi-db",
      ...(isIndex ? { cellCodes: engine.scenario.cells.map((c) => c.id) } : {}),
    },
    values,
  );
}
