// Prepared coverage engines kept in memory between jobs. The cold prepare (grid and every
// cell's path-loss cache) is the expensive part; requests built on the same network version
// then pay only the incremental evaluation of their changed cells.
import os from "node:os";
import type { CoverageEngine } from "../radio/engine";
import type { Scenario } from "../radio/scenario";
import { simulationThreadsSetting } from "../env";
import { threadedEngineBuilder } from "./simulationThreads";

/** Progress of a build, 0..1. */
export type ProgressListener = (fraction: number) => void;

/** Builds an engine for a scenario: (scenario, onProgress) → engine, the shape of threadedEngineBuilder. */
export type EngineBuilder = (scenario: Scenario, onProgress: ProgressListener) => Promise<CoverageEngine>;

/** Worker threads of a cold build: BEAMGATE_SIMULATION_THREADS, else every core. */
export function simulationThreadCount(): number {
  return simulationThreadsSetting() ?? os.availableParallelism();
}

/**
 * THE place where the engine is built: the cells' cold stages run on worker threads
 * (simulationThreads.ts), so the web server in the same process keeps answering while the
 * build runs and progress is reported per cell. Bit-identical to prepareEngine.
 */
export function buildEngine(scenario: Scenario, onProgress: ProgressListener): Promise<CoverageEngine> {
  return threadedEngineBuilder({ threads: simulationThreadCount() })(scenario, onProgress);
}

// Two: the version most requests are built on, plus the one before or after it.
const CAPACITY = 2;
const cache = new Map<string, Promise<CoverageEngine>>();

/**
 * The engine for `key` (networkId@version plus anything else the scenario depends on), built
 * with `build` when not kept. Keeps the last two keys used; a failed build is not kept.
 */
export function getEngine(
  key: string,
  scenario: Scenario,
  onProgress: ProgressListener,
  build: EngineBuilder = buildEngine,
): Promise<CoverageEngine> {
  const kept = cache.get(key);
  if (kept) {
    // Most recently used moves to the end of the map's order.
    cache.delete(key);
    cache.set(key, kept);
    onProgress(1);
    return kept;
  }
  const built = build(scenario, onProgress);
  cache.set(key, built);
  built.catch(() => {
    if (cache.get(key) === built) cache.delete(key);
  });
  while (cache.size > CAPACITY) cache.delete(cache.keys().next().value as string);
  return built;
}

/** The keys kept, least recently used first (for tests and diagnostics). */
export function cachedEngineKeys(): string[] {
  return [...cache.keys()];
}

export function clearEngineCache(): void {
  cache.clear();
}
