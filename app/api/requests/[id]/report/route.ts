import { NextResponse } from "next/server";
import { handle } from "../../../_lib/respond";
import { requireActor } from "@/lib/auth/session";
import { runtime as appRuntime } from "@/app/_lib/runtime";
import { printPageToPdf } from "@/app/_lib/printPdf";
import { getRequest } from "@/lib/db/requests/data";
import { DomainError } from "@/lib/changes/errors";

export const dynamic = "force-dynamic";
// Printing launches a browser: the Node.js runtime, never the edge.
export const runtime = "nodejs";

/** GET /api/requests/:id/report → the impact report as a PDF (app/(print)/requests/[id]/report printed by Chromium). */
export const GET = handle(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  await requireActor("request.read");
  const { id } = await context.params;
  const { db } = await appRuntime();
  const detail = await getRequest(db.prisma, id);
  if (!detail) throw new DomainError("not_found", `request ${id} not found`);
  const url = new URL(request.url);
  const port = Number(process.env.PORT ?? url.port ?? 3000) || 3000;
  const pdf = await printPageToPdf({
    path: `/requests/${encodeURIComponent(id)}/report`,
    cookieHeader: request.headers.get("cookie"),
    port,
    readySelector: "[data-testid=impact-report]",
  });
  return new NextResponse(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `attachment; filename="impact-report-CR${detail.number}.pdf"`,
      "cache-control": "private, no-store",
    },
  });
});
