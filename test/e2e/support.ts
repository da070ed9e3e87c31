// Shared by the browser tests: the demo users' generated credentials, written by the seed
// into the e2e data folder, and a sign-in helper.
import fs from "node:fs";
import path from "node:path";
import type { Page } from "@playwright/test";

export interface Credential {
  email: string;
  name: string;
  role: string;
  password: string;
}

export function credentials(): Credential[] {
  const port = process.env.BEAMGATE_E2E_PORT ?? "3100";
  return JSON.parse(fs.readFileSync(path.join(process.cwd(), "var", `e2e-${port}`, "demo-credentials.json"), "utf8"));
}

export function userOf(role: string, index = 0): Credential {
  const found = credentials().filter((c) => c.role === role)[index];
  if (!found) throw new Error(`no demo user with role ${role} (#${index})`);
  return found;
}

export const artifactsDir = path.join(process.cwd(), "test", "artifacts");

export async function screenshot(page: Page, name: string) {
  fs.mkdirSync(artifactsDir, { recursive: true });
  await page.screenshot({ path: path.join(artifactsDir, `${name}.png`), fullPage: true });
}
