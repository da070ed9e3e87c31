// City benchmark of the PostgreSQL job queue: `npx tsx test/bench/city.bench.ts --json --workers 1,2`
//
// Generates a seeded invented city (generateBenchScenario: 500 three-sector sites = 1,500 cells on
// 5 km × 5 km = 25 km², buildings of up to 8 floors, a 20 m grid — coarser than the 5 m default, to keep a run
// near half a minute per worker), stores it in a throw-away database on the machine's PostgreSQL
// (BEAMGATE_TEST_PG_ADMIN_URL, default postgresql://postgres@127.0.0.1:5432/postgres), and for each N
// of --workers runs one full split simulation (simulation → simulation.cells × groups → simulation.merge)
// on N fresh worker processes (`lib/jobs/cli/worker.ts`), with the stored partials deleted first.
// Prints ONE JSON object:
//   cells, grids, gridSizeM, areaKm2, radiusM     the network and the computation radius used
//   runs: [{workers, pairs, wallMs, cellsMs, mergeMs, pairsPerSec, peakRssMbPerWorker}]
//       wallMs       enqueue → simulation done (workers already started and idle)
//       cellsMs      enqueue → the merge job sent (every group's partial stored); mergeMs the rest
//       pairs        cell × grid pairs computed by the group jobs (sum of the footprints)
//       peakRssMbPerWorker  process.resourceUsage().maxRSS each worker reported at exit
//   speedup       pairsPerSec of the largest N over that of N = 1
//   rerunMs       a second request (3 cells changed) on the same version after the last run, enqueue → done:
//                 one "simulation" job on whichever worker takes it, from the stored merged aggregates
//   rerunEngineMs that job's own evaluation of the 3 cells (changed cells, update, KPI pass, result)
//   loadAverage   os.loadavg() before and after (other work on the machine skews the figures)
// Each worker runs in its own session (see startWorker), so it is scheduled as a separate service is.
// The database is dropped at the end, also on failure.
import { spawn, type ChildProcess } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import pg from "pg";
import { openDatabase, type Database } from "../../lib/db/open";
import { createNetwork } from "../../lib/db/networks/mutations";
import { loadScenario } from "../../lib/db/networks/data";
import { createUser } from "../../lib/db/users";
import { act, createRequest, type RequestActor } from "../../lib/db/requests/mutations";
import { deleteStagePartials, storedGroupPairs } from "../../lib/db/stagePartials";
import { QueueSimulationJobs, queueSettings, splitRadiusM, stageKeyOf, MERGE_QUEUE, SIMULATION_QUEUE } from "../../lib/jobs/queue";
import { buildGrid } from "../../lib/radio/grid";
import { generateBenchScenario } from "./benchScenario";

const argv = process.argv.slice(2);
const json = argv.includes("--json");
const arg = (name: string, fallback: string) => {
  const i = argv.indexOf(name);
  return i >= 0 && argv[i + 1] ? argv[i + 1] : fallback;
};
const workerCounts = arg("--workers", "1,2").split(",").map((w) => {
  const n = Number(w);
  if (!Number.isInteger(n) || n < 1 || n > 64) throw new RangeError(`--workers: "${w}" is not a worker count (1…64)`);
  return n;
});
const sizeM = Number(arg("--size", "5000"));
const sites = Number(arg("--sites", "500"));
const gridSizeM = Number(arg("--grid", "20"));
const log = (...a: unknown[]) => {
  if (!json) console.error(...a);
};
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

