import { NextResponse } from "next/server";
import { handle } from "../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { getSimulationStatus } from "@/lib/db/simulations";
import { DomainError } from "@/lib/changes/errors";

export const dynamic = "force-dynamic";

/** GET /api/simulations/:id — status (queued, running, retrying, done, failed), progress 0..1, error. */
export const GET = handle(async (_request: Request, context: { params: Promise<{ id: string }> }) => {
  await requireActor("request.read");
  const { id } = await context.params;
  const { db } = await runtime();
  const status = await getSimulationStatus(db.prisma, id);
  if (!status) throw new DomainError("not_found", `simulation ${id} not found`);
  return NextResponse.json(status);
});
