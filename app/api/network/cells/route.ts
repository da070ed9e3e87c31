import { NextResponse } from "next/server";
import { handle } from "../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { listCells } from "@/lib/db/networks/data";
import { networkAsOf } from "@/lib/db/history";
import { DomainError } from "@/lib/changes/errors";
import { networkIdFrom } from "../_lib";

export const dynamic = "force-dynamic";

/** GET /api/network/cells[?asOf=2026-12-01T12:00:00Z | ?version=3] — the cells as they were then. */
export const GET = handle(async (request: Request) => {
  await requireActor("network.read");
  const { db } = await runtime();
  const params = new URL(request.url).searchParams;
  const networkId = await networkIdFrom(db.prisma, params);
  const asOf = params.get("asOf");
  const version = params.get("version");
  if (asOf && version) throw new DomainError("invalid", "give asOf or version, not both", { field: "asOf" });
  if (asOf !== null) {
    const date = new Date(asOf);
    if (Number.isNaN(date.getTime())) throw new DomainError("invalid", `asOf: "${asOf}" is not a date`, { field: "asOf" });
    return NextResponse.json({ asOf: date.toISOString(), cells: await networkAsOf(db.prisma, networkId, date) });
  }
  if (version !== null) {
    const number = Number(version);
    if (!Number.isInteger(number) || number < 1) throw new DomainError("invalid", `version: "${version}" is not a version number`, { field: "version" });
    return NextResponse.json({ version: number, cells: await networkAsOf(db.prisma, networkId, number) });
  }
  return NextResponse.json({ cells: await listCells(db.prisma, networkId) });
});
