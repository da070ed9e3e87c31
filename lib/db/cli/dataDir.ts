// The local data folder: the embedded database, and for the demo a generated session
// secret and the demo users' passwords. Never committed (see .gitignore).
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";

export function dataDir(): string {
  return path.resolve(process.env.BEAMGATE_DATA_DIR ? path.dirname(process.env.BEAMGATE_DATA_DIR) : path.join(process.cwd(), "data"));
}

/** Puts NEXTAUTH_SECRET into the environment: from it, else from data/secret, else a new one saved there. */
export function ensureDemoSecret(): string {
  if (process.env.NEXTAUTH_SECRET) return process.env.NEXTAUTH_SECRET;
  const file = path.join(dataDir(), "secret");
  fs.mkdirSync(path.dirname(file), { recursive: true });
  if (!fs.existsSync(file)) fs.writeFileSync(file, crypto.randomBytes(32).toString("base64url"), { mode: 0o600 });
  process.env.NEXTAUTH_SECRET = fs.readFileSync(file, "utf8").trim();
  return process.env.NEXTAUTH_SECRET;
}
