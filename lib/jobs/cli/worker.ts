// `npm run worker`: one stateless simulation worker on the PostgreSQL job queue (lib/jobs/queue.ts).
//
//   DATABASE_URL=postgresql://user@host:5432/beamgate BEAMGATE_JOB_RUNNER=queue npm run worker
//
// Start as many as there are cores, on as many machines as reach the database: each is one
// thread and takes one job at a time. SIGTERM or SIGINT stops it gracefully (the job in hand is
// finished, up to BEAMGATE_WORKER_STOP_S seconds, else handed back for retry). Settings: the
// BEAMGATE_QUEUE_* / BEAMGATE_CELL_* variables of queue.ts. BEAMGATE_WORKER_REPORT=FILE writes
// { pid, maxRssMb, jobs } there at exit (benchmarks read peak memory from it).
import fs from "node:fs";
import { openDatabase } from "../../db/open";
import { DatabaseError } from "../../db/errors";
import { redactUrl, resolveDatabaseTarget } from "../../db/target";
import { jsonLog, queueSettings, SimulationWorker } from "../queue";

async function main(): Promise<number> {
  const target = resolveDatabaseTarget();
  if (target.kind !== "postgres") {
    console.error("worker: DATABASE_URL must name a PostgreSQL server (postgresql://…); the embedded database serves one process only");
    return 2;
  }
  if ((process.env.BEAMGATE_JOB_RUNNER ?? "queue") !== "queue") {
    console.error(`worker: BEAMGATE_JOB_RUNNER is "${process.env.BEAMGATE_JOB_RUNNER}"; workers serve the queue runner (set it to "queue")`);
    return 2;
  }
  const stopSeconds = Number(process.env.BEAMGATE_WORKER_STOP_S ?? 60);
  const settings = queueSettings();
  // pg-boss completes and fails jobs without awaiting; with the database gone those promises reject.
  // The job then expires and is retried; the process must live on to take the next one.
  process.on("unhandledRejection", (reason) => jsonLog("worker.unhandled-rejection", { message: (reason as Error)?.message ?? String(reason) }));

  // The database may not be up yet (a machine booting with the server): retry with back-off.
  let db;
  for (let attempt = 0, delayMs = 1000; ; attempt++, delayMs = Math.min(30_000, delayMs * 2)) {
    try {
      db = await openDatabase(target);
      break;
    } catch (error) {
      // Only an unreachable server is worth waiting for; a refused migration or a bad URL is not.
      if (!(error instanceof DatabaseError && error.failure === "unreachable")) throw error;
      jsonLog("worker.database-unreachable", { url: redactUrl(target.url), message: (error as Error).message, retryInMs: delayMs });
      await new Promise((resolve) => setTimeout(resolve, delayMs));
    }
  }
  const worker = new SimulationWorker(db, target.url, { settings });
  await worker.start();

  return new Promise<number>((resolve) => {
    let stopping = false;
    const stop = (signal: string) => {
      if (stopping) return;
      stopping = true;
      jsonLog("worker.stopping", { signal });
      worker
        .stop(true, stopSeconds * 1000)
        .catch((error: unknown) => jsonLog("worker.stop-error", { message: (error as Error).message }))
        .then(() => db.close())
        .then(() => {
          const report = { pid: process.pid, maxRssMb: process.resourceUsage().maxRSS / 1024, jobs: worker.counts };
          if (process.env.BEAMGATE_WORKER_REPORT) fs.writeFileSync(process.env.BEAMGATE_WORKER_REPORT, JSON.stringify(report));
          jsonLog("worker.stopped", report);
          resolve(0);
        });
    };
    process.on("SIGTERM", () => stop("SIGTERM"));
    process.on("SIGINT", () => stop("SIGINT"));
  });
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    console.error("worker:", error instanceof Error ? error.message : error);
    process.exit(1);
  },
);
