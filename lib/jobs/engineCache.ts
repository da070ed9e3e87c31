// Prepared coverage engines kept in memory between jobs. The cold prepare (grid and every
// cell's path-loss cache) is the expensive part; requests built on the same network version
// then pay only the incremental evaluation of their changed cells.
import { assembleEngine, type CoverageEngine } from "../radio/engine";
import { buildGrid } from "../radio/grid";
import { computeCellPathLoss, type CellPathLoss } from "../radio/pathLossStage";
import { validateScenario } from "../radio/validation";
import type { Scenario } from "../radio/scenario";

/** Progress of a build, 0..1. */
export type ProgressListener = (fraction: number) => void;

/** Builds an engine for a scenario; the threaded builder (simulationThreads.ts) will have this shape. */
export type EngineBuilder = (scenario: Scenario, onProgress: ProgressListener) => Promise<CoverageEngine>;

const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * THE place where the engine is built: single-threaded for now, the same stages as
 * prepareEngine (lib/radio/engine.ts) run one cell at a time, yielding to the event loop
 * between cells so that the web server in the same process keeps answering and progress
 * can be written. Replace the body with the threaded builder when it lands.
 */
export async function buildEngine(scenario: Scenario, onProgress: ProgressListener): Promise<CoverageEngine> {
  validateScenario(scenario);
  const grid = buildGrid(scenario);
  const pathLoss: CellPathLoss[] = [];
  for (let i = 0; i < scenario.cells.length; i++) {
    pathLoss.push(computeCellPathLoss(scenario, grid, i));
    onProgress((i + 1) / scenario.cells.length);
    await yieldToEventLoop();
  }
  return assembleEngine(scenario, grid, pathLoss);
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
