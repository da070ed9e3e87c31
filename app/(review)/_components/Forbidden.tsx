// What a signed-in user sees on a page their role may not open (the HTTP-403 of a page).
import Link from "next/link";
import type { Permission } from "@/lib/changes/roles";

const WHAT: Partial<Record<Permission, string>> = {
  "users.manage": "manage user accounts",
  "settings.manage": "change the KPI settings",
  "audit.verify": "verify the audit chain",
  "network.read": "read the network",
  "audit.read": "read the audit trail",
};

export function Forbidden({ permission }: { permission: Permission }) {
  return (
    <main>
      <div className="panel forbidden" data-testid="forbidden" role="alert">
        <h1>Not available to your role</h1>
        <p>
          Your role may not {WHAT[permission] ?? permission}. An administrator can change your role if you need this page.
        </p>
        <p>
          <Link href="/requests">Back to the change requests</Link>
        </p>
      </div>
    </main>
  );
}
