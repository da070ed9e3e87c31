// Simulation jobs on a PostgreSQL-backed queue (pg-boss 10): the app enqueues, stateless worker
// processes on any machine that reaches the database take the jobs (lib/jobs/cli/worker.ts). A job
// whose worker dies is retried by another once it expires; a failed attempt is retried after a delay;
// only the last failure marks the simulation failed.
//
// Queues:
//   "simulation"        { simulationId }   one per simulation (singletonKey = its id). A network of at
//                       most splitAboveCells cells runs here whole, as the in-process runner does. A
//                       larger one (a city) runs split (splitEvaluation.ts): when the network version's
//                       merged aggregates are stored, this job evaluates the changes on them and stores
//                       the result; else it sends the missing cell groups and ends.
//   "simulation.cells"  { simulationId, stageKey, radiusM, part, cellIds }  a group of cells: their cold
//                       stages reduced to the group's partial (power sums and server lists), stored as
//                       StagePartial (stageKey, part); the group that completes the set sends the merge.
//   "simulation.merge"  { simulationId, stageKey, radiusM }  merges the partials into the network's
//                       aggregates (stored as part −1), evaluates the changes, stores the result.
//   "simulation.dead"   dead letters: a job given up (retries exhausted, e.g. its last worker was killed)
//                       marks its simulation failed, unless something already finished it.
// Partials are kept per network version, so later requests on the same version run in one job.
import crypto from "node:crypto";
import PgBoss from "pg-boss";
import { z } from "zod";
import type { Database, Prisma } from "../db/open";
import { loadScenario } from "../db/networks/data";
import { fail, markRetrying, markRunning, markStepRunning, setSplitProgress, simulationJob, simulationStatus, storeResult } from "../db/simulations";
import { forEachGroupPartial, hasStagePartial, loadStagePartial, PREMERGE_PART, storedGroupParts, storeStagePartial, WHOLE_NETWORK_PART, type StoredPartial } from "../db/stagePartials";
import { buildGrid, type Grid } from "../radio/grid";
import { MODEL_REVISION } from "../radio/modelRevision";
import type { Scenario } from "../radio/scenario";
import { validateScenario } from "../radio/validation";
import type { SimulationJobs } from "./index";
import { linkBudgetRadius } from "./computationRadius";
import { executeSimulation, parseChanges, resultOf } from "./runSimulation";
import { BufferRecycler, computeGroupPartial, PartialMerger, SplitNetwork } from "./splitEvaluation";

export const SIMULATION_QUEUE = "simulation";
export const CELLS_QUEUE = "simulation.cells";
export const MERGE_QUEUE = "simulation.merge";
export const DEAD_LETTER_QUEUE = "simulation.dead";
/** First key of the advisory locks of a stage's merges (any fixed number of ours). */
const STAGE_LOCK_CLASS = 720_411_304;

// ---------------------------------------------------------------- settings

const settingsSchema = z.object({
  /** Retries after the first attempt of any job (pg-boss retryLimit). */
  BEAMGATE_QUEUE_RETRY_LIMIT: z.coerce.number().int().min(0).max(20).default(3),
  /** Seconds before a failed job is retried (pg-boss retryDelay, doubled each time by retryBackoff). */
  BEAMGATE_QUEUE_RETRY_DELAY_S: z.coerce.number().int().min(0).max(3600).default(5),
  /** Seconds a job may stay active before it counts as lost (worker killed) and is retried elsewhere. */
  BEAMGATE_QUEUE_EXPIRE_S: z.coerce.number().int().min(1).max(86_000).default(1800),
  /** How often an idle worker polls for jobs, seconds (≥ 0.5). */
  BEAMGATE_QUEUE_POLL_S: z.coerce.number().min(0.5).max(60).default(2),
  /** How often expired jobs are looked for, seconds (one worker does it at a time). */
  BEAMGATE_QUEUE_MAINTENANCE_S: z.coerce.number().int().min(1).max(3600).default(30),
  /** Networks with more cells than this are split into cell-group jobs. */
  BEAMGATE_SPLIT_ABOVE_CELLS: z.coerce.number().int().min(0).default(300),
  /** Cells per "simulation.cells" job. */
  BEAMGATE_CELL_GROUP_SIZE: z.coerce.number().int().min(1).max(10_000).default(100),
  /** Margin below the noise of one resource element at the computation radius, dB (computationRadius.ts). */
  BEAMGATE_CELL_MARGIN_DB: z.coerce.number().min(-50).max(100).default(10),
  /** Fixed computation radius, metres, instead of the link-budget one (split runs only). */
  BEAMGATE_CELL_RADIUS_M: z.coerce.number().positive().optional(),
  /** Fault injection for tests: every job handler waits this long (ms) after taking its job. */
  BEAMGATE_FAULT_JOB_DELAY_MS: z.coerce.number().int().min(0).default(0),
});

