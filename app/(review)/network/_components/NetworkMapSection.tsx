// Server part of the network map: floors and sites of the latest version (the grid, not yet
// the engine), handed to the client map. Rendered inside Suspense so the cells table does not wait.
import { runtime } from "@/app/_lib/runtime";
import { baselineMapInfo } from "@/lib/jobs/mapLayers";
import { baselineRasterUrl } from "../../_components/mapUrls";
import { BaselineMap } from "./BaselineMap";

export async function NetworkMapSection({ networkId }: { networkId: string }) {
  const { db } = await runtime();
  const { version, floors, sites } = await baselineMapInfo(db.prisma, networkId);
  return <BaselineMap rasterUrl={baselineRasterUrl(networkId, version)} floors={floors} sites={sites} version={version} />;
}
