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

  async waitForImpact() {
    await expect(this.page.getByRole("heading", { name: /Predicted impact/ })).toBeVisible({ timeout: 240_000 });
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

/** Page object of the request builder. */
export class BuilderPage {
  constructor(private readonly page: Page) {}

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
