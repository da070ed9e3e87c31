// Which requests get in each other's way. Two undecided requests that touch the same cell
// conflict (flagged on both); when a request on a cell is approved, implemented or rolled
// back, every undecided request on that cell is stale: its old values or its simulation may
// no longer describe the network it will meet.

import { OPEN_STATES, type RequestState } from "./rules";

export interface RequestRef {
  id: string;
  state: RequestState;
  /** Cells the request's items touch (duplicates are harmless). */
  cellIds: readonly string[];
  /** Network version number its old values were taken from. */
  baseVersion: number;
  stale?: boolean;
}

/** The request whose decision or field work may make others stale. */
export interface StaleTrigger {
  id: string;
  cellIds: readonly string[];
  /**
   * approved: no new network version yet, but the cells are promised to another change.
   * implemented / rolled_back: a new network version now holds other values on these cells
   * (rollback too, our addition: it rewrites the same cells).
   */
  kind: "approved" | "implemented" | "rolled_back";
  /** The network version the implementation or rollback created. */
  newVersion?: number;
}

export interface StaleMark {
  id: string;
  /** Cells shared with the trigger, sorted. */
  cellIds: string[];
  /** One sentence for ChangeRequest.staleReason. */
  reason: string;
}

export interface Conflict {
  /** The two request ids, a < b. */
  a: string;
  b: string;
  /** Cells both touch, sorted. */
  cellIds: string[];
}

/** States that hold a claim on their cells: undecided, or approved and not yet carried out. */
export const CLAIMING_STATES: readonly RequestState[] = [...OPEN_STATES, "approved"];

function shared(a: readonly string[], b: ReadonlySet<string>): string[] {
  return [...new Set(a.filter((c) => b.has(c)))].sort();
}

const VERB: Readonly<Record<StaleTrigger["kind"], string>> = {
  approved: "was approved",
  implemented: "was implemented",
  rolled_back: "was rolled back",
};

/**
 * The undecided requests (draft, submitted, simulated, returned) that become stale because
 * `trigger` happened: they share at least one cell with it, are not already stale, and (for
 * a new network version) were built on an older version. Sorted by id.
 */
export function staleAfter(trigger: StaleTrigger, requests: readonly RequestRef[]): StaleMark[] {
  const cells = new Set(trigger.cellIds);
  const out: StaleMark[] = [];
  for (const request of requests) {
    if (request.id === trigger.id || request.stale === true) continue;
    if (!OPEN_STATES.includes(request.state)) continue;
    if (trigger.newVersion !== undefined && request.baseVersion >= trigger.newVersion) continue;
    const common = shared(request.cellIds, cells);
    if (common.length === 0) continue;
    const list = common.length <= 5 ? common.join(", ") : `${common.slice(0, 5).join(", ")} and ${common.length - 5} more`;
    out.push({
      id: request.id,
      cellIds: common,
      reason: `request ${trigger.id} ${VERB[trigger.kind]} and also changes cell${common.length === 1 ? "" : "s"} ${list}`,
    });
  }
  return out.sort((x, y) => (x.id < y.id ? -1 : x.id > y.id ? 1 : 0));
}

/**
 * Every pair of claiming requests (undecided or approved) that touch a common cell, with the
 * cells they share. Sorted by (a, b).
 */
export function conflictPairs(requests: readonly RequestRef[]): Conflict[] {
  const byCell = new Map<string, string[]>();
  for (const request of requests) {
    if (!CLAIMING_STATES.includes(request.state)) continue;
    for (const cell of new Set(request.cellIds)) {
      const list = byCell.get(cell);
      if (list === undefined) byCell.set(cell, [request.id]);
      else if (!list.includes(request.id)) list.push(request.id);
    }
  }
  const pairs = new Map<string, Conflict>();
  for (const [cell, ids] of byCell) {
    const sorted = [...ids].sort();
    for (let i = 0; i < sorted.length; i++) {
      for (let j = i + 1; j < sorted.length; j++) {
        const key = `${sorted[i]}\u0000${sorted[j]}`;
        const pair = pairs.get(key);
        if (pair === undefined) pairs.set(key, { a: sorted[i], b: sorted[j], cellIds: [cell] });
        else pair.cellIds.push(cell);
      }
    }
  }
  const out = [...pairs.values()];
  for (const pair of out) pair.cellIds.sort();
  return out.sort((x, y) => (x.a === y.a ? (x.b < y.b ? -1 : 1) : x.a < y.a ? -1 : 1));
}

/** The conflicts of one request: each other request it shares cells with. */
export function conflictsOf(
  id: string,
  requests: readonly RequestRef[],
): { otherId: string; cellIds: string[] }[] {
  return conflictPairs(requests)
    .filter((p) => p.a === id || p.b === id)
    .map((p) => ({ otherId: p.a === id ? p.b : p.a, cellIds: p.cellIds }));
}
