// The life of one Simulation row (queued → running → done | failed) and its results: KPI
// summary and worst grids as JSON, per-grid layers as quantised Int16 bytes. Storing is
// idempotent (a retried job overwrites, never duplicates); a finished submission of the
// request's current revision moves the request from "submitted" to "simulated".
import { MAP_RASTER_NO_DATA } from "../io/mapRaster";
import type { Prisma } from "./open";
import type { Tx } from "./audit";
import { appendAuditEventTx } from "./audit";
import { bytesToInt16, int16ToBytes } from "./rasterBytes";
import { SYSTEM_ACTOR, transition } from "../changes/rules";
import { DomainError } from "../changes/errors";
import type { ImpactReport } from "../radio/impact";
import { simulatedRevisionTx, snapshotOf, updateIfVersion, writeTransaction } from "./requests/tx";

// ---------------------------------------------------------------- quantisation

/** Layer names, in the order the job stores them. */
export const SIMULATION_LAYERS = [
  "before.bestRsrp",
  "after.bestRsrp",
  "before.sinr",
  "after.sinr",
  "before.server",
  "after.server",
] as const;
export type SimulationLayer = (typeof SIMULATION_LAYERS)[number];

/** dB values as Int16 hundredths of a dB; -32768 marks "no signal" (−Infinity or NaN). */
export const CENTI_DB_ENCODING = "int16-centi-db";
/** Cell indices into the scenario's cell list as Int16; -1 marks "no server". */
export const INDEX_ENCODING = "int16-index";
// Layers are stored in the map raster's own quantisation (lib/io/mapRaster.ts): centi-dB,
// or cell index, with −32768 for "no cell reaches", so maps need no re-encoding.
export const NO_SIGNAL_SENTINEL = MAP_RASTER_NO_DATA;

/** Stored centi-dB back to dB with 0.01 dB resolution, −Infinity for no signal. */
export function dequantiseCentiDb(values: Int16Array): Float32Array {
  const out = new Float32Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = values[i] === NO_SIGNAL_SENTINEL ? -Infinity : values[i] / 100;
  return out;
}

/** Stored cell indices back to the engine's convention (−1 where no cell serves). */
function dequantiseIndex(values: Int16Array): Int16Array {
  for (let i = 0; i < values.length; i++) if (values[i] === NO_SIGNAL_SENTINEL) values[i] = -1;
  return values;
}

// ---------------------------------------------------------------- results

export interface SimulationLayerData {
  layer: SimulationLayer;
  encoding: typeof CENTI_DB_ENCODING | typeof INDEX_ENCODING;
  values: Int16Array;
}

export interface SimulationSummary {
  network: ImpactReport["network"];
  clusters: ImpactReport["clusters"];
  cells: ImpactReport["cells"];
  /** Cell ids in the order the server layers index them. */
  serverCellIds: string[];
}

export interface SimulationWorstGrids {
  grids: ImpactReport["worstGrids"];
  /** How many grids qualified before the limit. */
  total: number;
}

export interface SimulationResult {
  summary: SimulationSummary;
  worstGrids: SimulationWorstGrids;
  layers: SimulationLayerData[];
}

/** JSON as the database will hold it: non-finite numbers become null, as JSON.stringify does. */
function toJson(value: unknown): object {
  return JSON.parse(JSON.stringify(value)) as object;
}

async function simulationOrThrow(tx: Tx, id: string) {
  const sim = await tx.simulation.findUnique({ where: { id }, include: { request: true } });
  if (!sim) throw new DomainError("not_found", `simulation ${id} does not exist`, { context: { simulationId: id } });
  return sim;
}

// ---------------------------------------------------------------- status

const MAX_ERROR_LENGTH = 2000;

export async function markRunning(prisma: Prisma, simulationId: string): Promise<void> {
  await prisma.simulation.update({
    where: { id: simulationId },
    data: { status: "running", startedAt: new Date(), attempts: { increment: 1 }, progress: 0, error: null },
  });
}

/** Progress 0..1 of a running simulation (ignored once it is no longer running). */
export async function setProgress(prisma: Prisma, simulationId: string, fraction: number): Promise<void> {
  const progress = Math.max(0, Math.min(1, Number.isFinite(fraction) ? fraction : 0));
  await prisma.simulation.updateMany({ where: { id: simulationId, status: "running" }, data: { progress } });
}

/**
 * A failed attempt that the job queue will retry: status "retrying" with the attempt's error,
 * nothing else recorded (no audit event, the request untouched) until the job finally succeeds or
 * fails. Ignored once the simulation is done or failed.
 */
export async function markRetrying(prisma: Prisma, simulationId: string, message: string): Promise<void> {
  const error = message.length > MAX_ERROR_LENGTH ? `${message.slice(0, MAX_ERROR_LENGTH - 1)}…` : message;
  await prisma.simulation.updateMany({
    where: { id: simulationId, status: { in: ["queued", "running", "retrying"] } },
    data: { status: "retrying", error },
  });
}

