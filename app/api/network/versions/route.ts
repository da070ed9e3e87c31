import { NextResponse } from "next/server";
import { handle } from "../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { listVersions } from "@/lib/db/history";
import { networkIdFrom } from "../_lib";

export const dynamic = "force-dynamic";

/** GET /api/network/versions — every version of the network, newest first. */
export const GET = handle(async (request: Request) => {
  await requireActor("network.read");
  const { db } = await runtime();
  const networkId = await networkIdFrom(db.prisma, new URL(request.url).searchParams);
  return NextResponse.json({ versions: await listVersions(db.prisma, networkId) });
});
