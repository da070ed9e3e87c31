// The worker threads of the threaded cold run, kept between runs. A fresh worker costs ~0.2 s to start and
// then runs its first few cells 2–3× slower than a warm one while V8 compiles the hot loops (measured on the
// 300 000-grid benchmark, 2 cores); kept workers pay that once per process. Idle workers hold no scenario
// (released after each run), do not keep the process alive (unref) and end after IDLE_MS without work.
import { Worker } from "node:worker_threads";
import { pathToFileURL } from "node:url";

/** How long idle workers are kept, ms. */
export const IDLE_MS = 60_000;

/**
 * Starts a worker on `file`. A .ts file is loaded through tsx: `execArgv: ["--import", "tsx"]` does not
 * install tsx's hooks inside a worker on Node 20 ("Unknown file extension .ts"), so a two-line bootstrap
 * registers tsx's ESM API in the worker and then imports the file. Compiled .js/.mjs files start directly.
 */
export function startWorker(file: string): Worker {
  if (!file.endsWith(".ts")) return new Worker(file);
  const url = JSON.stringify(pathToFileURL(file).href);
  const bootstrap = `import("tsx/esm/api").then((api) => { api.register(); return import(${url}); });`;
  return new Worker(bootstrap, { eval: true });
}

export interface PooledWorker {
  worker: Worker;
  /** The worker's module has loaded (it posted { ready: true }). */
  ready: boolean;
}

export class SimulationThreadPool {
  readonly file: string;
  private readonly workers: PooledWorker[] = [];
  private queue: Promise<unknown> = Promise.resolve();
  private idleTimer: NodeJS.Timeout | undefined;
  private closed = false;

  constructor(file: string) {
    this.file = file;
  }

  /** Workers alive now (for tests and diagnostics). */
  get size(): number {
    return this.workers.length;
  }

  /** Closed pools (idle too long, or closed by hand) take no more runs. */
  get isClosed(): boolean {
    return this.closed;
  }

  /**
   * Runs `run` with `count` workers of its own (started when the pool has fewer), one run at a time: two cold
   * runs at once would only share the same cores. The workers are kept for the next run unless `run` fails,
   * when they are ended, so that no half-done cell of the failed run can reach a later one.
   */
  exclusive<T>(count: number, run: (workers: PooledWorker[]) => Promise<T>): Promise<T> {
    const result = this.queue.then(async () => {
      if (this.closed) throw new Error(`simulation thread pool for ${this.file} is closed`);
      clearTimeout(this.idleTimer);
      while (this.workers.length < count) this.workers.push(this.spawn());
      const taken = this.workers.slice(0, count);
      // A pending promise does not keep Node alive; busy workers must.
      for (const w of taken) w.worker.ref();
      try {
        return await run(taken);
      } catch (error) {
        await this.retire(taken);
        throw error;
      } finally {
        for (const w of taken) w.worker.unref();
        this.idleTimer = setTimeout(() => void this.close(), IDLE_MS);
        this.idleTimer.unref();
      }
    });
    this.queue = result.catch(() => {});
    return result;
  }

  /** Ends every worker; a closed pool takes no more runs. */
  async close(): Promise<void> {
    this.closed = true;
    clearTimeout(this.idleTimer);
    await this.retire(this.workers.slice());
  }

  private spawn(): PooledWorker {
    const pooled: PooledWorker = { worker: startWorker(this.file), ready: false };
    pooled.worker.unref();
    pooled.worker.on("message", (message: { ready?: true }) => {
      if (message && message.ready) pooled.ready = true;
    });
    // A worker that dies leaves the pool; the run that used it sees the same event and fails.
    const drop = () => {
      const i = this.workers.indexOf(pooled);
      if (i >= 0) this.workers.splice(i, 1);
    };
    pooled.worker.on("error", drop);
    pooled.worker.on("exit", drop);
    return pooled;
  }

  private async retire(workers: PooledWorker[]): Promise<void> {
    for (const w of workers) {
      const i = this.workers.indexOf(w);
      if (i >= 0) this.workers.splice(i, 1);
    }
    await Promise.all(workers.map((w) => w.worker.terminate()));
  }
}

const pools = new Map<string, SimulationThreadPool>();

/**
 * The pool for `file`. `fresh` (the worker module was just rebuilt) ends the kept workers first, since
 * they run the old code.
 */
export function simulationThreadPool(file: string, fresh = false): SimulationThreadPool {
  let pool = pools.get(file);
  if (pool && fresh) {
    void pool.close();
    pool = undefined;
  }
  if (!pool || pool.isClosed) {
    pool = new SimulationThreadPool(file);
    pools.set(file, pool);
  }
  return pool;
}

/** Ends every kept worker of every pool (tests; a server shutting down). */
export async function closeSimulationThreadPools(): Promise<void> {
  const all = [...pools.values()];
  pools.clear();
  await Promise.all(all.map((p) => p.close()));
}
