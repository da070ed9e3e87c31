import "server-only";
// What the app's pages and route handlers share: the database handle and its simulation
// job runner. On first use it also queues again the simulations a stopped process left
// unfinished (the in-process runner does not survive a restart).
import { getDatabase } from "@/lib/db/client";
import type { Database } from "@/lib/db/open";
import { getSimulationJobs, requeueUnfinished } from "@/lib/jobs";

const holder = globalThis as unknown as { beamgateRequeued?: Promise<number> };

export async function runtime(): Promise<{ db: Database; jobs: ReturnType<typeof getSimulationJobs> }> {
  const db = await getDatabase();
  const jobs = getSimulationJobs(db);
  holder.beamgateRequeued ??= requeueUnfinished(db, jobs).catch((error) => {
    console.error("beamgate: could not requeue unfinished simulations:", error);
    return 0;
  });
  await holder.beamgateRequeued;
  return { db, jobs };
}
