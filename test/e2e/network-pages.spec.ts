// The network, history, audit and admin pages in a browser: the map draws a real raster, a
// change implemented through the workflow shows up in the cell's history and in "as of",
// and the admin pages open only for the administrator.
import { expect, test, type APIRequestContext, type Page } from "@playwright/test";
import { apiAs } from "./api-client";
import { SignInPage } from "./signin-page";
import { credentials, screenshot, userOf } from "./support";

test.describe.configure({ mode: "serial" });

const SEED_TIME_BEFORE = "2000-01-01T00:00:00";

async function signIn(page: Page, role: string) {
  await new SignInPage(page).signIn(userOf(role));
}

/** Polls a request until its state is `state` (the submission simulation runs in the background). */
async function waitForState(api: APIRequestContext, id: string, state: string): Promise<{ version: number; state: string }> {
  let last = "";
  for (let i = 0; i < 120; i++) {
    const body = await (await api.get(`/api/requests/${id}`)).json();
    last = body.state;
    if (body.state === state) return body;
    await new Promise((resolve) => setTimeout(resolve, 1000));
  }
  throw new Error(`request ${id} stayed ${last}, never reached ${state}`);
}

async function act(api: APIRequestContext, id: string, action: string, version: number) {
  const response = await api.post(`/api/requests/${id}/actions`, { data: { action, version } });
  expect(response.status(), `${action}: ${await response.text()}`).toBe(200);
  return response.json();
}

// Filled by the workflow test, read by the history and as-of tests.
const changed = { cell: "", oldTilt: 0, newTilt: 0, requestNumber: 0 };

