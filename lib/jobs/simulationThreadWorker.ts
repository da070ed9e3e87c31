// Worker thread of simulationThreads.ts, kept between runs (simulationThreadPool.ts). Per run it receives the
// scenario and the grid once (the grid's arrays on SharedArrayBuffers, so no copy), then computes one cell's
// cold stage (path-loss cache + baseline RSRP) per request and hands the typed arrays back transferred; at the
// end of the run it drops them. Usually started from its esbuild bundle (workerBundle.ts), so it imports
// nothing but lib/radio and node:.
import { parentPort } from "node:worker_threads";
import { computeCellStage } from "../radio/engine";
import type { Grid } from "../radio/grid";
import type { PathLossOptions } from "../radio/pathLossStage";
import type { Scenario } from "../radio/scenario";

export interface WorkerRun {
  runId: number;
  scenario: Scenario;
  grid: Grid;
  options: PathLossOptions;
}

export type WorkerRequest = { run: WorkerRun } | { runId: number; cellIndex: number } | { release: number };

if (!parentPort) throw new Error("simulationThreadWorker.ts must run as a worker thread");
const port = parentPort;
let run: WorkerRun | null = null;

port.on("message", (message: WorkerRequest) => {
  if ("run" in message) {
    run = message.run;
    return;
  }
  if ("release" in message) {
    if (run?.runId === message.release) run = null;
    return;
  }
  const { runId, cellIndex } = message;
  try {
    if (!run || run.runId !== runId) throw new Error(`no scenario and grid received for run ${runId}`);
    const stage = computeCellStage(run.scenario, run.grid, cellIndex, run.options);
    const buffers = new Set<ArrayBuffer>();
    for (const a of [stage.pathLoss.pathLossDb, stage.pathLoss.footprint, stage.rsrp.rsrpDbm, stage.rsrp.rsrpMw, stage.rsrp.tileMaxDbm, stage.rsrp.segmentMaxDbm, stage.rsrp.tileOffsets]) {
      if (a) buffers.add(a.buffer as ArrayBuffer);
    }
    port.postMessage({ runId, cellIndex, stage }, [...buffers]);
  } catch (error) {
    port.postMessage({ runId, cellIndex, error: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
  }
});
port.postMessage({ ready: true });
