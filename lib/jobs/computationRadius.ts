// The computation radius of a split (city-scale) run: beyond it no cell can reach a grid with more
// than the noise of one resource element minus a margin, so a cell's path-loss cache keeps only the
// grids inside it (lib/radio/pathLossStage.ts, sparse footprint).
//
// Link budget (DESIGN.md §2, RSRP per resource element), all in dB / dBm:
//   P_RS,max + G_max − PL(r) − L_other  <  N_RE − margin
//   P_RS,max  highest RS power any cell's antenna model allows (rsPowerMaxDbm), so a change request
//             raising power stays inside the radius the stages were computed with
//   G_max     GE,max + 10 log10(rows · columns): the element gain plus the full array gain of the
//             steered planar array (lib/radio/arrayFactor.ts normalises the beam peak to N·M), an
//             upper bound of every beam's gain in every direction
//   N_RE      −174 dBm/Hz + 10 log10(subcarrier spacing) + NF, the lowest of the cells (lib/radio/noise.ts)
//   PL(r)     the scenario environment's TR 38.901 Table 7.4.1-1 NLOS formula, PL = max(PL_LOS, PL'_NLOS),
//             at the lowest carrier frequency and the highest antenna, minimised over the user heights
//             the grid holds (outdoor 1.5 m; each floor with its building-entry wall loss, TR 38.901
//             §7.4.3, since an upper floor's lower PL' is bought with an O2I loss)
// Modelling choice (say so wherever the radius is used): a grid in clear line of sight farther than r
// would be computed with the (lower) LOS formula; in a built-up city such paths over kilometres are
// rare, and `pathLossCase: "los"` gives the strict radius for open terrain.
import type { Scenario } from "../radio/scenario";
import { umaLosDb, umaNlosDb } from "../radio/uma";
import { umiLosDb, umiNlosDb } from "../radio/umi";
import { cellNoise } from "../radio/noise";
import { wallPenetrationLossDb } from "../radio/buildingEntry";
import { MAX_UT_HEIGHT_M, MIN_D2D_M } from "../radio/pathLossStage";

export interface RadiusOptions {
  /** How far below the noise of one resource element a cell is cut off, dB (default 10). */
  marginDb?: number;
  /** Path-loss formula at the radius (default "nlos", see above). */
  pathLossCase?: "nlos" | "los";
}

export const DEFAULT_RADIUS_MARGIN_DB = 10;
// Beyond this the radius is reported as Infinity (dense caches): TR 38.901 stops at 5 km already.
const MAX_RADIUS_M = 100_000;

export interface RadiusBudget {
  /** Metres, rounded up to a whole metre; Infinity when the budget is not exhausted within 100 km. */
  radiusM: number;
  /** The path loss the radius must reach, dB: P_RS,max + G_max − L_other − (N_RE − margin). */
  requiredPathLossDb: number;
  maxRsPowerDbm: number;
  maxGainDbi: number;
  noisePerResourceElementDbm: number;
  marginDb: number;
}

/** The radius beyond which every cell of `scenario` is below N_RE − margin (link budget above). */
export function linkBudgetRadius(scenario: Scenario, options: RadiusOptions = {}): RadiusBudget {
  const marginDb = options.marginDb ?? DEFAULT_RADIUS_MARGIN_DB;
  if (!Number.isFinite(marginDb)) throw new RangeError(`linkBudgetRadius: marginDb must be a finite number of dB, got ${marginDb}`);
  if (scenario.cells.length === 0) throw new RangeError(`linkBudgetRadius: scenario "${scenario.name}" has no cells`);
  const models = new Map(scenario.antennaModels.map((m) => [m.id, m]));
  let maxRsPowerDbm = -Infinity, maxGainDbi = -Infinity, noise = Infinity, minGHz = Infinity, maxHeight = 0;
  for (const cell of scenario.cells) {
    const model = models.get(cell.antennaModelId);
    if (!model) throw new RangeError(`cell "${cell.id}": antennaModelId "${cell.antennaModelId}" names no antenna model`);
    maxRsPowerDbm = Math.max(maxRsPowerDbm, model.rsPowerMaxDbm, cell.rsPowerDbm);
    maxGainDbi = Math.max(maxGainDbi, model.elementGainDbi + 10 * Math.log10(model.rows * model.columns));
    noise = Math.min(noise, cellNoise(cell, scenario.settings.noiseFigureDb).resourceElementDbm);
    minGHz = Math.min(minGHz, cell.frequencyMHz / 1000);
    maxHeight = Math.max(maxHeight, cell.antennaHeightM);
  }
  const settings = scenario.settings;
  const requiredPathLossDb = maxRsPowerDbm + maxGainDbi - settings.otherLossesDb - (noise - marginDb);

  // ---- user heights present: outdoors, and each floor (indoor adds at least the wall loss)
  const heights: { hUt: number; extraDb: number }[] = [{ hUt: settings.userHeightM, extraDb: 0 }];
  const maxFloors = scenario.buildings.reduce((m, b) => Math.max(m, b.floors), 0);
  const wall = maxFloors > 0 ? wallPenetrationLossDb(settings.buildingLoss, minGHz) : 0;
  for (let k = 0; k < maxFloors; k++) heights.push({ hUt: Math.min(MAX_UT_HEIGHT_M, settings.userHeightM + k * settings.floorHeightM), extraDb: wall });
  const uma = settings.environment === "UMa";
  const formula = options.pathLossCase === "los" ? (uma ? umaLosDb : umiLosDb) : uma ? umaNlosDb : umiNlosDb;
  const lowestPathLoss = (d2D: number): number => {
    let best = Infinity;
    for (const { hUt, extraDb } of heights) {
      const h = Math.max(1.5, hUt);
      const d3D = Math.sqrt(d2D * d2D + (maxHeight - h) * (maxHeight - h));
      best = Math.min(best, formula(Math.max(MIN_D2D_M, d2D), d3D, minGHz, maxHeight, h) + extraDb);
    }
    return best;
  };

  // ---- the smallest r with PL(r) ≥ required, by bisection (PL is non-decreasing in distance)
  let radiusM: number;
  if (lowestPathLoss(MAX_RADIUS_M) < requiredPathLossDb) radiusM = Infinity;
  else if (lowestPathLoss(MIN_D2D_M) >= requiredPathLossDb) radiusM = MIN_D2D_M;
  else {
    let lo = MIN_D2D_M, hi = MAX_RADIUS_M;
    while (hi - lo > 0.5) {
      const mid = 0.5 * (lo + hi);
      if (lowestPathLoss(mid) >= requiredPathLossDb) hi = mid;
      else lo = mid;
    }
    radiusM = Math.ceil(hi);
  }
  return { radiusM, requiredPathLossDb, maxRsPowerDbm, maxGainDbi, noisePerResourceElementDbm: noise, marginDb };
}
