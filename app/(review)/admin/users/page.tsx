import { runtime } from "@/app/_lib/runtime";
import { listUsers } from "@/lib/db/users";
import { ROLE_LABELS, ROLES } from "@/lib/changes/roles";
import { pageActor } from "../../_components/guard";
import { Forbidden } from "../../_components/Forbidden";
import { UsersAdmin } from "./_components/UsersAdmin";

export const dynamic = "force-dynamic";

export default async function AdminUsersPage() {
  const gate = await pageActor("users.manage");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const { db } = await runtime();
  const users = await listUsers(db.prisma);
  return (
    <main>
      <h1>Users</h1>
      <p className="subtitle">
        One role per account. Every change here is written to the audit trail; passwords are stored only as hashes and never shown again.
      </p>
      <UsersAdmin users={users} roles={ROLES.map((role) => ({ role, label: ROLE_LABELS[role] }))} selfId={gate.actor.id} />
    </main>
  );
}
