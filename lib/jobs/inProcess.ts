// Simulation jobs run inside the app's own process, one at a time, first queued first run:
// two cores are shared with the web server, and consecutive jobs on one network version
// reuse the cached engine. Enqueue never throws into the caller; every failure is recorded
// on the Simulation row by runSimulation.
import type { Prisma } from "../db/open";
import type { SimulationJobs } from "./index";
import { runSimulation, type RunOutcome, type RunSimulationOptions } from "./runSimulation";

export class InProcessSimulationJobs implements SimulationJobs {
  private readonly queue: string[] = [];
  private running: Promise<void> | null = null;
  private readonly waiters: (() => void)[] = [];
  /** Outcome of each finished job, newest last (bounded), for diagnostics. */
  readonly outcomes: { simulationId: string; outcome: RunOutcome }[] = [];

  constructor(
    private readonly db: { prisma: Prisma },
    private readonly options: RunSimulationOptions = {},
  ) {}

  async enqueue(simulationId: string): Promise<void> {
    if (!this.queue.includes(simulationId)) this.queue.push(simulationId);
    if (this.running === null) {
      // Start after the caller's current work (e.g. its response) has gone on.
      this.running = new Promise<void>((resolve) => setImmediate(resolve)).then(() => this.drain());
    }
  }

  /** Resolves when the queue is empty and nothing runs (for shutdown and tests). */
  idle(): Promise<void> {
    if (this.running === null && this.queue.length === 0) return Promise.resolve();
    return new Promise((resolve) => this.waiters.push(resolve));
  }

  /** Jobs waiting, not counting the one running. */
  get pending(): number {
    return this.queue.length;
  }

  private async drain(): Promise<void> {
    try {
      for (let id = this.queue.shift(); id !== undefined; id = this.queue.shift()) {
        let outcome: RunOutcome;
        try {
          outcome = await runSimulation(this.db, id, this.options);
        } catch (error) {
          // runSimulation records its own failures; this is a last resort.
          outcome = { status: "failed", error: (error as Error).message };
          console.error(`simulation ${id}: job runner error`, error);
        }
        this.outcomes.push({ simulationId: id, outcome });
        if (this.outcomes.length > 100) this.outcomes.shift();
      }
    } finally {
      this.running = null;
      for (const resolve of this.waiters.splice(0)) resolve();
    }
  }
}
