import "server-only";
import type { Prisma } from "@/lib/db/open";
import { listNetworks } from "@/lib/db/networks/data";
import { DomainError } from "@/lib/changes/errors";

/** The network named by ?network=<id>, else the only (first) one. */
export async function networkIdFrom(prisma: Prisma, params: URLSearchParams): Promise<string> {
  const wanted = params.get("network");
  const networks = await listNetworks(prisma);
  const found = wanted ? networks.find((n) => n.id === wanted) : networks[0];
  if (!found) throw new DomainError("not_found", wanted ? `network ${wanted} not found` : "no network yet");
  return found.id;
}
