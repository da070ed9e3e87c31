import "server-only";
// Multipart uploads with a hard size limit. The declared Content-Length is refused before a byte
// is read; a body without one (chunked) is read only up to the limit, so no upload can make the
// server buffer more than the limit whatever it claims.
import { NextResponse } from "next/server";
import { DomainError } from "@/lib/changes/errors";

/** multipart framing (boundaries, part headers) on top of the files' own bytes. */
const MULTIPART_OVERHEAD_BYTES = 1024 * 1024;

export class UploadTooLarge extends Error {
  constructor(
    readonly limitBytes: number,
    readonly declaredBytes: number | null,
  ) {
    super(
      `the upload is too large: ${declaredBytes === null ? "more than" : `${megabytes(declaredBytes)}, over`} the limit of ${megabytes(limitBytes)}; ` +
        "split it or ask an administrator to import it with the command line",
    );
    this.name = "UploadTooLarge";
  }
}

function megabytes(n: number): string {
  return `${(n / 1024 / 1024).toFixed(1)} MB`;
}

/** The 413 answer, in the shape of every other error answer. */
export function tooLargeResponse(error: UploadTooLarge): NextResponse {
  return NextResponse.json(
    { error: { code: "too_large", message: error.message, details: [], context: { limitBytes: error.limitBytes, declaredBytes: error.declaredBytes } } },
    { status: 413, headers: { connection: "close" } },
  );
}

/** The request's multipart form, refused with UploadTooLarge beyond limitBytes of files (plus framing). */
export async function readLimitedForm(request: Request, limitBytes: number): Promise<FormData> {
  const cap = limitBytes + MULTIPART_OVERHEAD_BYTES;
  const declared = request.headers.get("content-length");
  if (declared !== null && /^\d+$/.test(declared.trim()) && Number(declared) > cap) throw new UploadTooLarge(limitBytes, Number(declared));
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) {
    throw new DomainError("bad_request", `the body must be multipart/form-data (got ${type ? `"${type}"` : "no content type"})`);
  }
  const chunks: Uint8Array[] = [];
  let total = 0;
  if (request.body) {
    const reader = request.body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.length;
      if (total > cap) {
        await reader.cancel().catch(() => {});
        throw new UploadTooLarge(limitBytes, null);
      }
      chunks.push(value);
    }
  }
  const body = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    body.set(chunk, offset);
    offset += chunk.length;
  }
  try {
    return await new Response(body, { headers: { "content-type": type } }).formData();
  } catch {
    throw new DomainError("bad_request", "the multipart body could not be read (malformed or truncated)");
  }
}

/** The uploaded files of a form field, as name + bytes. */
export async function formFiles(form: FormData, field: string): Promise<{ name: string; bytes: Uint8Array }[]> {
  const out: { name: string; bytes: Uint8Array }[] = [];
  for (const entry of form.getAll(field)) {
    if (typeof entry === "string") continue;
    out.push({ name: entry.name, bytes: new Uint8Array(await entry.arrayBuffer()) });
  }
  return out;
}