function startWorker(url: string, report: string): Promise<ChildProcess> {
  const child = spawn(process.execPath, ["--import", "tsx", "lib/jobs/cli/worker.ts"], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: url, BEAMGATE_JOB_RUNNER: "queue", BEAMGATE_QUEUE_POLL_S: "0.5", BEAMGATE_WORKER_REPORT: report },
    stdio: ["ignore", "ignore", "pipe"],
    // Its own session, as a worker started by a service manager or on another machine would be. With
    // the kernel's scheduler autogroups (sched_autogroup_enabled = 1), processes of one session share
    // one CPU slice: on a machine busy with other sessions, N workers of the benchmark's session would
    // split the slice of one and show no gain at all.
    detached: true,
  });
  return new Promise((resolve, reject) => {
    let buffered = "";
    child.stderr!.on("data", (chunk: Buffer) => {
      buffered += chunk.toString();
      if (buffered.includes('"worker.started"')) resolve(child);
      if (buffered.length > 100_000) buffered = buffered.slice(-10_000);
      if (!json && /job\.(failed|rejected)|queue\.error/.test(chunk.toString())) process.stderr.write(chunk);
      if (process.env.BEAMGATE_BENCH_LOG) fs.appendFileSync(process.env.BEAMGATE_BENCH_LOG, chunk);
    });
    child.once("exit", (code) => reject(new Error(`worker exited with ${code} before starting:\n${buffered.slice(-2000)}`)));
  });
}

async function stopWorker(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null) return;
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  child.kill("SIGTERM");
  await exited;
}

