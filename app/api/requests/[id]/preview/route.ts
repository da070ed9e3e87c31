import { NextResponse } from "next/server";
import { handle } from "../../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { previewRequest } from "@/lib/db/requests/mutations";

export const dynamic = "force-dynamic";

/** POST /api/requests/:id/preview — queues a preview simulation of a draft; answers its id. */
export const POST = handle(async (_request: Request, context: { params: Promise<{ id: string }> }) => {
  const actor = await requireActor("request.preview");
  const { id } = await context.params;
  const { db } = await runtime();
  return NextResponse.json(await previewRequest(db, actor, id), { status: 202 });
});
