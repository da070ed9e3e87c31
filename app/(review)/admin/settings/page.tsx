import { runtime } from "@/app/_lib/runtime";
import { getKpiSettings, listNetworks } from "@/lib/db/networks/data";
import { DEFAULT_SETTINGS } from "@/lib/radio/scenario";
import { pageActor } from "../../_components/guard";
import { Forbidden } from "../../_components/Forbidden";
import { SettingsForm } from "./_components/SettingsForm";

export const dynamic = "force-dynamic";

export default async function AdminSettingsPage() {
  const gate = await pageActor("settings.manage");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const { db } = await runtime();
  const [network] = await listNetworks(db.prisma);
  if (!network) {
    return (
      <main>
        <h1>KPI settings</h1>
        <p className="subtitle">No network yet: an administrator imports one, or run the demo seed.</p>
      </main>
    );
  }
  const settings = await getKpiSettings(db.prisma, network.id);
  return (
    <main>
      <h1>KPI settings of {network.name}</h1>
      <p className="subtitle">Thresholds of the KPIs and options of the coverage model, per network. Every change is written to the audit trail.</p>
      <div className="caution" data-testid="defaults-note">
        The defaults shown beside each field are common practice, not a standard: set the values your organisation reports against.
        A change applies to simulations run from now on; results already stored keep the settings they ran with.
      </div>
      <SettingsForm networkId={network.id} settings={settings} defaults={DEFAULT_SETTINGS} />
    </main>
  );
}
