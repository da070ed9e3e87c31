import "server-only";
// The one gate every page, route handler and server action passes: who is signed in, is
// the account still active, and may its role do this. Throws DomainError otherwise.
import { getServerSession } from "next-auth";
import { authOptions } from "./options";
import { getPrisma } from "../db/client";
import { findUser } from "../db/users";
import { DomainError } from "../changes/errors";
import { can, isRole, type Permission, type Role } from "../changes/roles";

export interface Actor {
  id: string;
  email: string;
  name: string;
  role: Role;
}

/** The signed-in, active user, or null. */
export async function currentActor(): Promise<Actor | null> {
  const session = await getServerSession(authOptions);
  const id = (session?.user as { id?: string } | undefined)?.id;
  if (!id) return null;
  const user = await findUser(await getPrisma(), id);
  if (!user || !user.active || !isRole(user.role)) return null;
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

/** The signed-in user if its role holds the permission; 401 / 403 as DomainError otherwise. */
export async function requireActor(permission: Permission): Promise<Actor> {
  const actor = await currentActor();
  if (!actor) throw new DomainError("unauthenticated", "sign in first");
  if (!can(actor.role, permission)) {
    throw new DomainError("forbidden", `the role ${actor.role} may not ${permission}`, {
      context: { role: actor.role, permission },
    });
  }
  return actor;
}
