// The whole life of a change request in the browser: an engineer drafts, previews and
// submits; an owner, in a second browser context, approves; the field team implements;
// the cell's history then shows the new value. A viewer sees no action buttons and a
// forced request from them is refused.
import { expect, test } from "@playwright/test";
import { SignInPage } from "./signin-page";
import { BuilderPage, RequestPage } from "./request-page";
import { screenshot, userOf } from "./support";
import { apiAs } from "./api-client";

test("engineer → owner → field: draft, preview, submit, simulated, approve, implemented, history", async ({ browser, baseURL }) => {
  const engineerContext = await browser.newContext();
  const ownerContext = await browser.newContext();
  const engineer = await engineerContext.newPage();
  const owner = await ownerContext.newPage();
  await new SignInPage(engineer).signIn(userOf("engineer"));
  await new SignInPage(owner).signIn(userOf("owner"));

  // Pick a cell and a new electrical tilt within its range that differs from today's.
  const api = await apiAs(baseURL!, userOf("engineer"));
  const cells = (await (await api.get("/api/network/cells")).json()).cells as { code: string; electricalTiltDeg: number }[];
  const cell = cells[cells.length - 1];
  const newTilt = cell.electricalTiltDeg >= 10 ? cell.electricalTiltDeg - 3 : cell.electricalTiltDeg + 3;

  // Bad input first: a tilt far outside the antenna's range is refused beside the field, nothing saved.
  const builder = new BuilderPage(engineer);
  await builder.create("Downtilt the last cell", "Reduce overshoot towards the shore", cell.code, "40");
  await expect(engineer.getByText(/outside|range|at most/i).first()).toBeVisible();
  await expect(engineer).toHaveURL(/\/requests\/new/);
  await expect(engineer.getByLabel(`${cell.code} Electrical tilt`)).toHaveValue("40");
  await engineer.getByLabel(`${cell.code} Electrical tilt`).fill(String(newTilt));
  await engineer.getByRole("button", { name: "Save as draft" }).click();
  await expect(engineer).toHaveURL(/\/requests\/(?!new)[^/]+$/);
  const requestUrl = new URL(engineer.url()).pathname;
  await screenshot(engineer, "builder-saved");

  const page = new RequestPage(engineer);
  await page.press("Preview impact");
  await page.waitForImpact();
  expect(await page.mapPixelVariance()).toBeGreaterThan(50);
  await screenshot(engineer, "impact-preview");

  await page.press("Submit for review");
  await expect(engineer.getByText("Ready for review")).toBeVisible({ timeout: 240_000 });

  // The owner reviews in a second context: sees the caution near the decision buttons.
  const review = new RequestPage(owner);
  await review.open(requestUrl);
  await expect(owner.getByText("Before you approve:")).toBeVisible();
  await review.waitForImpact();
  await screenshot(owner, "impact-review");
  // Rejecting needs a comment: the page says so and nothing changes.
  await review.press("Reject");
  await expect(owner.getByTestId("action-error")).toContainText("needs a comment");
  await review.press("Approve", "Checked the worst grids; fine for the night window.");
  await expect(owner.getByText("Approved, awaiting field work")).toBeVisible();

  // The author can never approve: the engineer has no such button.
  await engineer.reload();
  await expect(engineer.getByRole("button", { name: "Approve", exact: true })).toHaveCount(0);

  const fieldContext = await browser.newContext();
  const field = await fieldContext.newPage();
  await new SignInPage(field).signIn(userOf("field"));
  const work = new RequestPage(field);
  await work.open(requestUrl);
  await work.press("Mark implemented");
  await expect(field.getByText("Live on the network")).toBeVisible();

  await field.goto(`/network/cells/${encodeURIComponent(cell.code)}`);
  await expect(field.getByText(String(newTilt)).first()).toBeVisible();
  await screenshot(field, "cell-history-after");
  const now = (await (await api.get("/api/network/cells")).json()).cells.find((c: { code: string }) => c.code === cell.code);
  expect(now.electricalTiltDeg).toBe(newTilt);
  await Promise.all([engineerContext.close(), ownerContext.close(), fieldContext.close()]);
});

