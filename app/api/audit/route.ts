import { NextResponse } from "next/server";
import { handle } from "../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { listAuditEvents } from "@/lib/db/audit";

export const dynamic = "force-dynamic";

/** GET /api/audit[?request=<id>&before=<seq>&take=N] — audit events, newest first. */
export const GET = handle(async (request: Request) => {
  await requireActor("audit.read");
  const params = new URL(request.url).searchParams;
  const take = Math.min(Math.max(Number(params.get("take") ?? 100) || 100, 1), 1000);
  const before = Number(params.get("before") ?? 0) || undefined;
  const { db } = await runtime();
  const events = await listAuditEvents(db.prisma, { requestId: params.get("request") ?? undefined, take, beforeSeq: before });
  return NextResponse.json({ events });
});
