// Review web app benchmark: `npm run --silent bench:ui` (npx tsx test/bench/ui.bench.ts) prints one JSON object.
//   msToMap              navigation start → the impact page's map canvas (data-testid="grid-map") carries
//                        data-ready="true", i.e. its first raster is painted (GridMap.tsx sets it in draw())
//   rasterBytes          bytes of the first raster layer as transferred (response body on the wire; 0 and
//                        rasterFromCache true when the browser's cache served it, as on the warm visit)
//   rasterDecodedBytes   the same raster's bytes after any content coding
//   rasterLayer          which layer that was (floor 0)
//   pageTtfbMs           navigation start → first byte of the page (server time: summary, CDFs, geometry)
//   rasterMs             the raster request: start → last byte (server time: stored layer → map raster)
//   drawMs               raster's last byte → map drawn (client: decode, paint, draw)
//   warm                 the same figures for a second visit in the same browser (server caches warm)
//   serverReadyToVisitMs the server answering /signin → the first visit's navigation (sign-in happens between).
//                        The server prepares at start, in the background, the opening map layer of the most
//                        recently active open requests (app/_lib/mapRasters.ts); a first visit arriving before
//                        that is done waits for it, one arriving later finds it ready. server.log says how long
//                        the preparation took.
//   simulationMs         the preview simulation run in-process before the server starts (threaded cold run)
//   buildReused          an existing .next-bench-ui build was new enough to serve
// Targets: msToMap < 1500, rasterBytes < 2 000 000.
//
// Setup (not timed): a fresh embedded database under var/bench-ui, an engineer, the 300 000-grid benchmark
// scenario (benchScenario.ts, seed 1) stored as a network, a change request of three cells and its preview
// simulation run here; the database is closed, the app built into .next-bench-ui (reused when its BUILD_ID
// is newer than every source file) and served on port 3400 (BEAMGATE_BENCH_UI_PORT) by lib/db/cli/start.ts;
// headless Debian chromium signs in through /signin and opens /requests/:id twice. The server is stopped at the end.
import { spawn, type ChildProcess } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { chromium, type Page, type Response } from "playwright-core";
import { openDatabase } from "../../lib/db/open";
import { createUser } from "../../lib/db/users";
import { createNetwork } from "../../lib/db/networks/mutations";
import { createRequest, previewRequest, type RequestActor } from "../../lib/db/requests/mutations";
import { hashPassword } from "../../lib/auth/password";
import { InProcessSimulationJobs } from "../../lib/jobs";
import { closeSimulationThreadPools } from "../../lib/jobs/simulationThreadPool";
import { generateBenchScenario } from "./benchScenario";

const ROOT = process.cwd();
const BENCH_DIR = path.join(ROOT, "var", "bench-ui");
const DATA_DIR = path.join(BENCH_DIR, "pglite");
const DIST_DIR = ".next-bench-ui";
const PORT = Number(process.env.BEAMGATE_BENCH_UI_PORT ?? 3400);
const BASE = `http://localhost:${PORT}`;
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"];
/** What the build reads: a build newer than all of these can be served as it is. */
const BUILD_SOURCES = ["app", "lib", "instrumentation.ts", "next.config.mjs", "package.json", "package-lock.json", "tsconfig.json"];

const log = (...a: unknown[]) => console.error("bench:ui:", ...a);
const round = (x: number) => Math.round(x);

function newestMtime(entry: string): number {
  const stat = fs.statSync(entry, { throwIfNoEntry: false });
  if (!stat) return 0;
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const name of fs.readdirSync(entry)) newest = Math.max(newest, newestMtime(path.join(entry, name)));
  return newest;
}

// ---------------------------------------------------------------- the data, before the server starts