/**
 * A queue job of a split run starts on a simulation: a retry (retryCount > 0) counts as one more
 * attempt and puts a "retrying" simulation back to "running". Returns the simulation's status
 * afterwards, or null when there is no such simulation.
 */
export async function markStepRunning(prisma: Prisma, simulationId: string, isRetry: boolean): Promise<string | null> {
  if (isRetry) {
    await prisma.simulation.updateMany({
      where: { id: simulationId, status: { in: ["queued", "running", "retrying"] } },
      data: { status: "running", attempts: { increment: 1 } },
    });
  }
  const row = await prisma.simulation.findUnique({ where: { id: simulationId }, select: { status: true } });
  return row?.status ?? null;
}

/** Progress of a split run: the overall fraction and its cell-group detail (ignored once finished). */
export async function setSplitProgress(
  prisma: Prisma,
  simulationId: string,
  fraction: number,
  detail: { groups: { done: number; total: number }; cells: { done: number; total: number } },
): Promise<void> {
  const progress = Math.max(0, Math.min(1, Number.isFinite(fraction) ? fraction : 0));
  await prisma.simulation.updateMany({
    where: { id: simulationId, status: { in: ["running", "retrying"] } },
    data: { progress, progressDetail: detail },
  });
}

/** Status of a simulation, or null when the id names none (a queue job's first check). */
export async function simulationStatus(prisma: Prisma, simulationId: string): Promise<string | null> {
  const row = await prisma.simulation.findUnique({ where: { id: simulationId }, select: { status: true } });
  return row?.status ?? null;
}

export interface StoreOutcome {
  /** The request moved submitted → simulated. */
  requestMoved: boolean;
}

/**
 * Stores the result and marks the simulation done, in one transaction. Idempotent: layers are
 * upserted by (simulation, layer). The request moves to "simulated" only when this is a
 * submission simulation of its current revision and it is still waiting for one.
 */
export async function storeResult(prisma: Prisma, simulationId: string, result: SimulationResult): Promise<StoreOutcome> {
  for (const layer of result.layers) {
    if (!(SIMULATION_LAYERS as readonly string[]).includes(layer.layer)) {
      throw new RangeError(`storeResult: unknown layer "${layer.layer}"`);
    }
  }
  return writeTransaction(prisma, async (tx) => {
    const sim = await simulationOrThrow(tx, simulationId);
    const wasDone = sim.status === "done";
    const finishedAt = new Date();
    await tx.simulation.update({
      where: { id: simulationId },
      data: {
        status: "done",
        progress: 1,
        error: null,
        summary: toJson(result.summary),
        worstGrids: toJson(result.worstGrids),
        finishedAt,
      },
    });
    for (const layer of result.layers) {
      const data = int16ToBytes(layer.values);
      await tx.simulationRaster.upsert({
        where: { simulationId_layer: { simulationId, layer: layer.layer } },
        create: { simulationId, layer: layer.layer, encoding: layer.encoding, length: layer.values.length, data },
        update: { encoding: layer.encoding, length: layer.values.length, data },
      });
    }
    const request = sim.request;
    const moves =
      !wasDone && sim.purpose === "submission" && request.state === "submitted" && request.revision === sim.revision;
    if (moves) {
      const snapshot = snapshotOf(request, await simulatedRevisionTx(tx, request.id));
      const decided = transition(snapshot, "simulation_finished", SYSTEM_ACTOR, { simulatedRevision: sim.revision });
      await updateIfVersion(tx, request.id, request.version, { state: decided.patch.state, version: decided.patch.version });
      await appendAuditEventTx(tx, {
        action: decided.event.type,
        entityType: "ChangeRequest",
        entityId: request.id,
        requestId: request.id,
        before: { state: request.state, version: request.version },
        after: { state: decided.to, version: decided.patch.version, revision: sim.revision, simulationId },
        at: finishedAt,
      });
    } else {
      // Previews, outdated revisions and repeated stores are kept on record without moving the request.
      await appendAuditEventTx(tx, {
        action: "simulation.finished",
        entityType: "Simulation",
        entityId: simulationId,
        requestId: request.id,
        before: { status: sim.status },
        after: { status: "done", purpose: sim.purpose, revision: sim.revision, requestRevision: request.revision },
        at: finishedAt,
      });
    }
    return { requestMoved: moves };
  });
}


/**
 * Marks the simulation failed with its error. The request keeps its state ("submitted");
 * the failure is recorded as the simulation_failed event when it concerns the current
 * revision. A failure never replaces a result already stored.
 */
