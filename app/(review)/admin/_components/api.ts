// JSON calls of the admin screens: the API answers {error:{code,message,details:[{path,message}]}} on
// failure; this turns that into a message and a field → message map for the form.

export interface ApiFailure {
  message: string;
  fields: Record<string, string>;
}

export type ApiResult<T> = { ok: true; data: T } | { ok: false; failure: ApiFailure };

/** Paths the domain uses for a field that the form names differently. */
const FIELD_ALIASES: Record<string, string> = { passwordHash: "password" };

export async function sendJson<T>(method: "POST" | "PATCH" | "PUT", url: string, body: unknown): Promise<ApiResult<T>> {
  let response: Response;
  try {
    response = await fetch(url, {
      method,
      credentials: "same-origin",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(body),
    });
  } catch (error) {
    return { ok: false, failure: { message: `The server could not be reached (${error instanceof Error ? error.message : String(error)}).`, fields: {} } };
  }
  const json = (await response.json().catch(() => null)) as unknown;
  if (response.ok) return { ok: true, data: json as T };
  const error = (json as { error?: { message?: string; details?: { path?: string; message?: string }[] } } | null)?.error;
  const fields: Record<string, string> = {};
  for (const detail of error?.details ?? []) {
    if (!detail.path || !detail.message) continue;
    const path = FIELD_ALIASES[detail.path] ?? detail.path;
    fields[path] = fields[path] ? `${fields[path]}; ${detail.message}` : detail.message;
  }
  return { ok: false, failure: { message: error?.message ?? `The request failed (HTTP ${response.status}).`, fields } };
}
