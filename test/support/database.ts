// A fresh, real database for one test file: the embedded default (PGlite in a temporary
// folder) or, when BEAMGATE_TEST_DB=postgres, a throw-away database on the machine's
// PostgreSQL server, dropped afterwards. Both get the project's own migrations.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import crypto from "node:crypto";
import pg from "pg";
import { openDatabase, type Database } from "../../lib/db/open";

export const testDatabaseKind = process.env.BEAMGATE_TEST_DB === "postgres" ? "postgres" : "embedded";

export function postgresAdminUrl(): string {
  return process.env.BEAMGATE_TEST_PG_ADMIN_URL ?? "postgresql://postgres@127.0.0.1:5432/postgres";
}

export interface TestDatabase {
  db: Database;
  /** A DATABASE_URL that reaches the same database (for child processes). */
  url: string;
  drop(): Promise<void>;
}

export async function createTestDatabase(): Promise<TestDatabase> {
  if (testDatabaseKind === "postgres") {
    const admin = new URL(postgresAdminUrl());
    const name = `beamgate_test_${process.pid}_${crypto.randomBytes(4).toString("hex")}`;
    const adminClient = new pg.Client({ connectionString: admin.toString() });
    await adminClient.connect();
    await adminClient.query(`create database "${name}"`);
    await adminClient.end();
    const url = new URL(admin.toString());
    url.pathname = `/${name}`;
    const db = await openDatabase({ kind: "postgres", url: url.toString(), host: `${url.hostname}:${url.port || 5432}`, database: name });
    return {
      db,
      url: url.toString(),
      async drop() {
        await db.close();
        const client = new pg.Client({ connectionString: admin.toString() });
        await client.connect();
        await client.query(`drop database if exists "${name}" with (force)`);
        await client.end();
      },
    };
  }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "beamgate-test-"));
  const db = await openDatabase({ kind: "embedded", dir });
  return {
    db,
    url: `file:${dir}`,
    async drop() {
      await db.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
