// Per-cell cold stages of a split queue run (lib/jobs/queue.ts): written by the "simulation.cells"
// jobs, read by the "simulation.merge" job. The typed arrays go in as their exact bytes, so the
// engine assembled from them is bit-identical to one computed in a single process.
import type { Prisma, SqlChannel } from "./open";
import type { CellStage } from "../radio/engine";
import { bytesToFloat32, float32ToBytes } from "./rasterBytes";

function int32ToBytes(values: Int32Array): Uint8Array<ArrayBuffer> {
  return new Uint8Array(values.buffer.slice(values.byteOffset, values.byteOffset + values.byteLength) as ArrayBuffer);
}

function bytesToInt32(bytes: Uint8Array, what: string): Int32Array {
  if (bytes.byteLength % 4 !== 0) throw new RangeError(`${what}: length ${bytes.byteLength} is not a multiple of 4`);
  const values = new Int32Array(bytes.byteLength / 4);
  new Uint8Array(values.buffer).set(bytes);
  return values;
}

// A sparse footprint that holds grids 0 … n−1 in order (a radius beyond the whole area) is stored as
// zero bytes and rebuilt on reading: the same Int32Array, a quarter of the bytes of the row saved.
function isLeadingRun(footprint: Int32Array): boolean {
  for (let j = 0; j < footprint.length; j++) if (footprint[j] !== j) return false;
  return true;
}

function leadingRun(n: number): Int32Array {
  const footprint = new Int32Array(n);
  for (let j = 0; j < n; j++) footprint[j] = j;
  return footprint;
}

/**
 * Stores the stages of some cells under `stageKey`, upserting by (stageKey, cellId) so that a
 * retried job overwrites what an earlier attempt may have written and never adds a row. Raw SQL on
 * the pg driver, not Prisma: Prisma's JSON protocol turns every byte array into base64 text and was
 * seven times slower than the computation it stores.
 */
export async function storeCellStages(db: SqlChannel, stageKey: string, stages: readonly CellStage[]): Promise<void> {
  const buf = (bytes: Uint8Array | null) => (bytes ? Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) : null);
  for (const stage of stages) {
    const { pathLoss, rsrp } = stage;
    if (pathLoss.cellId !== rsrp.cellId) throw new RangeError(`storeCellStages: path loss of "${pathLoss.cellId}" paired with RSRP of "${rsrp.cellId}"`);
    await db.query(
      `insert into "CellStage" ("stageKey", "cellId", "footprint", "pathLossDb", "rsrpDbm", "rsrpMw", "tileMaxDbm", "segmentMaxDbm", "tileOffsets", "pairs")
       values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10)
       on conflict ("stageKey", "cellId") do update set
         "footprint" = excluded."footprint", "pathLossDb" = excluded."pathLossDb", "rsrpDbm" = excluded."rsrpDbm",
         "rsrpMw" = excluded."rsrpMw", "tileMaxDbm" = excluded."tileMaxDbm", "segmentMaxDbm" = excluded."segmentMaxDbm",
         "tileOffsets" = excluded."tileOffsets", "pairs" = excluded."pairs", "createdAt" = now()`,
      [
        stageKey,
        pathLoss.cellId,
        buf(pathLoss.footprint ? (isLeadingRun(pathLoss.footprint) ? new Uint8Array(0) : int32ToBytes(pathLoss.footprint)) : null),
        buf(float32ToBytes(pathLoss.pathLossDb)),
        buf(float32ToBytes(rsrp.rsrpDbm)),
        buf(float32ToBytes(rsrp.rsrpMw)),
        buf(float32ToBytes(rsrp.tileMaxDbm)),
        buf(rsrp.segmentMaxDbm ? float32ToBytes(rsrp.segmentMaxDbm) : null),
        buf(rsrp.tileOffsets ? int32ToBytes(rsrp.tileOffsets) : null),
        pathLoss.pathLossDb.length,
      ],
    );
  }
}

/** Ids of the cells whose stage is stored under `stageKey`. */
export async function storedStageCellIds(prisma: Prisma, stageKey: string): Promise<Set<string>> {
  const rows = await prisma.cellStage.findMany({ where: { stageKey }, select: { cellId: true } });
  return new Set(rows.map((row) => row.cellId));
}

/** Cell × grid pairs stored under `stageKey` (for throughput figures). */
export async function storedStagePairs(prisma: Prisma, stageKey: string): Promise<number> {
  const sum = await prisma.cellStage.aggregate({ where: { stageKey }, _sum: { pairs: true } });
  return sum._sum.pairs ?? 0;
}

// Rows read per query: bounds the driver's buffers on city-scale networks (a row is up to a few MB).
const LOAD_CHUNK = 32;

interface StageRow {
  cellId: string;
  footprint: Buffer | null;
  pathLossDb: Buffer;
  rsrpDbm: Buffer;
  rsrpMw: Buffer;
  tileMaxDbm: Buffer;
  segmentMaxDbm: Buffer | null;
  tileOffsets: Buffer | null;
  pairs: number;
}

/** The stored stages of `cellIds`, in that order; throws naming the first cell that has none. */
export async function loadCellStages(db: SqlChannel, stageKey: string, cellIds: readonly string[]): Promise<CellStage[]> {
  const out: CellStage[] = [];
  for (let start = 0; start < cellIds.length; start += LOAD_CHUNK) {
    const chunk = cellIds.slice(start, start + LOAD_CHUNK);
    const rows = await db.query<StageRow>(
      `select "cellId", "footprint", "pathLossDb", "rsrpDbm", "rsrpMw", "tileMaxDbm", "segmentMaxDbm", "tileOffsets", "pairs"
       from "CellStage" where "stageKey" = $1 and "cellId" = any($2::text[])`,
      [stageKey, chunk],
    );
    const byId = new Map(rows.map((row) => [row.cellId, row]));
    for (const cellId of chunk) {
      const row = byId.get(cellId);
      if (!row) throw new RangeError(`cell stage ${stageKey} / "${cellId}" is not stored`);
      const what = `cell stage ${stageKey} / "${cellId}"`;
      const footprint = row.footprint === null ? null : row.footprint.byteLength === 0 ? leadingRun(row.pairs) : bytesToInt32(row.footprint, `${what} footprint`);
      if (footprint && footprint.length !== row.pairs) throw new RangeError(`${what}: footprint of ${footprint.length} grids for ${row.pairs} pairs`);
      const pathLossDb = bytesToFloat32(row.pathLossDb, row.pairs);
      out.push({
        pathLoss: { cellId, footprint, pathLossDb },
        rsrp: {
          cellId,
          footprint,
          rsrpDbm: bytesToFloat32(row.rsrpDbm, row.pairs),
          rsrpMw: bytesToFloat32(row.rsrpMw, row.pairs),
          tileMaxDbm: bytesToFloat32(row.tileMaxDbm),
          segmentMaxDbm: row.segmentMaxDbm ? bytesToFloat32(row.segmentMaxDbm) : null,
          tileOffsets: row.tileOffsets ? bytesToInt32(row.tileOffsets, `${what} tile offsets`) : null,
        },
      });
    }
  }
  return out;
}

/** Removes every stage stored under `stageKey` (benchmarks start afresh); returns how many. */
export async function deleteCellStages(prisma: Prisma, stageKey: string): Promise<number> {
  return (await prisma.cellStage.deleteMany({ where: { stageKey } })).count;
}

/** Stored stage rows under `stageKey` (one per cell, however often a job was retried). */
export async function cellStageRowCount(prisma: Prisma, stageKey: string): Promise<number> {
  return prisma.cellStage.count({ where: { stageKey } });
}