export interface QueueSettings {
  retryLimit: number;
  retryDelaySeconds: number;
  expireInSeconds: number;
  pollingIntervalSeconds: number;
  maintenanceIntervalSeconds: number;
  splitAboveCells: number;
  cellGroupSize: number;
  marginDb: number;
  radiusM?: number;
  faultDelayMs: number;
}

/** Queue settings from the environment (validated; a bad value throws naming the variable). */
export function queueSettings(env: Readonly<Record<string, string | undefined>> = process.env): QueueSettings {
  const parsed = settingsSchema.safeParse(env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`).join("; ");
    throw new RangeError(`job queue settings are invalid: ${problems}`);
  }
  const e = parsed.data;
  return {
    retryLimit: e.BEAMGATE_QUEUE_RETRY_LIMIT,
    retryDelaySeconds: e.BEAMGATE_QUEUE_RETRY_DELAY_S,
    expireInSeconds: e.BEAMGATE_QUEUE_EXPIRE_S,
    pollingIntervalSeconds: e.BEAMGATE_QUEUE_POLL_S,
    maintenanceIntervalSeconds: e.BEAMGATE_QUEUE_MAINTENANCE_S,
    splitAboveCells: e.BEAMGATE_SPLIT_ABOVE_CELLS,
    cellGroupSize: e.BEAMGATE_CELL_GROUP_SIZE,
    marginDb: e.BEAMGATE_CELL_MARGIN_DB,
    radiusM: e.BEAMGATE_CELL_RADIUS_M,
    faultDelayMs: e.BEAMGATE_FAULT_JOB_DELAY_MS,
  };
}

// ---------------------------------------------------------------- pg-boss

export type Log = (event: string, fields?: Record<string, unknown>) => void;

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/** One JSON line per event on stderr: workers run unattended, their logs are read by machines. */
export const jsonLog: Log = (event, fields = {}) => {
  process.stderr.write(`${JSON.stringify({ at: new Date().toISOString(), pid: process.pid, event, ...fields })}\n`);
};

/**
 * Starts pg-boss on `url` and makes sure the four queues exist (idempotent). Processes starting
 * together can deadlock in pg-boss's schema and queue creation (PostgreSQL picks a victim), and the
 * database may still be starting: each attempt that fails is retried after a growing, jittered pause.
 */
export async function startBoss(url: string, settings: QueueSettings, log: Log, role: "producer" | "worker", attempts = 6): Promise<PgBoss> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await startBossOnce(url, settings, log, role);
    } catch (error) {
      if (attempt >= attempts) throw error;
      const delayMs = Math.round(250 * 2 ** attempt * (0.5 + Math.random()));
      log("queue.start-retry", { attempt, message: (error as Error).message, retryInMs: delayMs });
      await sleep(delayMs);
    }
  }
}

async function startBossOnce(url: string, settings: QueueSettings, log: Log, role: "producer" | "worker"): Promise<PgBoss> {
  const boss = new PgBoss({
    connectionString: url,
    // Only workers look for expired jobs; an app that only sends need not.
    supervise: role === "worker",
    schedule: false,
    maintenanceIntervalSeconds: settings.maintenanceIntervalSeconds,
    max: role === "worker" ? 4 : 2,
  });
  // pg-boss reports polling and maintenance errors (e.g. the database restarting) as events; without a
  // listener an EventEmitter "error" would end the process. It keeps polling and reconnects by itself.
  boss.on("error", (error: Error) => log("queue.error", { message: error.message }));
  try {
    await boss.start();
    await createQueues(boss, settings);
  } catch (error) {
    await boss.stop({ graceful: false, wait: true }).catch(() => {});
    throw error;
  }
  return boss;
}

async function createQueues(boss: PgBoss, settings: QueueSettings): Promise<void> {
  const common = {
    retryLimit: settings.retryLimit,
    retryDelay: settings.retryDelaySeconds,
    retryBackoff: true,
    expireInSeconds: settings.expireInSeconds,
  };
  await boss.createQueue(DEAD_LETTER_QUEUE, { name: DEAD_LETTER_QUEUE, ...common });
  // "stately": at most one job per singletonKey waiting and one active, so a double enqueue is one job
  // and two workers never run the same simulation at once.
  await boss.createQueue(SIMULATION_QUEUE, { name: SIMULATION_QUEUE, ...common, policy: "stately", deadLetter: DEAD_LETTER_QUEUE });
  await boss.createQueue(CELLS_QUEUE, { name: CELLS_QUEUE, ...common, policy: "stately", deadLetter: DEAD_LETTER_QUEUE });
  await boss.createQueue(MERGE_QUEUE, { name: MERGE_QUEUE, ...common, policy: "stately", deadLetter: DEAD_LETTER_QUEUE });
}

function sendOptions(settings: QueueSettings, singletonKey: string) {
  return {
    singletonKey,
    retryLimit: settings.retryLimit,
    retryDelay: settings.retryDelaySeconds,
    retryBackoff: true,
    expireInSeconds: settings.expireInSeconds,
    deadLetter: DEAD_LETTER_QUEUE,
  };
}

/** The app's side: enqueue sends one "simulation" job per simulation; the workers do the rest. */
export class QueueSimulationJobs implements SimulationJobs {
  private boss: Promise<PgBoss> | null = null;
  private readonly sending = new Set<Promise<unknown>>();

  constructor(
    private readonly url: string,
    private readonly settings: QueueSettings = queueSettings(),
    private readonly log: Log = jsonLog,
  ) {}

  private started(): Promise<PgBoss> {
    if (!this.boss) {
      this.boss = startBoss(this.url, this.settings, this.log, "producer").catch((error: unknown) => {
        this.boss = null;
        throw error;
      });
    }
    return this.boss;
  }

  async enqueue(simulationId: string): Promise<void> {
    const sent = this.started().then((boss) => boss.send(SIMULATION_QUEUE, { simulationId }, sendOptions(this.settings, simulationId)));
    this.sending.add(sent);
    try {
      // null: a job for this simulation is already waiting (singletonKey), which is the point.
      await sent;
    } finally {
      this.sending.delete(sent);
    }
  }

  /** Resolves once every enqueue in flight has reached the database (jobs run elsewhere). */
  async idle(): Promise<void> {
    await Promise.allSettled([...this.sending]);
  }

  async stop(): Promise<void> {
    const boss = this.boss;
    this.boss = null;
    if (boss) await (await boss).stop({ graceful: false, wait: true }).catch(() => {});
  }
}

// ---------------------------------------------------------------- payloads

/** A job whose payload can never succeed: completed with a rejection record, never retried. */
export class RejectedJob extends Error {}

const simulationPayload = z.object({ simulationId: z.string().min(1).max(200) }).strict();
const cellsPayload = z
  .object({
    simulationId: z.string().min(1).max(200),
    stageKey: z.string().min(1).max(500),
    radiusM: z.number().positive(),
    part: z.number().int().min(0),
    cellIds: z.array(z.string().min(1)).min(1).max(100_000),
  })
  .strict();
const mergePayload = z.object({ simulationId: z.string().min(1).max(200), stageKey: z.string().min(1).max(500), radiusM: z.number().positive() }).strict();

function parsePayload<T>(schema: z.ZodType<T>, queue: string, data: unknown): T {
  const parsed = schema.safeParse(data);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${issue.path.join(".") || "(payload)"}: ${issue.message}`).join("; ");
    throw new RejectedJob(`${queue} job payload ${JSON.stringify(data)?.slice(0, 200)} is malformed: ${problems}`);
  }
  return parsed.data;
}

