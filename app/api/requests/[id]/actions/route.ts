import { NextResponse } from "next/server";
import { handle, readJson } from "../../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { act } from "@/lib/db/requests/mutations";

export const dynamic = "force-dynamic";

/**
 * POST /api/requests/:id/actions {action, version, comment?}
 * action: submit | withdraw | rebase | approve | reject | return | implement | rollback.
 * The role and state rules are checked by the workflow itself (lib/changes/rules.ts).
 */
export const POST = handle(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const actor = await requireActor("request.read");
  const { id } = await context.params;
  const { db } = await runtime();
  return NextResponse.json(await act(db, actor, id, await readJson(request)));
});
