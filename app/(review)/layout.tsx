import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/session";
import { can } from "@/lib/changes/roles";
import { ROLE_LABELS } from "@/lib/changes/roles";
import { SignOutButton } from "./_components/SignOutButton";

export const dynamic = "force-dynamic";

export default async function ReviewLayout({ children }: { children: React.ReactNode }) {
  const actor = await currentActor();
  if (!actor) redirect("/signin");
  return (
    <>
      <header className="topbar">
        <Link className="brand" href="/requests">BEAMGATE</Link>
        <nav aria-label="Main">
          <Link href="/requests">Change requests</Link>
          <Link href="/network">Network</Link>
          <Link href="/audit">Audit trail</Link>
          {can(actor.role, "users.manage") && <Link href="/admin/users">Users</Link>}
          {can(actor.role, "settings.manage") && <Link href="/admin/settings">KPI settings</Link>}
          {can(actor.role, "network.import") && <Link href="/admin/import">Import</Link>}
        </nav>
        <div className="who">
          <span data-testid="who">
            {actor.name} · {ROLE_LABELS[actor.role]}
          </span>
          <SignOutButton />
        </div>
      </header>
      {children}
    </>
  );
}
