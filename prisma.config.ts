// Prisma CLI configuration. The CLI runs on the JavaScript engine with a driver adapter,
// so nothing is downloaded: an in-memory PGlite serves commands that need a database
// (schema diffing); the app applies migrations itself (lib/db/migrate.ts).
import path from "node:path";
import { defineConfig } from "prisma/config";

export default defineConfig({
  schema: path.join("prisma", "schema.prisma"),
  migrations: { path: path.join("prisma", "migrations") },
  experimental: { adapter: true },
  engine: "js",
  async adapter() {
    const { PGlite } = await import("@electric-sql/pglite");
    const { PrismaPGlite } = await import("pglite-prisma-adapter");
    return new PrismaPGlite(new PGlite());
  },
});
