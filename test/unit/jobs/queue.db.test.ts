// The PostgreSQL job queue against the machine's real PostgreSQL server (BEAMGATE_TEST_DB=postgres):
// split runs equal single-process runs bit for bit, a killed worker's job is retried by another
// and stored once, a job failing every retry fails its simulation, a malformed payload is rejected.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createNetwork } from "../../../lib/db/networks/mutations";
import { loadScenario } from "../../../lib/db/networks/data";
import { createUser } from "../../../lib/db/users";
import { act, createRequest, type RequestActor } from "../../../lib/db/requests/mutations";
import { loadRaster, SIMULATION_LAYERS } from "../../../lib/db/simulations";
import { stagePartialRowCount, storedGroupPairs } from "../../../lib/db/stagePartials";
import { executeSimulation } from "../../../lib/jobs/runSimulation";
import { clearEngineCache } from "../../../lib/jobs/engineCache";
import {
  CELLS_QUEUE,
  DEAD_LETTER_QUEUE,
  QueueSimulationJobs,
  queueSettings,
  SIMULATION_QUEUE,
  SimulationWorker,
  splitRadiusM,
  stageKeyOf,
  startBoss,
  type QueueSettings,
} from "../../../lib/jobs/queue";
import { prepareEngine } from "../../../lib/radio/engine";
import type { Prisma } from "../../../lib/db/open";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../support/database";
import { tinyScenario } from "../../support/tinyScenario";
import { generateBenchScenario } from "../../bench/benchScenario";

const quiet = () => {};

async function waitFor<T>(what: string, probe: () => Promise<T | undefined | null | false>, timeoutMs: number): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

const finished = (prisma: Prisma, id: string, timeoutMs = 60_000) =>
  waitFor(
    `simulation ${id} to finish`,
    async () => {
      const sim = await prisma.simulation.findUniqueOrThrow({ where: { id } });
      return sim.status === "done" || sim.status === "failed" ? sim : null;
    },
    timeoutMs,
  );

