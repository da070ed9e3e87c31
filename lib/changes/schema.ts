// The JSON bodies of the change-request API, as zod schemas, and their types. Parse with
// parseBody(), which throws one DomainError("invalid") naming every wrong field by its path
// ("items[2].newValue"). Domain checks that need the network (ranges, known cells) are in
// validate.ts; these schemas only check shape.

import { z } from "zod";
import { CELL_PARAMETERS, type CellParameter } from "../radio/scenario";
import { DomainError, formatPath, invalid, type IssueDetail } from "./errors";
import { USER_ACTIONS } from "./rules";

const MAX_TITLE = 200;
const MAX_TEXT = 4000;
// A request is reviewed item by item; a thousand is already more than a person can check.
export const MAX_ITEMS = 1000;

const text = (label: string, max: number) =>
  z
    .string({ error: `${label} must be text` })
    .trim()
    .min(1, { error: `${label} must not be empty` })
    .max(max, { error: `${label} must be at most ${max} characters` });

// Dates travel as ISO 8601 with a zone (Z or ±hh:mm) so that no server time zone guesses.
const isoDate = z
  .iso.datetime({ offset: true, error: "must be an ISO 8601 date-time with a time zone, e.g. 2026-03-01T22:00:00Z" })
  .transform((s) => new Date(s));

const parameter = z.enum(CELL_PARAMETERS as [CellParameter, ...CellParameter[]], {
  error: `must be one of ${CELL_PARAMETERS.join(", ")}`,
});

const newValue = z.union([z.number(), z.string().trim().min(1)], {
  error: "must be a finite number, or a beam-set id for beamSetId",
});

export const itemSchema = z.strictObject({
  cellId: text("cellId", 100),
  parameter,
  newValue,
});

const items = z
  .array(itemSchema, { error: "must be a list of items" })
  .min(1, { error: "a request needs at least one item" })
  .max(MAX_ITEMS, { error: `at most ${MAX_ITEMS} items per request` });

/**
 * Window end after start, and both or neither (an edit changes the window as a pair, so the
 * order can be checked here). Runs even when a date failed to parse, so it looks before it touches.
 */
function checkWindow(value: { windowStart?: unknown; windowEnd?: unknown }, ctx: z.RefinementCtx): void {
  const start = value.windowStart;
  const end = value.windowEnd;
  if (start === undefined && end === undefined) return;
  const hasStart = start !== undefined && start !== null;
  const hasEnd = end !== undefined && end !== null;
  if (hasStart !== hasEnd) {
    ctx.addIssue({
      code: "custom",
      path: [hasStart ? "windowEnd" : "windowStart"],
      message: "the change window needs both windowStart and windowEnd",
    });
    return;
  }
  if (start instanceof Date && end instanceof Date && end.getTime() <= start.getTime()) {
    ctx.addIssue({ code: "custom", path: ["windowEnd"], message: "must be after windowStart" });
  }
}

export const createRequestSchema = z
  .strictObject({
    title: text("title", MAX_TITLE),
    reason: text("reason", MAX_TEXT),
    networkVersionId: text("networkVersionId", 100).optional(),
    windowStart: isoDate.optional(),
    windowEnd: isoDate.optional(),
    items,
  })
  .superRefine(checkWindow);

const version = z
  .number({ error: "must be the request's version number as last read" })
  .int({ error: "must be a whole number" })
  .min(1, { error: "must be at least 1" });

/** An edit replaces only the fields it names; `items`, when given, replaces the whole list. */
export const editRequestSchema = z
  .strictObject({
    version,
    title: text("title", MAX_TITLE).optional(),
    reason: text("reason", MAX_TEXT).optional(),
    windowStart: isoDate.nullable().optional(),
    windowEnd: isoDate.nullable().optional(),
    items: items.optional(),
  })
  .superRefine(checkWindow);

export const actionBodySchema = z
  .strictObject({
    action: z.enum(USER_ACTIONS, { error: `must be one of ${USER_ACTIONS.join(", ")}` }),
    comment: z.string({ error: "comment must be text" }).trim().max(MAX_TEXT).optional(),
    version,
  })
  .superRefine((value, ctx) => {
    // A verdict against the author's work says why; the author reads it to revise.
    if ((value.action === "reject" || value.action === "return") && (value.comment ?? "") === "") {
      ctx.addIssue({ code: "custom", path: ["comment"], message: `a comment is required to ${value.action}` });
    }
  });

export const commentBodySchema = z.strictObject({
  text: text("text", MAX_TEXT),
});

export type ItemInput = z.infer<typeof itemSchema>;
export type CreateRequestBody = z.infer<typeof createRequestSchema>;
export type EditRequestBody = z.infer<typeof editRequestSchema>;
export type ActionBody = z.infer<typeof actionBodySchema>;
export type CommentBody = z.infer<typeof commentBodySchema>;

/** Turn zod issues into our details, one per field path. */
export function issuesOf(error: z.ZodError): IssueDetail[] {
  const out: IssueDetail[] = [];
  for (const issue of error.issues) {
    if (issue.code === "unrecognized_keys") {
      // One line per stray key, at its own path: typos ("newvalue") are the usual cause.
      for (const key of issue.keys) out.push({ path: formatPath([...issue.path, key]), message: "unknown field" });
    } else if (issue.path.length === 0 && issue.code === "invalid_type") {
      out.push({ path: formatPath(issue.path), message: "the body must be a JSON object" });
    } else {
      out.push({ path: formatPath(issue.path), message: issue.message });
    }
  }
  return out;
}

/** Parse a decoded JSON body or throw DomainError("invalid") listing every wrong field. */
export function parseBody<S extends z.ZodType>(schema: S, body: unknown): z.output<S> {
  const result = schema.safeParse(body);
  if (result.success) return result.data;
  throw invalid(issuesOf(result.error), "invalid request body");
}

/** Decode JSON text; malformed JSON is "bad_request", not "invalid". */
export function parseJsonText(textBody: string): unknown {
  try {
    return JSON.parse(textBody) as unknown;
  } catch (cause) {
    throw new DomainError("bad_request", `the body is not valid JSON (${(cause as Error).message})`, { cause });
  }
}