async function prepareData(): Promise<{ requestId: string; email: string; password: string; simulationMs: number }> {
  fs.rmSync(BENCH_DIR, { recursive: true, force: true });
  fs.mkdirSync(BENCH_DIR, { recursive: true });
  const db = await openDatabase({ kind: "embedded", dir: DATA_DIR });
  try {
    const password = crypto.randomBytes(12).toString("base64url");
    const email = "bench.engineer@example.test";
    const user = await createUser(db.prisma, { email, name: "Bench Engineer", role: "engineer", passwordHash: await hashPassword(password) });
    const actor: RequestActor = { id: user.id, role: "engineer", email };
    const scenario = generateBenchScenario({ seed: 1, sizeM: 2000, sites: 22, maxFloors: 18 });
    const { networkId } = await createNetwork(db.prisma, scenario, { kind: "seed", note: "UI benchmark" });
    const [a, b, c] = [scenario.cells[10], scenario.cells[31], scenario.cells[47]];
    const created = await createRequest(
      db,
      actor,
      {
        title: "Benchmark: three cells",
        reason: "UI benchmark request",
        items: [
          { cellId: a.id, parameter: "azimuthDeg", newValue: Math.round((a.azimuthDeg + 30) % 360) },
          { cellId: b.id, parameter: "electricalTiltDeg", newValue: b.electricalTiltDeg >= 8 ? 4 : b.electricalTiltDeg + 4 },
          { cellId: c.id, parameter: "rsPowerDbm", newValue: c.rsPowerDbm - 3 },
        ],
      },
      networkId,
    );
    const jobs = new InProcessSimulationJobs(db);
    const started = performance.now();
    const { simulationId } = await previewRequest(db, actor, created.id, { jobs });
    await jobs.idle();
    const simulationMs = performance.now() - started;
    const sim = await db.prisma.simulation.findUniqueOrThrow({ where: { id: simulationId } });
    if (sim.status !== "done") throw new Error(`the preview simulation ended "${sim.status}": ${sim.error ?? "no error recorded"}`);
    return { requestId: created.id, email, password, simulationMs };
  } finally {
    await db.close();
    await closeSimulationThreadPools();
  }
}

// ---------------------------------------------------------------- build and serve

/** A digest of every source file (path and bytes), for builds whose sources were touched but not changed. */
function sourceDigest(): string {
  const hash = crypto.createHash("sha256");
  const add = (entry: string) => {
    const stat = fs.statSync(entry, { throwIfNoEntry: false });
    if (!stat) return;
    if (stat.isDirectory()) {
      for (const name of fs.readdirSync(entry).sort()) add(path.join(entry, name));
      return;
    }
    hash.update(path.relative(ROOT, entry)).update("\0").update(fs.readFileSync(entry)).update("\0");
  };
  for (const source of BUILD_SOURCES) add(path.join(ROOT, source));
  return hash.digest("hex");
}

/**
 * `next build` into .next-bench-ui unless the build there is newer than every source file, or was made from
 * sources with the same digest (the Prisma client, say, regenerated byte for byte). tsconfig.json and
 * next-env.d.ts, which the build rewrites for its own folder, are put back as they were.
 */
async function buildIfStale(): Promise<boolean> {
  const buildId = path.join(ROOT, DIST_DIR, "BUILD_ID");
  const digestFile = path.join(ROOT, DIST_DIR, "bench-ui-sources.sha256");
  const built = fs.statSync(buildId, { throwIfNoEntry: false })?.mtimeMs ?? 0;
  const sources = Math.max(...BUILD_SOURCES.map((s) => newestMtime(path.join(ROOT, s))));
  if (built > sources) return true;
  const digest = sourceDigest();
  if (built > 0 && fs.existsSync(digestFile) && fs.readFileSync(digestFile, "utf8") === digest) return true;
  log(`building into ${DIST_DIR} (log: var/bench-ui/build.log)`);
  const kept = ["tsconfig.json", "next-env.d.ts"].map((name) => {
    const file = path.join(ROOT, name);
    const stat = fs.statSync(file, { throwIfNoEntry: false });
    return { file, bytes: stat ? fs.readFileSync(file) : null, mtime: stat?.mtime };
  });
  const out = fs.openSync(path.join(BENCH_DIR, "build.log"), "w");
  try {
    const code = await new Promise<number | null>((resolve, reject) => {
      const child = spawn("npx", ["next", "build"], {
        cwd: ROOT,
        stdio: ["ignore", out, out],
        env: { ...process.env, BEAMGATE_DIST_DIR: DIST_DIR, NEXT_TELEMETRY_DISABLED: "1" },
      });
      child.on("error", reject);
      child.on("exit", resolve);
    });
    if (code !== 0) throw new Error(`next build failed (exit ${code}); see var/bench-ui/build.log`);
    // The digest of the sources as they were when the build started.
    fs.writeFileSync(digestFile, digest);
  } finally {
    fs.closeSync(out);
    for (const k of kept) {
      if (!k.bytes) continue;
      if (!fs.readFileSync(k.file).equals(k.bytes)) {
        fs.writeFileSync(k.file, k.bytes);
        fs.utimesSync(k.file, k.mtime!, k.mtime!);
      }
    }
  }
  return false;
}

