// Which database Beamgate talks to: the embedded default (PGlite in a data folder, no
// server to install) or a PostgreSQL server named by DATABASE_URL. Same schema, same
// migrations, same code above this line.
import path from "node:path";

export type DatabaseTarget =
  | { kind: "embedded"; dir: string }
  | { kind: "memory" }
  | { kind: "postgres"; url: string; host: string; database: string };

/** Reads DATABASE_URL (and BEAMGATE_DATA_DIR for the embedded folder). */
export function resolveDatabaseTarget(env: Readonly<Record<string, string | undefined>> = process.env): DatabaseTarget {
  const url = env.DATABASE_URL?.trim();
  if (!url || url === "embedded") {
    return { kind: "embedded", dir: path.resolve(/*turbopackIgnore: true*/ env.BEAMGATE_DATA_DIR ?? path.join(/*turbopackIgnore: true*/ process.cwd(), "data", "pglite")) };
  }
  if (url === "memory") return { kind: "memory" };
  if (url.startsWith("file:")) return { kind: "embedded", dir: path.resolve(/*turbopackIgnore: true*/ url.slice("file:".length)) };
  if (url.startsWith("postgresql://") || url.startsWith("postgres://")) {
    let parsed: URL;
    try {
      parsed = new URL(url);
    } catch {
      throw new Error(`DATABASE_URL is not a valid URL: ${redactUrl(url)}`);
    }
    return { kind: "postgres", url, host: `${parsed.hostname}:${parsed.port || "5432"}`, database: parsed.pathname.slice(1) };
  }
  throw new Error(`DATABASE_URL must be postgresql://…, file:FOLDER, "embedded" or unset; got ${redactUrl(url)}`);
}

/** The URL with any password replaced, for messages. */
export function redactUrl(url: string): string {
  return url.replace(/\/\/([^:/@]+):([^@]*)@/, "//$1:***@");
}

export function describeTarget(target: DatabaseTarget): string {
  if (target.kind === "embedded") return `embedded database in ${target.dir}`;
  if (target.kind === "memory") return "in-memory embedded database";
  return `PostgreSQL ${target.host}/${target.database}`;
}
