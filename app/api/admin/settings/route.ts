import { NextResponse } from "next/server";
import { handle, readJson } from "../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { getKpiSettings } from "@/lib/db/networks/data";
import { updateKpiSettings } from "@/lib/db/admin";
import { networkIdFrom } from "../../network/_lib";

export const dynamic = "force-dynamic";

/** GET /api/admin/settings — the network's KPI thresholds and model options. */
export const GET = handle(async (request: Request) => {
  await requireActor("settings.manage");
  const { db } = await runtime();
  const networkId = await networkIdFrom(db.prisma, new URL(request.url).searchParams);
  return NextResponse.json({ networkId, settings: await getKpiSettings(db.prisma, networkId) });
});

/** PUT /api/admin/settings {coverageThresholdDbm?, overlapDeltaDb?, …} — changes some settings. */
export const PUT = handle(async (request: Request) => {
  const actor = await requireActor("settings.manage");
  const { db } = await runtime();
  const networkId = await networkIdFrom(db.prisma, new URL(request.url).searchParams);
  return NextResponse.json({ networkId, settings: await updateKpiSettings(db, actor, networkId, await readJson(request)) });
});
