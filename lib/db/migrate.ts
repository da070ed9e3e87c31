// Applies prisma/migrations/*/migration.sql in name order, each once, each in its own
// transaction, recording name and checksum. Idempotent: a second run applies nothing.
// An applied migration whose file has since changed is refused: history is not rewritten.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { DatabaseError } from "./errors";
import type { Database, SqlChannel } from "./open";

// Any fixed number of ours; serialises concurrent start-ups against one server.
const MIGRATION_LOCK_KEY = 720_411_303;

export interface MigrationFile {
  name: string;
  sql: string;
  checksum: string;
}

export function migrationsDir(): string {
  return process.env.BEAMGATE_MIGRATIONS_DIR ?? path.join(/*turbopackIgnore: true*/ process.cwd(), "prisma", "migrations");
}

export function readMigrations(dir = migrationsDir()): MigrationFile[] {
  if (!fs.existsSync(dir)) throw new DatabaseError("migration", `migrations folder ${dir} not found`);
  return fs
    .readdirSync(dir, { withFileTypes: true })
    .filter((entry) => entry.isDirectory() && fs.existsSync(path.join(dir, entry.name, "migration.sql")))
    .map((entry) => entry.name)
    .sort()
    .map((name) => {
      const sql = fs.readFileSync(path.join(dir, name, "migration.sql"), "utf8");
      return { name, sql, checksum: crypto.createHash("sha256").update(sql).digest("hex") };
    });
}

/** Returns the names it applied (empty when the database was up to date). */
export async function applyMigrations(database: Database, files = readMigrations()): Promise<string[]> {
  return database.session((db) => applyOnSession(db, database.target.kind === "postgres", files));
}

async function applyOnSession(db: SqlChannel, usesServer: boolean, files: MigrationFile[]): Promise<string[]> {
  if (usesServer) await db.query("select pg_advisory_lock($1)", [MIGRATION_LOCK_KEY]);
  try {
    await db.exec(
      `create table if not exists "_beamgate_migrations" (
         name text primary key, checksum text not null, applied_at timestamptz not null default now())`,
    );
    const rows = await db.query<{ name: string; checksum: string }>(`select name, checksum from "_beamgate_migrations"`);
    const applied = new Map(rows.map((row) => [row.name, row.checksum]));
    const done: string[] = [];
    for (const file of files) {
      const known = applied.get(file.name);
      if (known !== undefined) {
        if (known !== file.checksum) {
          throw new DatabaseError(
            "migration",
            `migration ${file.name} was changed after it was applied (checksum differs); add a new migration instead`,
          );
        }
        continue;
      }
      const name = file.name.replace(/'/g, "''");
      await db.exec(
        `begin;\n${file.sql}\n;insert into "_beamgate_migrations"(name, checksum) values ('${name}', '${file.checksum}');\ncommit;`,
      ).catch(async (error: Error) => {
        await db.exec("rollback").catch(() => {});
        throw new DatabaseError("migration", `migration ${file.name} failed: ${error.message}`);
      });
      done.push(file.name);
    }
    return done;
  } finally {
    if (usesServer) await db.query("select pg_advisory_unlock($1)", [MIGRATION_LOCK_KEY]).catch(() => {});
  }
}