async function waitDone(db: Database, simulationId: string, onPoll?: () => Promise<void>): Promise<void> {
  for (;;) {
    const sim = await db.prisma.simulation.findUniqueOrThrow({ where: { id: simulationId }, select: { status: true, error: true } });
    if (sim.status === "done") return;
    if (sim.status === "failed") throw new Error(`simulation ${simulationId} failed: ${sim.error}`);
    if (onPoll) await onPoll();
    // every 100 ms: a tighter poll costs the workers a few per cent of the two cores
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

async function main(): Promise<void> {
  const loadBefore = os.loadavg();
  const admin = new URL(process.env.BEAMGATE_TEST_PG_ADMIN_URL ?? "postgresql://postgres@127.0.0.1:5432/postgres");
  const name = `beamgate_city_bench_${process.pid}_${crypto.randomBytes(3).toString("hex")}`;
  const adminQuery = async (sql: string) => {
    const client = new pg.Client({ connectionString: admin.toString() });
    await client.connect();
    try {
      await client.query(sql);
    } finally {
      await client.end();
    }
  };
  await adminQuery(`create database "${name}"`);
  const url = new URL(admin.toString());
  url.pathname = `/${name}`;
  const reportDir = fs.mkdtempSync(path.join(os.tmpdir(), "beamgate-city-bench-"));
  const workers: ChildProcess[] = [];
  let db: Database | undefined;
  try {
    db = await openDatabase({ kind: "postgres", url: url.toString(), host: `${url.hostname}:${url.port || 5432}`, database: name });
    const scenario = generateBenchScenario({ seed: 11, sizeM, sites, gridSizeM, maxFloors: 8 });
    const { networkId } = await createNetwork(db.prisma, scenario, { kind: "seed", note: "city benchmark" });
    const stored = await loadScenario(db.prisma, networkId, { version: 1 });
    const grids = buildGrid(stored).count;
    const settings = queueSettings({ ...process.env, BEAMGATE_QUEUE_POLL_S: "0.5" });
    const radiusM = splitRadiusM(stored, settings);
    const stageKey = stageKeyOf(networkId, 1, stored, radiusM);
    log(`city: ${stored.cells.length} cells, ${stored.buildings.length} buildings, ${grids} grids of ${gridSizeM} m, radius ${radiusM} m`);
    const user = await createUser(db.prisma, { email: "bench@example.test", name: "Bench", role: "engineer", passwordHash: "x" });
    const actor: RequestActor = { id: user.id, role: "engineer", email: user.email };
    const jobs = new QueueSimulationJobs(url.toString(), settings, () => {});
    let k = 0;
    const submitted = async (cells: number): Promise<string> => {
      const items = stored.cells.slice(k, k + cells).map((c, i) => ({
        cellId: c.id,
        parameter: i % 2 ? "azimuthDeg" : "electricalTiltDeg",
        newValue: i % 2 ? (c.azimuthDeg + 15) % 360 : c.electricalTiltDeg === 8 ? 7 : c.electricalTiltDeg + 1,
      }));
      k += cells;
      const created = await createRequest(db!, actor, { title: `bench ${k}`, reason: "city benchmark", items }, networkId);
      const held: string[] = [];
      await act(db!, actor, created.id, { action: "submit", version: created.version }, { jobs: { enqueue: async (id) => void held.push(id) } });
      return held[0];
    };

    const runs = [];
    let rerunMs: number | null = null;
    let rerunEngineMs: number | null = null;
    for (const [r, n] of workerCounts.entries()) {
      await deleteStagePartials(db.prisma, stageKey);
      const reports = Array.from({ length: n }, (_, i) => path.join(reportDir, `run${r}-worker${i}.json`));
      workers.splice(0, workers.length, ...(await Promise.all(reports.map((file) => startWorker(url.toString(), file)))));
      const simulationId = await submitted(1);
      const start = performance.now();
      await jobs.enqueue(simulationId);
      let cellsMs = 0;
      await waitDone(db, simulationId, async () => {
        if (cellsMs > 0) return;
        const merges = await db!.query<{ n: number }>(`select count(*)::int as n from pgboss.job where name = $1 and data->>'simulationId' = $2`, [MERGE_QUEUE, simulationId]);
        if (merges[0].n > 0) cellsMs = performance.now() - start;
      });
      const wallMs = performance.now() - start;
      const pairs = await storedGroupPairs(db.prisma, stageKey);
      log(`${n} worker(s): ${pairs} pairs in ${wallMs.toFixed(0)} ms (cells ${cellsMs.toFixed(0)} ms)`);
      if (r === workerCounts.length - 1) {
        // A second request on the version: one "simulation" job on whichever worker takes it, from the stored
        // aggregates (or the ones it holds, if it merged them).
        const rerunId = await submitted(3);
        const t = performance.now();
        await jobs.enqueue(rerunId);
        await waitDone(db, rerunId);
        rerunMs = performance.now() - t;
        const out = await db.query<{ output: { evaluateMs?: number } }>(
          `select output from pgboss.job where name in ($1, $2) and data->>'simulationId' = $3 and output ? 'evaluateMs'`,
          [SIMULATION_QUEUE, MERGE_QUEUE, rerunId],
        );
        rerunEngineMs = out[0]?.output?.evaluateMs ?? null;
        log(`rerun of 3 cells: ${rerunMs.toFixed(0)} ms (evaluation ${rerunEngineMs} ms)`);
      }
      await Promise.all(workers.map(stopWorker));
      const peak = reports.map((file) => (fs.existsSync(file) ? (JSON.parse(fs.readFileSync(file, "utf8")) as { maxRssMb: number }).maxRssMb : NaN));
      runs.push({
        workers: n,
        pairs,
        wallMs: Math.round(wallMs),
        cellsMs: Math.round(cellsMs),
        mergeMs: Math.round(wallMs - cellsMs),
        pairsPerSec: Math.round(pairs / (wallMs / 1000)),
        peakRssMbPerWorker: peak.map((mb) => Math.round(mb)),
      });
    }
    await jobs.stop();
    const one = runs.find((run) => run.workers === 1);
    const most = runs[runs.length - 1];
    const result = {
      cells: stored.cells.length,
      grids,
      gridSizeM,
      areaKm2: (sizeM * sizeM) / 1e6,
      buildings: stored.buildings.length,
      radiusM,
      note: `grid ${gridSizeM} m (default 5 m): coarser, to keep one run near half a minute per worker`,
      runs,
      speedup: one ? Math.round((most.pairsPerSec / one.pairsPerSec) * 100) / 100 : null,
      rerunMs: rerunMs === null ? null : Math.round(rerunMs),
      rerunEngineMs,
      machine: { cpus: os.availableParallelism(), node: process.version },
      loadAverage: { before: loadBefore.map((x) => Math.round(x * 100) / 100), after: os.loadavg().map((x) => Math.round(x * 100) / 100) },
    };
    console.log(JSON.stringify(result));
  } finally {
    await Promise.all(workers.map((w) => stopWorker(w).catch(() => {})));
    await db?.close();
    await adminQuery(`drop database if exists "${name}" with (force)`).catch((error: unknown) => console.error(`could not drop ${name}:`, error));
    fs.rmSync(reportDir, { recursive: true, force: true });
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
