// shownSimulationsOfOpenRequests: which simulation each open request's page shows, for preparing its map ahead.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createNetwork } from "../../../../lib/db/networks/mutations";
import { createUser } from "../../../../lib/db/users";
import { act, createRequest, editRequest, previewRequest, type RequestActor } from "../../../../lib/db/requests/mutations";
import { shownSimulationsOfOpenRequests } from "../../../../lib/db/requests/data";
import { runSimulation } from "../../../../lib/jobs/runSimulation";
import type { SimulationJobs } from "../../../../lib/jobs";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../../support/database";
import { tinyScenario } from "../../../support/tinyScenario";

/** A job runner that only records what it is given: the test runs each job itself. */
function heldJobs(): SimulationJobs & { ids: string[] } {
  const ids: string[] = [];
  return { ids, enqueue: async (id) => void ids.push(id) };
}

describe(`shownSimulationsOfOpenRequests (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  let networkId: string;
  let engineer: RequestActor;
  let owner: RequestActor;
  const body = (title: string, cellId: string, parameter: string, newValue: number) => ({ title, reason: `${title}: test`, items: [{ cellId, parameter, newValue }] });

  beforeAll(async () => {
    t = await createTestDatabase();
    networkId = (await createNetwork(t.db.prisma, tinyScenario(), { kind: "seed", note: "test" })).networkId;
    const e = await createUser(t.db.prisma, { email: "e@example.test", name: "E", role: "engineer", passwordHash: "x" });
    const o = await createUser(t.db.prisma, { email: "o@example.test", name: "O", role: "owner", passwordHash: "x" });
    engineer = { id: e.id, role: "engineer", email: e.email };
    owner = { id: o.id, role: "owner", email: o.email };
  });

  afterAll(async () => {
    await t?.drop();
  });

  it("shownSimulationsOfOpenRequests gives each open request's newest finished simulation of its revision, most recently active first", async () => {
    const jobs = heldJobs();
    expect(await shownSimulationsOfOpenRequests(t.db.prisma, 10)).toEqual([]);

    // a draft previewed twice across an edit: the page shows the preview of revision 2
    const edited = await createRequest(t.db, engineer, body("Edited", "S1-A", "rsPowerDbm", 12), networkId);
    const firstPreview = await previewRequest(t.db, engineer, edited.id, { jobs });
    await runSimulation(t.db, firstPreview.simulationId);
    const revised = await editRequest(t.db, engineer, edited.id, { version: edited.version, items: [{ cellId: "S1-A", parameter: "rsPowerDbm", newValue: 13 }] });
    const secondPreview = await previewRequest(t.db, engineer, edited.id, { jobs });
    await runSimulation(t.db, secondPreview.simulationId);
    expect(revised.revision).toBe(2);

    // a request whose only simulation has not run yet: nothing to show
    const waiting = await createRequest(t.db, engineer, body("Waiting", "S1-B", "mechanicalTiltDeg", 3), networkId);
    await previewRequest(t.db, engineer, waiting.id, { jobs });

    // submitted and simulated, then rejected: no longer open
    const rejected = await createRequest(t.db, engineer, body("Rejected", "S2-A", "electricalTiltDeg", 5), networkId);
    const submitted = await act(t.db, engineer, rejected.id, { action: "submit", version: rejected.version }, { jobs });
    await runSimulation(t.db, submitted.simulationId!);
    const afterReject = await shownSimulationsOfOpenRequests(t.db.prisma, 10);
    expect(afterReject.map((s) => s.requestId)).toEqual([rejected.id, edited.id]);
    const simulated = await t.db.prisma.changeRequest.findUniqueOrThrow({ where: { id: rejected.id } });
    await act(t.db, owner, rejected.id, { action: "reject", version: simulated.version, comment: "not now" });

    // a second previewed draft, the most recent activity
    const latest = await createRequest(t.db, engineer, body("Latest", "S1-B", "rsPowerDbm", 11), networkId);
    const latestPreview = await previewRequest(t.db, engineer, latest.id, { jobs });
    await runSimulation(t.db, latestPreview.simulationId);

    expect(await shownSimulationsOfOpenRequests(t.db.prisma, 10)).toEqual([
      { requestId: latest.id, simulationId: latestPreview.simulationId },
      { requestId: edited.id, simulationId: secondPreview.simulationId },
    ]);
    expect(await shownSimulationsOfOpenRequests(t.db.prisma, 1)).toEqual([{ requestId: latest.id, simulationId: latestPreview.simulationId }]);
  });
});