describe.skipIf(testDatabaseKind !== "postgres")("PostgreSQL job queue (lib/jobs/queue.ts)", () => {
  let t: TestDatabase;
  let engineer: RequestActor;
  let tinyNetworkId: string;
  const base: QueueSettings = { ...queueSettings({}), retryDelaySeconds: 1, pollingIntervalSeconds: 0.5, maintenanceIntervalSeconds: 1, expireInSeconds: 30 };
  const children: ChildProcess[] = [];

  /** A submitted request's submission simulation, not yet queued (the test queues it). */
  async function submittedSimulation(networkId: string, cellId: string, value: number): Promise<{ simulationId: string; requestId: string }> {
    const created = await createRequest(t.db, engineer, {
      title: `tilt ${cellId}`,
      reason: "queue test",
      items: [{ cellId, parameter: "electricalTiltDeg", newValue: value }],
    }, networkId);
    const held: string[] = [];
    await act(t.db, engineer, created.id, { action: "submit", version: created.version }, { jobs: { enqueue: async (id) => void held.push(id) } });
    expect(held).toHaveLength(1);
    return { simulationId: held[0], requestId: created.id };
  }

  async function bossJobs(name: string, simulationId?: string): Promise<{ state: string; retry_count: number; output: unknown; data: unknown }[]> {
    if (simulationId === undefined) return t.db.query(`select state, retry_count, output, data from pgboss.job where name = $1`, [name]);
    return t.db.query(`select state, retry_count, output, data from pgboss.job where name = $1 and data->>'simulationId' = $2`, [name, simulationId]);
  }

  function spawnWorker(env: Record<string, string>): { child: ChildProcess; log: string[] } {
    const log: string[] = [];
    // `npx tsx lib/jobs/cli/worker.ts` (npm run worker) as one process, so that signals and the exit code are the worker's own.
    const child = spawn(process.execPath, ["--import", "tsx", "lib/jobs/cli/worker.ts"], {
      cwd: path.resolve(__dirname, "../../.."),
      env: { ...process.env, DATABASE_URL: t.url, BEAMGATE_JOB_RUNNER: "queue", BEAMGATE_QUEUE_POLL_S: "0.5", BEAMGATE_QUEUE_MAINTENANCE_S: "1", ...env },
      stdio: ["ignore", "ignore", "pipe"],
      // Its own process group, so the kill reaches every process it started.
      detached: true,
    });
    child.stderr!.on("data", (chunk: Buffer) => log.push(...chunk.toString().split("\n").filter(Boolean)));
    children.push(child);
    return { child, log };
  }

  const killGroup = (child: ChildProcess, signal: NodeJS.Signals) => {
    try {
      process.kill(-child.pid!, signal);
    } catch {
      /* already gone */
    }
  };

  beforeAll(async () => {
    t = await createTestDatabase();
    tinyNetworkId = (await createNetwork(t.db.prisma, tinyScenario(), { kind: "seed", note: "test" })).networkId;
    const user = await createUser(t.db.prisma, { email: "queue@example.test", name: "Queue tester", role: "engineer", passwordHash: "x" });
    engineer = { id: user.id, role: "engineer", email: user.email };
  }, 60_000);

  afterAll(async () => {
    for (const child of children) if (child.exitCode === null) killGroup(child, "SIGKILL");
    await t?.drop();
  });

  it("a split run (simulation → simulation.cells → simulation.merge) stores exactly the single-process result; a second request on the version runs in one job", async () => {
    const scenario = generateBenchScenario({ seed: 5, sizeM: 600, sites: 4, gridSizeM: 10 });
    const networkId = (await createNetwork(t.db.prisma, scenario, { kind: "seed", note: "split test" })).networkId;
    const { simulationId } = await submittedSimulation(networkId, scenario.cells[2].id, 9);
    const second = await submittedSimulation(networkId, scenario.cells[7].id, 3);
    const settings: QueueSettings = { ...base, splitAboveCells: 0, cellGroupSize: 5, radiusM: 350 };
    const worker = new SimulationWorker(t.db, t.url, { settings, log: quiet });
    const jobs = new QueueSimulationJobs(t.url, settings, quiet);
    try {
      await worker.start();
      await jobs.enqueue(simulationId);
      await jobs.enqueue(simulationId); // singletonKey: one job
      const sim = await finished(t.db.prisma, simulationId, 90_000);
      expect(sim.error).toBeNull();
      expect(sim.status).toBe("done");
      // 12 cells in groups of 5: 2 cells, then the last 10 in groups of 2
      expect(sim.progressDetail).toEqual({ groups: { done: 6, total: 6 }, cells: { done: 12, total: 12 } });
      expect(await bossJobs(SIMULATION_QUEUE, simulationId)).toHaveLength(1);
      // the splitting job computes the first group itself and queues the other five
      expect(await bossJobs(CELLS_QUEUE, simulationId)).toHaveLength(5);
      // the network's aggregates are stored: the next request needs no cell job
      await jobs.enqueue(second.simulationId);
      expect((await finished(t.db.prisma, second.simulationId, 60_000)).status).toBe("done");
      expect(await bossJobs(CELLS_QUEUE, second.simulationId)).toHaveLength(0);
    } finally {
      await worker.stop(false);
      await jobs.stop();
    }
    const stored = await loadScenario(t.db.prisma, networkId, { version: 1 });
    const stageKey = stageKeyOf(networkId, 1, stored, splitRadiusM(stored, { ...base, radiusM: 350 }));
    // six groups and the whole network
    expect(await stagePartialRowCount(t.db.prisma, stageKey)).toBe(7);
    // a sparse footprint really was used: the radius cuts the 600 m area
    const grids = prepareEngine(stored).grid.count;
    expect(await storedGroupPairs(t.db.prisma, stageKey)).toBeLessThan(scenario.cells.length * grids);

    // The same simulations in one process, engine prepared with the same radius, into two more requests.
    for (const [split, cellId, value] of [[simulationId, scenario.cells[2].id, 9], [second.simulationId, scenario.cells[7].id, 3]] as const) {
      const single = await submittedSimulation(networkId, cellId, value);
      await executeSimulation(t.db, single.simulationId, { buildEngine: async (s) => prepareEngine(s, { radiusM: 350 }) });
      const [a, b] = await Promise.all([split, single.simulationId].map((id) => t.db.prisma.simulation.findUniqueOrThrow({ where: { id } })));
      expect(JSON.stringify(a.summary)).toBe(JSON.stringify(b.summary));
      expect(JSON.stringify(a.worstGrids)).toBe(JSON.stringify(b.worstGrids));
      for (const layer of SIMULATION_LAYERS) {
        const [ra, rb] = await Promise.all([loadRaster(t.db.prisma, split, layer), loadRaster(t.db.prisma, single.simulationId, layer)]);
        expect(ra!.length).toBeGreaterThan(0);
        expect(Buffer.from(ra!.data).equals(Buffer.from(rb!.data))).toBe(true);
      }
    }
    clearEngineCache();
  }, 150_000);

  it("a worker SIGKILLed mid-job leaves no result; a second worker retries the job after its expiry and stores it once", async () => {
    const { simulationId } = await submittedSimulation(tinyNetworkId, "S1-A", 7);
    const settings: QueueSettings = { ...base, expireInSeconds: 4, retryLimit: 3 };
    const jobs = new QueueSimulationJobs(t.url, settings, quiet);
    await jobs.enqueue(simulationId);
    await jobs.stop();
    // Fault injection: the first worker holds every job for 60 s after taking it.
    const first = spawnWorker({ BEAMGATE_FAULT_JOB_DELAY_MS: "60000" });
    await waitFor("the first worker to take the job", async () => first.log.some((line) => line.includes('"job.started"')), 60_000);
    expect((await bossJobs(SIMULATION_QUEUE, simulationId))[0].state).toBe("active");
    killGroup(first.child, "SIGKILL");
    await new Promise<void>((resolve) => (first.child.exitCode !== null ? resolve() : first.child.once("exit", () => resolve())));

    const before = await t.db.prisma.simulation.findUniqueOrThrow({ where: { id: simulationId } });
    expect(before.status).not.toBe("done");
    expect(await t.db.prisma.simulationRaster.count({ where: { simulationId } })).toBe(0);

    const second = spawnWorker({});
    try {
      const sim = await finished(t.db.prisma, simulationId, 60_000);
      expect(sim.status).toBe("done");
      expect(await t.db.prisma.simulationRaster.count({ where: { simulationId } })).toBe(SIMULATION_LAYERS.length);
      const queued = await bossJobs(SIMULATION_QUEUE, simulationId);
      expect(queued).toHaveLength(1);
      expect(queued[0].retry_count).toBeGreaterThanOrEqual(1);
      await waitFor("the job to complete", async () => (await bossJobs(SIMULATION_QUEUE, simulationId))[0].state === "completed", 10_000);
      expect(second.log.some((line) => line.includes('"job.done"'))).toBe(true);
    } finally {
      killGroup(second.child, "SIGTERM");
      await new Promise<void>((resolve) => (second.child.exitCode !== null ? resolve() : second.child.once("exit", () => resolve())));
    }
    expect(second.child.exitCode).toBe(0);
    expect(second.log.some((line) => line.includes('"worker.stopped"'))).toBe(true);
  }, 150_000);

  it("a worker whose database connections are cut mid-job reconnects, finishes the job and keeps running", async () => {
    const { simulationId } = await submittedSimulation(tinyNetworkId, "S2-A", 6);
    const worker = spawnWorker({ BEAMGATE_FAULT_JOB_DELAY_MS: "3000" });
    try {
      const jobs = new QueueSimulationJobs(t.url, { ...base, expireInSeconds: 60 }, quiet);
      await jobs.enqueue(simulationId);
      await jobs.stop();
      await waitFor("the worker to take the job", async () => worker.log.some((line) => line.includes('"job.started"')), 60_000);
      // What a database restart does to a client: every connection of the worker is terminated.
      const cut = await t.db.query<{ pid: number }>(
        `select pid, pg_terminate_backend(pid) from pg_stat_activity
         where datname = current_database() and pid <> pg_backend_pid() and backend_type = 'client backend'`,
      );
      expect(cut.length).toBeGreaterThan(0);
      const sim = await finished(t.db.prisma, simulationId, 60_000);
      expect(sim.status).toBe("done");
      expect(sim.attempts).toBe(1);
      expect(worker.child.exitCode).toBeNull();
    } finally {
      killGroup(worker.child, "SIGTERM");
      await new Promise<void>((resolve) => (worker.child.exitCode !== null ? resolve() : worker.child.once("exit", () => resolve())));
    }
  }, 120_000);

  it("a job failing on every attempt marks the simulation failed with its error and leaves the request submitted", async () => {
    const { simulationId, requestId } = await submittedSimulation(tinyNetworkId, "S1-B", 5);
    // Corrupt what the job reads: every attempt fails the same way.
    await t.db.prisma.simulation.update({ where: { id: simulationId }, data: { changes: { not: "a list" } } });
    const settings: QueueSettings = { ...base, retryLimit: 2, retryDelaySeconds: 0 };
    const worker = new SimulationWorker(t.db, t.url, { settings, log: quiet });
    const jobs = new QueueSimulationJobs(t.url, settings, quiet);
    try {
      await worker.start();
      await jobs.enqueue(simulationId);
      const sim = await finished(t.db.prisma, simulationId, 60_000);
      expect(sim.status).toBe("failed");
      expect(sim.error).toMatch(/no changes recorded/);
      expect(sim.attempts).toBe(3);
      const request = await t.db.prisma.changeRequest.findUniqueOrThrow({ where: { id: requestId } });
      expect(request.state).toBe("submitted");
      const [job] = await waitFor("the job to be failed", async () => {
        const rows = await bossJobs(SIMULATION_QUEUE, simulationId);
        return rows.length === 1 && rows[0].state === "failed" ? rows : null;
      }, 10_000);
      expect(job.retry_count).toBe(2);
      // The dead letter finds the simulation already failed and changes nothing.
      await waitFor("the dead letter", async () => (await bossJobs(DEAD_LETTER_QUEUE, simulationId)).some((j) => j.state === "completed"), 10_000);
      const after = await t.db.prisma.simulation.findUniqueOrThrow({ where: { id: simulationId } });
      expect(after.finishedAt?.getTime()).toBe(sim.finishedAt?.getTime());
    } finally {
      await worker.stop(false);
      await jobs.stop();
    }
  }, 90_000);

  it("malformed payloads (no simulationId, unknown id) are rejected once and never retried", async () => {
    const settings: QueueSettings = { ...base, retryLimit: 3, retryDelaySeconds: 0 };
    const boss = await startBoss(t.url, settings, quiet, "producer");
    const worker = new SimulationWorker(t.db, t.url, { settings, log: quiet });
    try {
      await boss.send(SIMULATION_QUEUE, { simulation: "typo" }, { retryLimit: 3, singletonKey: "bad-1" });
      await boss.send(SIMULATION_QUEUE, { simulationId: "no-such-simulation" }, { retryLimit: 3, singletonKey: "bad-2" });
      await worker.start();
      const rejected = await waitFor(
        "both jobs to be rejected",
        async () => {
          const rows = (await bossJobs(SIMULATION_QUEUE)).filter((j) => ["bad-1", "bad-2"].some((k) => JSON.stringify(j.data).includes(k === "bad-1" ? "typo" : "no-such")));
          return rows.length === 2 && rows.every((j) => j.state === "completed") ? rows : null;
        },
        30_000,
      );
      for (const job of rejected) {
        expect(job.retry_count).toBe(0);
        expect((job.output as { rejected?: string }).rejected).toMatch(/malformed|does not exist/);
      }
      expect(worker.counts.rejected).toBe(2);
    } finally {
      await worker.stop(false);
      await boss.stop({ graceful: false });
    }
  }, 60_000);
});