// ---------------------------------------------------------------- stage keys

/**
 * The key of one network version's cell stages: the version, plus a digest of what the stages depend
 * on besides it (the model settings, which are not versioned, the computation radius and the model's revision).
 */
export function stageKeyOf(networkId: string, version: number, scenario: Scenario, radiusM: number): string {
  const digest = crypto.createHash("sha256").update(JSON.stringify({ settings: scenario.settings, radiusM, model: MODEL_REVISION })).digest("hex").slice(0, 16);
  return `${networkId}@${version}#${digest}`;
}

/**
 * Cell groups of a scenario in cell order: deterministic, so every job agrees on them. Groups of `groupSize`,
 * except the last 2 × groupSize cells, in groups of a quarter of that: sent last, the small groups fill the
 * workers' last minutes evenly, so that no worker waits long for another's last group before the merge.
 */
export function cellGroups(cellIds: readonly string[], groupSize: number): string[][] {
  const groups: string[][] = [];
  const tailFrom = Math.max(0, cellIds.length - 2 * groupSize);
  const small = Math.max(1, Math.ceil(groupSize / 4));
  for (let i = 0; i < tailFrom; i += groupSize) groups.push(cellIds.slice(i, Math.min(tailFrom, i + groupSize)));
  for (let i = tailFrom; i < cellIds.length; i += small) groups.push(cellIds.slice(i, i + small));
  return groups;
}

