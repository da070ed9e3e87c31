import { NextResponse } from "next/server";
import { handle } from "../../../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { cellHistory } from "@/lib/db/history";
import { networkIdFrom } from "../../../_lib";

export const dynamic = "force-dynamic";

/** GET /api/network/cells/:code/history — every value each parameter had, with the request behind it. */
export const GET = handle(async (request: Request, context: { params: Promise<{ code: string }> }) => {
  await requireActor("network.read");
  const { code } = await context.params;
  const { db } = await runtime();
  const networkId = await networkIdFrom(db.prisma, new URL(request.url).searchParams);
  return NextResponse.json({ cell: code, history: await cellHistory(db.prisma, networkId, code) });
});
