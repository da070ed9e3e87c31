import "server-only";
// The builder's map layers: the network's latest version (its floors come from the grid, which the server may
// have to build first). Not awaited by the page: the builder shows the form at once and the map when ready.
import type { Prisma } from "@/lib/db/open";
import { baselineMapInfo } from "@/lib/jobs/mapLayers";
import { baselineRasterUrl } from "../../_components/mapUrls";
import type { BuilderMapInfo } from "./BuilderMap";

export function builderMapInfo(prisma: Prisma, networkId: string): Promise<BuilderMapInfo | null> {
  return baselineMapInfo(prisma, networkId).then(
    ({ version, floors }) => ({ rasterUrl: baselineRasterUrl(networkId, version), floors, version }),
    (error: unknown) => {
      console.error(`beamgate: the builder's map of network ${networkId} could not be prepared:`, error);
      return null;
    },
  );
}
