// The demo scenario in the database: the generated coastal town as network version 1 and
// one user per role with a generated password. Running it again changes nothing.
import crypto from "node:crypto";
import type { Database } from "./open";
import { createNetwork } from "./networks/mutations";
import { generateDemoTown, DEMO_USERS } from "../io/demoTown";
import { hashPassword } from "../auth/password";
import { createUser, normaliseEmail } from "./users";
import { appendAuditEvent } from "./audit";

export interface DemoCredential {
  email: string;
  name: string;
  role: string;
  password: string;
}

export interface SeedResult {
  created: boolean;
  networkName: string;
  credentials: DemoCredential[];
}

/** A readable random password: 4 groups of 4 from an alphabet without look-alikes. */
export function generatePassword(): string {
  const alphabet = "abcdefghjkmnpqrstuvwxyz23456789";
  const bytes = crypto.randomBytes(16);
  let out = "";
  for (let i = 0; i < 16; i++) {
    out += alphabet[bytes[i] % alphabet.length];
    if (i % 4 === 3 && i < 15) out += "-";
  }
  return out;
}

export async function seedDemo(db: Database, seed = 7, known: DemoCredential[] = []): Promise<SeedResult> {
  const scenario = generateDemoTown(seed);
  const existing = await db.prisma.network.findUnique({ where: { name: scenario.name } });
  if (existing) return { created: false, networkName: scenario.name, credentials: known };

  const credentials: DemoCredential[] = [];
  for (const user of DEMO_USERS) {
    const email = normaliseEmail(user.email);
    if (await db.prisma.user.findUnique({ where: { email } })) continue;
    const password = generatePassword();
    const created = await createUser(db.prisma, { email, name: user.name, role: user.role, passwordHash: await hashPassword(password) });
    await appendAuditEvent(db, { action: "user.create", entityType: "user", entityId: created.id, after: { email, role: user.role } });
    credentials.push({ email, name: user.name, role: user.role, password });
  }
  const admin = await db.prisma.user.findFirst({ where: { role: "admin" } });
  const saved = await createNetwork(db.prisma, scenario, { kind: "seed", note: `demo scenario, seed ${seed}`, actorId: admin?.id });
  await appendAuditEvent(db, {
    action: "network.seed",
    entityType: "network",
    entityId: saved.networkId,
    actorId: admin?.id,
    after: { name: scenario.name, version: 1, sites: scenario.sites.length, cells: scenario.cells.length, seed },
  });
  return { created: true, networkName: scenario.name, credentials };
}
