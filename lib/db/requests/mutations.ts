// Writes of change requests. Each is one transaction: the pure rules (lib/changes) decide,
// the row is written only if it still has the version that was read (optimistic lock), and
// the audit event lands with the change. Simulations are queued in the same transaction and
// handed to the job runner after commit.
import type { Database, Prisma } from "../open";
import { appendAuditEventTx, type Tx } from "../audit";
import { cellOfRow, listCells, type AsOf } from "../networks/data";
import { decodeParameterValue, encodeParameterValue } from "../networks/values";
import { DomainError, type IssueDetail } from "../../changes/errors";
import { assertCan, isEditableState, transition, type Actor, type RequestState } from "../../changes/rules";
import {
  actionBodySchema,
  commentBodySchema,
  createRequestSchema,
  editRequestSchema,
  parseBody,
} from "../../changes/schema";
import { sameValue, validateItems, type ItemLike, type ValidatedItem } from "../../changes/validate";
import { OPEN_STATES } from "../../changes/rules";
import { staleAfter, type RequestRef, type StaleTrigger } from "../../changes/conflicts";
import type { AntennaModel, BeamSet, Cell, CellParameter, ParameterChange } from "../../radio/scenario";
import { getSimulationJobs, type SimulationJobs } from "../../jobs";
import { requestRowTx, simulatedRevisionTx, snapshotOf, updateIfVersion, writeTransaction } from "./tx";
import type { CommentDto } from "./data";

/** Who acts: the rules' actor; the email, when known, goes into the audit trail. */
export type RequestActor = Actor & { email?: string | null };

export interface WriteOptions {
  /** Where queued simulations go (default: this process's runner for the database). */
  jobs?: SimulationJobs;
}

export interface RequestWriteResult {
  id: string;
  number: number;
  state: RequestState;
  version: number;
  revision: number;
  baseVersion: number;
  /** Not refusals: e.g. an item that changes nothing. */
  warnings: IssueDetail[];
  /** A simulation queued by this write. */
  simulationId?: string;
  /** The network version an implement or rollback created. */
  networkVersion?: number;
  /** Other requests this write marked stale. */
  markedStale: string[];
}

type Db = Database | { prisma: Prisma };

// ---------------------------------------------------------------- helpers

/** Parameter → Cell column (the beam set is stored by code). */
const COLUMN: Readonly<Record<CellParameter, "azimuthDeg" | "mechanicalTiltDeg" | "electricalTiltDeg" | "beamSetCode" | "rsPowerDbm">> = {
  azimuthDeg: "azimuthDeg",
  mechanicalTiltDeg: "mechanicalTiltDeg",
  electricalTiltDeg: "electricalTiltDeg",
  beamSetId: "beamSetCode",
  rsPowerDbm: "rsPowerDbm",
};

async function actorEmailTx(tx: Tx, actor: RequestActor): Promise<string | null> {
  if (actor.email) return actor.email;
  if (actor.role === "system") return null;
  const user = await tx.user.findUnique({ where: { id: actor.id }, select: { email: true } });
  return user?.email ?? null;
}

async function latestVersionTx(tx: Tx, networkId: string): Promise<number> {
  const latest = await tx.networkVersion.findFirst({ where: { networkId }, orderBy: { number: "desc" }, select: { number: true } });
  if (!latest) throw new DomainError("not_found", `network ${networkId} has no version`, { context: { networkId } });
  return latest.number;
}

/** The cells (by code) and hardware catalogues that items are validated against. */
async function validationContextTx(tx: Tx, networkId: string, asOf: AsOf) {
  // listCells only reads, and reads through the transaction so it sees what the transaction sees.
  const rows = await listCells(tx as unknown as Prisma, networkId, asOf);
  const cells = new Map<string, Cell>(rows.map((row) => [row.code, cellOfRow(row)]));
  const models = await tx.antennaModel.findMany({ where: { networkId } });
  const sets = await tx.beamSet.findMany({ where: { networkId } });
  const antennaModels: AntennaModel[] = models.map(({ id: _id, networkId: _n, code, beamSetCodes, ...rest }) => ({
    ...rest,
    id: code,
    beamSetIds: beamSetCodes,
  }));
  const beamSets: BeamSet[] = sets.map((s) => ({
    id: s.code,
    name: s.name,
    description: s.description,
    beams: s.beams as unknown as BeamSet["beams"],
  }));
  return { cells, antennaModels, beamSets };
}

