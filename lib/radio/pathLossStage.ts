// The per-cell path-loss stage: everything about a cell → grid link that does NOT depend on the cell's
// azimuth, tilts, beam set or power. Computed once per cell and kept (the cache of DESIGN.md §2).
//
// The result holds plain typed arrays only, so a runner can compute cells on worker threads and hand the
// buffers back (transferable). The angles are kept as unit direction vectors (direction.ts), one array per
// antenna point, which the engine attaches (engine.ts cellPathLossWithDirections); stored angles would cost the
// gain pass a sine and a cosine per grid.
//
// Modelling choices (documented clamps, deterministic):
// - d2D is clamped to ≥ 10 m (TR 38.901 Table 7.4.1-1 lower limit); beyond 5 km the formulas are extrapolated.
// - hUT in the formulas is clamped to 1.5–22.5 m (the table's UT height range); hBS is the antenna height
//   above the mast's ground. d3D uses the absolute height difference (terrain included).
// - LOS: the horizontal ray grid → site is marched at grid-size steps through the building-height map
//   (terrain + roofs, nearest position); the path is LOS when no sample rises above the straight 3D line.
//   Samples on the grid's own building and on the building the site stands on are skipped (the O2I model
//   covers the former; rooftop/facade masts look past the latter). One trace serves all floors of a position.
// - Diffraction (settings.diffraction, deterministic mode): PL = PL_LOS + J(ν) of one knife edge, the sample
//   of highest elevation angle seen from the antenna (the antenna-side horizon), for LOS and obstructed paths
//   alike; J(ν) = 0 for ν ≤ −0.78. Without it, obstructed paths take the table's NLOS formula.
// - Indoor grids add TR 38.901 §7.4.3 PL_tw (low/high loss) + 0.5 d2D-in, d2D-in the distance from the grid to
//   its own footprint edge toward the site (capped at the horizontal distance to the site).
import type { Scenario } from "./scenario";
import type { Grid } from "./grid";
import { planePositionAt } from "./horizontalPlane";
import { rayExitDistance } from "./polygon";
import { createHorizonResult, traceHorizon } from "./lineOfSight";
import { umaLosDb, umaNlosDb } from "./uma";
import { umiLosDb, umiNlosDb } from "./umi";
import { knifeEdgeLossDb, fresnelParameter } from "./knifeEdge";
import { wallPenetrationLossDb, indoorLossDb } from "./buildingEntry";

export const MIN_D2D_M = 10;
export const MIN_UT_HEIGHT_M = 1.5;
export const MAX_UT_HEIGHT_M = 22.5;

export interface CellPathLoss {
  cellId: string;
  /** Grid indices held (ascending), or null when the cell holds every grid (dense). */
  footprint: Int32Array | null;
  /** Total path loss cell → grid incl. O2I and other losses, dB; one value per footprint entry (or grid). */
  pathLossDb: Float32Array;
  /**
   * Unit directions antenna → grid per footprint entry (direction.ts), when kept: shared by the cells whose antennas
   * stand at one point. Absent, the gain pass computes them (the same bits). Always present as a property (undefined
   * when not kept), so every cache object has one shape for the JIT.
   */
  direction?: Float32Array;
}

export interface PathLossOptions {
  /**
   * Keep only grids within this horizontal distance of the site (sparse footprint); default Infinity (dense).
   * When no grid is farther, the cache is dense all the same.
   */
  radiusM?: number;
  /**
   * Compute only the positions of these grids (ascending): the footprint holds every layer of each of them (within
   * the radius). Each grid's value is the one the whole-grid computation gives (a position's trace serves its
   * layers alone). For a few grids of a city network whose caches are not kept (lib/jobs/splitEvaluation.ts).
   */
  grids?: Int32Array;
}

/**
 * Computes one cell's path-loss cache. Pure and deterministic: any thread gives the same bits. `allocate` gives
 * the memory of the returned arrays (e.g. shared memory for threads).
 */
