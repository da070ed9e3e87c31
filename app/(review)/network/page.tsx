import { requireActor } from "@/lib/auth/session";
import { getPrisma } from "@/lib/db/client";
import { listCells, listNetworks } from "@/lib/db/networks/data";
import { CellsTable } from "./_components/CellsTable";

export const dynamic = "force-dynamic";

export default async function NetworkPage() {
  await requireActor("network.read");
  const prisma = await getPrisma();
  const [network] = await listNetworks(prisma);
  if (!network) {
    return (
      <main>
        <h1>Network</h1>
        <p className="subtitle">No network yet: an administrator imports one, or run the demo seed.</p>
      </main>
    );
  }
  const cells = await listCells(prisma, network.id);
  return (
    <main>
      <h1>{network.name}</h1>
      <p className="subtitle">
        Version {network.latestVersion} · {network.sites} sites · {network.cells} cells · {network.buildings} buildings ·
        clusters: {network.clusters.map((c) => c.name).join(", ")}
      </p>
      <div className="panel">
        <CellsTable cells={cells} />
      </div>
    </main>
  );
}
