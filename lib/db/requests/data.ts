// Reads of change requests: small plain objects with ISO date strings, never raw rows or
// raster bytes.
import type { Prisma } from "../open";
import { listAuditEvents, type AuditEventDto } from "../audit";
import { decodeParameterValue } from "../networks/values";
import { availableActions, OPEN_STATES, STATE_LABELS, type Actor, type RequestAction, type RequestState } from "../../changes/rules";
import { CLAIMING_STATES, conflictPairs, type RequestRef } from "../../changes/conflicts";
import { pointInPolygon } from "../../radio/polygon";
import type { CellParameter } from "../../radio/scenario";
import { simulatedRevisionTx, snapshotOf } from "./tx";

export interface RequestFilter {
  networkId?: string;
  states?: readonly RequestState[];
  authorId?: string;
  stale?: boolean;
  /** Newest first; default 200. */
  take?: number;
  skip?: number;
}

export interface RequestListItem {
  id: string;
  number: number;
  networkId: string;
  title: string;
  state: RequestState;
  stateLabel: string;
  authorId: string;
  authorName: string;
  approverName: string | null;
  stale: boolean;
  staleReason: string | null;
  baseVersion: number;
  revision: number;
  version: number;
  itemCount: number;
  commentCount: number;
  /** Cell codes the items touch, sorted, unique. */
  cellIds: string[];
  /** Other undecided or approved requests sharing a cell with this one. */
  conflictIds: string[];
  /** Clusters whose polygon holds a changed cell's site. */
  clusterNames: string[];
  windowStart: string | null;
  windowEnd: string | null;
  createdAt: string;
  updatedAt: string;
}

const iso = (d: Date | null) => (d === null ? null : d.toISOString());

/** Claiming requests (undecided or approved) of the networks, as the conflict rules see them. */
async function claimingRefs(prisma: Prisma, networkIds: readonly string[]): Promise<Map<string, RequestRef[]>> {
  const rows = await prisma.changeRequest.findMany({
    where: { networkId: { in: [...networkIds] }, state: { in: [...CLAIMING_STATES] } },
    select: { id: true, networkId: true, state: true, baseVersion: true, stale: true, items: { select: { cellCode: true } } },
  });
  const byNetwork = new Map<string, RequestRef[]>();
  for (const row of rows) {
    const list = byNetwork.get(row.networkId) ?? [];
    list.push({
      id: row.id,
      state: row.state as RequestState,
      baseVersion: row.baseVersion,
      stale: row.stale,
      cellIds: row.items.map((i) => i.cellCode),
    });
    byNetwork.set(row.networkId, list);
  }
  return byNetwork;
}

/** For each network: cell code → names of the clusters holding its site. */
async function clustersOfCells(prisma: Prisma, networkIds: readonly string[]): Promise<Map<string, Map<string, string[]>>> {
  const [clusters, cells] = await Promise.all([
    prisma.cluster.findMany({ where: { networkId: { in: [...networkIds] } }, orderBy: { code: "asc" } }),
    prisma.cell.findMany({ where: { networkId: { in: [...networkIds] } }, select: { code: true, networkId: true, site: { select: { x: true, y: true } } } }),
  ]);
  const out = new Map<string, Map<string, string[]>>();
  for (const cell of cells) {
    const names = clusters
      .filter((c) => c.networkId === cell.networkId)
      .filter((c) => pointInPolygon((c.polygon as [number, number][]).map(([x, y]) => ({ x, y })), cell.site.x, cell.site.y))
      .map((c) => c.name);
    const own = out.get(cell.networkId) ?? new Map<string, string[]>();
    own.set(cell.code, names);
    out.set(cell.networkId, own);
  }
  return out;
}

function uniqueSorted(values: Iterable<string>): string[] {
  return [...new Set(values)].sort();
}