async function validateAgainstTx(tx: Tx, networkId: string, asOf: AsOf, items: readonly ItemLike[]) {
  const context = await validationContextTx(tx, networkId, asOf);
  return validateItems(items, context.cells, context.antennaModels, context.beamSets);
}

function itemRows(items: readonly ValidatedItem[]) {
  return items.map((item) => ({
    position: item.position,
    cellCode: item.cellId,
    parameter: item.parameter,
    oldValue: encodeParameterValue(item.oldValue),
    newValue: encodeParameterValue(item.newValue),
  }));
}

type ItemRow = { position: number; cellCode: string; parameter: string; oldValue: string; newValue: string };

function storedItemLike(items: readonly ItemRow[]): ItemLike[] {
  return items.map((item) => ({
    cellId: item.cellCode,
    parameter: item.parameter,
    newValue: decodeParameterValue(item.parameter as CellParameter, item.newValue),
  }));
}

/** The changes a simulation runs, frozen when it is queued. */
function changesOf(items: readonly { cellCode: string; parameter: string; newValue: string }[]): ParameterChange[] {
  return items.map((item) => ({
    cellId: item.cellCode,
    parameter: item.parameter as CellParameter,
    value: decodeParameterValue(item.parameter as CellParameter, item.newValue),
  }));
}

async function queueSimulationTx(
  tx: Tx,
  request: { id: string },
  revision: number,
  purpose: "submission" | "preview",
  items: readonly ItemRow[],
): Promise<string> {
  const sim = await tx.simulation.create({
    data: { requestId: request.id, revision, purpose, status: "queued", changes: changesOf(items).map((c) => ({ ...c })) },
    select: { id: true },
  });
  return sim.id;
}

/** Hands a committed simulation to the runner; a runner failure leaves it queued for requeueUnfinished. */
async function enqueueAfterCommit(db: Db, options: WriteOptions, simulationId: string | undefined): Promise<void> {
  if (simulationId === undefined) return;
  try {
    await (options.jobs ?? getSimulationJobs(db)).enqueue(simulationId);
  } catch (error) {
    console.error(`simulation ${simulationId} stays queued: the job runner refused it`, error);
  }
}

/** Marks undecided requests on the same cells stale, each with its own audit event. */
async function markStaleTx(
  tx: Tx,
  networkId: string,
  trigger: StaleTrigger,
  actor: RequestActor,
  actorEmail: string | null,
  at: Date,
): Promise<string[]> {
  const rows = await tx.changeRequest.findMany({
    where: { networkId, state: { in: [...OPEN_STATES] }, id: { not: trigger.id } },
    select: { id: true, state: true, baseVersion: true, stale: true, version: true, items: { select: { cellCode: true } } },
  });
  const refs: RequestRef[] = rows.map((r) => ({
    id: r.id,
    state: r.state as RequestState,
    baseVersion: r.baseVersion,
    stale: r.stale,
    cellIds: r.items.map((i) => i.cellCode),
  }));
  const marks = staleAfter(trigger, refs);
  for (const mark of marks) {
    const row = rows.find((r) => r.id === mark.id)!;
    await updateIfVersion(tx, mark.id, row.version, { stale: true, staleReason: mark.reason, version: row.version + 1 });
    await appendAuditEventTx(tx, {
      action: "request.marked_stale",
      entityType: "ChangeRequest",
      entityId: mark.id,
      requestId: mark.id,
      actorId: actor.id,
      actorEmail,
      before: { stale: false, version: row.version },
      after: { stale: true, version: row.version + 1, reason: mark.reason, cellIds: mark.cellIds, causedBy: trigger.id },
      at,
    });
  }
  return marks.map((m) => m.id);
}

/**
 * Writes the request's values onto the network as a new version: closes the open temporal
 * rows of each changed (cell, parameter), opens new ones, and updates the cells' current
 * values. Refuses with "stale" when a cell no longer holds the value the request expects.
 */
