import "server-only";
// Prints one of the app's own print pages to PDF with the machine's Chromium (never a downloaded one),
// signed in as the caller: their Cookie header is copied into a fresh browser context. The browser only
// ever talks to this server on the loopback interface — every other request is refused — so neither a
// forged Host header nor a link in the page can make it fetch anything else.
import type { Browser } from "playwright-core";

export const CHROMIUM_PATH = "/usr/bin/chromium";
const CHROMIUM_FLAGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
];
/** A4 width minus the 10 mm margins of app/(print)/print.css, CSS pixels (190 mm at 96 px/in). */
const PRINT_WIDTH_PX = 718;
const READY_TIMEOUT_MS = 45_000;

export interface PrintOptions {
  /** Path of the page on this server, e.g. /requests/abc/report. */
  path: string;
  /** The caller's Cookie header. */
  cookieHeader: string | null;
  /** Port this server listens on. */
  port: number;
  /** A CSS selector that must be present before printing. */
  readySelector: string;
}

/** "a=1; b=2" → [{name, value}], skipping malformed pairs. */
export function parseCookieHeader(header: string | null): { name: string; value: string }[] {
  if (!header) return [];
  const out: { name: string; value: string }[] = [];
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq <= 0) continue;
    const name = part.slice(0, eq).trim();
    const value = part.slice(eq + 1).trim();
    if (name) out.push({ name, value });
  }
  return out;
}

// One print at a time: each is a whole browser, and the machine may have two cores.
let queue: Promise<unknown> = Promise.resolve();

export function printPageToPdf(options: PrintOptions): Promise<Buffer> {
  const run = queue.then(() => printOnce(options));
  queue = run.catch(() => undefined);
  return run;
}

async function printOnce({ path, cookieHeader, port, readySelector }: PrintOptions): Promise<Buffer> {
  // Loaded at run time from node_modules, outside the server bundle (it spawns processes and reads its own files).
  const { chromium } = (await import(/* webpackIgnore: true */ /* turbopackIgnore: true */ "playwright-core")) as typeof import("playwright-core");
  // "localhost" (not 127.0.0.1): Chromium always resolves it to loopback, and a dev server accepts it as its own origin.
  const origin = `http://localhost:${port}`;
  let browser: Browser | undefined;
  try {
    browser = await chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_FLAGS, headless: true });
    const context = await browser.newContext({
      viewport: { width: PRINT_WIDTH_PX, height: 1000 },
      deviceScaleFactor: 2,
      reducedMotion: "reduce",
      javaScriptEnabled: true,
    });
    const cookies = parseCookieHeader(cookieHeader).map(({ name, value }) => ({
      name,
      value,
      url: origin,
      secure: name.startsWith("__Secure-") || name.startsWith("__Host-"),
    }));
    if (cookies.length > 0) await context.addCookies(cookies);
    const page = await context.newPage();
    await page.route("**/*", (route) => (route.request().url().startsWith(`${origin}/`) ? route.continue() : route.abort()));
    const response = await page.goto(`${origin}${path}`, { waitUntil: "load", timeout: READY_TIMEOUT_MS });
    if (!response || !response.ok()) throw new Error(`the print page answered HTTP ${response?.status() ?? "nothing"}`);
    await page.waitForSelector(readySelector, { timeout: READY_TIMEOUT_MS });
    // The map is the last to appear: its raster arrives by fetch, then is painted on a canvas.
    if ((await page.locator("canvas[data-testid=grid-map]").count()) > 0) {
      await page.waitForSelector('canvas[data-testid=grid-map][data-ready="true"]', { timeout: READY_TIMEOUT_MS });
    }
    // Charts measure their box, then draw; give them two frames after the last layout.
    await page.evaluate(() => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve))));
    await page.emulateMedia({ media: "print" });
    return await page.pdf({ format: "A4", printBackground: true, preferCSSPageSize: true });
  } finally {
    await browser?.close().catch(() => {});
  }
}
