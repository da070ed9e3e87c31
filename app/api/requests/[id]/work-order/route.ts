import { NextResponse } from "next/server";
import { handle } from "../../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { getRequest } from "@/lib/db/requests/data";
import { DomainError } from "@/lib/changes/errors";
import { buildWorkOrder, workOrderCsv, workOrderJson } from "@/lib/changes/workOrder";

export const dynamic = "force-dynamic";

/** GET /api/requests/:id/work-order?format=csv|json&sheet=work|rollback — for approved requests. */
export const GET = handle(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  await requireActor("workorder.read");
  const { id } = await context.params;
  const params = new URL(request.url).searchParams;
  const format = params.get("format") ?? "json";
  const sheet = params.get("sheet") ?? "work";
  if (format !== "csv" && format !== "json") throw new DomainError("invalid", `format: "csv" or "json", got "${format}"`, { field: "format" });
  if (sheet !== "work" && sheet !== "rollback") throw new DomainError("invalid", `sheet: "work" or "rollback", got "${sheet}"`, { field: "sheet" });
  const { db } = await runtime();
  const detail = await getRequest(db.prisma, id);
  if (!detail) throw new DomainError("not_found", `request ${id} not found`);
  const order = buildWorkOrder({
    id: detail.id,
    title: detail.title,
    state: detail.state,
    approvedBy: detail.approverName ?? "",
    approvedAt: detail.decidedAt,
    windowStart: detail.windowStart,
    windowEnd: detail.windowEnd,
    items: detail.items,
  });
  const name = `work-order-CR${detail.number}${sheet === "rollback" ? "-rollback" : ""}`;
  if (format === "json") {
    return new NextResponse(workOrderJson(order), {
      headers: { "content-type": "application/json", "content-disposition": `attachment; filename="${name}.json"` },
    });
  }
  return new NextResponse(workOrderCsv(order, sheet), {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${name}.csv"` },
  });
});
