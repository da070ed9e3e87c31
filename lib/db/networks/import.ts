// A validated import (lib/io/networkImport.ts) into the database: the whole scenario lands as
// a new network, version 1, with its "network.import" audit event, in ONE transaction — all of
// it or nothing.
//
// Re-importing a network as a new version of an existing one is not supported yet: a name that
// already exists is refused, naming it. (A new version would need the cells matched by code and
// their parameter history continued, which is the job of change requests today.)
import type { Database, Prisma } from "../open";
import { appendAuditEventTx } from "../audit";
import { createNetworkTx, type SavedNetwork } from "./mutations";
import { DomainError } from "../../changes/errors";
import { assertCan, type Actor } from "../../changes/rules";
import type { Scenario } from "../../radio/scenario";
import type { LocalProjection } from "../../io/geo";

/** Who imports: a signed-in user with network.import, or the machine itself (the CLI, role "system"). */
export type ImportActor = Actor & { email?: string | null };

export interface ImportNetworkOptions {
  /** The UTM projection the positions were converted with (absent for local-metre data). */
  projection?: LocalProjection;
  /** Recorded on version 1 (default "imported"). */
  note?: string;
  /** Valid-from of the first parameter values (default now). */
  at?: Date;
}

export interface ImportedNetwork extends SavedNetwork {
  name: string;
  counts: { sites: number; cells: number; buildings: number; clusters: number };
}

type Db = Database | { prisma: Prisma };

/** The error for a name that is taken; the same whether found by the check or by the unique index. */
function nameTaken(name: string): DomainError {
  return new DomainError(
    "conflict",
    `a network named "${name}" already exists; importing a new version of an existing network is not supported yet — import it under another name`,
    { field: "name", context: { name } },
  );
}

function isUniqueViolation(error: unknown): boolean {
  const e = error as { code?: string; message?: string } | null;
  return e?.code === "P2002" || /unique constraint/i.test(e?.message ?? "");
}

/** Writes a clean scenario as a new network. Throws DomainError("conflict") when its name exists. */
export async function importNetwork(db: Db, actor: ImportActor, scenario: Scenario, options: ImportNetworkOptions = {}): Promise<ImportedNetwork> {
  if (actor.role !== "system") assertCan(actor, "network.import");
  const name = scenario.name.trim();
  if (name === "") throw new DomainError("invalid", "name: a network needs a name", { field: "name", details: [{ path: "name", message: "required" }] });
  const named = name === scenario.name ? scenario : { ...scenario, name };
  const at = options.at ?? new Date();
  const projection = options.projection;
  const counts = {
    sites: named.sites.length,
    cells: named.cells.length,
    buildings: named.buildings.length,
    clusters: named.clusters.length,
  };
  try {
    const saved = await db.prisma.$transaction(
      async (tx) => {
        if (await tx.network.findUnique({ where: { name }, select: { id: true } })) throw nameTaken(name);
        const actorId = actor.role === "system" ? undefined : actor.id;
        const actorEmail =
          actor.role === "system"
            ? null
            : (actor.email ?? (await tx.user.findUnique({ where: { id: actor.id }, select: { email: true } }))?.email ?? null);
        const result = await createNetworkTx(tx, named, {
          kind: "import",
          note: options.note ?? "imported",
          actorId,
          at,
          ...(projection ? { projection: { utmZone: projection.zone, utmHemisphere: projection.hemisphere } } : {}),
        });
        await appendAuditEventTx(tx, {
          action: "network.import",
          entityType: "network",
          entityId: result.networkId,
          actorId: actorId ?? null,
          actorEmail,
          after: {
            name,
            version: result.versionNumber,
            ...counts,
            ...(projection ? { utmZone: projection.zone, utmHemisphere: projection.hemisphere } : {}),
            ...(named.origin ? { originLon: named.origin.lon, originLat: named.origin.lat } : {}),
          },
          at,
        });
        return result;
      },
      // 10 000 buildings go in a few statements, but the embedded database may queue a while.
      { timeout: 120_000, maxWait: 30_000 },
    );
    return { ...saved, name, counts };
  } catch (error) {
    // Two imports of one name racing: the unique index decides, and says so the same way.
    if (!(error instanceof DomainError) && isUniqueViolation(error)) {
      if (await db.prisma.network.findUnique({ where: { name }, select: { id: true } })) throw nameTaken(name);
    }
    throw error;
  }
}
