// The one interface through which requests get simulated: in the app's process by default, or,
// with BEAMGATE_JOB_RUNNER=queue on a PostgreSQL server, a job queue worked by `npm run worker`
// processes on any number of machines (queue.ts).
import type { Prisma } from "../db/open";
import type { DatabaseTarget } from "../db/target";
import { InProcessSimulationJobs } from "./inProcess";
import { QueueSimulationJobs } from "./queue";
import { unfinishedSimulationIds } from "../db/simulations";

export interface SimulationJobs {
  /** Queues the simulation (its row already exists with status "queued"); resolves once queued, not when run. */
  enqueue(simulationId: string): Promise<void>;
}

const perDatabase = new WeakMap<object, InProcessSimulationJobs | QueueSimulationJobs>();

/** Which runner: the queue only when asked for (BEAMGATE_JOB_RUNNER=queue) and the database is a server. */
export function jobRunnerKind(target: DatabaseTarget | undefined, env: Readonly<Record<string, string | undefined>> = process.env): "threads" | "queue" {
  const runner = env.BEAMGATE_JOB_RUNNER?.trim() || "threads";
  if (runner !== "threads" && runner !== "queue") {
    throw new RangeError(`BEAMGATE_JOB_RUNNER must be "threads" or "queue", got ${JSON.stringify(runner)}`);
  }
  if (runner === "queue" && target?.kind !== "postgres") {
    // The embedded database serves one process; queue workers elsewhere could never reach it.
    if (target) console.warn(`BEAMGATE_JOB_RUNNER=queue needs a PostgreSQL server (DATABASE_URL=postgresql://…); running jobs in-process`);
    return "threads";
  }
  return runner;
}

/** The job runner for this database handle (one per handle, so one FIFO or one queue client per process). */
export function getSimulationJobs(db: { prisma: Prisma; target?: DatabaseTarget }): SimulationJobs & { idle(): Promise<void> } {
  let jobs = perDatabase.get(db.prisma);
  if (!jobs) {
    const target = db.target;
    jobs = jobRunnerKind(target) === "queue" && target?.kind === "postgres" ? new QueueSimulationJobs(target.url) : new InProcessSimulationJobs(db);
    perDatabase.set(db.prisma, jobs);
  }
  return jobs;
}

/**
 * Queues again every simulation left queued or running by a process that stopped (an
 * in-process queue does not survive a restart). Call once at start-up; returns how many.
 */
export async function requeueUnfinished(db: { prisma: Prisma }, jobs: SimulationJobs = getSimulationJobs(db)): Promise<number> {
  const ids = await unfinishedSimulationIds(db.prisma);
  for (const id of ids) await jobs.enqueue(id);
  return ids.length;
}

export { InProcessSimulationJobs } from "./inProcess";
export { QueueSimulationJobs } from "./queue";
