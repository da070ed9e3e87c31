// Cell-group partials of city-scale runs (lib/jobs/splitEvaluation.ts, prisma model StagePartial): written by the
// "simulation.cells" jobs (one per group) and the "simulation.merge" job (part −1, the whole network), read by the
// merge and by later requests on the same network version. The typed arrays go in as their exact bytes, so what is
// read back is bit for bit what was computed. Raw SQL on the pg driver: Prisma's JSON protocol turns every byte array
// into base64 text.
import type { Prisma, SqlChannel } from "./open";
import type { PowerSums } from "../radio/powerSums";
import { createServerLists, type ListThresholds, type ServerLists } from "../radio/serverLists";

/** What a row holds (lib/jobs/splitEvaluation.ts GroupPartial has this shape). */
export interface StoredPartial {
  cells: number;
  pairs: number;
  powerSums: PowerSums;
  lists: ServerLists;
  /** A merge of groups: which (absent for a single group). */
  parts?: number[];
}

/** Part number of the merged whole network. */
export const WHOLE_NETWORK_PART = -1;
/** Part number of a merge of some groups made ahead of the last ones (lib/jobs/queue.ts premerge). */
export const PREMERGE_PART = -2;

const bytesOf = (a: ArrayBufferView): Buffer => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

function typed<T extends Float64Array | Float32Array | Int32Array | Uint8Array>(Kind: { new (n: number): T; BYTES_PER_ELEMENT: number }, bytes: Buffer, length: number, what: string): T {
  if (bytes.byteLength !== length * Kind.BYTES_PER_ELEMENT) throw new RangeError(`${what}: ${bytes.byteLength} bytes for ${length} values`);
  const values = new Kind(length);
  new Uint8Array(values.buffer).set(bytes);
  return values;
}

/** Stores one partial under (stageKey, part), replacing an earlier attempt's row. */
export async function storeStagePartial(db: SqlChannel, stageKey: string, part: number, partial: StoredPartial): Promise<void> {
  const { powerSums, lists } = partial;
  const G = lists.gridCount, S = lists.slots;
  // the lists, compacted: only the entries each grid holds
  let entries = 0;
  for (let g = 0; g < G; g++) entries += lists.length[g];
  const cell = new Int32Array(entries), dbm = new Float32Array(entries);
  for (let g = 0, e = 0; g < G; g++) {
    for (let k = g * S, end = k + lists.length[g]; k < end; k++, e++) {
      cell[e] = lists.cell[k];
      dbm[e] = lists.dbm[k];
    }
  }
  await db.query(
    `insert into "StagePartial" ("stageKey", "part", "cells", "pairs", "gridCount", "slots", "powerHi", "powerLo", "listLength", "listCell", "listDbm", "parts")
     values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12)
     on conflict ("stageKey", "part") do update set
       "cells" = excluded."cells", "pairs" = excluded."pairs", "gridCount" = excluded."gridCount", "slots" = excluded."slots",
       "powerHi" = excluded."powerHi", "powerLo" = excluded."powerLo", "listLength" = excluded."listLength",
       "listCell" = excluded."listCell", "listDbm" = excluded."listDbm", "parts" = excluded."parts", "createdAt" = now()`,
    [stageKey, part, partial.cells, partial.pairs, G, S, bytesOf(powerSums.hi), bytesOf(powerSums.lo), bytesOf(lists.length), bytesOf(cell), bytesOf(dbm), partial.parts ?? null],
  );
}

interface PartialRow {
  part: number;
  parts: number[] | null;
  cells: number;
  pairs: string | number;
  gridCount: number;
  slots: number;
  powerHi: Buffer;
  powerLo: Buffer;
  listLength: Buffer;
  listCell: Buffer;
  listDbm: Buffer;
}

