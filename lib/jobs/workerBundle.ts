// The simulation worker as one plain ES module, bundled by esbuild into var/build/ and rebuilt only when one
// of its sources is newer. A worker started on the bundle loads in tens of milliseconds; one started on the
// TypeScript source has to load tsx first (~0.8 s per worker). esbuild runs as its own executable (the one
// tsx installs), not as an imported package, so the same code works from `node`, tsx and the Next.js server.
import { execFile } from "node:child_process";
import fs from "node:fs/promises";
import path from "node:path";

export interface WorkerBundleOptions {
  /** Project root (default process.cwd(): under Next.js import.meta.url points into the build output). */
  root?: string;
  /** Entry module, relative to root. */
  entry?: string;
  /** Output module, relative to root. */
  outFile?: string;
  /** The esbuild executable (default <root>/node_modules/esbuild/bin/esbuild). */
  esbuild?: string;
}

export interface WorkerBundle {
  /** Absolute path of the bundled module. */
  file: string;
  /** True when this call (or a concurrent one in this process) bundled it. */
  rebuilt: boolean;
}

const DEFAULT_ENTRY = "lib/jobs/simulationThreadWorker.ts";
const DEFAULT_OUT = "var/build/simulationThreadWorker.mjs";

/** The list of inputs esbuild reported for the bundle, kept beside it: the bundle is stale when one is newer. */
const metaFileOf = (file: string) => file.replace(/\.mjs$/, "") + ".meta.json";

async function mtimeMs(file: string): Promise<number | null> {
  try {
    return (await fs.stat(file)).mtimeMs;
  } catch {
    return null;
  }
}

/** True when the bundle exists and none of its recorded inputs (nor the entry) changed after it was built. */
export async function workerBundleIsFresh(root: string, entry: string, file: string): Promise<boolean> {
  const built = await mtimeMs(file);
  if (built === null) return false;
  let inputs: string[];
  try {
    const meta = JSON.parse(await fs.readFile(metaFileOf(file), "utf8")) as { inputs?: Record<string, unknown> };
    inputs = Object.keys(meta.inputs ?? {});
  } catch {
    return false;
  }
  if (!inputs.includes(entry)) inputs.push(entry);
  const times = await Promise.all(inputs.map((input) => mtimeMs(path.resolve(root, input))));
  // A missing input means the import graph moved: bundle again rather than trust the old one.
  return times.every((t) => t !== null && t <= built);
}

function runEsbuild(esbuild: string, args: string[], cwd: string): Promise<void> {
  return new Promise((resolve, reject) => {
    execFile(esbuild, args, { cwd, timeout: 60_000 }, (error, _stdout, stderr) => {
      if (error) reject(new Error(`bundling the simulation worker failed (${esbuild}): ${String(stderr).trim() || error.message}`));
      else resolve();
    });
  });
}

const building = new Map<string, Promise<WorkerBundle>>();

/**
 * The bundled worker, built first when missing or stale. Concurrent calls in one process share one build;
 * concurrent processes each write to a file of their own and rename it into place (atomic), so a worker
 * never loads a half-written bundle.
 */
export function ensureWorkerBundle(options: WorkerBundleOptions = {}): Promise<WorkerBundle> {
  const root = options.root ?? process.cwd();
  const entry = options.entry ?? DEFAULT_ENTRY;
  const file = path.resolve(root, options.outFile ?? DEFAULT_OUT);
  const esbuild = options.esbuild ?? path.join(root, "node_modules/esbuild/bin/esbuild");
  const pending = building.get(file);
  if (pending) return pending;
  const job = (async (): Promise<WorkerBundle> => {
    if (await workerBundleIsFresh(root, entry, file)) return { file, rebuilt: false };
    await fs.mkdir(path.dirname(file), { recursive: true });
    const tag = `${process.pid}-${Date.now()}`;
    const tmp = `${file}.${tag}.tmp`;
    const tmpMeta = `${metaFileOf(file)}.${tag}.tmp`;
    // Sources edited while esbuild runs must count as newer than the bundle: date it from the start.
    const started = new Date();
    try {
      await runEsbuild(
        esbuild,
        [entry, "--bundle", "--platform=node", "--format=esm", "--target=node20", "--log-level=error", `--outfile=${tmp}`, `--metafile=${tmpMeta}`],
        root,
      );
      await fs.utimes(tmp, started, started);
      // Meta first: a reader that sees the new meta with the old bundle finds it stale and rebuilds.
      await fs.rename(tmpMeta, metaFileOf(file));
      await fs.rename(tmp, file);
    } finally {
      await Promise.all([fs.rm(tmp, { force: true }), fs.rm(tmpMeta, { force: true })]);
    }
    return { file, rebuilt: true };
  })();
  building.set(file, job);
  job.then(
    () => building.delete(file),
    () => building.delete(file),
  );
  return job;
}