export async function listRequests(prisma: Prisma, filter: RequestFilter = {}): Promise<RequestListItem[]> {
  const rows = await prisma.changeRequest.findMany({
    where: {
      ...(filter.networkId ? { networkId: filter.networkId } : {}),
      ...(filter.states ? { state: { in: [...filter.states] } } : {}),
      ...(filter.authorId ? { authorId: filter.authorId } : {}),
      ...(filter.stale !== undefined ? { stale: filter.stale } : {}),
    },
    orderBy: { number: "desc" },
    take: filter.take ?? 200,
    skip: filter.skip ?? 0,
    include: {
      author: { select: { name: true } },
      approver: { select: { name: true } },
      items: { select: { cellCode: true } },
      _count: { select: { items: true, comments: true } },
    },
  });
  const networkIds = uniqueSorted(rows.map((r) => r.networkId));
  const [claims, clusters] = await Promise.all([claimingRefs(prisma, networkIds), clustersOfCells(prisma, networkIds)]);
  const conflicts = new Map<string, Set<string>>();
  for (const refs of claims.values()) {
    for (const pair of conflictPairs(refs)) {
      (conflicts.get(pair.a) ?? conflicts.set(pair.a, new Set()).get(pair.a)!).add(pair.b);
      (conflicts.get(pair.b) ?? conflicts.set(pair.b, new Set()).get(pair.b)!).add(pair.a);
    }
  }
  return rows.map((row) => {
    const cellIds = uniqueSorted(row.items.map((i) => i.cellCode));
    const clusterOf = clusters.get(row.networkId);
    return {
      id: row.id,
      number: row.number,
      networkId: row.networkId,
      title: row.title,
      state: row.state as RequestState,
      stateLabel: STATE_LABELS[row.state as RequestState] ?? row.state,
      authorId: row.authorId,
      authorName: row.author.name,
      approverName: row.approver?.name ?? null,
      stale: row.stale,
      staleReason: row.staleReason,
      baseVersion: row.baseVersion,
      revision: row.revision,
      version: row.version,
      itemCount: row._count.items,
      commentCount: row._count.comments,
      cellIds,
      conflictIds: uniqueSorted(conflicts.get(row.id) ?? []),
      clusterNames: uniqueSorted(cellIds.flatMap((c) => clusterOf?.get(c) ?? [])),
      windowStart: iso(row.windowStart),
      windowEnd: iso(row.windowEnd),
      createdAt: row.createdAt.toISOString(),
      updatedAt: row.updatedAt.toISOString(),
    };
  });
}

export interface RequestItemDto {
  position: number;
  cellId: string;
  parameter: CellParameter;
  oldValue: number | string;
  newValue: number | string;
}

export interface CommentDto {
  id: string;
  authorId: string;
  authorName: string;
  text: string;
  createdAt: string;
}

