import { notFound } from "next/navigation";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { getRequest } from "@/lib/db/requests/data";
import { listCells, listHardware } from "@/lib/db/networks/data";
import { RequestBuilder } from "../../_components/RequestBuilder";
import { builderMapInfo } from "../../_components/builderMapInfo";

export const dynamic = "force-dynamic";

export default async function EditRequestPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requireActor("request.edit");
  const { id } = await params;
  const { db } = await runtime();
  const detail = await getRequest(db.prisma, id, actor);
  if (!detail) notFound();
  // Old values come from the version the request is built on; the map shows the network as it stands.
  const map = builderMapInfo(db.prisma, detail.networkId);
  const [cells, hardware] = await Promise.all([
    listCells(db.prisma, detail.networkId, { version: detail.baseVersion }),
    listHardware(db.prisma, detail.networkId),
  ]);
  return (
    <main>
      <h1>Edit CR-{detail.number}</h1>
      <p className="subtitle">Built on network version {detail.baseVersion}. Saving starts a new revision; simulate it again before submitting.</p>
      <RequestBuilder
        cells={cells}
        {...hardware}
        initial={{ title: detail.title, reason: detail.reason, windowStart: detail.windowStart, windowEnd: detail.windowEnd, items: detail.items }}
        editing={{ requestId: detail.id, version: detail.version }}
        map={map}
      />
    </main>
  );
}
