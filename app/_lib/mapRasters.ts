import "server-only";
// Map layers of finished simulations, encoded as the raster route sends them and kept in memory. A finished
// simulation's layers never change, and the first encoding of one after the server starts rebuilds the
// simulation's grid from its scenario (about half a second for a 300,000-grid network, during which the server
// answers nothing else). So the route keeps what it encoded, and the server prepares at start the layer that each
// recently active open request's page opens with: the maps people are about to look at.
//
// Kept on globalThis: Next.js loads the route handlers and the start-up hook (instrumentation.ts) as separate
// module instances, which must share one cache.
import { getDatabase } from "@/lib/db/client";
import type { Prisma } from "@/lib/db/open";
import { shownSimulationsOfOpenRequests } from "@/lib/db/requests/data";
import type { MapRasterHeaderLayer } from "@/lib/io/mapRaster";
import { mapGeometry, mapRasterBytes } from "@/lib/jobs/mapLayers";

/** Most bytes kept; a 2 km × 2 km network at 5 m has 0.3 MB layers, so this holds well over a hundred. */
const BUDGET_BYTES = 48 * 1024 * 1024;
/** Open requests whose opening layer is prepared at start. */
const PREPARED_AT_START = 4;

interface Entry {
  promise: Promise<Uint8Array>;
  /** 0 until encoded. */
  bytes: number;
}

const holder = globalThis as unknown as { beamgateMapRasters?: Map<string, Entry> };
/** Least recently used first (a Map keeps insertion order; a hit is moved to the end). */
const entries = (holder.beamgateMapRasters ??= new Map<string, Entry>());

function evictOverBudget(): void {
  let total = 0;
  for (const entry of entries.values()) total += entry.bytes;
  for (const [key, entry] of entries) {
    if (total <= BUDGET_BYTES) break;
    if (entry.bytes === 0) continue; // still encoding
    entries.delete(key);
    total -= entry.bytes;
  }
}

/** One floor of one layer of a finished simulation as map-raster bytes (mapRasterBytes), kept for the next asker. */
export function simulationRaster(prisma: Prisma, simulationId: string, layer: MapRasterHeaderLayer, floor: number): Promise<Uint8Array> {
  const key = `${simulationId}\n${layer}\n${floor}`;
  const hit = entries.get(key);
  if (hit) {
    entries.delete(key);
    entries.set(key, hit);
    return hit.promise;
  }
  const entry: Entry = { promise: mapRasterBytes(prisma, simulationId, layer, floor), bytes: 0 };
  entries.set(key, entry);
  entry.promise.then(
    (bytes) => {
      entry.bytes = bytes.length;
      evictOverBudget();
    },
    // refusals (unknown layer, a simulation not finished yet) are not kept: asking again asks afresh
    () => {
      if (entries.get(key) === entry) entries.delete(key);
    },
  );
  return entry.promise;
}

/**
 * Prepares the layer each recently active open request's impact map opens with (best RSRP after the change,
 * outdoor or the lowest floor: ImpactMapSection's initialRasterUrls), one at a time. Returns how many.
 */
export async function prepareOpeningMaps(prisma: Prisma, count = PREPARED_AT_START): Promise<number> {
  const shown = await shownSimulationsOfOpenRequests(prisma, count);
  for (const { simulationId } of shown) {
    const { floors } = await mapGeometry(prisma, simulationId);
    await simulationRaster(prisma, simulationId, "rsrp-after", floors.includes(0) ? 0 : (floors[0] ?? 0));
    // let waiting requests in between two preparations
    await new Promise((resolve) => setImmediate(resolve));
  }
  return shown.length;
}

/** At server start (instrumentation.ts): prepareOpeningMaps in the background; a failure is logged, never fatal. */
export function prepareOpeningMapsAtStart(): void {
  setImmediate(() => {
    const started = performance.now();
    getDatabase()
      .then((db) => prepareOpeningMaps(db.prisma))
      .then((count) => {
        if (count > 0) console.log(`beamgate: prepared the opening map of ${count} open request${count === 1 ? "" : "s"} in ${Math.round(performance.now() - started)} ms`);
      })
      .catch((error: unknown) => console.error("beamgate: could not prepare the opening maps:", error));
  });
}