test("the network page draws a coverage map that is not blank, beside the cells table", async ({ page }) => {
  await signIn(page, "engineer");
  await page.goto("/network");
  const table = page.getByTestId("cells-table");
  await expect(table).toBeVisible();
  expect(await table.locator("tbody tr").count()).toBeGreaterThanOrEqual(24);
  await expect(table.locator("tbody tr").first().getByRole("link")).toHaveAttribute("href", /^\/network\/cells\//);

  // the first map of a version builds the coverage engine on the server: seconds
  const canvas = page.getByTestId("grid-map");
  await expect(canvas).toBeVisible({ timeout: 90_000 });
  await expect(page.locator(".gridmap-legend")).toContainText("Best RSRP", { timeout: 60_000 });
  await page.waitForTimeout(300);
  const stats = await canvas.evaluate((element) => {
    const c = element as HTMLCanvasElement;
    const data = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
    let n = 0, sum = 0, sumSq = 0, painted = 0;
    for (let i = 0; i < data.length; i += 4) {
      if (data[i + 3] === 0) continue;
      painted++;
      for (let k = 0; k < 3; k++) {
        const v = data[i + k];
        n++;
        sum += v;
        sumSq += v * v;
      }
    }
    const mean = n ? sum / n : 0;
    return { painted, total: data.length / 4, variance: n ? sumSq / n - mean * mean : 0 };
  });
  // most of the stage is raster, and a coverage map spans many colours (a flat fill has variance near 0)
  expect(stats.painted / stats.total).toBeGreaterThan(0.3);
  expect(stats.variance).toBeGreaterThan(300);
  await screenshot(page, "network");
});

test("a tilt change implemented through the workflow creates version 2", async ({ baseURL }) => {
  const engineer = await apiAs(baseURL!, userOf("engineer"));
  const cells = (await (await engineer.get("/api/network/cells")).json()).cells as { code: string; electricalTiltDeg: number }[];
  const cell = cells[cells.length - 1];
  changed.cell = cell.code;
  changed.oldTilt = cell.electricalTiltDeg;
  changed.newTilt = cell.electricalTiltDeg >= 10 ? cell.electricalTiltDeg - 2 : cell.electricalTiltDeg + 2;
  const created = await engineer.post("/api/requests", {
    data: {
      title: "Tighten the hillside footprint",
      reason: "browser test of the network history pages",
      items: [{ cellId: cell.code, parameter: "electricalTiltDeg", newValue: changed.newTilt }],
    },
  });
  expect(created.status(), await created.text()).toBe(201);
  const { id, number, version } = await created.json();
  changed.requestNumber = number;
  await act(engineer, id, "submit", version);
  const simulated = await waitForState(engineer, id, "simulated");
  const approved = await act(await apiAs(baseURL!, userOf("owner")), id, "approve", simulated.version);
  const implemented = await act(await apiAs(baseURL!, userOf("field")), id, "implement", approved.version);
  expect(implemented.state).toBe("implemented");
  const versions = (await (await engineer.get("/api/network/versions")).json()).versions as { number: number }[];
  expect(versions[0].number).toBe(2);
});

test("a cell's history page charts every parameter and names the request behind the change", async ({ page }) => {
  await signIn(page, "engineer");
  await page.goto("/network");
  await page.getByTestId("cells-table").getByRole("link", { name: changed.cell, exact: true }).click();
  await expect(page).toHaveURL(new RegExp(`/network/cells/${changed.cell}$`));
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(`Cell ${changed.cell}`);
  await expect(page.getByTestId("cell-attributes")).toContainText("Subcarrier spacing");
  // four numeric parameters as step charts, the beam set as a timeline
  await expect(page.getByTestId("parameter-step-chart")).toHaveCount(4);
  await expect(page.getByTestId("parameter-timeline")).toHaveCount(1);
  // a flat line has a zero-height box, so check the drawn path rather than visibility
  await expect(page.locator('[data-testid="parameter-step-chart"] path.recharts-line-curve').first()).toHaveAttribute("d", /^M[\d.]+,[\d.]+L/);
  const tilt = page.getByTestId("parameter-electricalTiltDeg");
  await expect(tilt.locator("tbody tr")).toHaveCount(2);
  await expect(tilt.locator("tbody tr").first()).toContainText(`${changed.newTilt.toFixed(1)}°`);
  await expect(tilt.getByRole("link", { name: new RegExp(`#${changed.requestNumber}`) })).toHaveAttribute("href", /^\/requests\//);
  await expect(page.getByTestId("parameter-azimuthDeg").locator("tbody tr")).toHaveCount(1);
  await screenshot(page, "cell-history");
});

test("the network as of a date before the seed has no cells; as of now it has all, and version 1 shows the change", async ({ page, baseURL }) => {
  await signIn(page, "engineer");
  const engineer = await apiAs(baseURL!, userOf("engineer"));
  const total = ((await (await engineer.get("/api/network/cells")).json()).cells as unknown[]).length;

  await page.goto("/network/as-of");
  await page.getByLabel("Date and time (UTC)").fill(SEED_TIME_BEFORE);
  await page.getByRole("button", { name: "Show" }).first().click();
  await expect(page).toHaveURL(/[?&]at=2000-01-01/);
  await expect(page.getByTestId("asof-empty")).toBeVisible();
  await expect(page.getByTestId("cells-table")).toHaveCount(0);

  await page.goto(`/network/as-of?at=${encodeURIComponent(new Date().toISOString())}`);
  await expect(page.getByTestId("cells-table").locator("tbody tr")).toHaveCount(total);
  await expect(page.getByTestId("asof-summary")).toContainText("Every parameter had the value it has today");

  await page.getByRole("combobox", { name: "Version" }).selectOption("1");
  await page.getByRole("button", { name: "Show" }).nth(1).click();
  await expect(page).toHaveURL(/[?&]version=1/);
  await expect(page.getByTestId("cells-table").locator("tbody tr")).toHaveCount(total);
  const row = page.getByTestId("cells-table").locator("tbody tr", { has: page.getByRole("link", { name: changed.cell, exact: true }) });
  await expect(row.locator(".cell-differs")).toHaveCount(1);
  await expect(row.locator(".cell-differs")).toContainText(`now ${changed.newTilt.toFixed(1)}`);
  await expect(page.getByTestId("asof-summary")).toContainText("1 parameter value on 1 cell");
  await expect(page.getByTestId("asof-differences")).toContainText(`${changed.cell} electrical tilt: ${changed.oldTilt.toFixed(1)}° then, ${changed.newTilt.toFixed(1)}° today`);
  await screenshot(page, "as-of");
});

test("the audit trail lists the newest events first and the owner verifies the chain intact", async ({ page }) => {
  await signIn(page, "owner");
  await page.goto("/audit");
  const seqs = await page.getByTestId("audit-table").locator("tbody tr td:first-child").allInnerTexts();
  expect(seqs.length).toBeGreaterThan(5);
  const numbers = seqs.map(Number);
  expect(numbers).toEqual([...numbers].sort((a, b) => b - a));
  await expect(page.getByTestId("audit-table")).toContainText("request.implemented");
  // a creation lists its items as cell, parameter and values, not as raw JSON
  // (other specs create requests too: pick this spec's own creation by its cell)
  await expect(
    page.getByTestId("audit-table").locator("tr", { hasText: "request.created" }).filter({ hasText: `${changed.cell} electricalTiltDeg:` }),
  ).toHaveCount(1);
  await page.getByRole("button", { name: "Verify chain now" }).click();
  await expect(page.getByTestId("chain-status")).toHaveText("intact");
  await screenshot(page, "audit");
});

test("a viewer reads the audit trail without the verify button", async ({ page }) => {
  await signIn(page, "viewer");
  await page.goto("/audit");
  await expect(page.getByTestId("audit-table")).toBeVisible();
  await expect(page.getByRole("button", { name: "Verify chain now" })).toHaveCount(0);
  await expect(page.getByTestId("verify-note")).toBeVisible();
});

test("the administrator sees every demo user on the users page", async ({ page }) => {
  await signIn(page, "admin");
  await page.goto("/admin/users");
  const rows = page.getByTestId("users-table").getByTestId("user-row");
  for (const user of credentials()) await expect(rows.filter({ hasText: user.email })).toHaveCount(1);
  await screenshot(page, "admin-users");
});

test("the settings page shows each default and refuses an out-of-range value beside its field", async ({ page }) => {
  await signIn(page, "admin");
  await page.goto("/admin/settings");
  await expect(page.getByTestId("defaults-note")).toContainText("common practice, not a standard");
  await expect(page.getByTestId("setting-coverageThresholdDbm")).toContainText("default -105 dBm");
  await expect(page.getByTestId("setting-overlapDeltaDb")).toContainText("default 6 dB");
  await expect(page.getByTestId("setting-overlapMaxOthers")).toContainText("default 3 cells");
  await expect(page.getByTestId("setting-interferenceThresholdDb")).toContainText("default 0 dB");
  const coverage = page.getByLabel("Coverage threshold");
  await expect(coverage).toHaveValue("-105");
  await coverage.fill("5");
  await page.getByRole("button", { name: /^Save/ }).click();
  await expect(page.getByTestId("setting-coverageThresholdDbm").locator(".field-error")).toContainText("must be within");
  await expect(coverage).toHaveValue("5");
  await screenshot(page, "admin-settings");
});

test("a viewer opening /admin/users gets the forbidden page", async ({ page }) => {
  await signIn(page, "viewer");
  await page.goto("/admin/users");
  await expect(page.getByTestId("forbidden")).toBeVisible();
  await expect(page.getByTestId("users-table")).toHaveCount(0);
  await screenshot(page, "forbidden");
});
