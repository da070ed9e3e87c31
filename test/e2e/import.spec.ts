import http from "node:http";
// The web paths of files in and out: the PDF impact report, the bulk change upload and the network import.
// Report and bulk tests run first: they build on the demo network while it is the only one (the import below
// adds a second network, and requests built without naming a network need exactly one).
import { expect, test } from "@playwright/test";
import { SignInPage } from "./signin-page";
import { userOf } from "./support";
import { apiAs } from "./api-client";
import { generateImportFixture } from "../../lib/io/fixtures/importFixture";

/** A small invented set in the upload format: 4 sites, 12 cells, 16 buildings, four clusters, GeoTIFF terrain. */
function smallSet(): { name: string; mimeType: string; buffer: Buffer }[] {
  return generateImportFixture({ seed: 5, sites: 4, lotsPerSide: 4 }).map((f) => ({
    name: f.name,
    mimeType: f.name.endsWith(".csv") ? "text/csv" : f.name.endsWith(".tif") ? "image/tiff" : "application/geo+json",
    buffer: Buffer.from(f.bytes),
  }));
}

/** The same set with cells.csv row 3 given an azimuth of 400° and row 4 an unknown site. */
function badSet() {
  return smallSet().map((f) => {
    if (f.name !== "cells.csv") return f;
    const lines = f.buffer.toString("utf8").split("\n");
    const header = lines[0].split(",");
    const azimuth = header.indexOf("azimuth_deg");
    const site = header.indexOf("site_id");
    const row3 = lines[2].split(",");
    row3[azimuth] = "400";
    lines[2] = row3.join(",");
    const row4 = lines[3].split(",");
    row4[site] = "NO-SUCH-SITE";
    lines[3] = row4.join(",");
    return { ...f, buffer: Buffer.from(lines.join("\n")) };
  });
}

test("GET /api/requests/:id/report answers the impact report as a PDF for an owner", async ({ baseURL }) => {
  const engineer = await apiAs(baseURL!, userOf("engineer"));
  const cells = (await (await engineer.get("/api/network/cells")).json()).cells as { code: string; electricalTiltDeg: number }[];
  const cell = cells[1];
  const created = await engineer.post("/api/requests", {
    data: {
      title: "Report check",
      reason: "PDF impact report",
      items: [{ cellId: cell.code, parameter: "electricalTiltDeg", newValue: cell.electricalTiltDeg >= 10 ? cell.electricalTiltDeg - 2 : cell.electricalTiltDeg + 2 }],
    },
  });
  expect(created.status()).toBe(201);
  const request = await created.json();
  const preview = await engineer.post(`/api/requests/${request.id}/preview`, { data: { version: request.version } });
  expect(preview.status()).toBe(202);
  const { simulationId } = await preview.json();
  await expect
    .poll(async () => (await (await engineer.get(`/api/simulations/${simulationId}`)).json()).status, { timeout: 240_000, intervals: [2000] })
    .toBe("done");

  const owner = await apiAs(baseURL!, userOf("owner"));
  const pdf = await owner.get(`/api/requests/${request.id}/report`, { timeout: 120_000 });
  expect(pdf.status()).toBe(200);
  expect(pdf.headers()["content-type"]).toBe("application/pdf");
  expect(pdf.headers()["content-disposition"]).toMatch(/attachment; filename="impact-report-CR\d+\.pdf"/);
  const body = await pdf.body();
  expect(body.subarray(0, 5).toString("latin1")).toBe("%PDF-");
  expect(body.length).toBeGreaterThan(20_000);

  // Without a session there is no report.
  const visitor = await apiAs(baseURL!, null);
  expect((await visitor.get(`/api/requests/${request.id}/report`)).status()).toBe(401);
});

test("POST /api/requests/bulk names the CSV row of a refused change, then creates the draft from a clean file", async ({ baseURL }) => {
  const engineer = await apiAs(baseURL!, userOf("engineer"));
  const cells = (await (await engineer.get("/api/network/cells")).json()).cells as { code: string; electricalTiltDeg: number }[];
  const [a, b] = cells;
  const csv = (rows: string[]) => ({ name: "changes.csv", mimeType: "text/csv", buffer: Buffer.from(["cell_id,parameter,new_value", ...rows].join("\n") + "\n") });
  // Row 3 asks for 40° of electrical tilt: past every antenna's range, refused by the request validation.
  const bad = await engineer.post("/api/requests/bulk", {
    multipart: { file: csv([`${a.code},electrical_tilt,${a.electricalTiltDeg >= 10 ? a.electricalTiltDeg - 1 : a.electricalTiltDeg + 1}`, `${b.code},electrical_tilt,40`]), title: "Bulk", reason: "bulk test" },
  });
  expect(bad.status()).toBe(422);
  const refused = (await bad.json()).report.errors as { file: string; row: number; column: string; reason: string }[];
  expect(refused).toEqual([expect.objectContaining({ file: "changes.csv", row: 3, column: "new_value" })]);

  const good = await engineer.post("/api/requests/bulk", {
    multipart: { file: csv([`${a.code},electrical_tilt,${a.electricalTiltDeg >= 10 ? a.electricalTiltDeg - 1 : a.electricalTiltDeg + 1}`]), title: "Bulk", reason: "bulk test" },
  });
  expect(good.status()).toBe(201);
  const { id } = await good.json();
  const detail = await (await engineer.get(`/api/requests/${id}`)).json();
  expect(JSON.stringify(detail)).toContain(a.code);
});

