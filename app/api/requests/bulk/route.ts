import { NextResponse } from "next/server";
import { handle } from "../../_lib/respond";
import { formFiles, readLimitedForm, tooLargeResponse, UploadTooLarge } from "../../_lib/upload";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { parseBulkChangesUpload } from "@/lib/io/bulkChanges";
import type { FormatProblem } from "@/lib/io/scenarioFolder";
import { createRequest } from "@/lib/db/requests/mutations";
import { DomainError } from "@/lib/changes/errors";

export const dynamic = "force-dynamic";

/** A bulk change file is a list of changes, not a network: 5 MB is tens of thousands of rows. */
const BULK_MAX_BYTES = 5 * 1024 * 1024;

/**
 * Maps createRequest's refusals (paths "items[i].field") back to the CSV: sources[i] is where items[i] was
 * read (parseBulkChangesUpload keeps the file's own line numbers, so blank lines and several changes per row
 * in the wide layout stay right). Other paths (title, reason) name the form field.
 */
function problemsOfRefusal(error: DomainError, fileName: string, sources: { row: number; column: string }[]): FormatProblem[] {
  const details = error.details.length > 0 ? error.details : [{ path: error.field ?? "", message: error.message }];
  return details.map((detail) => {
    const match = /^items\[(\d+)\](?:\.(\w+))?/.exec(detail.path);
    const source = match ? sources[Number(match[1])] : undefined;
    if (!match || !source) return { severity: "error" as const, file: "form", ...(detail.path ? { column: detail.path } : {}), reason: detail.message };
    const field = match[2];
    // The column the item's value was read from; an unknown cell points at the cell column instead.
    const column = field === "cellId" ? "cell_id" : source.column;
    return { severity: "error" as const, file: fileName, row: source.row, column, reason: `${field ?? "item"}: ${detail.message}` };
  });
}

/**
 * POST /api/requests/bulk multipart/form-data: file (one CSV), title, reason, network (id; optional when
 * there is one network). 422 {report} with the file's problems or the refused items (file, row, column);
 * 201 {id, number, items, report} for the new draft request.
 */
export const POST = handle(async (request: Request) => {
  const actor = await requireActor("request.create");
  let form: FormData;
  try {
    form = await readLimitedForm(request, BULK_MAX_BYTES);
  } catch (error) {
    if (error instanceof UploadTooLarge) return tooLargeResponse(error);
    throw error;
  }
  const files = await formFiles(form, "file");
  if (files.length !== 1) {
    const reason = files.length === 0 ? "no file: upload one CSV of changes" : `${files.length} files: upload one CSV of changes`;
    return NextResponse.json({ report: { errors: [{ severity: "error", file: "upload", reason }], warnings: [] } }, { status: 422 });
  }
  const [file] = files;
  const parsed = parseBulkChangesUpload(file.bytes, file.name);
  const errors = parsed.problems.filter((p) => p.severity === "error");
  const warnings = parsed.problems.filter((p) => p.severity === "warning");
  if (errors.length > 0) return NextResponse.json({ report: { errors, warnings } }, { status: 422 });

  const text = (name: string) => {
    const v = form.get(name);
    return typeof v === "string" ? v : undefined;
  };
  const network = text("network")?.trim() || undefined;
  const { db } = await runtime();
  try {
    const result = await createRequest(
      db,
      actor,
      { title: text("title") ?? "", reason: text("reason") ?? "", items: parsed.items.map((i) => ({ ...i })) },
      network,
    );
    return NextResponse.json({ id: result.id, number: result.number, items: parsed.items.length, report: { errors: [], warnings } }, { status: 201 });
  } catch (error) {
    if (error instanceof DomainError && error.code === "invalid") {
      return NextResponse.json({ report: { errors: problemsOfRefusal(error, file.name, parsed.sources), warnings } }, { status: 422 });
    }
    throw error;
  }
});
