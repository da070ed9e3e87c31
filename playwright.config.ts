import { defineConfig } from "@playwright/test";

// Browser tests drive Debian's Chromium (never a downloaded browser) against the built
// app, served on its own port with a fresh embedded database seeded with the demo town.
const port = Number(process.env.BEAMGATE_E2E_PORT ?? 3100);

export default defineConfig({
  testDir: "test/e2e",
  testMatch: "**/*.spec.ts",
  outputDir: "test-results",
  timeout: 120_000,
  expect: { timeout: 15_000 },
  fullyParallel: false,
  workers: 1,
  retries: 0,
  reporter: [["list"]],
  use: {
    baseURL: `http://localhost:${port}`,
    launchOptions: {
      executablePath: process.env.BEAMGATE_CHROMIUM ?? "/usr/bin/chromium",
      args: [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-first-run",
        "--disable-quic",
      ],
    },
    viewport: { width: 1400, height: 900 },
    screenshot: "only-on-failure",
  },
  webServer: {
    command: `bash test/e2e/serve.sh ${port}`,
    url: `http://localhost:${port}/signin`,
    timeout: 600_000,
    reuseExistingServer: false,
    stdout: "pipe",
    stderr: "pipe",
  },
});
