import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { openDatabase } from "../../../lib/db/open";
import { resolveDatabaseTarget } from "../../../lib/db/target";
import { DatabaseError } from "../../../lib/db/errors";

function snapshot(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const name of fs.readdirSync(dir)) out[name] = fs.readFileSync(path.join(dir, name), "utf8");
  return out;
}

describe("openDatabase(target) refuses bad targets with one clear line", () => {
  it("an unreachable PostgreSQL URL names the host and the failure", async () => {
    const target = resolveDatabaseTarget({ DATABASE_URL: "postgresql://postgres@127.0.0.1:1/none" });
    const error = await openDatabase(target).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(DatabaseError);
    expect((error as DatabaseError).failure).toBe("unreachable");
    expect((error as Error).message).toBe("cannot reach PostgreSQL at 127.0.0.1:1: ECONNREFUSED");
  });

  it("a DATABASE_URL of another kind is refused naming it, password hidden", () => {
    expect(() => resolveDatabaseTarget({ DATABASE_URL: "mysql://root:secret@db/x" })).toThrow(
      'DATABASE_URL must be postgresql://…, file:FOLDER, "embedded" or unset; got mysql://root:***@db/x',
    );
  });

  it("an embedded folder held by a live process is refused naming that process, and nothing is touched", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "beamgate-lock-"));
    fs.writeFileSync(path.join(dir, "beamgate.lock"), String(process.ppid));
    const before = snapshot(dir);
    const error = await openDatabase({ kind: "embedded", dir }).catch((e: unknown) => e);
    expect((error as DatabaseError).failure).toBe("locked");
    expect((error as Error).message).toContain(`in use by process ${process.ppid}`);
    expect(snapshot(dir)).toEqual(before);
  });

  it("a lock left by a process that has ended is taken over", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "beamgate-stale-"));
    fs.writeFileSync(path.join(dir, "beamgate.lock"), "999999999");
    const db = await openDatabase({ kind: "embedded", dir });
    expect(fs.readFileSync(path.join(dir, "beamgate.lock"), "utf8")).toBe(String(process.pid));
    await db.close();
    expect(fs.existsSync(path.join(dir, "beamgate.lock"))).toBe(false);
  });

  it("a corrupted embedded folder is reported as such and left exactly as it was", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "beamgate-corrupt-"));
    fs.writeFileSync(path.join(dir, "PG_VERSION"), "not a version\n");
    const before = snapshot(dir);
    const error = await openDatabase({ kind: "embedded", dir }).catch((e: unknown) => e);
    expect((error as DatabaseError).failure).toBe("corrupted");
    expect((error as Error).message).toContain(`the embedded database folder ${dir} could not be opened`);
    expect(snapshot(dir)).toEqual(before);
  });
});