/** The computation radius of a split run: the fixed setting, else the link budget's (finite or not). */
export function splitRadiusM(scenario: Scenario, settings: QueueSettings): number {
  if (settings.radiusM !== undefined) return settings.radiusM;
  const { radiusM } = linkBudgetRadius(scenario, { marginDb: settings.marginDb });
  // Beyond the area's diagonal every grid is held anyway; the diagonal keeps the key finite and stable.
  const b = scenario.bounds;
  return Math.min(radiusM, Math.ceil(Math.hypot(b.maxX - b.minX, b.maxY - b.minY)) + 1);
}

// ---------------------------------------------------------------- the worker

/** The *Ms fields of a job's output (its own timings), for the log. */
function timingsOf(output: unknown): Record<string, number> {
  if (!output || typeof output !== "object") return {};
  return Object.fromEntries(Object.entries(output).filter(([k, v]) => k.endsWith("Ms") && typeof v === "number"));
}

type QueueJob = PgBoss.JobWithMetadata<unknown>;

export interface WorkerOptions {
  settings?: QueueSettings;
  log?: Log;
}

const CELL_SHARE = 0.9;

/** A stateless worker: takes jobs from the four queues of one database until stopped. */
export class SimulationWorker {
  readonly settings: QueueSettings;
  private readonly log: Log;
  private boss: PgBoss | null = null;
  /** The last scenario and grid loaded, by stage key: consecutive cell groups of one run share them. */
  private prepared: { key: string; scenario: Scenario; grid: Grid } | null = null;
  /**
   * The network of the last split evaluation, by stage key: a later request on the same version then skips
   * reading and summarising the stored aggregates. One only (tens of MB for a city).
   */
  private merged: { key: string; network: SplitNetwork } | null = null;
  /** Jobs handled, by outcome, for the exit report. */
  readonly counts = { done: 0, failed: 0, rejected: 0, skipped: 0 };
  /** Cell arrays of group jobs, reused from one job to the next. */
  private readonly recycler = new BufferRecycler();

  constructor(
    private readonly db: Database,
    private readonly url: string,
    options: WorkerOptions = {},
  ) {
    this.settings = options.settings ?? queueSettings();
    this.log = options.log ?? jsonLog;
  }

  private get prisma(): Prisma {
    return this.db.prisma;
  }

  /** The queues, in the order a free worker looks at them: a merge first (everyone waits for it), groups last. */
  private readonly runners: [string, (job: QueueJob) => Promise<unknown>][] = [
    [MERGE_QUEUE, (job) => this.merge(job)],
    [SIMULATION_QUEUE, (job) => this.simulation(job)],
    [CELLS_QUEUE, (job) => this.cells(job)],
    [DEAD_LETTER_QUEUE, (job) => this.deadLetter(job)],
  ];
  private running = false;
  private loop: Promise<void> | null = null;

  async start(): Promise<void> {
    const boss = await startBoss(this.url, this.settings, this.log, "worker");
    this.boss = boss;
    this.running = true;
    this.loop = this.takeJobs(boss);
    this.log("worker.started", { queues: this.runners.map(([queue]) => queue) });
  }

