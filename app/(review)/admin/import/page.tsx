import Link from "next/link";
import { runtime } from "@/app/_lib/runtime";
import { listNetworks } from "@/lib/db/networks/data";
import { DEFAULT_MAX_UPLOAD_BYTES } from "@/lib/io/networkImport";
import { pageActor } from "../../_components/guard";
import { Forbidden } from "../../_components/Forbidden";
import { ImportForm } from "./_components/ImportForm";

export const dynamic = "force-dynamic";

export default async function ImportPage() {
  const gate = await pageActor("network.import");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const { db } = await runtime();
  const networks = await listNetworks(db.prisma);
  return (
    <main>
      <h1>Import a network</h1>
      <p className="subtitle">
        Sites, cells, buildings, clusters and terrain become a new network, version 1. Every file is checked first and every problem is
        listed; an upload with any error imports nothing. Positions may be WGS84 longitude/latitude or local metres. Re-importing a
        network as a new version of an existing one is not supported yet: choose a new name.
      </p>
      <ImportForm maxMb={Math.round(DEFAULT_MAX_UPLOAD_BYTES / 1024 / 1024)} />
      <div className="panel">
        <h3 style={{ marginTop: 0 }}>Networks</h3>
        <table className="data" data-testid="networks-table">
          <thead>
            <tr>
              <th>Name</th>
              <th className="num">Version</th>
              <th className="num">Sites</th>
              <th className="num">Cells</th>
              <th className="num">Buildings</th>
              <th className="num">Clusters</th>
            </tr>
          </thead>
          <tbody>
            {networks.map((n) => (
              <tr key={n.id}>
                <td>{n.name}</td>
                <td className="num">{n.latestVersion}</td>
                <td className="num">{n.sites}</td>
                <td className="num">{n.cells}</td>
                <td className="num">{n.buildings}</td>
                <td className="num">{n.clusters.length}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="muted">
          <Link href="/network">Open the network</Link>
        </p>
      </div>
    </main>
  );
}
