// `npm start`: applies pending migrations, then serves the built app with `next start`.
// The database is closed before the server opens it (the embedded one takes one process).
import { spawn } from "node:child_process";
import path from "node:path";
import { openDatabase } from "../open";
import { describeTarget, resolveDatabaseTarget } from "../target";
import { DatabaseError } from "../errors";
import { ensureDemoSecret } from "./dataDir";

async function main() {
  const target = resolveDatabaseTarget();
  const db = await openDatabase(target);
  await db.close();
  if (!process.env.NEXTAUTH_SECRET) {
    if (target.kind === "postgres" && process.env.NODE_ENV === "production") {
      throw new Error("NEXTAUTH_SECRET must be set when serving a PostgreSQL-backed deployment");
    }
    ensureDemoSecret();
  }
  const port = process.env.PORT ?? "3000";
  process.env.NEXTAUTH_URL ??= `http://localhost:${port}`;
  console.log(`beamgate: ${describeTarget(target)} ready; serving http://localhost:${port}`);
  const next = spawn(process.execPath, [path.join(process.cwd(), "node_modules", "next", "dist", "bin", "next"), "start", "-p", port], {
    stdio: "inherit",
    env: process.env,
  });
  const stop = (signal: NodeJS.Signals) => next.kill(signal);
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
  next.on("exit", (code) => process.exit(code ?? 0));
}

main().catch((error) => {
  if (error instanceof DatabaseError) console.error(`beamgate: ${error.message}`);
  else console.error(`beamgate: start failed: ${(error as Error).message}`);
  process.exit(1);
});
