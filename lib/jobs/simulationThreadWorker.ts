// Worker thread of simulationThreads.ts: receives the scenario and the grid once, then computes one cell's
// cold stage (path-loss cache + baseline RSRP) per request and hands the typed arrays back (transferred).
import { parentPort, workerData } from "node:worker_threads";
import { computeCellStage } from "../radio/engine";
import type { Grid } from "../radio/grid";
import type { PathLossOptions } from "../radio/pathLossStage";
import type { Scenario } from "../radio/scenario";

export interface WorkerInit {
  scenario: Scenario;
  grid: Grid;
  options: PathLossOptions;
}

export type WorkerRequest = { cellIndex: number } | { stop: true };

if (!parentPort) throw new Error("simulationThreadWorker.ts must run as a worker thread");
const port = parentPort;
const { scenario, grid, options } = workerData as WorkerInit;

port.on("message", (message: WorkerRequest) => {
  if ("stop" in message) {
    port.close();
    return;
  }
  try {
    const stage = computeCellStage(scenario, grid, message.cellIndex, options);
    const buffers = new Set<ArrayBuffer>();
    for (const a of [stage.pathLoss.pathLossDb, stage.pathLoss.footprint, stage.rsrp.rsrpDbm, stage.rsrp.rsrpMw, stage.rsrp.tileMaxDbm, stage.rsrp.segmentMaxDbm, stage.rsrp.tileOffsets]) {
      if (a) buffers.add(a.buffer as ArrayBuffer);
    }
    port.postMessage({ cellIndex: message.cellIndex, stage }, [...buffers]);
  } catch (error) {
    port.postMessage({ cellIndex: message.cellIndex, error: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
  }
});
port.postMessage({ ready: true });