  /**
   * One job at a time, whatever its queue: jobs compute synchronously, so a second one taken meanwhile would
   * only wait, active, holding its group from the other workers. After a job the next is looked for at once;
   * with none, after the polling interval. Trouble reaching the database is logged and waited out (growing
   * pauses): the job in hand, if any, expires and is retried elsewhere.
   */
  private async takeJobs(boss: PgBoss): Promise<void> {
    let pauseMs = 1000 * this.settings.pollingIntervalSeconds;
    while (this.running) {
      let taken: { queue: string; job: QueueJob; run: (job: QueueJob) => Promise<unknown> } | null = null;
      try {
        for (const [queue, run] of this.runners) {
          const [job] = await boss.fetch<unknown>(queue, { batchSize: 1, includeMetadata: true });
          if (job) {
            taken = { queue, job, run };
            break;
          }
        }
        pauseMs = 1000 * this.settings.pollingIntervalSeconds;
      } catch (error) {
        this.log("queue.error", { message: (error as Error).message, retryInMs: pauseMs });
        await sleep(pauseMs);
        pauseMs = Math.min(30_000, pauseMs * 2);
        continue;
      }
      if (!taken) {
        await sleep(pauseMs);
        continue;
      }
      const { queue, job, run } = taken;
      // A completion (or failure) lost with the database leaves the job active, to expire and be retried: its
      // result, if stored, is found then and kept. pg-boss retries a failed attempt, or dead-letters the last.
      const record = (what: "complete" | "fail", done: Promise<void>) =>
        done.catch((error: unknown) => this.log(`job.${what}-not-recorded`, { queue, jobId: job.id, message: (error as Error).message }));
      let output: unknown;
      try {
        output = await this.handle(queue, job, run);
      } catch (error) {
        await record("fail", boss.fail(queue, job.id, { message: error instanceof Error ? error.message : String(error) }));
        continue;
      }
      await record("complete", boss.complete(queue, job.id, output as object));
    }
  }

  /** Stops taking jobs; graceful waits (up to timeoutMs) for the job in hand, else leaves it to expire and be retried. */
  async stop(graceful = true, timeoutMs = 60_000): Promise<void> {
    const boss = this.boss;
    this.running = false;
    const loop = this.loop;
    this.loop = null;
    if (loop && graceful) await Promise.race([loop, sleep(timeoutMs)]);
    this.boss = null;
    if (boss) await boss.stop({ graceful: false, wait: true });
  }

  /**
   * Runs one job. What it returns becomes the job's output (completed); what it throws fails the
   * attempt (pg-boss retries it until retryLimit). A RejectedJob completes with a rejection record:
   * retrying a payload that can never work would only repeat the error.
   */
  private async handle(queue: string, job: QueueJob, run: (job: QueueJob) => Promise<unknown>): Promise<unknown> {
    const started = Date.now();
    this.log("job.started", { queue, jobId: job.id, attempt: job.retryCount + 1 });
    try {
      if (this.settings.faultDelayMs > 0) await sleep(this.settings.faultDelayMs);
      const output = await run(job);
      this.counts[(output as { skipped?: string } | undefined)?.skipped ? "skipped" : "done"]++;
      this.log("job.done", { queue, jobId: job.id, ms: Date.now() - started, ...timingsOf(output) });
      return output ?? { ok: true };
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      if (error instanceof RejectedJob) {
        this.counts.rejected++;
        this.log("job.rejected", { queue, jobId: job.id, reason: message });
        // A simulation that one of its jobs can never complete would wait forever: it fails now
        // (nothing happens when the id names no simulation).
        await this.recordFailure(job, message, true).catch(() => {});
        return { rejected: message };
      }
      this.counts.failed++;
      const final = job.retryCount >= job.retryLimit;
      this.log("job.failed", { queue, jobId: job.id, attempt: job.retryCount + 1, final, message });
      await this.recordFailure(job, message, final).catch((recordError: unknown) =>
        this.log("job.failure-not-recorded", { queue, jobId: job.id, message: (recordError as Error).message }),
      );
      throw error;
    }
  }

  /** A failed attempt: "retrying" while retries remain; the simulation failed on the last one. */
  private async recordFailure(job: QueueJob, message: string, final: boolean): Promise<void> {
    const simulationId = (job.data as { simulationId?: unknown } | null)?.simulationId;
    if (typeof simulationId !== "string") return;
    if (final) await fail(this.prisma, simulationId, message);
    else await markRetrying(this.prisma, simulationId, `attempt ${job.retryCount + 1} of ${job.retryLimit + 1} failed: ${message}`);
  }