async function applyToNetworkTx(
  tx: Tx,
  request: { id: string; number: number; title: string; networkId: string; items: ItemRow[] },
  direction: "implement" | "rollback",
  actor: RequestActor,
  at: Date,
): Promise<number> {
  const codes = [...new Set(request.items.map((i) => i.cellCode))];
  const cells = await tx.cell.findMany({ where: { networkId: request.networkId, code: { in: codes } } });
  const byCode = new Map(cells.map((c) => [c.code, c]));
  const problems: string[] = [];
  for (const item of request.items) {
    const parameter = item.parameter as CellParameter;
    const cell = byCode.get(item.cellCode);
    const expected = decodeParameterValue(parameter, direction === "implement" ? item.oldValue : item.newValue);
    if (!cell) {
      problems.push(`cell ${item.cellCode} no longer exists`);
      continue;
    }
    const current = cell[COLUMN[parameter]];
    if (!sameValue(current, expected)) {
      problems.push(`cell ${item.cellCode} ${parameter} is now ${String(current)}, the request expects ${String(expected)}`);
    }
  }
  if (problems.length > 0) {
    const verb = direction === "implement" ? "implement" : "roll back";
    throw new DomainError(
      "stale",
      `cannot ${verb} request ${request.number}: the network changed since it was built (${problems.join("; ")}); ${
        direction === "implement" ? "rebase it and simulate again" : "a later change holds these cells"
      }`,
      { context: { requestId: request.id } },
    );
  }

  const number = (await latestVersionTx(tx, request.networkId)) + 1;
  await tx.networkVersion.create({
    data: {
      networkId: request.networkId,
      number,
      kind: direction,
      note: `${direction === "implement" ? "implemented" : "rolled back"} request ${request.number}: ${request.title}`,
      createdById: actor.role === "system" ? null : actor.id,
      changeRequestId: request.id,
      createdAt: at,
    },
  });
  const cellUpdates = new Map<string, Record<string, number | string>>();
  for (const item of request.items) {
    const parameter = item.parameter as CellParameter;
    const cell = byCode.get(item.cellCode)!;
    const text = direction === "implement" ? item.newValue : item.oldValue;
    await tx.cellParameterValue.updateMany({
      where: { cellId: cell.id, parameter, validTo: null },
      data: { validTo: at, toVersion: number },
    });
    await tx.cellParameterValue.create({
      data: { cellId: cell.id, parameter, value: text, validFrom: at, fromVersion: number, changeRequestId: request.id },
    });
    const update = cellUpdates.get(cell.id) ?? {};
    update[COLUMN[parameter]] = decodeParameterValue(parameter, text);
    cellUpdates.set(cell.id, update);
  }
  for (const [cellId, data] of cellUpdates) await tx.cell.update({ where: { id: cellId }, data });
  return number;
}

function resultOf(
  row: { id: string; number: number; baseVersion: number },
  fields: { state: RequestState; version: number; revision: number; baseVersion?: number },
  extra: Partial<Pick<RequestWriteResult, "warnings" | "simulationId" | "networkVersion" | "markedStale">> = {},
): RequestWriteResult {
  return {
    id: row.id,
    number: row.number,
    state: fields.state,
    version: fields.version,
    revision: fields.revision,
    baseVersion: fields.baseVersion ?? row.baseVersion,
    warnings: extra.warnings ?? [],
    markedStale: extra.markedStale ?? [],
    ...(extra.simulationId !== undefined ? { simulationId: extra.simulationId } : {}),
    ...(extra.networkVersion !== undefined ? { networkVersion: extra.networkVersion } : {}),
  };
}

// ---------------------------------------------------------------- create / edit / comment

/**
 * Creates a draft from the decoded JSON body (createRequestSchema). The network is the one
 * of body.networkVersionId, else `networkId`, else the only network there is. Old values come
 * from the network's current (latest) version; body.networkVersionId, when given, must be it.
 */
