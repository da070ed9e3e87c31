import { NextResponse } from "next/server";
import { handle } from "../_lib/respond";
import { formFiles, readLimitedForm, tooLargeResponse, UploadTooLarge } from "../_lib/upload";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { DEFAULT_MAX_UPLOAD_BYTES, parseNetworkUpload } from "@/lib/io/networkImport";
import { importNetwork } from "@/lib/db/networks/import";
import { DomainError } from "@/lib/changes/errors";

export const dynamic = "force-dynamic";

/**
 * POST /api/import[?dryRun=1] multipart/form-data: files (one or more; "files[]" also read), name (optional).
 * 413 over the size limit (from Content-Length, before reading); 422 {report} with any error, nothing written;
 * 200 {dryRun: true, report} when only checking; 201 {networkId, name, report} when imported;
 * 409 {error, report} when the name is taken.
 */
export const POST = handle(async (request: Request) => {
  const actor = await requireActor("network.import");
  let form: FormData;
  try {
    form = await readLimitedForm(request, DEFAULT_MAX_UPLOAD_BYTES);
  } catch (error) {
    if (error instanceof UploadTooLarge) return tooLargeResponse(error);
    throw error;
  }
  const dryRun = ["1", "true", "yes"].includes(new URL(request.url).searchParams.get("dryRun") ?? "");
  const files = [...(await formFiles(form, "files")), ...(await formFiles(form, "files[]"))];
  const rawName = form.get("name");
  const name = typeof rawName === "string" && rawName.trim() !== "" ? rawName.trim() : undefined;
  const result = await parseNetworkUpload(files, { maxBytes: DEFAULT_MAX_UPLOAD_BYTES, ...(name ? { name } : {}) });
  const { report } = result;
  if (!result.scenario) return NextResponse.json({ report }, { status: 422 });
  const { db } = await runtime();
  if (dryRun) {
    // A check also says whether the name is free, so that "Import" after a clean check does not surprise.
    const taken = await db.prisma.network.findUnique({ where: { name: result.scenario.name }, select: { id: true } });
    const nameProblem = taken
      ? [{ severity: "error" as const, file: "upload", column: "name", value: result.scenario.name, reason: "a network of this name already exists; choose another name (re-importing as a new version is not supported yet)" }]
      : [];
    const checked = { ...report, errors: [...report.errors, ...nameProblem] };
    return NextResponse.json({ dryRun: true, name: result.scenario.name, report: checked }, { status: taken ? 422 : 200 });
  }
  try {
    const saved = await importNetwork(db, actor, result.scenario, {
      ...(result.projection ? { projection: result.projection } : {}),
      note: `imported from ${files.map((f) => f.name).join(", ")}`,
    });
    return NextResponse.json({ networkId: saved.networkId, name: saved.name, counts: saved.counts, report }, { status: 201 });
  } catch (error) {
    if (error instanceof DomainError && error.code === "conflict") {
      return NextResponse.json({ error: { code: error.code, message: error.message, field: error.field, details: [], context: error.context }, report }, { status: 409 });
    }
    throw error;
  }
});
