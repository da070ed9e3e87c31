import Link from "next/link";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { listCells, listHardware, listNetworks } from "@/lib/db/networks/data";
import { RequestBuilder } from "../_components/RequestBuilder";
import { builderMapInfo } from "../_components/builderMapInfo";

export const dynamic = "force-dynamic";

export default async function NewRequestPage() {
  await requireActor("request.create");
  const { db } = await runtime();
  const [network] = await listNetworks(db.prisma);
  if (!network) return <main><h1>New change request</h1><p className="subtitle">There is no network to change yet.</p></main>;
  // not awaited: the map arrives after the form (the first map of a version makes the server build its grid)
  const map = builderMapInfo(db.prisma, network.id);
  const [cells, hardware] = await Promise.all([listCells(db.prisma, network.id), listHardware(db.prisma, network.id)]);
  return (
    <main>
      <h1>New change request</h1>
      <p className="subtitle">
        {network.name}, version {network.latestVersion}: choose the cells, set their new values, save a draft, then preview its impact.
        Many cells at once? <Link href="/requests/bulk">Create from a CSV file</Link>.
      </p>
      <RequestBuilder cells={cells} {...hardware} map={map} initial={{ title: "", reason: "", windowStart: null, windowEnd: null, items: [] }} />
    </main>
  );
}