export async function createRequest(
  db: Db,
  actor: RequestActor,
  body: unknown,
  networkId?: string,
): Promise<RequestWriteResult> {
  assertCan(actor, "request.create");
  const input = parseBody(createRequestSchema, body);
  return writeTransaction(db.prisma, async (tx) => {
    let targetNetwork = networkId;
    let namedVersion: number | undefined;
    if (input.networkVersionId !== undefined) {
      const version = await tx.networkVersion.findUnique({ where: { id: input.networkVersionId } });
      if (!version || (networkId !== undefined && version.networkId !== networkId)) {
        throw new DomainError("invalid", `networkVersionId: unknown network version ${JSON.stringify(input.networkVersionId)}`, {
          field: "networkVersionId",
          details: [{ path: "networkVersionId", message: `unknown network version ${JSON.stringify(input.networkVersionId)}` }],
        });
      }
      targetNetwork = version.networkId;
      namedVersion = version.number;
    }
    if (targetNetwork === undefined) {
      const networks = await tx.network.findMany({ select: { id: true }, take: 2 });
      if (networks.length !== 1) {
        throw new DomainError("invalid", "networkVersionId: name the network version the request is built on", {
          field: "networkVersionId",
          details: [{ path: "networkVersionId", message: `required when there are ${networks.length} networks` }],
        });
      }
      targetNetwork = networks[0].id;
    }
    const baseVersion = await latestVersionTx(tx, targetNetwork);
    if (namedVersion !== undefined && namedVersion !== baseVersion) {
      throw new DomainError(
        "conflict",
        `the network moved on from version ${namedVersion} to ${baseVersion} while the request was being written; reload the cells and try again`,
        { field: "networkVersionId", context: { namedVersion, latestVersion: baseVersion } },
      );
    }
    const validated = await validateAgainstTx(tx, targetNetwork, undefined, input.items);
    const row = await tx.changeRequest.create({
      data: {
        networkId: targetNetwork,
        title: input.title,
        reason: input.reason,
        state: "draft",
        authorId: actor.id,
        baseVersion,
        windowStart: input.windowStart ?? null,
        windowEnd: input.windowEnd ?? null,
        items: { create: itemRows(validated.items) },
      },
    });
    await appendAuditEventTx(tx, {
      action: "request.created",
      entityType: "ChangeRequest",
      entityId: row.id,
      requestId: row.id,
      actorId: actor.id,
      actorEmail: await actorEmailTx(tx, actor),
      after: {
        number: row.number,
        title: row.title,
        state: row.state,
        baseVersion,
        revision: row.revision,
        version: row.version,
        items: itemRows(validated.items),
      },
      at: row.createdAt,
    });
    return resultOf(row, { state: "draft", version: row.version, revision: row.revision }, { warnings: validated.warnings });
  });
}

/**
 * Edits a draft or returned request (the author only), naming the version last read. Given
 * items replace the whole list; their old values come from the request's base version.
 */
export async function editRequest(db: Db, actor: RequestActor, id: string, body: unknown): Promise<RequestWriteResult> {
  const input = parseBody(editRequestSchema, body);
  return writeTransaction(db.prisma, async (tx) => {
    const row = await requestRowTx(tx, id);
    const decided = transition(snapshotOf(row, await simulatedRevisionTx(tx, id)), "edit", actor, {
      expectedVersion: input.version,
    });
    let warnings: IssueDetail[] = [];
    let newItems: ReturnType<typeof itemRows> | undefined;
    if (input.items !== undefined) {
      const validated = await validateAgainstTx(tx, row.networkId, { version: row.baseVersion }, input.items);
      warnings = validated.warnings;
      newItems = itemRows(validated.items);
    }
    const revision = decided.patch.revision ?? row.revision;
    await updateIfVersion(tx, id, row.version, {
      state: decided.patch.state,
      version: decided.patch.version,
      revision,
      ...(input.title !== undefined ? { title: input.title } : {}),
      ...(input.reason !== undefined ? { reason: input.reason } : {}),
      ...(input.windowStart !== undefined ? { windowStart: input.windowStart } : {}),
      ...(input.windowEnd !== undefined ? { windowEnd: input.windowEnd } : {}),
    });
    if (newItems !== undefined) {
      await tx.changeItem.deleteMany({ where: { requestId: id } });
      await tx.changeItem.createMany({ data: newItems.map((item) => ({ ...item, requestId: id })) });
    }
    await appendAuditEventTx(tx, {
      action: decided.event.type,
      entityType: "ChangeRequest",
      entityId: id,
      requestId: id,
      actorId: actor.id,
      actorEmail: await actorEmailTx(tx, actor),
      before: {
        state: row.state,
        version: row.version,
        revision: row.revision,
        ...(input.title !== undefined ? { title: row.title } : {}),
        ...(newItems !== undefined ? { items: itemRows(row.items.map(toValidated)) } : {}),
      },
      after: {
        state: decided.to,
        version: decided.patch.version,
        revision,
        ...(input.title !== undefined ? { title: input.title } : {}),
        ...(input.reason !== undefined ? { reasonChanged: true } : {}),
        ...(newItems !== undefined ? { items: newItems } : {}),
      },
    });
    return resultOf(row, { state: decided.to, version: decided.patch.version, revision }, { warnings });
  });
}

