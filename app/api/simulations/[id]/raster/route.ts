import { handle } from "../../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { simulationRaster } from "@/app/_lib/mapRasters";
import type { MapRasterHeaderLayer } from "@/lib/io/mapRaster";

export const dynamic = "force-dynamic";

/**
 * GET /api/simulations/:id/raster?layer=rsrp-after&floor=0 — one floor of one layer in the
 * compact binary map format (application/octet-stream; see lib/io/mapRaster.ts). Encoded layers are kept in
 * memory (app/_lib/mapRasters.ts).
 */
export const GET = handle(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  await requireActor("request.read");
  const { id } = await context.params;
  const params = new URL(request.url).searchParams;
  const layer = (params.get("layer") ?? "rsrp-after") as MapRasterHeaderLayer;
  const floor = Number(params.get("floor") ?? "0");
  const { db } = await runtime();
  const bytes = await simulationRaster(db.prisma, id, layer, floor);
  return new Response(bytes as unknown as BodyInit, {
    headers: { "content-type": "application/octet-stream", "cache-control": "private, max-age=3600" },
  });
});
