import { handle } from "../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { baselineMapRasterBytes, type BaselineMapLayer } from "@/lib/jobs/mapLayers";
import { networkIdFrom } from "../_lib";

export const dynamic = "force-dynamic";

/**
 * GET /api/network/raster?layer=rsrp-before&floor=0[&network=<id>] — one floor of one layer of the
 * network as it stands (its latest version), in the compact binary map format (lib/io/mapRaster.ts).
 * The first request of a version builds the coverage engine, which takes seconds. Pages add
 * &v=<latest version> only so that the browser's cache is keyed by version; it is not read here.
 */
export const GET = handle(async (request: Request) => {
  await requireActor("network.read");
  const params = new URL(request.url).searchParams;
  const layer = (params.get("layer") ?? "rsrp-before") as BaselineMapLayer;
  const floor = Number(params.get("floor") ?? "0");
  const { db } = await runtime();
  const networkId = await networkIdFrom(db.prisma, params);
  const bytes = await baselineMapRasterBytes(db.prisma, networkId, layer, floor);
  return new Response(bytes as unknown as BodyInit, {
    headers: { "content-type": "application/octet-stream", "cache-control": "private, max-age=600" },
  });
});