function toValidated(item: ItemRow): ValidatedItem {
  const parameter = item.parameter as CellParameter;
  const oldValue = decodeParameterValue(parameter, item.oldValue);
  const newValue = decodeParameterValue(parameter, item.newValue);
  return { position: item.position, cellId: item.cellCode, parameter, oldValue, newValue, unchanged: sameValue(oldValue, newValue) };
}

/** Adds a comment (anyone who may comment; does not move the request or its version). */
export async function addComment(db: Db, actor: RequestActor, id: string, text: string): Promise<CommentDto> {
  assertCan(actor, "request.comment");
  const input = parseBody(commentBodySchema, { text });
  return writeTransaction(db.prisma, async (tx) => {
    await requestRowTx(tx, id);
    const comment = await tx.comment.create({
      data: { requestId: id, authorId: actor.id, text: input.text },
      include: { author: { select: { name: true } } },
    });
    await appendAuditEventTx(tx, {
      action: "request.commented",
      entityType: "ChangeRequest",
      entityId: id,
      requestId: id,
      actorId: actor.id,
      actorEmail: await actorEmailTx(tx, actor),
      after: { commentId: comment.id, text: comment.text },
      at: comment.createdAt,
    });
    return {
      id: comment.id,
      authorId: comment.authorId,
      authorName: comment.author.name,
      text: comment.text,
      createdAt: comment.createdAt.toISOString(),
    };
  });
}

// ---------------------------------------------------------------- actions

/**
 * Takes an action (decoded JSON body: { action, comment?, version }). Submit queues a
 * submission simulation; approve marks other undecided requests on the same cells stale;
 * implement and rollback write a new network version and mark others stale too.
 */
export async function act(
  db: Db,
  actor: RequestActor,
  id: string,
  body: unknown,
  options: WriteOptions = {},
): Promise<RequestWriteResult> {
  const input = parseBody(actionBodySchema, body);
  if (input.action === "rebase") return rebase(db, actor, id, input.version, options);
  const action = input.action;
  const result = await writeTransaction(db.prisma, async (tx) => {
    const row = await requestRowTx(tx, id);
    const decided = transition(snapshotOf(row, await simulatedRevisionTx(tx, id)), action, actor, {
      expectedVersion: input.version,
      comment: input.comment ?? null,
    });
    const at = new Date();
    const actorEmail = await actorEmailTx(tx, actor);
    const patch = decided.patch;
    const decides = action === "approve" || action === "reject" || action === "return";
    // The optimistic lock first: a writer that lost does no further work.
    await updateIfVersion(tx, id, row.version, {
      state: patch.state,
      version: patch.version,
      ...(patch.approverId !== undefined ? { approverId: patch.approverId } : {}),
      ...(decides ? { decidedAt: at } : {}),
    });

    let simulationId: string | undefined;
    let networkVersion: number | undefined;
    let markedStale: string[] = [];
    if (action === "submit") {
      simulationId = await queueSimulationTx(tx, row, row.revision, "submission", row.items);
    } else if (action === "approve") {
      markedStale = await markStaleTx(tx, row.networkId, { id, cellIds: row.items.map((i) => i.cellCode), kind: "approved" }, actor, actorEmail, at);
    } else if (action === "implement" || action === "rollback") {
      networkVersion = await applyToNetworkTx(tx, row, action, actor, at);
      await tx.changeRequest.update({
        where: { id },
        data: action === "implement" ? { implementedVersion: networkVersion } : { rolledBackVersion: networkVersion },
      });
      markedStale = await markStaleTx(
        tx,
        row.networkId,
        { id, cellIds: row.items.map((i) => i.cellCode), kind: action === "implement" ? "implemented" : "rolled_back", newVersion: networkVersion },
        actor,
        actorEmail,
        at,
      );
    }
    const comment = decided.event.comment;
    if (comment !== null) await tx.comment.create({ data: { requestId: id, authorId: actor.id, text: comment, createdAt: at } });
    await appendAuditEventTx(tx, {
      action: decided.event.type,
      entityType: "ChangeRequest",
      entityId: id,
      requestId: id,
      actorId: actor.id,
      actorEmail,
      before: { state: row.state, version: row.version },
      after: {
        state: decided.to,
        version: patch.version,
        revision: row.revision,
        comment,
        ...(simulationId !== undefined ? { simulationId } : {}),
        ...(networkVersion !== undefined ? { networkVersion } : {}),
        ...(markedStale.length > 0 ? { markedStale } : {}),
      },
      at,
    });
    return resultOf(row, { state: decided.to, version: patch.version, revision: row.revision }, { simulationId, networkVersion, markedStale });
  });
  await enqueueAfterCommit(db, options, result.simulationId);
  return result;
}

