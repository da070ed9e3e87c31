import { NextResponse } from "next/server";
import { z } from "zod";
import { handle, readJson } from "../../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { updateUserAudited } from "@/lib/db/admin";
import { hashPassword } from "@/lib/auth/password";
import { parseBody } from "@/lib/changes/schema";

export const dynamic = "force-dynamic";

const changeSchema = z.strictObject({
  name: z.string().trim().min(1, { error: "must not be empty" }).max(200).optional(),
  role: z.string().optional(),
  active: z.boolean({ error: "must be true or false" }).optional(),
  password: z.string().min(10, { error: "must be at least 10 characters" }).max(200).optional(),
});

/** PATCH /api/admin/users/:id {name?, role?, active?, password?} */
export const PATCH = handle(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const actor = await requireActor("users.manage");
  const { id } = await context.params;
  const { password, ...rest } = parseBody(changeSchema, await readJson(request));
  const { db } = await runtime();
  const user = await updateUserAudited(db, actor, id, {
    ...rest,
    ...(password !== undefined ? { passwordHash: await hashPassword(password) } : {}),
  });
  return NextResponse.json(user);
});
