import "server-only";
// Pages pass this gate instead of calling requireActor directly: a visitor without a session
// goes to the sign-in page, a role without the permission gets a "forbidden" answer the page
// renders with <Forbidden/>, and any other error still reaches the error boundary.
import { redirect } from "next/navigation";
import { requireActor, type Actor } from "@/lib/auth/session";
import { isDomainError } from "@/lib/changes/errors";
import type { Permission } from "@/lib/changes/roles";

export type PageGate = { ok: true; actor: Actor } | { ok: false; permission: Permission; message: string };

export async function pageActor(permission: Permission): Promise<PageGate> {
  let outcome: PageGate | "signin";
  try {
    outcome = { ok: true, actor: await requireActor(permission) };
  } catch (error) {
    if (!isDomainError(error)) throw error;
    if (error.code === "unauthenticated") outcome = "signin";
    else if (error.code === "forbidden") outcome = { ok: false, permission, message: error.message };
    else throw error;
  }
  // redirect() throws Next's own signal, so it must not run inside the try above
  if (outcome === "signin") redirect("/signin");
  return outcome;
}
