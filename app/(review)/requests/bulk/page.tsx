import { runtime } from "@/app/_lib/runtime";
import { listNetworks } from "@/lib/db/networks/data";
import { pageActor } from "../../_components/guard";
import { Forbidden } from "../../_components/Forbidden";
import { BulkUploadForm } from "./_components/BulkUploadForm";

export const dynamic = "force-dynamic";

export default async function BulkRequestPage() {
  const gate = await pageActor("request.create");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const { db } = await runtime();
  const networks = (await listNetworks(db.prisma)).map((n) => ({ id: n.id, name: n.name, latestVersion: n.latestVersion }));
  return (
    <main>
      <h1>New change request from a file</h1>
      <p className="subtitle">
        One CSV becomes the items of one draft request. Either one row per change — <code>cell_id,parameter,new_value</code> — or one
        row per cell with a column per parameter (<code>cell_id,azimuth_deg,electrical_tilt_deg,…</code>; an empty field means
        unchanged). Parameters: azimuth_deg, mechanical_tilt_deg, electrical_tilt_deg, beam_set, rs_power_dbm. Every value is
        checked against the cell&apos;s hardware range; any problem creates nothing.
      </p>
      {networks.length === 0 ? <p className="panel muted">There is no network to change yet.</p> : <BulkUploadForm networks={networks} />}
    </main>
  );
}