export function computeCellPathLoss(scenario: Scenario, grid: Grid, cellIndex: number, options: PathLossOptions = {}, allocate: (bytes: number) => ArrayBufferLike = (b) => new ArrayBuffer(b)): CellPathLoss {
  const cell = scenario.cells[cellIndex];
  if (!cell) throw new RangeError(`computeCellPathLoss: no cell at index ${cellIndex}`);
  const site = scenario.sites.find((s) => s.id === cell.siteId);
  if (!site) throw new RangeError(`cell "${cell.id}": siteId "${cell.siteId}" names no site`);
  const settings = scenario.settings;
  const radius = options.radiusM ?? Infinity;
  const only = options.grids;
  const plane = grid.plane;
  const planeBuilding = plane.buildingIndex;
  const horizon = createHorizonResult();

  const ax = site.x, ay = site.y, az = site.groundHeightM + cell.antennaHeightM;
  const hBs = cell.antennaHeightM;
  const fGHz = cell.frequencyMHz / 1000;
  const wavelength = 0.299792458 / fGHz;
  const sitePlaneBuilding = planeBuilding[planePositionAt(plane, ax, ay)];
  const siteBuilding = sitePlaneBuilding >= 0 ? sitePlaneBuilding : -2;
  const wallLoss = wallPenetrationLossDb(settings.buildingLoss, fGHz);
  const other = settings.otherLossesDb;
  const diffraction = settings.diffraction;
  const uma = settings.environment === "UMa";
  const losDb = uma ? umaLosDb : umiLosDb;
  const nlosDb = uma ? umaNlosDb : umiNlosDb;

  // The first grid of each position to compute, in grid order (so a sparse footprint comes out ascending).
  let starts: Int32Array | null = null;
  if (only) {
    const firsts: number[] = [];
    for (let k = 0; k < only.length; k++) {
      if (k > 0 && !(only[k] > only[k - 1])) throw new RangeError(`computeCellPathLoss: options.grids must ascend (entry ${k})`);
      const first = grid.positionStart[grid.positionIndex[only[k]]];
      if (firsts.length === 0 || firsts[firsts.length - 1] !== first) firsts.push(first);
    }
    starts = Int32Array.from(firsts);
  }
  const capacity = starts ? starts.reduce((n, g) => n + grid.positionLayers[grid.positionIndex[g]], 0) : grid.count;
  const out = starts ? new Float32Array(capacity) : new Float32Array(allocate(4 * grid.count));
  // Made at the first position left out (then holding 0 … n − 1 so far): a radius that leaves none out gives a
  // dense cache, without a footprint that would list every grid.
  let footprint: Int32Array | null = starts ? new Int32Array(capacity) : null;
  let n = 0;

  for (let next = 0, g0 = starts ? (starts.length > 0 ? starts[0] : grid.count) : 0; g0 < grid.count; ) {
    const p = grid.positionIndex[g0];
    const g1 = g0 + grid.positionLayers[p];
    const following = starts ? (++next < starts.length ? starts[next] : grid.count) : g1;
    const px = grid.x[g0], py = grid.y[g0];
    const dxh = ax - px, dyh = ay - py;
    const D = Math.sqrt(dxh * dxh + dyh * dyh);
    if (D > radius) {
      if (!footprint) {
        footprint = new Int32Array(capacity);
        for (let j = 0; j < n; j++) footprint[j] = j;
      }
      g0 = following;
      continue;
    }
    const ownPlane = planeBuilding[p];
    const own = ownPlane >= 0 ? ownPlane : -2;

    // ---- trace the horizontal ray toward the site through the building-height map
    const ux = D > 0 ? dxh / D : 0, uy = D > 0 ? dyh / D : 0;
    // Without diffraction the march may stop once every floor of the position is blocked.
    const stopAbove = diffraction || D <= 0 ? Infinity : (grid.z[g1 - 1] - az) / D;
    traceHorizon(plane, px, py, ax, ay, az, own, siteBuilding, stopAbove, horizon);
    const maxSlope = horizon[0], obstacleS = horizon[1], obstacleH = horizon[2];

    // ---- indoor distance toward the site (shared by all floors)
    let indoor = 0;
    if (own >= 0) {
      const exit = D > 0 ? rayExitDistance(scenario.buildings[own].footprint, px, py, ux, uy) : 0;
      indoor = wallLoss + indoorLossDb(Math.min(Number.isFinite(exit) ? exit : 0, D));
    }

    // ---- per layer
    for (let g = g0; g < g1; g++) {
      const dz = grid.z[g] - az;
      let hUt = grid.heightAboveGround[g];
      if (hUt < MIN_UT_HEIGHT_M) hUt = MIN_UT_HEIGHT_M;
      else if (hUt > MAX_UT_HEIGHT_M) hUt = MAX_UT_HEIGHT_M;
      const d2D = D < MIN_D2D_M ? MIN_D2D_M : D;
      const d3D = Math.sqrt(d2D * d2D + dz * dz);
      let pl: number;
      if (diffraction) {
        pl = losDb(d2D, d3D, fGHz, hBs, hUt);
        if (maxSlope > -Infinity) {
          const lineHeight = az + (dz * obstacleS) / D;
          pl += knifeEdgeLossDb(fresnelParameter(obstacleH - lineHeight, obstacleS, D - obstacleS, wavelength));
        }
      } else {
        const los = D <= 0 || maxSlope <= dz / D;
        pl = los ? losDb(d2D, d3D, fGHz, hBs, hUt) : nlosDb(d2D, d3D, fGHz, hBs, hUt);
      }
      const value = pl + indoor + other;
      if (footprint) footprint[n] = g;
      out[n++] = value;
    }
    g0 = following;
  }
  if (footprint) {
    const kept = new Int32Array(allocate(4 * n)), values = new Float32Array(allocate(4 * n));
    kept.set(footprint.subarray(0, n));
    values.set(out.subarray(0, n));
    return { cellId: cell.id, footprint: kept, pathLossDb: values, direction: undefined };
  }
  return { cellId: cell.id, footprint: null, pathLossDb: out, direction: undefined };
}

/** Line-of-sight flag per grid for one cell (the trace computeCellPathLoss uses), for maps and tests. */
export function computeCellLineOfSight(scenario: Scenario, grid: Grid, cellIndex: number): Uint8Array {
  const cell = scenario.cells[cellIndex];
  const site = scenario.sites.find((s) => s.id === cell.siteId);
  if (!site) throw new RangeError(`cell "${cell.id}": siteId "${cell.siteId}" names no site`);
  const plane = grid.plane;
  const az = site.groundHeightM + cell.antennaHeightM;
  const siteB = plane.buildingIndex[planePositionAt(plane, site.x, site.y)];
  const horizon = createHorizonResult();
  const flags = new Uint8Array(grid.count);
  for (let p = 0; p < plane.width * plane.height; p++) {
    const g0 = grid.positionStart[p], g1 = g0 + grid.positionLayers[p];
    const own = plane.buildingIndex[p];
    traceHorizon(plane, grid.x[g0], grid.y[g0], site.x, site.y, az, own >= 0 ? own : -2, siteB >= 0 ? siteB : -2, Infinity, horizon);
    const D = Math.hypot(site.x - grid.x[g0], site.y - grid.y[g0]);
    for (let g = g0; g < g1; g++) flags[g] = D <= 0 || horizon[0] <= (grid.z[g] - az) / D ? 1 : 0;
  }
  return flags;
}
