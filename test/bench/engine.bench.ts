// Engine benchmark: `npx tsx test/bench/engine.bench.ts --json` prints one JSON object.
//   grids, cells, threads        size of the seeded scenario (generateBenchScenario, seed 1) and worker threads
//   coldMs                       validate + grid + every cell's cold stage on `threads` workers + baseline aggregates
//                                and KPIs (prepareEngineThreaded): median of 3 runs
//   coldMs1Thread                the same in this thread (prepareEngine, stage by stage): median of 3 runs,
//                                interleaved with the threaded runs so that both see the same machine
//   incrementalMs                median over 7 consecutive evaluations (after 3 warm-ups) of a 3-cell change (azimuth,
//                                electrical tilt, power) on the threaded engine, its tiles spread over the same
//                                workers, its output arrays reused between evaluations, as a simulation job runs
//                                them (withEvaluationOnThreads)
//   incrementalMs1Thread         the same evaluations in this thread (engine.withEvaluation), for comparison
//   pathLossPairsPerSec          cell × grid pairs per second of the single-thread path-loss stage (with the kept
//                                directions, one array per antenna point)
//   kpiBytesPerSec               bytes of per-cell input (dBm + mW Float32, 8 B per pair) per second of the whole KPI
//                                pass from the cells (power sums, server lists, per-grid KPIs), one thread
//   plainBytesPerSec             bytes per second of a plain sequential sum over a Float32Array of the same size
//   peakRssMb                    peak resident set size of the process
// Targets: incrementalMs ≤ 2 % of coldMs; kpiBytesPerSec ≥ 25 % of plainBytesPerSec; coldMs1Thread / coldMs ≥ 1.6.
// The worker threads are started and their code compiled by a warm-up run on a small scenario first: the app
// keeps them between runs too (simulationThreadPool.ts), so that is the state every cold run meets.
import os from "node:os";
import type { ParameterChange } from "../../lib/radio/scenario";
import { buildGrid } from "../../lib/radio/grid";
import { assembleEngine, cellPathLossWithDirections, prepareEngine, type CoverageEngine } from "../../lib/radio/engine";
import type { DirectionCache } from "../../lib/radio/direction";
import { computeKpis } from "../../lib/radio/kpi";
import { cellNoise } from "../../lib/radio/noise";
import { validateScenario } from "../../lib/radio/validation";
import { prepareEngineThreaded } from "../../lib/jobs/simulationThreads";
import { withEvaluationOnThreads } from "../../lib/jobs/sharedEngine";
import { closeSimulationThreadPools } from "../../lib/jobs/simulationThreadPool";
import { generateBenchScenario, seededRandom } from "./benchScenario";

const json = process.argv.includes("--json");
const log = (...a: unknown[]) => {
  if (!json) console.error(...a);
};
const collectGarbage = () => (globalThis as { gc?: () => void }).gc?.();
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const COLD_RUNS = 3;