export interface SimulationDto {
  id: string;
  revision: number;
  purpose: string;
  status: string;
  progress: number;
  attempts: number;
  error: string | null;
  summary: unknown;
  worstGrids: unknown;
  /** Stored per-grid layers (read the bytes with loadRaster). */
  layers: { layer: string; encoding: string; length: number }[];
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

export interface RequestDetail extends Omit<RequestListItem, "itemCount" | "commentCount" | "conflictIds"> {
  reason: string;
  decidedAt: string | null;
  implementedVersion: number | null;
  rolledBackVersion: number | null;
  /** Revision of the latest finished submission simulation. */
  simulatedRevision: number | null;
  items: RequestItemDto[];
  comments: CommentDto[];
  /** Latest first. */
  simulations: SimulationDto[];
  /** Audit events about this request, oldest first. */
  events: AuditEventDto[];
  conflicts: { otherId: string; otherNumber: number; otherTitle: string; cellIds: string[] }[];
  /** What the given actor may do now (empty without an actor). */
  availableActions: RequestAction[];
}

export function toItemDto(item: { position: number; cellCode: string; parameter: string; oldValue: string; newValue: string }): RequestItemDto {
  const parameter = item.parameter as CellParameter;
  return {
    position: item.position,
    cellId: item.cellCode,
    parameter,
    oldValue: decodeParameterValue(parameter, item.oldValue),
    newValue: decodeParameterValue(parameter, item.newValue),
  };
}

/**
 * The simulations the pages of the most recently active open requests show (each request's newest finished
 * simulation of its current revision, else its newest finished one), most recent first: the impact maps
 * people are about to open, for preparing them ahead.
 */
export async function shownSimulationsOfOpenRequests(prisma: Prisma, take: number): Promise<{ requestId: string; simulationId: string }[]> {
  const rows = await prisma.changeRequest.findMany({
    where: { state: { in: [...OPEN_STATES] }, simulations: { some: { status: "done" } } },
    orderBy: { updatedAt: "desc" },
    take,
    select: {
      id: true,
      revision: true,
      simulations: { where: { status: "done" }, orderBy: { createdAt: "desc" }, select: { id: true, revision: true } },
    },
  });
  return rows.map((row) => ({
    requestId: row.id,
    simulationId: (row.simulations.find((s) => s.revision === row.revision) ?? row.simulations[0]).id,
  }));
}

/** One request with everything its page shows, or null when it does not exist. */
export async function getRequest(prisma: Prisma, id: string, actor?: Actor | null): Promise<RequestDetail | null> {
  const row = await prisma.changeRequest.findUnique({
    where: { id },
    include: {
      author: { select: { name: true } },
      approver: { select: { name: true } },
      items: { orderBy: { position: "asc" } },
      comments: { orderBy: { createdAt: "asc" }, include: { author: { select: { name: true } } } },
      simulations: {
        orderBy: { createdAt: "desc" },
        include: { rasters: { select: { layer: true, encoding: true, length: true }, orderBy: { layer: "asc" } } },
      },
    },
  });
  if (!row) return null;
  const [claims, clusters, events, simulatedRevision] = await Promise.all([
    claimingRefs(prisma, [row.networkId]),
    clustersOfCells(prisma, [row.networkId]),
    listAuditEvents(prisma, { requestId: id, take: 10_000 }),
    simulatedRevisionTx(prisma, id),
  ]);
  const refs = claims.get(row.networkId) ?? [];
  const pairs = conflictPairs(refs).filter((p) => p.a === id || p.b === id);
  const otherIds = pairs.map((p) => (p.a === id ? p.b : p.a));
  const others = new Map(
    (await prisma.changeRequest.findMany({ where: { id: { in: otherIds } }, select: { id: true, number: true, title: true } })).map(
      (o) => [o.id, o],
    ),
  );
  const cellIds = uniqueSorted(row.items.map((i) => i.cellCode));
  const clusterOf = clusters.get(row.networkId);
  const snapshot = snapshotOf(row, simulatedRevision);
  return {
    id: row.id,
    number: row.number,
    networkId: row.networkId,
    title: row.title,
    reason: row.reason,
    state: row.state as RequestState,
    stateLabel: STATE_LABELS[row.state as RequestState] ?? row.state,
    authorId: row.authorId,
    authorName: row.author.name,
    approverName: row.approver?.name ?? null,
    stale: row.stale,
    staleReason: row.staleReason,
    baseVersion: row.baseVersion,
    revision: row.revision,
    version: row.version,
    cellIds,
    clusterNames: uniqueSorted(cellIds.flatMap((c) => clusterOf?.get(c) ?? [])),
    windowStart: iso(row.windowStart),
    windowEnd: iso(row.windowEnd),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
    decidedAt: iso(row.decidedAt),
    implementedVersion: row.implementedVersion,
    rolledBackVersion: row.rolledBackVersion,
    simulatedRevision,
    items: row.items.map(toItemDto),
    comments: row.comments.map((c) => ({
      id: c.id,
      authorId: c.authorId,
      authorName: c.author.name,
      text: c.text,
      createdAt: c.createdAt.toISOString(),
    })),
    simulations: row.simulations.map((s) => ({
      id: s.id,
      revision: s.revision,
      purpose: s.purpose,
      status: s.status,
      progress: s.progress,
      attempts: s.attempts,
      error: s.error,
      summary: s.summary,
      worstGrids: s.worstGrids,
      layers: s.rasters,
      createdAt: s.createdAt.toISOString(),
      startedAt: iso(s.startedAt),
      finishedAt: iso(s.finishedAt),
    })),
    events: [...events].reverse(),
    conflicts: pairs.map((p) => {
      const otherId = p.a === id ? p.b : p.a;
      const other = others.get(otherId);
      return { otherId, otherNumber: other?.number ?? 0, otherTitle: other?.title ?? "", cellIds: p.cellIds };
    }),
    availableActions: actor ? availableActions(snapshot, actor) : [],
  };
}
