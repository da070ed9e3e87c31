import Link from "next/link";
import { requireActor } from "@/lib/auth/session";
import { can } from "@/lib/changes/roles";
import { runtime } from "@/app/_lib/runtime";
import { listRequests } from "@/lib/db/requests/data";
import { RequestsTable } from "../_components/RequestsTable";
import type { RequestRowDto } from "../_components/types";

export const dynamic = "force-dynamic";

export default async function RequestsPage() {
  const actor = await requireActor("request.read");
  const { db } = await runtime();
  const requests = await listRequests(db.prisma, { take: 1000 });
  const numberOf = new Map(requests.map((r) => [r.id, r.number]));
  const rows: RequestRowDto[] = requests.map((r) => ({
    id: r.id,
    number: r.number,
    title: r.title,
    state: r.state,
    authorName: r.authorName,
    clusters: r.clusterNames,
    cellCount: r.cellIds.length,
    stale: r.stale,
    conflictWith: r.conflictIds.map((id) => numberOf.get(id)).filter((n): n is number => n !== undefined),
    updatedAt: r.updatedAt,
    createdAt: r.createdAt,
  }));
  const waiting = requests.filter((r) => r.state === "simulated").length;
  return (
    <main>
      <div style={{ display: "flex", alignItems: "baseline", gap: 16 }}>
        <h1 style={{ flex: 1 }}>Change requests</h1>
        {can(actor.role, "request.create") && (
          <Link className="primary" href="/requests/new">
            New change request
          </Link>
        )}
      </div>
      <p className="subtitle">
        {requests.length} requests · {waiting} simulated and waiting for an operations owner&apos;s decision
      </p>
      <div className="panel">
        <RequestsTable rows={rows} />
      </div>
    </main>
  );
}