  /** The simulation's status at the start of a job, or a rejection when the id names none. */
  private async begin(simulationId: string, job: QueueJob): Promise<string> {
    const status = await markStepRunning(this.prisma, simulationId, job.retryCount > 0);
    if (status === null) throw new RejectedJob(`simulation ${simulationId} does not exist`);
    return status;
  }

  private async loadRun(simulationId: string) {
    const { changes: recorded, networkId, baseVersion } = await simulationJob(this.prisma, simulationId);
    const changes = parseChanges(recorded, simulationId);
    const scenario = await loadScenario(this.prisma, networkId, { version: baseVersion });
    return { changes, networkId, baseVersion, scenario };
  }

  // ---- "simulation": whole, or cut into cell groups
  private async simulation(job: QueueJob): Promise<unknown> {
    const { simulationId } = parsePayload(simulationPayload, SIMULATION_QUEUE, job.data);
    const status = await simulationStatus(this.prisma, simulationId);
    if (status === null) throw new RejectedJob(`simulation ${simulationId} does not exist`);
    if (status === "done" || status === "failed") return { skipped: status };
    // The changes are checked by the run itself, after it has counted its attempt.
    const { changes: recorded, networkId, baseVersion } = await simulationJob(this.prisma, simulationId);
    const scenario = await loadScenario(this.prisma, networkId, { version: baseVersion });
    if (scenario.cells.length <= this.settings.splitAboveCells) {
      // Single-threaded on purpose: one worker process per core is the unit of scale.
      const stored = await executeSimulation(this.db, simulationId);
      return { simulationId, requestMoved: stored.requestMoved };
    }
    // markRunning of the whole run happens here, once per attempt of this job.
    await markRunning(this.prisma, simulationId);
    parseChanges(recorded, simulationId);
    validateScenario(scenario);
    const radiusM = splitRadiusM(scenario, this.settings);
    const stageKey = stageKeyOf(networkId, baseVersion, scenario, radiusM);
    // The version's aggregates are stored (or held here): one job does the rest.
    if (this.merged?.key === stageKey || (await hasStagePartial(this.db, stageKey, WHOLE_NETWORK_PART))) return this.mergeRun(simulationId, stageKey, radiusM, scenario);
    const groups = cellGroups(scenario.cells.map((c) => c.id), this.settings.cellGroupSize);
    const stored = new Set(await storedGroupParts(this.db, stageKey));
    const missing = groups.map((cells, part) => ({ cells, part })).filter((g) => !stored.has(g.part));
    await this.reportProgress(simulationId, groups, stored);
    if (missing.length === 0) return this.mergeRun(simulationId, stageKey, radiusM, scenario);
    // The other groups go to the queue in one insert; this worker takes the first itself, rather than wait
    // for the queue to hand it back, with the network already loaded.
    const [first, ...rest] = missing;
    if (rest.length > 0) {
      // Taken in group order (the small groups last): a higher priority for an earlier group, since jobs
      // inserted together carry one creation time.
      await this.requireBoss().insert(
        rest.map((group) => ({
          name: CELLS_QUEUE,
          data: { simulationId, stageKey, radiusM, part: group.part, cellIds: group.cells },
          priority: groups.length - group.part,
          ...sendOptions(this.settings, `${simulationId}:${group.part}`),
        })),
      );
    }
    this.log("simulation.split", { simulationId, stageKey, radiusM, groups: groups.length, sent: rest.length, cells: scenario.cells.length });
    const done = await this.groupRun(simulationId, stageKey, radiusM, first.part, first.cells, scenario);
    return { simulationId, stageKey, radiusM, groups: groups.length, sent: rest.length, ...done };
  }

  // ---- "simulation.cells": one group's partial
  private async cells(job: QueueJob): Promise<unknown> {
    const { simulationId, stageKey, radiusM, part, cellIds } = parsePayload(cellsPayload, CELLS_QUEUE, job.data);
    const status = await this.begin(simulationId, job);
    if (status === "done" || status === "failed") return { skipped: status };
    return { simulationId, ...(await this.groupRun(simulationId, stageKey, radiusM, part, cellIds)) };
  }