export async function fail(prisma: Prisma, simulationId: string, message: string): Promise<void> {
  const error = message.length > MAX_ERROR_LENGTH ? `${message.slice(0, MAX_ERROR_LENGTH - 1)}…` : message;
  await writeTransaction(prisma, async (tx) => {
    const sim = await simulationOrThrow(tx, simulationId);
    if (sim.status === "done") return;
    const finishedAt = new Date();
    await tx.simulation.update({ where: { id: simulationId }, data: { status: "failed", error, finishedAt } });
    const request = sim.request;
    if (sim.purpose === "submission" && request.state === "submitted" && request.revision === sim.revision) {
      const snapshot = snapshotOf(request, await simulatedRevisionTx(tx, request.id));
      const decided = transition(snapshot, "simulation_failed", SYSTEM_ACTOR, { simulatedRevision: sim.revision, error });
      await updateIfVersion(tx, request.id, request.version, { state: decided.patch.state, version: decided.patch.version });
      await appendAuditEventTx(tx, {
        action: decided.event.type,
        entityType: "ChangeRequest",
        entityId: request.id,
        requestId: request.id,
        before: { state: request.state, version: request.version },
        after: { state: decided.to, version: decided.patch.version, revision: sim.revision, simulationId, error },
        at: finishedAt,
      });
    } else {
      await appendAuditEventTx(tx, {
        action: "simulation.failed",
        entityType: "Simulation",
        entityId: simulationId,
        requestId: request.id,
        before: { status: sim.status },
        after: { status: "failed", purpose: sim.purpose, revision: sim.revision, error },
        at: finishedAt,
      });
    }
  });
}

// ---------------------------------------------------------------- reads

export interface StoredRaster {
  layer: string;
  encoding: string;
  length: number;
  data: Uint8Array;
}

/** One stored layer's bytes (Int16 little-endian), or null when it was not stored. */
export async function loadRaster(prisma: Prisma, simulationId: string, layer: string): Promise<StoredRaster | null> {
  const row = await prisma.simulationRaster.findUnique({
    where: { simulationId_layer: { simulationId, layer } },
    select: { layer: true, encoding: true, length: true, data: true },
  });
  if (!row) return null;
  const data = new Uint8Array(row.data);
  if (data.byteLength !== row.length * 2) {
    throw new RangeError(`simulation ${simulationId} layer ${layer}: ${data.byteLength} bytes for ${row.length} values`);
  }
  return { layer: row.layer, encoding: row.encoding, length: row.length, data };
}

/** A stored layer decoded: dB (Float32, −Infinity for no signal) or cell indices (Int16, −1 none). */
export async function loadRasterValues(
  prisma: Prisma,
  simulationId: string,
  layer: string,
): Promise<Float32Array | Int16Array | null> {
  const raster = await loadRaster(prisma, simulationId, layer);
  if (!raster) return null;
  const values = bytesToInt16(raster.data);
  return raster.encoding === CENTI_DB_ENCODING ? dequantiseCentiDb(values) : dequantiseIndex(values);
}

export interface SimulationStatusDto {
  id: string;
  requestId: string;
  revision: number;
  purpose: string;
  status: string;
  progress: number;
  attempts: number;
  error: string | null;
  finishedAt: string | null;
  /** Split queue runs: cell-group jobs and cells done of their totals; null otherwise. */
  progressDetail: { groups: { done: number; total: number }; cells: { done: number; total: number } } | null;
}

/** A simulation's state and progress, for the progress bar (no results). */
export async function getSimulationStatus(prisma: Prisma, simulationId: string): Promise<SimulationStatusDto | null> {
  const row = await prisma.simulation.findUnique({
    where: { id: simulationId },
    select: { id: true, requestId: true, revision: true, purpose: true, status: true, progress: true, attempts: true, error: true, finishedAt: true, progressDetail: true },
  });
  return row
    ? { ...row, finishedAt: row.finishedAt?.toISOString() ?? null, progressDetail: (row.progressDetail ?? null) as SimulationStatusDto["progressDetail"] }
    : null;
}

/** The network version a simulation ran on and its status (for its maps). */
export async function simulationTarget(prisma: Prisma, simulationId: string, options: { summary?: boolean } = {}) {
  const row = await prisma.simulation.findUnique({
    where: { id: simulationId },
    select: { status: true, summary: options.summary ?? false, request: { select: { networkId: true, baseVersion: true } } },
  });
  // summary: the stored JSON as stored (the caller checks its shape), when asked for; else null
  return row ? { status: row.status, networkId: row.request.networkId, baseVersion: row.request.baseVersion, summary: (row.summary ?? null) as unknown } : null;
}

/** Simulations left queued, running or retrying (e.g. by a process that stopped), oldest first. */
export async function unfinishedSimulationIds(prisma: Prisma): Promise<string[]> {
  const rows = await prisma.simulation.findMany({
    where: { status: { in: ["queued", "running", "retrying"] } },
    orderBy: { createdAt: "asc" },
    select: { id: true },
  });
  return rows.map((row) => row.id);
}

/** What a simulation job needs: the changes recorded when it was queued and the version to run on. */
export async function simulationJob(prisma: Prisma, simulationId: string) {
  const sim = await prisma.simulation.findUniqueOrThrow({
    where: { id: simulationId },
    select: { changes: true, request: { select: { networkId: true, baseVersion: true } } },
  });
  return { changes: sim.changes as unknown, networkId: sim.request.networkId, baseVersion: sim.request.baseVersion };
}