test("an admin imports a network: a bad set shows file/row/column and imports nothing, a clean set is listed", async ({ page }) => {
  await new SignInPage(page).signIn(userOf("admin"));
  await page.getByRole("link", { name: "Import", exact: true }).click();
  await expect(page).toHaveURL(/\/admin\/import$/);

  await page.locator("#import-files").setInputFiles(badSet());
  await page.getByLabel("Network name").fill("E2E Bad Reach");
  await page.getByRole("button", { name: "Import", exact: true }).click();
  await expect(page.getByTestId("import-outcome")).toContainText("nothing was imported");
  const errors = page.getByTestId("errors-table");
  await expect(errors.getByRole("row").filter({ hasText: "cells.csv" }).filter({ hasText: "azimuth_deg" }).filter({ hasText: "400" })).toHaveCount(1);
  await expect(errors.getByRole("row").filter({ hasText: "cells.csv" }).filter({ hasText: "site_id" })).toHaveCount(1);
  await expect(errors.getByRole("row").filter({ hasText: "azimuth_deg" }).getByRole("cell").nth(1)).toHaveText("3");
  await expect(page.getByTestId("warnings-table")).toBeVisible();
  await page.reload();
  await expect(page.getByTestId("networks-table")).not.toContainText("E2E Bad Reach");

  await page.locator("#import-files").setInputFiles(smallSet());
  await page.getByLabel("Network name").fill("E2E Import Reach");
  await page.getByRole("button", { name: "Check" }).click();
  await expect(page.getByTestId("import-outcome")).toContainText("can be imported");
  await expect(page.getByTestId("networks-table")).not.toContainText("E2E Import Reach");
  await page.getByRole("button", { name: "Import", exact: true }).click();
  await expect(page.getByTestId("import-outcome")).toContainText("Imported “E2E Import Reach”: 4 sites, 12 cells, 16 buildings");
  await expect(page.getByTestId("networks-table")).toContainText("E2E Import Reach");

  // The same name again is refused, naming it.
  await page.getByRole("button", { name: "Import", exact: true }).click();
  await expect(page.getByTestId("import-outcome")).toContainText('a network named "E2E Import Reach" already exists');
});

test("POST /api/import over the size limit is refused with 413 before it is read, and the app still serves", async ({ page, baseURL }) => {
  const admin = await apiAs(baseURL!, userOf("admin"));
  const cookie = (await admin.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join("; ");
  // Announce 60 MB but send only the first kilobyte: the server must answer from the
  // Content-Length alone (a full upload would race the early answer and end in EPIPE).
  const url = new URL("/api/import", baseURL);
  const { status, body } = await new Promise<{ status: number; body: string }>((resolve, reject) => {
    const request = http.request(
      { host: url.hostname, port: url.port, path: url.pathname, method: "POST",
        headers: { cookie, "content-type": "multipart/form-data; boundary=beamgate-oversize", "content-length": String(60 * 1024 * 1024) } },
      (response) => {
        let text = "";
        response.setEncoding("utf8");
        response.on("data", (chunk) => (text += chunk));
        response.on("end", () => {
          resolve({ status: response.statusCode ?? 0, body: text });
          request.destroy();
        });
      },
    );
    request.on("error", reject);
    request.write(Buffer.alloc(1024, 0x61));
  });
  expect(status).toBe(413);
  expect(JSON.parse(body).error.message).toMatch(/too large: 60\.0 MB, over the limit of 50\.0 MB/);
  const signin = await page.goto("/signin");
  expect(signin?.status()).toBe(200);
});

test("POST /api/import is 403 for an engineer and 401 without a session", async ({ baseURL }) => {
  const [sites] = smallSet();
  const engineer = await apiAs(baseURL!, userOf("engineer"));
  expect((await engineer.post("/api/import?dryRun=1", { multipart: { files: sites } })).status()).toBe(403);
  const visitor = await apiAs(baseURL!, null);
  expect((await visitor.post("/api/import?dryRun=1", { multipart: { files: sites } })).status()).toBe(401);
});
