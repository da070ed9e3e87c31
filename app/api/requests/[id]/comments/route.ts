import { NextResponse } from "next/server";
import { handle, readJson } from "../../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { addComment } from "@/lib/db/requests/mutations";
import { commentBodySchema, parseBody } from "@/lib/changes/schema";

export const dynamic = "force-dynamic";

/** POST /api/requests/:id/comments {text} */
export const POST = handle(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const actor = await requireActor("request.comment");
  const { id } = await context.params;
  const { text } = parseBody(commentBodySchema, await readJson(request));
  const { db } = await runtime();
  return NextResponse.json(await addComment(db, actor, id, text), { status: 201 });
});
