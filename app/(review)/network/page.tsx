import Link from "next/link";
import { Suspense } from "react";
import { runtime } from "@/app/_lib/runtime";
import { listCells, listNetworks } from "@/lib/db/networks/data";
import { listVersions } from "@/lib/db/history";
import { pageActor } from "../_components/guard";
import { Forbidden } from "../_components/Forbidden";
import { utcDateTime } from "../_components/format";
import { CellsTable } from "./_components/CellsTable";
import { NetworkMapSection } from "./_components/NetworkMapSection";

export const dynamic = "force-dynamic";

export default async function NetworkPage() {
  const gate = await pageActor("network.read");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const { db } = await runtime();
  const [network] = await listNetworks(db.prisma);
  if (!network) {
    return (
      <main>
        <h1>Network</h1>
        <p className="subtitle">No network yet: an administrator imports one, or run the demo seed.</p>
      </main>
    );
  }
  const [cells, versions] = await Promise.all([listCells(db.prisma, network.id), listVersions(db.prisma, network.id)]);
  const latest = versions[0];
  return (
    <main>
      <div className="page-head">
        <h1>{network.name}</h1>
        <Link className="secondary" href="/network/as-of">
          See the network as of a date…
        </Link>
      </div>
      <p className="subtitle" data-testid="network-summary">
        Version {network.latestVersion}
        {latest && ` of ${utcDateTime(latest.createdAt)}`}
        {latest?.requestNumber != null && (
          <>
            {" "}(<Link href={`/requests/${latest.changeRequestId}`}>request #{latest.requestNumber}</Link>)
          </>
        )}
        {" · "}
        {network.sites} sites · {network.cells} cells · {network.buildings} buildings · clusters:{" "}
        {network.clusters.map((c) => c.name).join(", ") || "none"}
      </p>

      <section className="panel" aria-labelledby="map-heading">
        <h2 id="map-heading" className="panel-title">
          Coverage of the network as it stands
        </h2>
        <p className="muted panel-note">
          Predicted by the coverage model for version {network.latestVersion}; an estimate that drive tests or measurements confirm.
        </p>
        <Suspense fallback={<div className="gridmap-stage map-placeholder" style={{ height: 600 }} />}>
          <NetworkMapSection networkId={network.id} />
        </Suspense>
      </section>

      <section className="panel" aria-labelledby="cells-heading">
        <h2 id="cells-heading" className="panel-title">
          Cells
        </h2>
        <p className="muted panel-note">Choose a cell for every value its parameters have had and the request behind each change.</p>
        <CellsTable cells={cells} />
      </section>
    </main>
  );
}