/**
 * Moves the request onto the network's latest version: old values refreshed from it, stale
 * cleared, a new revision. A request that was submitted or simulated lands in "submitted"
 * with a new submission simulation queued.
 */
export async function rebase(
  db: Db,
  actor: RequestActor,
  id: string,
  version: number,
  options: WriteOptions = {},
): Promise<RequestWriteResult> {
  const result = await writeTransaction(db.prisma, async (tx) => {
    const row = await requestRowTx(tx, id);
    const decided = transition(snapshotOf(row, await simulatedRevisionTx(tx, id)), "rebase", actor, { expectedVersion: version });
    const latest = await latestVersionTx(tx, row.networkId);
    const validated = await validateAgainstTx(tx, row.networkId, undefined, storedItemLike(row.items));
    const revision = decided.patch.revision ?? row.revision + 1;
    await updateIfVersion(tx, id, row.version, {
      state: decided.patch.state,
      version: decided.patch.version,
      revision,
      baseVersion: latest,
      stale: false,
      staleReason: null,
    });
    const items = itemRows(validated.items);
    for (const item of items) {
      await tx.changeItem.update({
        where: { requestId_cellCode_parameter: { requestId: id, cellCode: item.cellCode, parameter: item.parameter } },
        data: { oldValue: item.oldValue },
      });
    }
    const simulationId =
      decided.to === "submitted" ? await queueSimulationTx(tx, row, revision, "submission", items) : undefined;
    await appendAuditEventTx(tx, {
      action: decided.event.type,
      entityType: "ChangeRequest",
      entityId: id,
      requestId: id,
      actorId: actor.id,
      actorEmail: await actorEmailTx(tx, actor),
      before: { state: row.state, version: row.version, revision: row.revision, baseVersion: row.baseVersion, stale: row.stale },
      after: {
        state: decided.to,
        version: decided.patch.version,
        revision,
        baseVersion: latest,
        stale: false,
        items,
        ...(simulationId !== undefined ? { simulationId } : {}),
      },
    });
    return resultOf(
      row,
      { state: decided.to, version: decided.patch.version, revision, baseVersion: latest },
      { warnings: validated.warnings, simulationId },
    );
  });
  await enqueueAfterCommit(db, options, result.simulationId);
  return result;
}

/**
 * Queues a preview simulation of a draft (or returned) request: the author sees the impact
 * before submitting. The request itself does not change.
 */
export async function previewRequest(
  db: Db,
  actor: RequestActor,
  id: string,
  options: WriteOptions = {},
): Promise<{ simulationId: string }> {
  assertCan(actor, "request.preview");
  const simulationId = await writeTransaction(db.prisma, async (tx) => {
    const row = await requestRowTx(tx, id);
    if (!isEditableState(row.state as RequestState)) {
      throw new DomainError("illegal_transition", `cannot preview: request ${id} is "${row.state}"; previews are for drafts`, {
        context: { requestId: id, state: row.state },
      });
    }
    const simId = await queueSimulationTx(tx, row, row.revision, "preview", row.items);
    await appendAuditEventTx(tx, {
      action: "simulation.preview_queued",
      entityType: "Simulation",
      entityId: simId,
      requestId: id,
      actorId: actor.id,
      actorEmail: await actorEmailTx(tx, actor),
      after: { purpose: "preview", revision: row.revision, status: "queued" },
    });
    return simId;
  });
  await enqueueAfterCommit(db, options, simulationId);
  return { simulationId };
}