test("the builder's map chooses cells: a wedge adds its cell as the table does, a site's dot lists its cells", async ({ page, baseURL }) => {
  const api = await apiAs(baseURL!, userOf("engineer"));
  type Cell = { code: string; siteCode: string; x: number; y: number; azimuthDeg: number; electricalTiltDeg: number };
  const cells = (await (await api.get("/api/network/cells")).json()).cells as Cell[];
  const cell = cells.find((c) => cells.some((o) => o.siteCode === c.siteCode && o.code !== c.code))!;
  const sibling = cells.find((c) => c.siteCode === cell.siteCode && c.code !== cell.code)!;

  await new SignInPage(page).signIn(userOf("engineer"));
  const builder = new BuilderPage(page);
  await builder.open();
  await builder.waitForMap();
  await expect(builder.valueInput(cell.code)).toHaveCount(0);

  // a click two thirds along the cell's wedge chooses it: the table ticks it, its values row appears,
  // and the wedge turns to the highlight colour
  const onWedge = await builder.mapPoint(cell.x, cell.y, cell.azimuthDeg, 20);
  const before = await builder.mapColourAt(onWedge);
  await builder.clickMap(onWedge);
  await expect(page.getByLabel(`Choose ${cell.code}`)).toBeChecked();
  await expect(builder.valueInput(cell.code)).toBeVisible();
  await expect(page.getByTestId("chosen-count")).toContainText(cell.code);
  const accent = [0x0e, 0x6b, 0x6b];
  const distance = (c: number[]) => Math.hypot(c[0] - accent[0], c[1] - accent[1], c[2] - accent[2]);
  await expect.poll(async () => distance(await builder.mapColourAt(onWedge))).toBeLessThan(distance(before) - 20);

  // a click on the site's dot lists its cells, the chosen one marked; choosing the sibling there adds it too
  await builder.clickMap(await builder.mapPoint(cell.x, cell.y));
  const chooser = page.getByTestId("map-cell-chooser");
  await expect(chooser).toBeVisible();
  await expect(chooser.getByRole("button", { name: new RegExp(cell.code) })).toHaveAttribute("aria-pressed", "true");
  await chooser.getByRole("button", { name: new RegExp(sibling.code) }).click();
  await expect(page.getByLabel(`Choose ${sibling.code}`)).toBeChecked();
  await expect(builder.valueInput(sibling.code)).toBeVisible();
  await screenshot(page, "builder-map-site-list");
  await page.keyboard.press("Escape");
  await expect(chooser).toHaveCount(0);
  await screenshot(page, "builder-map");

  // the wedge again takes the cell out; the table's keyboard path still chooses it back
  await builder.clickMap(onWedge);
  await expect(page.getByLabel(`Choose ${cell.code}`)).not.toBeChecked();
  await expect(builder.valueInput(cell.code)).toHaveCount(0);
  await page.getByLabel(`Choose ${cell.code}`).focus();
  await page.keyboard.press("Space");
  await expect(builder.valueInput(cell.code)).toBeVisible();

  // saved, the cells chosen on the map are the request's items
  const newTilt = sibling.electricalTiltDeg >= 10 ? sibling.electricalTiltDeg - 2 : sibling.electricalTiltDeg + 2;
  await page.getByLabel("Title").fill("Chosen on the map");
  await page.getByLabel("Reason").fill("browser test of choosing cells on the map");
  await builder.valueInput(sibling.code).fill(String(newTilt));
  await page.getByRole("button", { name: "Save as draft" }).click();
  await expect(page).toHaveURL(/\/requests\/(?!new)[^/]+$/);
  await expect(page.getByTestId("items-table")).toContainText(sibling.code);
});

test("a viewer sees no action buttons, and a forced approval from them is refused", async ({ page, baseURL }) => {
  const engineer = await apiAs(baseURL!, userOf("engineer"));
  const cells = (await (await engineer.get("/api/network/cells")).json()).cells as { code: string; rsPowerDbm: number }[];
  const created = await engineer.post("/api/requests", {
    data: { title: "Viewer probe", reason: "check", items: [{ cellId: cells[0].code, parameter: "rsPowerDbm", newValue: cells[0].rsPowerDbm - 1 }] },
  });
  const { id, version } = await created.json();

  await new SignInPage(page).signIn(userOf("viewer"));
  await page.goto(`/requests/${id}`);
  await expect(page.getByTestId("no-actions")).toBeVisible();
  await expect(page.getByRole("button", { name: /Approve|Submit|Reject|Mark implemented/ })).toHaveCount(0);
  await screenshot(page, "request-viewer");

  const forced = await page.request.post(`/api/requests/${id}/actions`, { data: { action: "approve", version } });
  expect(forced.status()).toBe(403);
  const again = await (await engineer.get(`/api/requests/${id}`)).json();
  expect(again.state).toBe("draft");
  expect(again.version).toBe(version);

  await page.goto("/requests");
  await screenshot(page, "requests-list");
});