function partialOfRow(row: PartialRow, stageKey: string, thresholds: ListThresholds): StoredPartial {
  const what = `stage partial ${stageKey} / ${row.part}`;
  const G = row.gridCount;
  const lists = createServerLists(G, thresholds);
  if (lists.slots !== row.slots) throw new RangeError(`${what}: lists of ${row.slots} entries per grid, the settings give ${lists.slots}`);
  const length = typed(Uint8Array, row.listLength, G, `${what} list lengths`);
  let entries = 0;
  for (let g = 0; g < G; g++) {
    if (length[g] > lists.slots) throw new RangeError(`${what}: grid ${g} holds ${length[g]} entries, at most ${lists.slots}`);
    entries += length[g];
  }
  const cell = typed(Int32Array, row.listCell, entries, `${what} list cells`);
  const dbm = typed(Float32Array, row.listDbm, entries, `${what} list values`);
  lists.length.set(length);
  for (let g = 0, e = 0; g < G; g++) {
    for (let k = g * lists.slots, end = k + length[g]; k < end; k++, e++) {
      lists.cell[k] = cell[e];
      lists.dbm[k] = dbm[e];
    }
  }
  return {
    ...(row.parts ? { parts: row.parts } : {}),
    cells: row.cells,
    pairs: Number(row.pairs),
    powerSums: { hi: typed(Float64Array, row.powerHi, G, `${what} power`), lo: typed(Float64Array, row.powerLo, G, `${what} power`) },
    lists,
  };
}

const COLUMNS = `"part", "parts", "cells", "pairs", "gridCount", "slots", "powerHi", "powerLo", "listLength", "listCell", "listDbm"`;

/** The stored partial (stageKey, part), or null. `thresholds`: the settings it was computed with. */
export async function loadStagePartial(db: SqlChannel, stageKey: string, part: number, thresholds: ListThresholds): Promise<StoredPartial | null> {
  const rows = await db.query<PartialRow>(`select ${COLUMNS} from "StagePartial" where "stageKey" = $1 and "part" = $2`, [stageKey, part]);
  return rows.length === 0 ? null : partialOfRow(rows[0], stageKey, thresholds);
}

/** True when (stageKey, part) is stored (its bytes are not read). */
export async function hasStagePartial(db: SqlChannel, stageKey: string, part: number): Promise<boolean> {
  const rows = await db.query<{ n: number }>(`select 1 as n from "StagePartial" where "stageKey" = $1 and "part" = $2`, [stageKey, part]);
  return rows.length > 0;
}

/**
 * Calls `each` with every stored group partial of stageKey (not the merged rows), one row read at a time, but
 * those of `skip`.
 */
export async function forEachGroupPartial(db: SqlChannel, stageKey: string, thresholds: ListThresholds, each: (part: number, partial: StoredPartial) => void, skip: ReadonlySet<number> = new Set()): Promise<void> {
  for (const part of await storedGroupParts(db, stageKey)) {
    if (skip.has(part)) continue;
    const partial = await loadStagePartial(db, stageKey, part, thresholds);
    if (partial) each(part, partial);
  }
}

/** Group numbers stored under stageKey (not the whole network's), ascending. */
export async function storedGroupParts(db: SqlChannel, stageKey: string): Promise<number[]> {
  const rows = await db.query<{ part: number }>(`select "part" from "StagePartial" where "stageKey" = $1 and "part" >= 0 order by "part"`, [stageKey]);
  return rows.map((r) => r.part);
}

/** Cell × grid pairs computed by the stored groups of stageKey (for throughput figures). */
export async function storedGroupPairs(prisma: Prisma, stageKey: string): Promise<number> {
  const sum = await prisma.stagePartial.aggregate({ where: { stageKey, part: { gte: 0 } }, _sum: { pairs: true } });
  return Number(sum._sum.pairs ?? 0);
}

/** Removes every partial stored under stageKey (benchmarks start afresh); returns how many. */
export async function deleteStagePartials(prisma: Prisma, stageKey: string): Promise<number> {
  return (await prisma.stagePartial.deleteMany({ where: { stageKey } })).count;
}

/** Stored rows under stageKey (one per group and one for the whole, however often a job was retried). */
export async function stagePartialRowCount(prisma: Prisma, stageKey: string): Promise<number> {
  return prisma.stagePartial.count({ where: { stageKey } });
}
