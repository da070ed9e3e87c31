// The one interface through which requests get simulated. Today the jobs run in the app's
// process; a PostgreSQL-backed queue (several workers, jobs surviving a restart) will come
// behind the same interface.
import type { Prisma } from "../db/open";
import { InProcessSimulationJobs } from "./inProcess";
import { unfinishedSimulationIds } from "../db/simulations";

export interface SimulationJobs {
  /** Queues the simulation (its row already exists with status "queued"); resolves once queued, not when run. */
  enqueue(simulationId: string): Promise<void>;
}

const perDatabase = new WeakMap<object, InProcessSimulationJobs>();

/** The job runner for this database handle (one per handle, so one FIFO per process). */
export function getSimulationJobs(db: { prisma: Prisma }): SimulationJobs & { idle(): Promise<void> } {
  let jobs = perDatabase.get(db.prisma);
  if (!jobs) {
    jobs = new InProcessSimulationJobs(db);
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
