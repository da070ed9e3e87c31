// Change requests end to end on a real database: create, simulate, approve, implement, roll
// back; staleness and conflicts; optimistic concurrency; a failing simulation; the audit chain.
import { execFile } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createNetwork } from "../../../lib/db/networks/mutations";
import { listCells } from "../../../lib/db/networks/data";
import { createUser, updateUser } from "../../../lib/db/users";
import { act, addComment, createRequest, editRequest, previewRequest, rebase, type RequestActor } from "../../../lib/db/requests/mutations";
import { getRequest, listRequests } from "../../../lib/db/requests/data";
import { cellHistory, listVersions, networkAsOf } from "../../../lib/db/history";
import { loadRaster, loadRasterValues, SIMULATION_LAYERS } from "../../../lib/db/simulations";
import { verifyAuditChain } from "../../../lib/db/audit";
import { getSimulationJobs, InProcessSimulationJobs, type SimulationJobs } from "../../../lib/jobs";
import { runSimulation } from "../../../lib/jobs/runSimulation";
import { prepareEngine } from "../../../lib/radio/engine";
import { DomainError } from "../../../lib/changes/errors";
import type { Prisma } from "../../../lib/db/open";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../support/database";
import { tinyScenario } from "../../support/tinyScenario";

/** Polls the Simulation row until the job has finished one way or the other. */
async function waitForSimulation(prisma: Prisma, simulationId: string, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const sim = await prisma.simulation.findUniqueOrThrow({ where: { id: simulationId } });
    if (sim.status === "done" || sim.status === "failed") return sim;
    if (Date.now() > deadline) throw new Error(`simulation ${simulationId} still ${sim.status} after ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

/** The DomainError code a promise rejects with (fails the test if it resolves). */
async function codeOf(promise: Promise<unknown>): Promise<string> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof DomainError) return error.code;
    throw error;
  }
  throw new Error("expected a DomainError, but the call succeeded");
}

/** A job runner that only records what it is given: the test runs each job when it chooses. */
function heldJobs(): SimulationJobs & { ids: string[] } {
  const ids: string[] = [];
  return { ids, enqueue: async (id) => void ids.push(id) };
}

describe(`change requests (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  let networkId: string;
  let raceNetworkId: string;
  const actor: Record<"engineer" | "engineer2" | "owner" | "owner2" | "field" | "promoted", RequestActor> = {} as never;

  const item = (cellId: string, parameter: string, newValue: number | string) => ({ cellId, parameter, newValue });
  const body = (title: string, items: unknown[]) => ({ title, reason: `${title}: test reason`, items });

  beforeAll(async () => {
    t = await createTestDatabase();
    networkId = (await createNetwork(t.db.prisma, tinyScenario(), { kind: "seed", note: "test" })).networkId;
    raceNetworkId = (await createNetwork(t.db.prisma, tinyScenario("Race Bay"), { kind: "seed", note: "test" })).networkId;
    const make = async (key: keyof typeof actor, role: string) => {
      const user = await createUser(t.db.prisma, { email: `${key}@example.test`, name: `Test ${key}`, role, passwordHash: "x" });
      actor[key] = { id: user.id, role: role as RequestActor["role"], email: user.email };
    };
    await make("engineer", "engineer");
    await make("engineer2", "engineer");
    await make("owner", "owner");
    await make("owner2", "owner");
    await make("field", "field");
    await make("promoted", "engineer");
  });

  afterAll(async () => {
    if (t) await (getSimulationJobs(t.db) as InProcessSimulationJobs).idle();
    await t?.drop();
  });

  it("createRequest refuses bad items naming items[i].field, and writes nothing", async () => {
    const before = { requests: await t.db.prisma.changeRequest.count(), events: await t.db.prisma.auditEvent.count() };
    const error = await createRequest(
      t.db,
      actor.engineer,
      body("Bad", [item("S1-A", "electricalTiltDeg", 20), item("NOPE", "azimuthDeg", 10), item("S1-B", "beamSetId", "wide-99")]),
      networkId,
    ).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(DomainError);
    const paths = (error as DomainError).details.map((d) => d.path);
    expect((error as DomainError).code).toBe("invalid");
    expect(paths).toEqual(["items[0].newValue", "items[1].cellId", "items[2].newValue"]);
    expect((error as DomainError).message).toMatch(/electrical tilt 20° is outside 0–15°/);
    // Shape errors name the field too.
    const shape = await createRequest(t.db, actor.engineer, { title: "x", reason: "y", items: [{ cellId: "S1-A", parameter: "azimuthDeg" }] }, networkId).catch(
      (e: unknown) => e as DomainError,
    );
    expect((shape as DomainError).details.map((d) => d.path)).toContain("items[0].newValue");
    expect(await codeOf(createRequest(t.db, actor.owner, body("Owner", [item("S1-A", "azimuthDeg", 5)]), networkId))).toBe("forbidden");
    expect(await t.db.prisma.changeRequest.count()).toBe(before.requests);
    expect(await t.db.prisma.auditEvent.count()).toBe(before.events);
  });

  it("the full path: create → submit → simulated → approve → implement → roll back, with history", async () => {
    const prisma = t.db.prisma;
    const created = await createRequest(t.db, actor.promoted, body("More downtilt on S1-A", [item("S1-A", "electricalTiltDeg", 8)]), networkId);
    expect(created).toMatchObject({ state: "draft", version: 1, revision: 1, baseVersion: 1, warnings: [] });
    const stored = await prisma.changeItem.findMany({ where: { requestId: created.id } });
    expect(stored.map((i) => [i.cellCode, i.parameter, i.oldValue, i.newValue])).toEqual([["S1-A", "electricalTiltDeg", "4", "8"]]);
    await addComment(t.db, actor.owner, created.id, "Looking forward to the numbers");

    // Submit queues the simulation; the in-process runner takes it after commit.
    const submitted = await act(t.db, actor.promoted, created.id, { action: "submit", version: 1 });
    expect(submitted.state).toBe("submitted");
    expect(submitted.simulationId).toBeDefined();
    const sim = await waitForSimulation(prisma, submitted.simulationId!);
    expect(sim).toMatchObject({ status: "done", progress: 1, attempts: 1, revision: 1, purpose: "submission", error: null });

    const detail = (await getRequest(prisma, created.id, actor.owner))!;
    expect(detail.state).toBe("simulated");
    expect(detail.simulatedRevision).toBe(1);
    expect(detail.availableActions).toEqual(["approve", "reject", "return"]);
    expect(detail.clusterNames).toEqual(["Whole bay"]);
    expect(detail.comments.map((c) => [c.authorName, c.text])).toEqual([["Test owner", "Looking forward to the numbers"]]);
    const summary = detail.simulations[0].summary as { network: { before: { gridCount: number } }; clusters: { clusterId: string }[]; cells: unknown[] };
    expect(summary.clusters.map((c) => c.clusterId)).toEqual(["K1"]);
    expect(summary.cells).toHaveLength(3);
    const worst = detail.simulations[0].worstGrids as { grids: unknown[]; total: number };
    expect(worst.total).toBeGreaterThanOrEqual(worst.grids.length);
    expect(detail.simulations[0].layers.map((l) => l.layer).sort()).toEqual([...SIMULATION_LAYERS].sort());

    // The stored layers are the engine's own numbers, quantised to 0.01 dB.
    const engine = prepareEngine(tinyScenario());
    const after = engine.evaluate([{ cellId: "S1-A", parameter: "electricalTiltDeg", value: 8 }]).kpis.perGrid;
    expect(summary.network.before.gridCount).toBe(engine.grid.count);
    const raw = (await loadRaster(prisma, sim.id, "after.bestRsrp"))!;
    expect(raw).toMatchObject({ encoding: "int16-centi-db", length: engine.grid.count });
    expect(raw.data.byteLength).toBe(2 * engine.grid.count);
    const afterRsrp = (await loadRasterValues(prisma, sim.id, "after.bestRsrp")) as Float32Array;
    const beforeRsrp = (await loadRasterValues(prisma, sim.id, "before.bestRsrp")) as Float32Array;
    let maxError = 0;
    let differing = 0;
    for (let g = 0; g < engine.grid.count; g++) {
      if (Number.isFinite(after.bestRsrpDbm[g])) maxError = Math.max(maxError, Math.abs(afterRsrp[g] - after.bestRsrpDbm[g]));
      else expect(afterRsrp[g]).toBe(-Infinity);
      if (afterRsrp[g] !== beforeRsrp[g]) differing++;
    }
    expect(maxError).toBeLessThanOrEqual(0.005 + 1e-4);
    expect(differing).toBeGreaterThan(0);
    const server = (await loadRasterValues(prisma, sim.id, "after.server")) as Int16Array;
    expect(Array.from(server)).toEqual(Array.from(after.bestCell));

    // Four-eyes: the author, promoted to owner since, cannot approve their own request.
    await updateUser(prisma, actor.promoted.id, { role: "owner" });
    const promotedOwner: RequestActor = { ...actor.promoted, role: "owner" };
    expect(await codeOf(act(t.db, promotedOwner, created.id, { action: "approve", version: detail.version }))).toBe("four_eyes");
    expect(await codeOf(act(t.db, actor.owner, created.id, { action: "approve", version: detail.version - 1 }))).toBe("conflict");
    expect(await codeOf(act(t.db, actor.field, created.id, { action: "implement", version: detail.version }))).toBe("illegal_transition");
    const approved = await act(t.db, actor.owner, created.id, { action: "approve", version: detail.version, comment: "Fine by me" });
    expect(approved.state).toBe("approved");
    const approvedRow = await prisma.changeRequest.findUniqueOrThrow({ where: { id: created.id } });
    expect(approvedRow.approverId).toBe(actor.owner.id);
    expect(approvedRow.decidedAt).not.toBeNull();

    // Implement: a new network version holds the new value, the temporal record names the request.
    const beforeImplement = new Date();
    await new Promise((resolve) => setTimeout(resolve, 5));
    const implemented = await act(t.db, actor.field, created.id, { action: "implement", version: approved.version });
    expect(implemented).toMatchObject({ state: "implemented", networkVersion: 2 });
    const s1a = (rows: { code: string; electricalTiltDeg: number }[]) => rows.find((r) => r.code === "S1-A")!.electricalTiltDeg;
    expect(s1a(await listCells(prisma, networkId))).toBe(8);
    expect(s1a(await networkAsOf(prisma, networkId, beforeImplement))).toBe(4);
    expect(s1a(await networkAsOf(prisma, networkId, new Date()))).toBe(8);
    expect(s1a(await networkAsOf(prisma, networkId, 1))).toBe(4);
    expect(s1a(await networkAsOf(prisma, networkId, 2))).toBe(8);
    const history = await cellHistory(prisma, networkId, "S1-A");
    expect(history.electricalTiltDeg.map((h) => [h.value, h.fromVersion, h.toVersion, h.requestNumber])).toEqual([
      [4, 1, 2, null],
      [8, 2, null, created.number],
    ]);
    expect(history.electricalTiltDeg[1].requestTitle).toBe("More downtilt on S1-A");
    expect(history.electricalTiltDeg[0].validTo).toBe(history.electricalTiltDeg[1].validFrom);
    expect(history.azimuthDeg).toHaveLength(1);

    // Roll back: another version restores the old value.
    const rolledBack = await act(t.db, actor.field, created.id, { action: "rollback", version: implemented.version });
    expect(rolledBack).toMatchObject({ state: "rolled_back", networkVersion: 3 });
    expect(s1a(await listCells(prisma, networkId))).toBe(4);
    expect(s1a(await networkAsOf(prisma, networkId, 2))).toBe(8);
    expect(s1a(await networkAsOf(prisma, networkId, 3))).toBe(4);
    expect((await cellHistory(prisma, networkId, "S1-A")).electricalTiltDeg.map((h) => h.value)).toEqual([4, 8, 4]);
    const versions = await listVersions(prisma, networkId);
    expect(versions.map((v) => [v.number, v.kind, v.requestNumber])).toEqual([
      [3, "rollback", created.number],
      [2, "implement", created.number],
      [1, "seed", null],
    ]);
    expect(versions[0].createdByName).toBe("Test field");

    const events = (await getRequest(prisma, created.id))!.events.map((e) => e.action);
    expect(events).toEqual([
      "request.created",
      "request.commented",
      "request.submitted",
      "request.simulated",
      "request.approved",
      "request.implemented",
      "request.rolled_back",
    ]);
  });

  it("two requests on one cell conflict; approving one makes the other stale until rebased and re-simulated", async () => {
    const prisma = t.db.prisma;
    const a = await createRequest(t.db, actor.engineer, body("More power on S2-A", [item("S2-A", "rsPowerDbm", 20)]), networkId);
    const b = await createRequest(t.db, actor.engineer2, body("Less power on S2-A", [item("S2-A", "rsPowerDbm", 16), item("S1-B", "azimuthDeg", 125)]), networkId);
    const listed = await listRequests(prisma, { networkId, states: ["draft"] });
    expect(listed.find((r) => r.id === a.id)).toMatchObject({ conflictIds: [b.id], authorName: "Test engineer", itemCount: 1 });
    expect(listed.find((r) => r.id === b.id)).toMatchObject({ conflictIds: [a.id], cellIds: ["S1-B", "S2-A"], stale: false });
    expect((await getRequest(prisma, a.id))!.conflicts).toEqual([{ otherId: b.id, otherNumber: b.number, otherTitle: "Less power on S2-A", cellIds: ["S2-A"] }]);

    const sa = await act(t.db, actor.engineer, a.id, { action: "submit", version: a.version });
    const sb = await act(t.db, actor.engineer2, b.id, { action: "submit", version: b.version });
    await waitForSimulation(prisma, sa.simulationId!);
    await waitForSimulation(prisma, sb.simulationId!);
    const readyA = (await getRequest(prisma, a.id))!;
    const readyB = (await getRequest(prisma, b.id))!;
    expect([readyA.state, readyB.state]).toEqual(["simulated", "simulated"]);

    const approvedA = await act(t.db, actor.owner, a.id, { action: "approve", version: readyA.version });
    expect(approvedA.markedStale).toEqual([b.id]);
    const staleB = (await getRequest(prisma, b.id, actor.owner))!;
    expect(staleB.stale).toBe(true);
    expect(staleB.staleReason).toMatch(new RegExp(`${a.id} was approved .*S2-A`));
    expect(staleB.events.at(-1)).toMatchObject({ action: "request.marked_stale", actorId: actor.owner.id });
    expect(staleB.availableActions).toEqual(["reject", "return"]);
    expect(await codeOf(act(t.db, actor.owner, b.id, { action: "approve", version: staleB.version }))).toBe("stale");

    // Rebase: fresh again, a new revision, back to waiting for its simulation.
    expect(await codeOf(rebase(t.db, actor.engineer, b.id, staleB.version))).toBe("forbidden");
    const rebased = await rebase(t.db, actor.engineer2, b.id, staleB.version);
    expect(rebased).toMatchObject({ state: "submitted", revision: 2, baseVersion: 3 });
    expect(await codeOf(act(t.db, actor.owner, b.id, { action: "approve", version: rebased.version }))).toBe("illegal_transition");
    await waitForSimulation(prisma, rebased.simulationId!);
    const readyAgain = (await getRequest(prisma, b.id))!;
    expect(readyAgain).toMatchObject({ state: "simulated", stale: false, staleReason: null, simulatedRevision: 2 });
    const approvedB = await act(t.db, actor.owner2, b.id, { action: "approve", version: readyAgain.version });
    expect(approvedB.state).toBe("approved");

    // A implemented first: B's old value of S2-A no longer holds, so B cannot be implemented.
    await act(t.db, actor.field, a.id, { action: "implement", version: approvedA.version });
    const refusal = await act(t.db, actor.field, b.id, { action: "implement", version: approvedB.version }).catch((e: unknown) => e as DomainError);
    expect(refusal).toBeInstanceOf(DomainError);
    expect((refusal as DomainError).code).toBe("stale");
    expect((refusal as DomainError).message).toMatch(/S2-A rsPowerDbm is now 20, the request expects 18/);
    expect((await prisma.changeRequest.findUniqueOrThrow({ where: { id: b.id } })).state).toBe("approved");
    expect(await prisma.cell.findFirstOrThrow({ where: { networkId, code: "S1-B" } })).toMatchObject({ azimuthDeg: 120 });
  });

  it("a simulation of an outdated revision is stored but does not move the request", async () => {
    const prisma = t.db.prisma;
    const jobs = heldJobs();
    const c = await createRequest(t.db, actor.engineer, body("Turn S1-B", [item("S1-B", "mechanicalTiltDeg", 3)]), networkId);
    const first = await act(t.db, actor.engineer, c.id, { action: "submit", version: c.version }, { jobs });
    const withdrawn = await act(t.db, actor.engineer, c.id, { action: "withdraw", version: first.version });
    const edited = await editRequest(t.db, actor.engineer, c.id, { version: withdrawn.version, items: [item("S1-B", "mechanicalTiltDeg", 5)] });
    expect(edited).toMatchObject({ state: "draft", revision: 2 });
    expect(await codeOf(editRequest(t.db, actor.engineer2, c.id, { version: edited.version, title: "Not mine" }))).toBe("forbidden");
    const second = await act(t.db, actor.engineer, c.id, { action: "submit", version: edited.version }, { jobs });
    expect(jobs.ids).toEqual([first.simulationId, second.simulationId]);

    expect(await runSimulation(t.db, first.simulationId!)).toEqual({ status: "done", requestMoved: false });
    const stillWaiting = (await getRequest(prisma, c.id, actor.owner))!;
    expect(stillWaiting).toMatchObject({ state: "submitted", revision: 2, simulatedRevision: 1 });
    expect(stillWaiting.simulations.map((s) => [s.revision, s.status])).toEqual([
      [2, "queued"],
      [1, "done"],
    ]);
    expect(await codeOf(act(t.db, actor.owner, c.id, { action: "approve", version: stillWaiting.version }))).toBe("illegal_transition");

    expect(await runSimulation(t.db, second.simulationId!)).toEqual({ status: "done", requestMoved: true });
    // Running the same job again (a retry) overwrites its layers, never duplicates them.
    expect(await runSimulation(t.db, second.simulationId!)).toEqual({ status: "done", requestMoved: false });
    expect(await prisma.simulationRaster.count({ where: { simulationId: second.simulationId } })).toBe(6);
    const ready = (await getRequest(prisma, c.id))!;
    expect(ready).toMatchObject({ state: "simulated", simulatedRevision: 2 });

    // Approval reads the simulated revision from the simulations themselves: if the request's
    // revision moves on (here written behind the API's back), its simulation no longer counts.
    await prisma.changeRequest.update({ where: { id: c.id }, data: { revision: 3 } });
    expect(await codeOf(act(t.db, actor.owner, c.id, { action: "approve", version: ready.version }))).toBe("simulation_required");
    await prisma.changeRequest.update({ where: { id: c.id }, data: { revision: 2 } });

    // A preview is a simulation of its own that never moves the request.
    const draft = await createRequest(t.db, actor.engineer, body("Preview me", [item("S1-A", "rsPowerDbm", 12)]), networkId);
    const preview = await previewRequest(t.db, actor.engineer, draft.id, { jobs });
    expect(await runSimulation(t.db, preview.simulationId)).toEqual({ status: "done", requestMoved: false });
    expect((await getRequest(prisma, draft.id))!).toMatchObject({ state: "draft", version: draft.version });
    expect(await codeOf(previewRequest(t.db, actor.engineer, c.id, { jobs }))).toBe("illegal_transition");
  });

  it("two concurrent approvals of one version: exactly one wins, the other gets conflict", async () => {
    const prisma = t.db.prisma;
    const jobs = heldJobs();
    const r = await createRequest(t.db, actor.engineer, body("Race", [item("S1-A", "azimuthDeg", 10)]), raceNetworkId);
    const s = await act(t.db, actor.engineer, r.id, { action: "submit", version: r.version }, { jobs });
    await runSimulation(t.db, s.simulationId!);
    const ready = (await getRequest(prisma, r.id))!;
    const results = await Promise.allSettled([
      act(t.db, actor.owner, r.id, { action: "approve", version: ready.version }),
      act(t.db, actor.owner2, r.id, { action: "approve", version: ready.version }),
    ]);
    const won = results.filter((x) => x.status === "fulfilled");
    const lost = results.filter((x): x is PromiseRejectedResult => x.status === "rejected");
    expect(won).toHaveLength(1);
    expect(lost).toHaveLength(1);
    expect(lost[0].reason).toBeInstanceOf(DomainError);
    expect((lost[0].reason as DomainError).code).toBe("conflict");
    const row = await prisma.changeRequest.findUniqueOrThrow({ where: { id: r.id } });
    expect(row).toMatchObject({ state: "approved", version: ready.version + 1 });
    const winner = results[0].status === "fulfilled" ? actor.owner : actor.owner2;
    expect(row.approverId).toBe(winner.id);
    expect(await prisma.auditEvent.count({ where: { requestId: r.id, action: "request.approved" } })).toBe(1);
  });

  it("approve and withdraw at once, and edit and submit at once: one wins each time", async () => {
    const prisma = t.db.prisma;
    const jobs = heldJobs();
    const r = await createRequest(t.db, actor.engineer, body("Race 2", [item("S1-B", "rsPowerDbm", 14)]), raceNetworkId);
    const s = await act(t.db, actor.engineer, r.id, { action: "submit", version: r.version }, { jobs });
    await runSimulation(t.db, s.simulationId!);
    const ready = (await getRequest(prisma, r.id))!;
    const pair = await Promise.allSettled([
      act(t.db, actor.owner, r.id, { action: "approve", version: ready.version }),
      act(t.db, actor.engineer, r.id, { action: "withdraw", version: ready.version }),
    ]);
    expect(pair.filter((x) => x.status === "fulfilled")).toHaveLength(1);
    const loser = pair.find((x): x is PromiseRejectedResult => x.status === "rejected")!;
    expect((loser.reason as DomainError).code).toBe("conflict");
    const row = await prisma.changeRequest.findUniqueOrThrow({ where: { id: r.id } });
    expect(row.state).toBe(pair[0].status === "fulfilled" ? "approved" : "draft");
    expect(row.version).toBe(ready.version + 1);

    const d = await createRequest(t.db, actor.engineer, body("Race 3", [item("S2-A", "azimuthDeg", 200)]), raceNetworkId);
    const both = await Promise.allSettled([
      editRequest(t.db, actor.engineer, d.id, { version: d.version, items: [item("S2-A", "azimuthDeg", 210)] }),
      act(t.db, actor.engineer, d.id, { action: "submit", version: d.version }, { jobs }),
    ]);
    expect(both.filter((x) => x.status === "fulfilled")).toHaveLength(1);
    expect(((both.find((x) => x.status === "rejected") as PromiseRejectedResult).reason as DomainError).code).toBe("conflict");
    const dRow = await prisma.changeRequest.findUniqueOrThrow({ where: { id: d.id }, include: { items: true, simulations: true } });
    if (both[0].status === "fulfilled") {
      expect(dRow).toMatchObject({ state: "draft", revision: 2 });
      expect(dRow.items[0].newValue).toBe("210");
      expect(dRow.simulations).toHaveLength(0);
    } else {
      expect(dRow).toMatchObject({ state: "submitted", revision: 1 });
      expect(dRow.simulations).toHaveLength(1);
    }
  });

  it("a failing simulation leaves the request submitted with the error stored", async () => {
    const prisma = t.db.prisma;
    const failing = new InProcessSimulationJobs(t.db, {
      buildEngine: async () => {
        throw new Error("engine exploded (injected fault)");
      },
    });
    const r = await createRequest(t.db, actor.engineer, body("Doomed", [item("S1-A", "mechanicalTiltDeg", 4)]), raceNetworkId);
    const s = await act(t.db, actor.engineer, r.id, { action: "submit", version: r.version }, { jobs: failing });
    await failing.idle();
    const sim = await prisma.simulation.findUniqueOrThrow({ where: { id: s.simulationId! } });
    expect(sim).toMatchObject({ status: "failed", error: "engine exploded (injected fault)" });
    expect(await prisma.simulationRaster.count({ where: { simulationId: sim.id } })).toBe(0);
    const detail = (await getRequest(prisma, r.id, actor.engineer))!;
    expect(detail).toMatchObject({ state: "submitted", simulatedRevision: null, stale: false });
    expect(detail.events.at(-1)).toMatchObject({ action: "request.simulation_failed", actorId: null });
    expect((detail.events.at(-1)!.after as { error: string }).error).toBe("engine exploded (injected fault)");
    expect(detail.availableActions).toEqual(["withdraw", "rebase"]);
  });

  it("verifyAuditChain holds after the path, names a deleted last event, then an edited one", async () => {
    const prisma = t.db.prisma;
    const intact = await verifyAuditChain(prisma);
    expect(intact.ok).toBe(true);
    const count = await prisma.auditEvent.count();
    expect(intact).toMatchObject({ count, headSeq: count });

    await t.db.exec(`ALTER TABLE "AuditEvent" DISABLE TRIGGER "AuditEvent_append_only"`);
    const last = await prisma.auditEvent.findUniqueOrThrow({ where: { seq: count } });
    await t.db.exec(`DELETE FROM "AuditEvent" WHERE seq = ${count}`);
    expect(await verifyAuditChain(prisma)).toMatchObject({ ok: false, brokenAt: count, reason: "seq_gap" });
    await prisma.auditEvent.create({ data: { ...last, before: last.before ?? undefined, after: last.after ?? undefined } });
    expect((await verifyAuditChain(prisma)).ok).toBe(true);

    await t.db.exec(`UPDATE "AuditEvent" SET "entityId" = 'someone-else' WHERE seq = 3`);
    expect(await verifyAuditChain(prisma)).toMatchObject({ ok: false, brokenAt: 3, reason: "hash_mismatch" });
    await t.db.exec(`ALTER TABLE "AuditEvent" ENABLE TRIGGER "AuditEvent_append_only"`);
  });

  it("npm run audit:verify prints the broken seq and exits 1", async () => {
    // The embedded folder serves one process at a time: hand it over to the command.
    await (getSimulationJobs(t.db) as InProcessSimulationJobs).idle();
    if (testDatabaseKind === "embedded") await t.db.close();
    const root = path.resolve(import.meta.dirname, "../../..");
    const { code, stdout } = await new Promise<{ code: number | null; stdout: string }>((resolve) => {
      execFile(
        path.join(root, "node_modules/.bin/tsx"),
        ["lib/db/cli/auditVerify.ts"],
        { cwd: root, env: { ...process.env, DATABASE_URL: t.url }, timeout: 50_000 },
        (error, out) => resolve({ code: error ? ((error as { code?: number }).code ?? null) : 0, stdout: out }),
      );
    });
    expect(stdout).toMatch(/audit chain BROKEN at event 3 \(hash_mismatch\)/);
    expect(code).toBe(1);
  });
});
