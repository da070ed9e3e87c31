import { NextResponse } from "next/server";
import { z } from "zod";
import { handle, readJson } from "../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { listUsers } from "@/lib/db/users";
import { createUserAudited } from "@/lib/db/admin";
import { hashPassword } from "@/lib/auth/password";
import { parseBody } from "@/lib/changes/schema";

export const dynamic = "force-dynamic";

const newUserSchema = z.strictObject({
  email: z.email({ error: "must be an e-mail address" }),
  name: z.string().trim().min(1, { error: "must not be empty" }).max(200),
  role: z.string(),
  password: z.string().min(10, { error: "must be at least 10 characters" }).max(200),
});

/** GET /api/admin/users — every user (no password hashes). */
export const GET = handle(async () => {
  await requireActor("users.manage");
  const { db } = await runtime();
  return NextResponse.json({ users: await listUsers(db.prisma) });
});

/** POST /api/admin/users {email, name, role, password} */
export const POST = handle(async (request: Request) => {
  const actor = await requireActor("users.manage");
  const body = parseBody(newUserSchema, await readJson(request));
  const { db } = await runtime();
  const user = await createUserAudited(db, actor, {
    email: body.email,
    name: body.name,
    role: body.role,
    passwordHash: await hashPassword(body.password),
  });
  return NextResponse.json(user, { status: 201 });
});
