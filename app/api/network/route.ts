import { NextResponse } from "next/server";
import { handle } from "../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { listNetworks } from "@/lib/db/networks/data";

export const dynamic = "force-dynamic";

/** GET /api/network — the networks with their latest version and counts. */
export const GET = handle(async () => {
  await requireActor("network.read");
  const { db } = await runtime();
  return NextResponse.json({ networks: await listNetworks(db.prisma) });
});
