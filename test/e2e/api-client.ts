// Signs a demo user in through next-auth's own credentials endpoint and returns a request
// context carrying the session cookie: the same path a script with curl takes.
import { request, type APIRequestContext } from "@playwright/test";
import type { Credential } from "./support";

export async function apiAs(baseURL: string, user: Credential | null): Promise<APIRequestContext> {
  const context = await request.newContext({ baseURL });
  if (!user) return context;
  const { csrfToken } = (await (await context.get("/api/auth/csrf")).json()) as { csrfToken: string };
  const response = await context.post("/api/auth/callback/credentials", {
    form: { csrfToken, email: user.email, password: user.password, json: "true" },
    maxRedirects: 0,
  });
  if (response.status() >= 400) throw new Error(`sign-in of ${user.email} answered ${response.status()}`);
  const session = await (await context.get("/api/auth/session")).json();
  if (!session?.user) throw new Error(`sign-in of ${user.email} gave no session`);
  return context;
}