async function main() {
  const threads = os.availableParallelism();
  const scenario = generateBenchScenario({ seed: 1, sizeM: 2000, sites: 22, maxFloors: 18 });

  // ---- warm the JIT on a small scenario (both paths, and threaded evaluations of every kind of change), so no
  // figure pays compilation: a server that has answered a few requests has compiled these paths already
  const warm = generateBenchScenario({ seed: 2, sizeM: 500, sites: 3 });
  const warmChanges = (k: number): ParameterChange[] => [
    { cellId: warm.cells[k % warm.cells.length].id, parameter: "azimuthDeg", value: (33 + 47 * k) % 360 },
    { cellId: warm.cells[(k + 1) % warm.cells.length].id, parameter: "electricalTiltDeg", value: (3 + 5 * k) % 11 },
    { cellId: warm.cells[(k + 2) % warm.cells.length].id, parameter: "rsPowerDbm", value: 14 + (k % 4) },
  ];
  const warmSingle = prepareEngine(warm);
  const warmEngine = await prepareEngineThreaded(warm, { threads });
  for (let k = 0; k < 8; k++) {
    warmSingle.withEvaluation(warmChanges(k), (run) => run.kpis.network.coverageRatio);
    await withEvaluationOnThreads(warmEngine, warmChanges(k), (run) => run.kpis.network.coverageRatio, { threads });
  }

  // ---- cold runs, one thread and threaded, interleaved
  const cold1: number[] = [], coldN: number[] = [], pathLossMs: number[] = [];
  let single: CoverageEngine | undefined, engine: CoverageEngine | undefined;
  for (let run = 0; run < COLD_RUNS; run++) {
    single = engine = undefined; // let the previous engines go before the next run
    let t = performance.now();
    validateScenario(scenario);
    const grid = buildGrid(scenario);
    const tPl = performance.now();
    const directions: DirectionCache = new Map();
    const pathLoss = scenario.cells.map((_, i) => cellPathLossWithDirections(scenario, grid, i, {}, directions));
    pathLossMs.push(performance.now() - tPl);
    single = assembleEngine(scenario, grid, pathLoss);
    cold1.push(performance.now() - t);
    t = performance.now();
    engine = await prepareEngineThreaded(scenario, { threads });
    coldN.push(performance.now() - t);
    log(`cold run ${run + 1}: 1 thread ${cold1[run].toFixed(0)} ms (path loss ${pathLossMs[run].toFixed(0)} ms), ${threads} threads ${coldN[run].toFixed(0)} ms`);
  }
  const coldMs1Thread = median(cold1), coldMs = median(coldN);
  const grid = engine!.grid;
  if (JSON.stringify(engine!.baseline.kpis.network) !== JSON.stringify(single!.baseline.kpis.network)) throw new Error("threaded and single-thread baselines differ");

  // ---- incremental: 3-cell changes, median of 7 after 3 warm-ups, threaded and in this thread. The engines of the
  // earlier cold runs are collected first (with --expose-gc, as `npm run bench` runs): their ~1 GB of arrays would
  // otherwise be freed by the collector's background threads during these evaluations, on the cores they use.
  collectGarbage();
  const rnd = seededRandom(99);
  const change = (): ParameterChange[] => {
    const picks = new Set<number>();
    while (picks.size < 3) picks.add(Math.floor(rnd() * scenario.cells.length));
    const [a, b, c] = [...picks].map((i) => scenario.cells[i]);
    return [
      { cellId: a.id, parameter: "azimuthDeg", value: Math.round(a.azimuthDeg + 10 + rnd() * 40) % 360 },
      { cellId: b.id, parameter: "electricalTiltDeg", value: Math.round(rnd() * 12) },
      { cellId: c.id, parameter: "rsPowerDbm", value: c.rsPowerDbm - 2 },
    ];
  };
  // each path in its own loop of consecutive evaluations (as an engineer revising one request makes them)
  const incremental: number[] = [], incremental1: number[] = [];
  for (let k = 0; k < 10; k++) {
    const ch = change();
    const t = performance.now();
    // as a simulation job does (runSimulation): the run is read inside, its arrays go back to the engine's pool
    await withEvaluationOnThreads(engine!, ch, (run) => run.kpis.network.coverageRatio, { threads });
    if (k >= 3) incremental.push(performance.now() - t);
  }
  for (let k = 0; k < 10; k++) {
    const ch = change();
    const t = performance.now();
    single!.withEvaluation(ch, (run) => run.kpis.network.coverageRatio);
    if (k >= 3) incremental1.push(performance.now() - t);
  }
  const incrementalMs = median(incremental), incrementalMs1Thread = median(incremental1);
  log(`incremental ${threads} threads ${incremental.map((x) => x.toFixed(1)).join(" ")} ms; 1 thread ${incremental1.map((x) => x.toFixed(1)).join(" ")} ms`);

  // ---- KPI pass vs a plain Float32Array sum of the same byte size
  const cells = single!.baseline.cells;
  const noiseMw = new Float64Array(scenario.cells.map((c) => Math.pow(10, cellNoise(c, scenario.settings.noiseFigureDb).resourceElementDbm / 10)));
  const kpiTimes: number[] = [];
  for (let k = 0; k < 7; k++) {
    const t = performance.now();
    computeKpis({ grid, cells, noiseMw, clusters: scenario.clusters, thresholds: scenario.settings });
    kpiTimes.push(performance.now() - t);
  }
  const bytes = cells.length * grid.count * 8;
  const kpiBytesPerSec = bytes / (median(kpiTimes) / 1000);
  const plain = new Float32Array(bytes / 4);
  for (let i = 0; i < plain.length; i++) plain[i] = (i % 97) * 0.01;
  const plainTimes: number[] = [];
  let sink = 0;
  for (let k = 0; k < 7; k++) {
    const t = performance.now();
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
    incrementalMs1Thread: Math.round(incrementalMs1Thread * 10) / 10,
    pathLossPairsPerSec: Math.round((grid.count * scenario.cells.length) / (median(pathLossMs) / 1000)),
    kpiBytesPerSec: Math.round(kpiBytesPerSec),
    plainBytesPerSec: Math.round(plainBytesPerSec),
    peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024),
    loadAverage: os.loadavg().map((x) => Math.round(x * 100) / 100),
  };
  log(
    `incremental/cold ${(100 * (incrementalMs / coldMs)).toFixed(2)} % (≤ 2), kpi/plain ${(100 * (kpiBytesPerSec / plainBytesPerSec)).toFixed(0)} % (≥ 25), ` +
      `speed-up ${(coldMs1Thread / coldMs).toFixed(2)} (≥ 1.6)`,
  );
  console.log(JSON.stringify(result));
  await closeSimulationThreadPools();
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
