// Engine benchmark: `npx tsx test/bench/engine.bench.ts --json` prints one JSON object.
//   grids, cells, threads        size of the seeded scenario (generateBenchScenario, seed 1) and worker threads
//   coldMs                       validate + grid + every cell's cold stage on `threads` workers + baseline KPI
//   coldMs1Thread                the same in this thread (prepareEngine)
//   incrementalMs                median over 7 evaluations of a 3-cell change (azimuth, electrical tilt, power)
//   pathLossPairsPerSec          cell × grid pairs per second of the single-thread path-loss stage
//   kpiBytesPerSec               bytes of per-cell input (dBm + mW Float32, 8 B per pair) per second of computeKpis
//   plainBytesPerSec             bytes per second of a plain sequential sum over a Float32Array of the same size
//   peakRssMb                    peak resident set size of the process
// Targets: incrementalMs ≤ 2 % of coldMs; kpiBytesPerSec ≥ 25 % of plainBytesPerSec; coldMs1Thread / coldMs ≥ 1.6.
import os from "node:os";
import type { ParameterChange } from "../../lib/radio/scenario";
import { buildGrid } from "../../lib/radio/grid";
import { computeCellPathLoss } from "../../lib/radio/pathLossStage";
import { assembleEngine, prepareEngine } from "../../lib/radio/engine";
import { computeKpis } from "../../lib/radio/kpi";
import { cellNoise } from "../../lib/radio/noise";
import { validateScenario } from "../../lib/radio/validation";
import { prepareEngineThreaded } from "../../lib/jobs/simulationThreads";
import { generateBenchScenario, seededRandom } from "./benchScenario";

const json = process.argv.includes("--json");
const log = (...a: unknown[]) => {
  if (!json) console.error(...a);
};
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

async function main() {
  const threads = os.availableParallelism();
  const scenario = generateBenchScenario({ seed: 1, sizeM: 2000, sites: 22, maxFloors: 18 });

  // ---- warm the JIT on a small scenario (both paths), so neither cold figure pays compilation alone
  const warm = generateBenchScenario({ seed: 2, sizeM: 500, sites: 3 });
  prepareEngine(warm).evaluate([{ cellId: warm.cells[0].id, parameter: "azimuthDeg", value: 33 }]);
  await prepareEngineThreaded(warm, { threads });

  // ---- cold, single thread (stage by stage, same work as prepareEngine)
  let t = performance.now();
  validateScenario(scenario);
  const grid = buildGrid(scenario);
  const tPl = performance.now();
  const pathLoss = scenario.cells.map((_, i) => computeCellPathLoss(scenario, grid, i));
  const pathLossMs = performance.now() - tPl;
  const single = assembleEngine(scenario, grid, pathLoss);
  const coldMs1Thread = performance.now() - t;
  log(`grids ${grid.count}, cells ${scenario.cells.length}; cold 1 thread ${coldMs1Thread.toFixed(0)} ms (path loss ${pathLossMs.toFixed(0)} ms)`);

  // ---- cold, threaded
  t = performance.now();
  const engine = await prepareEngineThreaded(scenario, { threads });
  const coldMs = performance.now() - t;
  log(`cold ${threads} threads ${coldMs.toFixed(0)} ms`);
  if (JSON.stringify(engine.baseline.kpis.network) !== JSON.stringify(single.baseline.kpis.network)) throw new Error("threaded and single-thread baselines differ");

  // ---- incremental: 3-cell changes, median of 7 after 3 warm-ups
  const rnd = seededRandom(99);
  const change = (): ParameterChange[] => {
    const picks = new Set<number>();
    while (picks.size < 3) picks.add(Math.floor(rnd() * scenario.cells.length));
    const [a, b, c] = [...picks].map((i) => scenario.cells[i]);
    return [
      { cellId: a.id, parameter: "azimuthDeg", value: Math.round((a.azimuthDeg + 10 + rnd() * 40) % 360) },
      { cellId: b.id, parameter: "electricalTiltDeg", value: Math.round(rnd() * 12) },
      { cellId: c.id, parameter: "rsPowerDbm", value: c.rsPowerDbm - 2 },
    ];
  };
  for (let k = 0; k < 3; k++) engine.evaluate(change());
  const incremental: number[] = [];
  for (let k = 0; k < 7; k++) {
    const ch = change();
    t = performance.now();
    engine.evaluate(ch);
    incremental.push(performance.now() - t);
  }
  const incrementalMs = median(incremental);
  log(`incremental ${incremental.map((x) => x.toFixed(1)).join(" ")} ms`);

  // ---- KPI pass vs a plain Float32Array sum of the same byte size
  const cells = engine.baseline.cells;
  const noiseMw = new Float64Array(scenario.cells.map((c) => Math.pow(10, cellNoise(c, scenario.settings.noiseFigureDb).resourceElementDbm / 10)));
  const kpiTimes: number[] = [];
  for (let k = 0; k < 7; k++) {
    t = performance.now();
    computeKpis({ grid: engine.grid, cells, noiseMw, clusters: scenario.clusters, thresholds: scenario.settings });
    kpiTimes.push(performance.now() - t);
  }
  const bytes = cells.length * grid.count * 8;
  const kpiBytesPerSec = bytes / (median(kpiTimes) / 1000);
  const plain = new Float32Array(bytes / 4);
  for (let i = 0; i < plain.length; i++) plain[i] = (i % 97) * 0.01;
  const plainTimes: number[] = [];
  let sink = 0;
  for (let k = 0; k < 7; k++) {
    t = performance.now();
    let s = 0;
    for (let i = 0; i < plain.length; i++) s += plain[i];
    plainTimes.push(performance.now() - t);
    sink += s;
  }
  const plainBytesPerSec = bytes / (median(plainTimes) / 1000);
  log(`kpi ${median(kpiTimes).toFixed(1)} ms, plain sum ${median(plainTimes).toFixed(1)} ms (${sink > 0 ? "ok" : "?"})`);

  const result = {
    grids: grid.count,
    cells: scenario.cells.length,
    threads,
    coldMs: Math.round(coldMs),
    coldMs1Thread: Math.round(coldMs1Thread),
    incrementalMs: Math.round(incrementalMs * 10) / 10,
    pathLossPairsPerSec: Math.round((grid.count * scenario.cells.length) / (pathLossMs / 1000)),
    kpiBytesPerSec: Math.round(kpiBytesPerSec),
    plainBytesPerSec: Math.round(plainBytesPerSec),
    peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024),
  };
  log(
    `incremental/cold ${(100 * (incrementalMs / coldMs)).toFixed(2)} % (≤ 2), kpi/plain ${(100 * (kpiBytesPerSec / plainBytesPerSec)).toFixed(0)} % (≥ 25), ` +
      `speed-up ${(coldMs1Thread / coldMs).toFixed(2)} (≥ 1.6)`,
  );
  console.log(JSON.stringify(result));
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
