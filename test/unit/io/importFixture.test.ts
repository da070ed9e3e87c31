import { describe, expect, it } from "vitest";
import { FIXTURE_CENTRE, generateImportFixture } from "../../../lib/io/fixtures/importFixture";
import { parseNetworkUpload } from "../../../lib/io/networkImport";

describe("generateImportFixture(options)", () => {
  it("is seeded: the same seed gives the same bytes, another seed other bytes", () => {
    const a = generateImportFixture({ seed: 5, sites: 4, lotsPerSide: 5 });
    const b = generateImportFixture({ seed: 5, sites: 4, lotsPerSide: 5 });
    const c = generateImportFixture({ seed: 6, sites: 4, lotsPerSide: 5 });
    expect(a).toEqual(b);
    expect(a.find((f) => f.name === "sites.csv")).not.toEqual(c.find((f) => f.name === "sites.csv"));
  });

  it("imports cleanly at full size: at least 500 cells and 10 000 buildings, in the open ocean", async () => {
    const { scenario, projection, report } = await parseNetworkUpload(generateImportFixture());
    expect(report.errors).toEqual([]);
    expect(scenario!.cells.length).toBeGreaterThanOrEqual(500);
    expect(scenario!.buildings.length).toBeGreaterThanOrEqual(10_000);
    expect(projection).toMatchObject({ zone: 8, hemisphere: "south" });
    expect(Math.abs(scenario!.origin!.lon - FIXTURE_CENTRE.lon)).toBeLessThan(0.1);
    expect(Math.abs(scenario!.origin!.lat - FIXTURE_CENTRE.lat)).toBeLessThan(0.1);
    // Every site stands on terrain that the generator made (above the 12 m base).
    expect(scenario!.sites.every((s) => s.groundHeightM > 0)).toBe(true);
  });
});
