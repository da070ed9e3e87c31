import { expect, type Page } from "@playwright/test";

/** Page object of a change request's page (impact, actions, timeline). */
export class RequestPage {
  constructor(private readonly page: Page) {}

  async open(url: string) {
    await this.page.goto(url);
  }

  state() {
    return this.page.getByRole("heading", { level: 1 });
  }

  async press(name: string, comment?: string) {
    if (comment !== undefined) await this.page.getByLabel(/^Comment/).fill(comment);
    await this.page.getByRole("button", { name, exact: true }).click();
  }

  /** Waits for the impact section, its map drawn and its charts (which start after the map) drawn too. */
  async waitForImpact() {
    await expect(this.page.getByRole("heading", { name: /Predicted impact/ })).toBeVisible({ timeout: 240_000 });
    await expect(this.page.getByTestId("grid-map")).toHaveAttribute("data-ready", "true", { timeout: 60_000 });
    await expect(this.page.getByTestId("delta-chart").locator("svg.recharts-surface").first()).toBeVisible();
    await expect(this.page.getByTestId("cdf-chart")).toHaveCount(2);
    await expect(this.page.locator(".chart[aria-busy]")).toHaveCount(0);
  }

  /** Variance of the RGB channels of the map canvas: a blank or single-colour canvas gives ~0. */
  async mapPixelVariance(): Promise<number> {
    const canvas = this.page.getByTestId("grid-map");
    await expect(canvas).toBeVisible();
    // Give the raster fetch and the first draw a moment.
    await this.page.waitForTimeout(1500);
    return canvas.evaluate((element) => {
      const c = element as HTMLCanvasElement;
      const data = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
      let sum = 0, sumSq = 0, n = 0;
      for (let i = 0; i < data.length; i += 16) {
        for (let k = 0; k < 3; k++) {
          sum += data[i + k];
          sumSq += data[i + k] * data[i + k];
          n++;
        }
      }
      const mean = sum / n;
      return sumSq / n - mean * mean;
    });
  }
}

/** A point on the map canvas, CSS pixels from its top-left corner. */
export interface MapPoint {
  px: number;
  py: number;
}

/** Page object of the request builder. */
export class BuilderPage {
  constructor(private readonly page: Page) {}

  async open() {
    await this.page.goto("/requests/new");
  }

  map() {
    return this.page.getByTestId("grid-map");
  }

  /** Waits until the map has drawn its coverage layer (so the view no longer moves on its own). */
  async waitForMap() {
    await expect(this.map()).toHaveAttribute("data-ready", "true", { timeout: 90_000 });
  }

  /**
   * The canvas point `distancePx` screen pixels from world point (x, y) towards bearing `bearingDeg` (clockwise
   * from north), by the view the map last drew (its data-view: centre in local metres, CSS pixels per metre).
   */
  async mapPoint(x: number, y: number, bearingDeg = 0, distancePx = 0): Promise<MapPoint> {
    const view = JSON.parse((await this.map().getAttribute("data-view")) ?? "null") as { cx: number; cy: number; s: number } | null;
    if (!view) throw new Error("the map has not drawn yet (no data-view)");
    const box = await this.map().boundingBox();
    if (!box) throw new Error("the map is not on screen");
    const rad = (bearingDeg * Math.PI) / 180;
    return {
      px: box.width / 2 + (x - view.cx) * view.s + Math.sin(rad) * distancePx,
      py: box.height / 2 - (y - view.cy) * view.s - Math.cos(rad) * distancePx,
    };
  }

  async clickMap(point: MapPoint) {
    await this.map().click({ position: { x: point.px, y: point.py } });
  }

  /** The canvas colour at a point, [r, g, b]. */
  async mapColourAt(point: MapPoint): Promise<[number, number, number]> {
    return this.map().evaluate((element, { px, py }) => {
      const canvas = element as HTMLCanvasElement;
      const scale = canvas.width / canvas.getBoundingClientRect().width;
      const d = canvas.getContext("2d")!.getImageData(Math.round(px * scale), Math.round(py * scale), 1, 1).data;
      return [d[0], d[1], d[2]] as [number, number, number];
    }, point);
  }

  /** The "New values" row inputs of a chosen cell: present exactly when the cell is in the request. */
  valueInput(cell: string, label = "Electrical tilt") {
    return this.page.getByLabel(`${cell} ${label}`);
  }

  async create(title: string, reason: string, cell: string, electricalTilt: string) {
    await this.page.goto("/requests/new");
    await this.page.getByLabel("Title").fill(title);
    await this.page.getByLabel("Reason").fill(reason);
    await this.page.getByLabel("Filter cells").fill(cell);
    await this.page.getByLabel(`Choose ${cell}`).check();
    await this.page.getByLabel(`${cell} Electrical tilt`).fill(electricalTilt);
    await this.page.getByRole("button", { name: "Save as draft" }).click();
  }
}
