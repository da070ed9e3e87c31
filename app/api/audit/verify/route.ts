import { NextResponse } from "next/server";
import { handle } from "../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { verifyAuditChain } from "@/lib/db/audit";

export const dynamic = "force-dynamic";

/** POST /api/audit/verify — recomputes the hash chain; names the first broken link. */
export const POST = handle(async () => {
  await requireActor("audit.verify");
  const { db } = await runtime();
  return NextResponse.json(await verifyAuditChain(db.prisma));
});