async function answers(url: string): Promise<boolean> {
  try {
    await fetch(url);
    return true;
  } catch {
    return false;
  }
}

async function startServer(): Promise<ChildProcess> {
  // A server left on the port (an earlier run that was killed, say) would be measured instead of a fresh one.
  if (await answers(`${BASE}/signin`)) throw new Error(`something already answers on port ${PORT}; stop it, or set BEAMGATE_BENCH_UI_PORT`);
  const out = fs.openSync(path.join(BENCH_DIR, "server.log"), "w");
  // Its own process group, so that stopping it stops next start as well.
  const server = spawn("npx", ["tsx", "lib/db/cli/start.ts"], {
    cwd: ROOT,
    detached: true,
    stdio: ["ignore", out, out],
    env: { ...process.env, PORT: String(PORT), BEAMGATE_DIST_DIR: DIST_DIR, BEAMGATE_DATA_DIR: DATA_DIR, NEXT_TELEMETRY_DISABLED: "1" },
  });
  fs.closeSync(out);
  const deadline = Date.now() + 120_000;
  for (;;) {
    if (server.exitCode !== null) throw new Error(`the server exited (${server.exitCode}); see var/bench-ui/server.log`);
    try {
      if ((await fetch(`${BASE}/signin`)).ok) return server;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error("the server did not answer /signin within 120 s; see var/bench-ui/server.log");
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** True while any process of the server's group is alive. */
function groupAlive(pid: number): boolean {
  try {
    process.kill(-pid, 0);
    return true;
  } catch {
    return false;
  }
}

/**
 * Stops the whole process group (npx, tsx, start.ts, next-server) and waits until none of it is left: npx
 * exiting is not enough, next-server has been seen to outlive it and keep the port for the next run.
 */
async function stopServer(server: ChildProcess): Promise<void> {
  const pid = server.pid;
  if (pid === undefined || !groupAlive(pid)) return;
  try {
    process.kill(-pid, "SIGTERM");
  } catch {
    return;
  }
  const deadline = Date.now() + 10_000;
  while (groupAlive(pid) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
  if (groupAlive(pid)) {
    try {
      process.kill(-pid, "SIGKILL");
    } catch {
      // gone meanwhile
    }
    const killed = Date.now() + 5_000;
    while (groupAlive(pid) && Date.now() < killed) await new Promise((r) => setTimeout(r, 100));
  }
}

// ---------------------------------------------------------------- measuring one visit

interface Visit {
  msToMap: number;
  rasterBytes: number;
  rasterFromCache: boolean;
  rasterDecodedBytes: number;
  rasterLayer: string;
  pageTtfbMs: number;
  rasterMs: number;
  drawMs: number;
}

async function visit(page: Page, url: string): Promise<Visit> {
  let raster: Response | null = null;
  const onResponse = (response: Response) => {
    if (!raster && /\/api\/simulations\/[^/]+\/raster\?.*floor=0/.test(response.url())) raster = response;
  };
  page.on("response", onResponse);
  try {
    await page.goto(url, { waitUntil: "commit" });
    const handle = await page.waitForFunction("window.__mapReadyAt", null, { timeout: 60_000, polling: 50 });
    const readyAt = (await handle.jsonValue()) as number;
    if (!raster) throw new Error("the map was drawn, but no raster response was seen");
    const response = raster as Response;
    const sizes = await response.request().sizes();
    const body = await response.body();
    const timing = (await page.evaluate(`(() => {
      const nav = performance.getEntriesByType("navigation")[0];
      const entry = performance.getEntriesByType("resource").find((e) => e.name === ${JSON.stringify(response.url())});
      return { ttfb: nav.responseStart, rasterStart: entry ? entry.startTime : NaN, rasterEnd: entry ? entry.responseEnd : NaN };
    })()`)) as { ttfb: number; rasterStart: number; rasterEnd: number };
    return {
      msToMap: round(readyAt),
      // A visit that finds the raster in the browser's cache transfers nothing (Chromium reports a negative size).
      rasterBytes: Math.max(0, sizes.responseBodySize),
      rasterFromCache: sizes.responseBodySize <= 0,
      rasterDecodedBytes: body.length,
      rasterLayer: new URL(response.url()).searchParams.get("layer") ?? "?",
      pageTtfbMs: round(timing.ttfb),
      rasterMs: round(timing.rasterEnd - timing.rasterStart),
      drawMs: round(readyAt - timing.rasterEnd),
    };
  } finally {
    page.off("response", onResponse);
  }
}

// ---------------------------------------------------------------- main

async function main() {
  // --reuse-data: serve the database of the previous run as it is (for investigating; the figures of record use a fresh one).
  const state = path.join(BENCH_DIR, "bench.json");
  let data: Awaited<ReturnType<typeof prepareData>>;
  if (process.argv.includes("--reuse-data") && fs.existsSync(state)) {
    data = JSON.parse(fs.readFileSync(state, "utf8"));
  } else {
    log("preparing the database (300 000-grid scenario, preview simulation)");
    data = await prepareData();
    fs.writeFileSync(state, JSON.stringify(data), { mode: 0o600 });
  }
  log(`simulation ${round(data.simulationMs)} ms`);
  const buildReused = await buildIfStale();
  log(buildReused ? `reusing ${DIST_DIR}` : `built ${DIST_DIR}`);
  const server = await startServer();
  const serverReadyAt = performance.now();
  const browser = await chromium.launch({ executablePath: process.env.BEAMGATE_CHROMIUM ?? "/usr/bin/chromium", args: CHROMIUM_ARGS });
  try {
    const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
    // The moment the map canvas first carries data-ready="true", in the page's clock (0 = navigation start).
    // A string, not a function: tsx's transform would add helpers (__name) that the page does not have.
    await context.addInitScript(`(() => {
      const check = () => {
        if (window.__mapReadyAt === undefined && document.querySelector('[data-testid="grid-map"][data-ready="true"]')) {
          window.__mapReadyAt = performance.now();
          observer.disconnect();
        }
      };
      const observer = new MutationObserver(check);
      observer.observe(document, { subtree: true, childList: true, attributes: true, attributeFilter: ["data-ready"] });
    })();`);
    const page = await context.newPage();
    page.on("console", (m) => m.type() === "error" && log(`page console: ${m.text()}`));
    page.on("pageerror", (e) => log(`page error: ${e.message}`));
    await page.goto(`${BASE}/signin`);
    await page.getByLabel("E-mail").fill(data.email);
    await page.getByLabel("Password").fill(data.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByTestId("who").waitFor({ timeout: 60_000 });
    const url = `${BASE}/requests/${data.requestId}`;
    let cold: Visit, warm: Visit;
    let serverReadyToVisitMs: number;
    try {
      serverReadyToVisitMs = round(performance.now() - serverReadyAt);
      cold = await visit(page, url);
      warm = await visit(page, url);
    } catch (error) {
      await page.screenshot({ path: path.join(BENCH_DIR, "failure.png"), fullPage: true }).catch(() => {});
      throw error;
    }
    console.log(JSON.stringify({ ...cold, warm, serverReadyToVisitMs, simulationMs: round(data.simulationMs), buildReused, loadavg: fs.readFileSync("/proc/loadavg", "utf8").split(" ").slice(0, 3).join(" ") }));
  } finally {
    await browser.close();
    await stopServer(server);
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