  /**
   * One group: its partial computed and stored; then the merge sent when every group is stored, or, when no
   * group waits in the queue any more (the other workers have the last ones in hand), the partials stored so
   * far merged ahead (premerge), so that the merge has little left to do.
   */
  private async groupRun(simulationId: string, stageKey: string, radiusM: number, part: number, cellIds: readonly string[], loaded?: Scenario): Promise<Record<string, number>> {
    const { scenario, grid } = await this.prepare(simulationId, stageKey, loaded);
    const index = new Map(scenario.cells.map((c, i) => [c.id, i]));
    const indices = cellIds.map((cellId) => {
      const i = index.get(cellId);
      if (i === undefined) throw new RejectedJob(`${CELLS_QUEUE}: cell "${cellId}" is not in simulation ${simulationId}'s network`);
      return i;
    });
    const t0 = performance.now();
    const partial = computeGroupPartial(scenario, grid, indices, radiusM, this.recycler);
    const t1 = performance.now();
    await storeStagePartial(this.db, stageKey, part, partial);
    const t2 = performance.now();
    const stored = new Set(await storedGroupParts(this.db, stageKey));
    const groups = cellGroups(scenario.cells.map((c) => c.id), this.settings.cellGroupSize);
    await this.reportProgress(simulationId, groups, stored);
    // Checked after this group's row is committed: of two groups finishing together, the later one
    // to look sees both, so at least one sends the merge (and singletonKey makes two sends one job).
    let premergeMs = 0;
    if (groups.every((_, g) => stored.has(g))) await this.sendMerge(simulationId, stageKey, radiusM);
    else if ((await this.requireBoss().getQueueSize(CELLS_QUEUE)) === 0) {
      const t3 = performance.now();
      await this.mergeStored(stageKey, scenario, grid, "ahead");
      premergeMs = Math.round(performance.now() - t3);
    }
    // Timings go into the job's output, for benchmarks and diagnostics.
    return { part, cells: cellIds.length, pairs: partial.pairs, computeMs: Math.round(t1 - t0), storeMs: Math.round(t2 - t1), premergeMs };
  }

  /**
   * The stored group partials merged, starting from the premerge (a merge of some of them made ahead). "ahead":
   * merges what is stored into the premerge row, unless another worker is doing so; "final": every group must be
   * stored, and a premerge under way is waited for (so its work is not done twice). The two hold one advisory lock
   * of the stage in PostgreSQL. Returns the merge (null when "ahead" found the lock taken or nothing new).
   */
  private async mergeStored(stageKey: string, scenario: Scenario, grid: Grid, mode: "ahead" | "final"): Promise<StoredPartial | null> {
    const settings = scenario.settings;
    const key = crypto.createHash("sha256").update(stageKey).digest().readInt32BE(0);
    return this.db.session(async (sql) => {
      if (mode === "ahead") {
        const [{ locked }] = await sql.query<{ locked: boolean }>("select pg_try_advisory_lock($1, $2) as locked", [STAGE_LOCK_CLASS, key]);
        if (!locked) return null;
      } else await sql.query("select pg_advisory_lock($1, $2)", [STAGE_LOCK_CLASS, key]);
      try {
        const merger = new PartialMerger(scenario, grid);
        const ahead = await loadStagePartial(sql, stageKey, PREMERGE_PART, settings);
        const included = new Set(ahead?.parts ?? []);
        if (ahead) merger.add(ahead);
        let added = 0;
        await forEachGroupPartial(sql, stageKey, settings, (part, partial) => {
          merger.add(partial);
          included.add(part);
          added++;
        }, included);
        if (mode === "final") return merger.finish();
        if (added === 0) return null;
        const merged = { ...merger.partial(), parts: [...included].sort((a, b) => a - b) };
        await storeStagePartial(sql, stageKey, PREMERGE_PART, merged);
        return merged;
      } finally {
        await sql.query("select pg_advisory_unlock($1, $2)", [STAGE_LOCK_CLASS, key]);
      }
    });
  }

  // ---- "simulation.merge": the network's aggregates from the partials, then the evaluation
  private async merge(job: QueueJob): Promise<unknown> {
    const { simulationId, stageKey, radiusM } = parsePayload(mergePayload, MERGE_QUEUE, job.data);
    const status = await this.begin(simulationId, job);
    if (status === "done" || status === "failed") return { skipped: status };
    return this.mergeRun(simulationId, stageKey, radiusM);
  }

