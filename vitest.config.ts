import { defineConfig } from "vitest/config";
import net from "node:net";
import path from "node:path";

// Unit and reference tests, then every database test twice: on the embedded default and,
// when the machine's PostgreSQL server answers, on a throw-away database there.
// Browser tests (test/e2e) run under Playwright, never here.

const postgresUrl = new URL(process.env.BEAMGATE_TEST_PG_ADMIN_URL ?? "postgresql://postgres@127.0.0.1:5432/postgres");

function reachable(host: string, port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ host, port, timeout: 1500 });
    socket.once("connect", () => (socket.destroy(), resolve(true)));
    socket.once("error", () => resolve(false));
    socket.once("timeout", () => (socket.destroy(), resolve(false)));
  });
}

const postgresUp = await reachable(postgresUrl.hostname, Number(postgresUrl.port || 5432));
if (!postgresUp) console.warn(`PostgreSQL at ${postgresUrl.host} is not reachable: database tests run on the embedded database only`);

const alias = { "@": path.resolve(import.meta.dirname) };
const databaseTests = ["test/unit/**/*.db.test.ts"];
const shared = { testTimeout: 60_000, hookTimeout: 120_000 };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          ...shared,
          name: "unit",
          include: ["test/unit/**/*.test.ts", "test/reference/**/*.test.ts"],
          exclude: [...databaseTests, "test/e2e/**", "node_modules/**"],
        },
      },
      {
        resolve: { alias },
        test: { ...shared, name: "db-embedded", include: databaseTests, env: { BEAMGATE_TEST_DB: "embedded" } },
      },
      ...(postgresUp
        ? [
            {
              resolve: { alias },
              test: { ...shared, name: "db-postgres", include: databaseTests, env: { BEAMGATE_TEST_DB: "postgres" } },
            },
          ]
        : []),
    ],
  },
});
