import "server-only";
// Route handlers are wiring: parse, call one lib/ function, answer. Domain errors become
// HTTP answers here and nowhere else.
import { NextResponse } from "next/server";
import { ZodError, type ZodType } from "zod";
import { DomainError, errorBody, formatPath, httpStatusOf } from "@/lib/changes/errors";
import { DatabaseError } from "@/lib/db/errors";

export function errorResponse(error: unknown): NextResponse {
  if (error instanceof DomainError) {
    return NextResponse.json(errorBody(error), { status: httpStatusOf(error.code) });
  }
  if (error instanceof ZodError) {
    return errorResponse(
      new DomainError("invalid", "the body has invalid fields", {
        details: error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })),
      }),
    );
  }
  if (error instanceof DatabaseError) {
    return NextResponse.json({ error: { code: "unavailable", message: error.message, details: [], context: {} } }, { status: 503 });
  }
  console.error(error);
  return NextResponse.json(
    { error: { code: "internal", message: "internal error; it was logged", details: [], context: {} } },
    { status: 500 },
  );
}

/** Wraps a handler so that any thrown error becomes its HTTP answer. */
export function handle<Args extends unknown[]>(fn: (...args: Args) => Promise<Response>) {
  return async (...args: Args): Promise<Response> => {
    try {
      return await fn(...args);
    } catch (error) {
      return errorResponse(error);
    }
  };
}

/** Reads a JSON body; a missing or malformed one is a 400. The domain function validates it. */
export async function readJson(request: Request): Promise<unknown> {
  try {
    return await request.json();
  } catch {
    throw new DomainError("bad_request", "the body must be JSON");
  }
}

/** Reads a JSON body and validates it; a missing or malformed body is a 400 naming why. */
export async function readBody<T>(request: Request, schema: ZodType<T>): Promise<T> {
  let json: unknown;
  try {
    json = await request.json();
  } catch {
    throw new DomainError("bad_request", "the body must be JSON");
  }
  return schema.parse(json);
}
