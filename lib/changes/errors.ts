// The one error class of the workflow. Domain code throws it with a code from a closed list;
// the app turns it into an HTTP answer in one place with httpStatusOf / errorBody.

export type DomainErrorCode =
  /** No signed-in user. */
  | "unauthenticated"
  /** Signed in, but this role (or this user) may not do this. */
  | "forbidden"
  /** The author of a request tried to decide on it (four-eyes rule). */
  | "four_eyes"
  | "not_found"
  /** The body is not JSON or not an object at all. */
  | "bad_request"
  /** The body parsed but a value is wrong; `details` lists each field. */
  | "invalid"
  /** The action is not legal from the request's current state. */
  | "illegal_transition"
  /** Another request touching the same cells was approved or implemented first; rebase. */
  | "stale"
  /** Approval needs a finished simulation of the request's current revision. */
  | "simulation_required"
  /** Optimistic concurrency lost: the request changed since the client read it. */
  | "conflict";

export const DOMAIN_ERROR_CODES: readonly DomainErrorCode[] = [
  "unauthenticated",
  "forbidden",
  "four_eyes",
  "not_found",
  "bad_request",
  "invalid",
  "illegal_transition",
  "stale",
  "simulation_required",
  "conflict",
];

/** One wrong field: its path as written in the body (e.g. "items[2].newValue") and why. */
export interface IssueDetail {
  path: string;
  message: string;
}

export type ErrorContextValue = string | number | boolean | null;

export interface DomainErrorOptions {
  /** The field at fault, when there is exactly one. */
  field?: string;
  /** Every wrong field, for "invalid". */
  details?: readonly IssueDetail[];
  /** Facts behind the refusal (current state, action, versions) for logs and clients. */
  context?: Readonly<Record<string, ErrorContextValue>>;
  cause?: unknown;
}

export class DomainError extends Error {
  readonly code: DomainErrorCode;
  readonly field?: string;
  readonly details: readonly IssueDetail[];
  readonly context: Readonly<Record<string, ErrorContextValue>>;

  constructor(code: DomainErrorCode, message: string, options: DomainErrorOptions = {}) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.name = "DomainError";
    this.code = code;
    if (options.field !== undefined) this.field = options.field;
    this.details = options.details ?? [];
    this.context = options.context ?? {};
  }
}

export function isDomainError(value: unknown): value is DomainError {
  return value instanceof DomainError;
}

const STATUS: Readonly<Record<DomainErrorCode, number>> = {
  unauthenticated: 401,
  forbidden: 403,
  four_eyes: 403,
  not_found: 404,
  bad_request: 400,
  // 422: the JSON was well formed but its content is refused.
  invalid: 422,
  // 409: the request is fine, the resource's current state refuses it.
  illegal_transition: 409,
  stale: 409,
  simulation_required: 409,
  conflict: 409,
};

export function httpStatusOf(code: DomainErrorCode): number {
  return STATUS[code];
}

/** The JSON body of an error answer. */
export interface ErrorBody {
  error: {
    code: DomainErrorCode;
    message: string;
    field?: string;
    details: readonly IssueDetail[];
    context: Readonly<Record<string, ErrorContextValue>>;
  };
}

export function errorBody(error: DomainError): ErrorBody {
  const body: ErrorBody["error"] = {
    code: error.code,
    message: error.message,
    details: error.details,
    context: error.context,
  };
  if (error.field !== undefined) body.field = error.field;
  return { error: body };
}

/** "items[2].newValue" from ["items", 2, "newValue"]: the path as the client wrote it. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const key of path) {
    if (typeof key === "number") out += `[${key}]`;
    else {
      const name = String(key);
      out += out === "" ? name : `.${name}`;
    }
  }
  return out === "" ? "(body)" : out;
}

/** One "invalid" error carrying every issue; the message lists them all. */
export function invalid(details: readonly IssueDetail[], summary = "invalid input"): DomainError {
  const listed = details.map((d) => `${d.path}: ${d.message}`).join("; ");
  const field = details.length === 1 ? details[0].path : undefined;
  return new DomainError("invalid", details.length === 0 ? summary : `${summary}: ${listed}`, {
    details,
    ...(field !== undefined ? { field } : {}),
  });
}
