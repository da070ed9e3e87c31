// Browser side of the JSON API: one fetch helper that turns error answers into a message
// and per-field details, so that every form shows the server's own validation.
export interface FieldProblem {
  path: string;
  message: string;
}

export class ApiProblem extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly code: string,
    readonly details: FieldProblem[],
  ) {
    super(message);
  }
}

export async function callApi<T>(url: string, method: string, body?: unknown): Promise<T> {
  const response = await fetch(url, {
    method,
    headers: body === undefined ? undefined : { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
    credentials: "same-origin",
  });
  const json = (await response.json().catch(() => null)) as
    | (T & { error?: undefined })
    | { error: { code: string; message: string; details?: FieldProblem[] } }
    | null;
  if (!response.ok || (json && "error" in json && json.error)) {
    const error = (json as { error?: { code: string; message: string; details?: FieldProblem[] } } | null)?.error;
    throw new ApiProblem(error?.message ?? `the server answered ${response.status}`, response.status, error?.code ?? "http", error?.details ?? []);
  }
  return json as T;
}

/** The details whose path starts with `prefix` (e.g. "items[2]"), for showing beside a field. */
export function problemsAt(problems: FieldProblem[], prefix: string): string[] {
  return problems.filter((p) => p.path === prefix || p.path.startsWith(`${prefix}.`) || p.path.startsWith(`${prefix}[`)).map((p) => p.message);
}
