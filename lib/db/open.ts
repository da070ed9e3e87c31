// Opens the database named by a target and hands back one Prisma client plus a raw SQL
// channel (for migrations and advisory locks). This module and its siblings in lib/db
// are the only code that touches Prisma or a database driver.
import fs from "node:fs";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { PrismaPGlite } from "pglite-prisma-adapter";
import { PrismaPg } from "@prisma/adapter-pg";
import pg from "pg";
import { PrismaClient } from "./generated/client";
import { DatabaseError } from "./errors";
import { describeTarget, type DatabaseTarget } from "./target";
import { applyMigrations } from "./migrate";
import { patchPgliteBytes } from "./pgliteBytes";

export type Prisma = InstanceType<typeof PrismaClient>;

/** Raw SQL outside Prisma, for migrations, locks and tests. */
export interface SqlChannel {
  /** Runs SQL text (several statements allowed). */
  exec(sql: string): Promise<void>;
  /** Runs one parameterised query. */
  query<T = Record<string, unknown>>(sql: string, params?: unknown[]): Promise<T[]>;
}

export interface Database extends SqlChannel {
  target: DatabaseTarget;
  prisma: Prisma;
  /** Runs fn on one connection held for its whole duration (session locks, transactions). */
  session<T>(fn: (sql: SqlChannel) => Promise<T>): Promise<T>;
  close(): Promise<void>;
}

export interface OpenOptions {
  /** Apply pending migrations before returning (default true). */
  migrate?: boolean;
}

export async function openDatabase(target: DatabaseTarget, options: OpenOptions = {}): Promise<Database> {
  const db = target.kind === "postgres" ? await openPostgres(target) : await openEmbedded(target);
  if (options.migrate ?? true) {
    try {
      await applyMigrations(db);
    } catch (error) {
      await db.close();
      if (error instanceof DatabaseError) throw error;
      throw new DatabaseError("migration", `migrating ${describeTarget(target)} failed: ${(error as Error).message}`);
    }
  }
  return db;
}

// ---------------------------------------------------------------- PostgreSQL server

async function openPostgres(target: Extract<DatabaseTarget, { kind: "postgres" }>): Promise<Database> {
  const pool = new pg.Pool({ connectionString: target.url, connectionTimeoutMillis: 5000, max: 10 });
  // An idle client that loses its server must not crash the process; the next query reconnects.
  pool.on("error", () => {});
  try {
    await pool.query("select 1");
  } catch (error) {
    await pool.end().catch(() => {});
    const e = error as NodeJS.ErrnoException;
    const what = e.code ? `${e.code}${e.message && !e.message.includes(e.code) ? ` (${e.message})` : ""}` : e.message;
    throw new DatabaseError("unreachable", `cannot reach PostgreSQL at ${target.host}: ${what}`);
  }
  const prisma = new PrismaClient({ adapter: new PrismaPg(pool) });
  return {
    target,
    prisma,
    async exec(sql) {
      await pool.query(sql);
    },
    async query(sql, params) {
      return (await pool.query(sql, params as unknown[])).rows;
    },
    async session(fn) {
      const connection = await pool.connect();
      try {
        return await fn({
          exec: async (sql) => void (await connection.query(sql)),
          query: async (sql, params) => (await connection.query(sql, params as unknown[])).rows,
        });
      } finally {
        connection.release();
      }
    },
    async close() {
      await prisma.$disconnect().catch(() => {});
      await pool.end().catch(() => {});
    },
  };
}

// ---------------------------------------------------------------- embedded (PGlite)

async function openEmbedded(target: Extract<DatabaseTarget, { kind: "embedded" | "memory" }>): Promise<Database> {
  await patchPgliteBytes();
  let releaseLock = () => {};
  let client: PGlite;
  if (target.kind === "embedded") {
    fs.mkdirSync(target.dir, { recursive: true });
    releaseLock = acquireFolderLock(target.dir);
    try {
      client = await PGlite.create(target.dir);
      await client.query("select 1");
    } catch (error) {
      releaseLock();
      throw new DatabaseError(
        "corrupted",
        `the embedded database folder ${target.dir} could not be opened (${(error as Error).message}); ` +
          "nothing in it was changed — restore it from a copy or move it aside to start afresh",
      );
    }
  } else {
    client = await PGlite.create();
  }
  const prisma = new PrismaClient({ adapter: new PrismaPGlite(client) });
  const channel: SqlChannel = {
    async exec(sql) {
      await client.exec(sql);
    },
    async query(sql, params) {
      return (await client.query(sql, params as unknown[])).rows as never[];
    },
  };
  return {
    target,
    prisma,
    ...channel,
    // PGlite has a single connection: every call is already on it.
    session: (fn) => fn(channel),
    async close() {
      await prisma.$disconnect().catch(() => {});
      await client.close().catch(() => {});
      releaseLock();
    },
  };
}

/**
 * PGlite serves one process at a time; a second one writing the same folder would corrupt
 * it. A lock file holding the owner's pid refuses the second opener with a clear message;
 * a lock left by a process that no longer runs is taken over.
 */
function acquireFolderLock(dir: string): () => void {
  const lockPath = path.join(dir, "beamgate.lock");
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      fs.writeFileSync(lockPath, String(process.pid), { flag: "wx" });
      let released = false;
      const release = () => {
        if (released) return;
        released = true;
        process.off("exit", release);
        try {
          if (fs.readFileSync(lockPath, "utf8") === String(process.pid)) fs.unlinkSync(lockPath);
        } catch {
          /* already gone */
        }
      };
      process.on("exit", release);
      return release;
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
      const owner = Number.parseInt(fs.readFileSync(lockPath, "utf8"), 10);
      if (Number.isInteger(owner) && owner !== process.pid && isAlive(owner)) {
        throw new DatabaseError(
          "locked",
          `the embedded database folder ${dir} is in use by process ${owner}; stop it first (one process at a time)`,
        );
      }
      fs.unlinkSync(lockPath);
    }
  }
  throw new DatabaseError("locked", `could not take the lock on ${lockPath}`);
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}
