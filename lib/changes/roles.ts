// Who may do what. One role per user; the matrix below is the only place that says which
// role may attempt which action. Rules that depend on the request itself (its state, its
// author, four-eyes) live in rules.ts, not here.

/**
 * - engineer: optimisation engineer; authors, previews, revises, submits and rebases requests.
 * - owner: operations owner; reviews simulated requests and approves, rejects or returns them.
 * - field: field / implementation crew; reads approved work orders and records that a change
 *   was carried out on the network or rolled back. A role of its own because DESIGN §1 names
 *   it as a separate person, and because whoever touched the live antenna is who should say so
 *   (the owner decides, the field records what was done).
 * - viewer: reads everything a request shows, including the audit trail; changes nothing.
 * - admin: manages users, roles, KPI settings and network imports. An admin may NOT approve,
 *   reject, return or author requests: approval is the owner's, and an account that can
 *   grant roles must not also be able to sign off changes (it could otherwise make itself
 *   both author and approver).
 */
export type Role = "engineer" | "owner" | "field" | "viewer" | "admin";

export const ROLES: readonly Role[] = ["engineer", "owner", "field", "viewer", "admin"];

/** Display names, our own words. */
export const ROLE_LABELS: Readonly<Record<Role, string>> = {
  engineer: "Optimisation engineer",
  owner: "Operations owner",
  field: "Field implementation",
  viewer: "Viewer",
  admin: "Administrator",
};

export type Permission =
  | "request.read"
  | "request.create"
  | "request.edit"
  | "request.submit"
  | "request.preview"
  | "request.rebase"
  | "request.comment"
  | "request.approve"
  | "request.reject"
  | "request.return"
  | "request.implement"
  | "request.rollback"
  | "workorder.read"
  | "network.read"
  | "network.import"
  | "audit.read"
  | "audit.verify"
  | "users.manage"
  | "settings.manage";

export const PERMISSIONS: readonly Permission[] = [
  "request.read",
  "request.create",
  "request.edit",
  "request.submit",
  "request.preview",
  "request.rebase",
  "request.comment",
  "request.approve",
  "request.reject",
  "request.return",
  "request.implement",
  "request.rollback",
  "workorder.read",
  "network.read",
  "network.import",
  "audit.read",
  "audit.verify",
  "users.manage",
  "settings.manage",
];

// Everyone signed in may read the network, the requests and the audit trail: DESIGN §1 gives
// "anyone later" the history, and openness is what makes the audit trail worth having.
const READ: readonly Permission[] = ["request.read", "workorder.read", "network.read", "audit.read"];

const MATRIX: Readonly<Record<Role, ReadonlySet<Permission>>> = {
  engineer: new Set<Permission>([
    ...READ,
    "request.create",
    "request.edit",
    "request.submit",
    "request.preview",
    "request.rebase",
    "request.comment",
  ]),
  owner: new Set<Permission>([
    ...READ,
    "request.approve",
    "request.reject",
    "request.return",
    "request.comment",
    "audit.verify",
  ]),
  field: new Set<Permission>([...READ, "request.implement", "request.rollback", "request.comment"]),
  viewer: new Set<Permission>(READ),
  admin: new Set<Permission>([...READ, "users.manage", "settings.manage", "network.import", "audit.verify"]),
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}

/** Whether a user with this role may attempt this action at all. Unknown roles may do nothing. */
export function can(role: Role | string | null | undefined, permission: Permission): boolean {
  if (!isRole(role)) return false;
  return MATRIX[role].has(permission);
}

/** The permissions of one role, in the order of PERMISSIONS (for a settings screen or docs). */
export function permissionsOf(role: Role): Permission[] {
  return PERMISSIONS.filter((p) => MATRIX[role].has(p));
}
