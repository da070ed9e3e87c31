import { NextResponse } from "next/server";
import { handle, readJson } from "../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { getRequest } from "@/lib/db/requests/data";
import { editRequest } from "@/lib/db/requests/mutations";
import { DomainError } from "@/lib/changes/errors";

export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

/** GET /api/requests/:id — the request with items, comments, simulations, events, conflicts. */
export const GET = handle(async (_request: Request, context: Context) => {
  const actor = await requireActor("request.read");
  const { id } = await context.params;
  const { db } = await runtime();
  const detail = await getRequest(db.prisma, id, actor);
  if (!detail) throw new DomainError("not_found", `request ${id} not found`);
  return NextResponse.json(detail);
});

/** PATCH /api/requests/:id {version, title?, reason?, items?, windowStart?, windowEnd?} — author, draft only. */
export const PATCH = handle(async (request: Request, context: Context) => {
  const actor = await requireActor("request.edit");
  const { id } = await context.params;
  const { db } = await runtime();
  return NextResponse.json(await editRequest(db, actor, id, await readJson(request)));
});