  /**
   * The network's aggregates (held, stored whole, or merged from the group partials and then stored whole), the
   * changes evaluated on them, the result stored. `scenario` when the caller has it loaded.
   */
  private async mergeRun(simulationId: string, stageKey: string, radiusM: number, scenario?: Scenario): Promise<unknown> {
    const { changes: recorded } = await simulationJob(this.prisma, simulationId);
    const changes = parseChanges(recorded, simulationId);
    const t0 = performance.now();
    const timings: Record<string, number> = {};
    const lap = (() => {
      let last = t0;
      return (name: string) => {
        const now = performance.now();
        timings[name] = Math.round(now - last);
        last = now;
      };
    })();
    let network = this.merged?.key === stageKey ? this.merged.network : null;
    if (!network) {
      this.merged = null; // let the old one go before the next is read
      const prepared = await this.prepare(simulationId, stageKey, scenario);
      lap("prepareMs");
      const settings = prepared.scenario.settings;
      let whole = await loadStagePartial(this.db, stageKey, WHOLE_NETWORK_PART, settings);
      if (!whole) {
        whole = (await this.mergeStored(stageKey, prepared.scenario, prepared.grid, "final"))!;
        lap("mergeMs");
        await storeStagePartial(this.db, stageKey, WHOLE_NETWORK_PART, whole);
      }
      lap("loadOrStoreMs");
      network = new SplitNetwork(prepared.scenario, prepared.grid, radiusM, whole);
      lap("baselineMs");
      this.merged = { key: stageKey, network };
    }
    const t1 = performance.now();
    const after = network.evaluate(changes);
    const result = resultOf({ scenario: network.scenario, grid: network.grid, baselineKpis: network.baselineKpis }, after.kpis);
    const t2 = performance.now();
    await this.prisma.simulation.updateMany({ where: { id: simulationId, status: "running" }, data: { progress: 0.97 } });
    const stored = await storeResult(this.prisma, simulationId, result);
    // Timings go into the job's output, for benchmarks and diagnostics.
    return { simulationId, requestMoved: stored.requestMoved, aggregatesMs: Math.round(t1 - t0), evaluateMs: Math.round(t2 - t1), ...timings, pointPairs: after.pointPairs };
  }

  // ---- "simulation.dead": a job given up
  private async deadLetter(job: QueueJob): Promise<unknown> {
    const simulationId = (job.data as { simulationId?: unknown } | null)?.simulationId;
    if (typeof simulationId !== "string" || simulationId === "") throw new RejectedJob(`dead letter without a simulation id: ${JSON.stringify(job.data)?.slice(0, 200)}`);
    const status = await simulationStatus(this.prisma, simulationId);
    if (status === null || status === "done" || status === "failed") return { skipped: status ?? "unknown" };
    await fail(this.prisma, simulationId, `the job queue gave up on this simulation after ${job.retryLimit + 1} attempts (a worker failed or was lost each time)`);
    return { simulationId, failed: true };
  }

  private async prepare(simulationId: string, stageKey: string, loaded?: Scenario): Promise<{ scenario: Scenario; grid: Grid }> {
    if (this.prepared?.key === stageKey) return this.prepared;
    const scenario = loaded ?? (await this.loadRun(simulationId)).scenario;
    validateScenario(scenario);
    this.prepared = { key: stageKey, scenario, grid: buildGrid(scenario) };
    return this.prepared;
  }

  private async reportProgress(simulationId: string, groups: string[][], stored: Set<number>): Promise<void> {
    const cellsTotal = groups.reduce((n, g) => n + g.length, 0);
    let cellsDone = 0, groupsDone = 0;
    groups.forEach((group, part) => {
      if (!stored.has(part)) return;
      cellsDone += group.length;
      groupsDone++;
    });
    await setSplitProgress(this.prisma, simulationId, groups.length === 0 ? CELL_SHARE : (CELL_SHARE * groupsDone) / groups.length, {
      groups: { done: groupsDone, total: groups.length },
      cells: { done: cellsDone, total: cellsTotal },
    });
  }

  private async sendMerge(simulationId: string, stageKey: string, radiusM: number): Promise<void> {
    await this.requireBoss().send(MERGE_QUEUE, { simulationId, stageKey, radiusM }, sendOptions(this.settings, simulationId));
  }

  private requireBoss(): PgBoss {
    if (!this.boss) throw new Error("the worker is stopped");
    return this.boss;
  }
}
