// Administration writes with their audit events: user accounts and per-network KPI
// settings. The password hash never enters the audit trail.
import { z } from "zod";
import type { Database, Prisma } from "./open";
import { appendAuditEventTx } from "./audit";
import { createUser, normaliseEmail, updateUser, type UserDto } from "./users";
import { DomainError, invalid } from "../changes/errors";
import { assertCan, type Actor } from "../changes/rules";
import { isRole, ROLES } from "../changes/roles";
import { parseBody } from "../changes/schema";
import type { ModelSettings } from "../radio/scenario";

type Db = Database | { prisma: Prisma };
export type AdminActor = Actor & { email?: string | null };

const ADMIN_TX = { maxWait: 30_000, timeout: 60_000 };

/** Prisma reports P2002; inside an embedded-database transaction the driver's own error comes through. */
function isUniqueViolation(error: unknown): boolean {
  if (typeof error !== "object" || error === null) return false;
  const e = error as { code?: string; cause?: { kind?: string; originalCode?: string }; message?: string };
  return (
    e.code === "P2002" ||
    e.cause?.kind === "UniqueConstraintViolation" ||
    e.cause?.originalCode === "23505" ||
    /duplicate key value violates unique constraint/.test(e.message ?? "")
  );
}

function checkRole(role: string): void {
  if (!isRole(role)) throw invalid([{ path: "role", message: `unknown role ${JSON.stringify(role)}; expected one of ${ROLES.join(", ")}` }]);
}

export interface NewUser {
  email: string;
  name: string;
  role: string;
  passwordHash: string;
}

export async function createUserAudited(db: Db, actor: AdminActor, data: NewUser): Promise<UserDto> {
  assertCan(actor, "users.manage");
  const problems = [];
  const email = normaliseEmail(data.email);
  if (!/^[^\s@]+@[^\s@]+$/.test(email)) problems.push({ path: "email", message: `${JSON.stringify(data.email)} is not an email address` });
  if (data.name.trim() === "") problems.push({ path: "name", message: "must not be empty" });
  if (!isRole(data.role)) problems.push({ path: "role", message: `unknown role ${JSON.stringify(data.role)}; expected one of ${ROLES.join(", ")}` });
  if (data.passwordHash === "") problems.push({ path: "passwordHash", message: "must not be empty" });
  if (problems.length > 0) throw invalid(problems, "invalid user");
  try {
    return await db.prisma.$transaction(async (tx) => {
      const user = await createUser(tx as unknown as Prisma, { ...data, email, name: data.name.trim() });
      await appendAuditEventTx(tx, {
        action: "user.created",
        entityType: "User",
        entityId: user.id,
        actorId: actor.id,
        actorEmail: actor.email ?? null,
        after: { email: user.email, name: user.name, role: user.role, active: user.active },
      });
      return user;
    }, ADMIN_TX);
  } catch (error) {
    if (isUniqueViolation(error)) throw invalid([{ path: "email", message: `${email} is already in use` }], "invalid user");
    throw error;
  }
}

export interface UserChanges {
  name?: string;
  role?: string;
  active?: boolean;
  passwordHash?: string;
}

/** Changes a user; an administrator cannot demote or deactivate themself (no locking out). */
export async function updateUserAudited(db: Db, actor: AdminActor, id: string, changes: UserChanges): Promise<UserDto> {
  assertCan(actor, "users.manage");
  if (changes.role !== undefined) checkRole(changes.role);
  if (changes.name !== undefined && changes.name.trim() === "") throw invalid([{ path: "name", message: "must not be empty" }]);
  if (id === actor.id && ((changes.role !== undefined && changes.role !== "admin") || changes.active === false)) {
    throw new DomainError("forbidden", "an administrator cannot remove their own administration rights; ask another administrator", {
      context: { userId: id },
    });
  }
  return db.prisma.$transaction(async (tx) => {
    const before = await tx.user.findUnique({ where: { id } });
    if (!before) throw new DomainError("not_found", `user ${id} does not exist`, { context: { userId: id } });
    const data = { ...changes, ...(changes.name !== undefined ? { name: changes.name.trim() } : {}) };
    const user = await updateUser(tx as unknown as Prisma, id, data);
    const fields = (["name", "role", "active"] as const).filter((k) => changes[k] !== undefined);
    await appendAuditEventTx(tx, {
      action: "user.updated",
      entityType: "User",
      entityId: id,
      actorId: actor.id,
      actorEmail: actor.email ?? null,
      before: Object.fromEntries(fields.map((k) => [k, before[k]])),
      after: { ...Object.fromEntries(fields.map((k) => [k, user[k]])), ...(changes.passwordHash !== undefined ? { passwordChanged: true } : {}) },
    });
    return user;
  }, ADMIN_TX);
}

// Bounds that keep the model meaningful; our own sanity limits, not from a standard.
const range = (min: number, max: number, unit: string) =>
  z
    .number({ error: "must be a number" })
    .refine(Number.isFinite, { error: "must be a finite number" })
    .refine((v) => v >= min && v <= max, { error: `must be within ${min}–${max}${unit}` });

export const kpiSettingsSchema = z
  .strictObject({
    gridSizeM: range(1, 100, " m"),
    userHeightM: range(0.5, 10, " m"),
    floorHeightM: range(2, 10, " m"),
    environment: z.enum(["UMa", "UMi"], { error: "must be UMa or UMi" }),
    buildingLoss: z.enum(["low", "high"], { error: "must be low or high" }),
    diffraction: z.boolean({ error: "must be true or false" }),
    otherLossesDb: range(0, 40, " dB"),
    noiseFigureDb: range(0, 20, " dB"),
    coverageThresholdDbm: range(-150, -40, " dBm"),
    overlapDeltaDb: range(0, 30, " dB"),
    overlapMaxOthers: z.number({ error: "must be a number" }).int({ error: "must be a whole number" }).min(0, { error: "must be within 0–32" }).max(32, { error: "must be within 0–32" }),
    overlapFloorDbm: range(-150, -40, " dBm"),
    interferenceThresholdDb: range(-20, 40, " dB"),
    worstGridDropDb: range(0, 60, " dB"),
  })
  .partial();

/**
 * Changes some of a network's KPI settings (decoded JSON; unknown or out-of-range fields are
 * refused by name). Returns the whole settings after the change.
 */
export async function updateKpiSettings(db: Db, actor: AdminActor, networkId: string, settings: unknown): Promise<ModelSettings> {
  assertCan(actor, "settings.manage");
  const changes = parseBody(kpiSettingsSchema, settings);
  return db.prisma.$transaction(async (tx) => {
    const before = await tx.kpiSettings.findUnique({ where: { networkId } });
    if (!before) throw new DomainError("not_found", `network ${networkId} has no KPI settings`, { context: { networkId } });
    const row = await tx.kpiSettings.update({ where: { networkId }, data: changes });
    const fields = Object.keys(changes) as (keyof typeof changes)[];
    await appendAuditEventTx(tx, {
      action: "settings.updated",
      entityType: "KpiSettings",
      entityId: networkId,
      actorId: actor.id,
      actorEmail: actor.email ?? null,
      before: Object.fromEntries(fields.map((k) => [k, before[k]])),
      after: Object.fromEntries(fields.map((k) => [k, row[k]])),
    });
    const { networkId: _n, updatedAt: _u, ...rest } = row;
    return { ...rest, environment: rest.environment as ModelSettings["environment"], buildingLoss: rest.buildingLoss as ModelSettings["buildingLoss"] };
  }, ADMIN_TX);
}
