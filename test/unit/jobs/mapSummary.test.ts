import { describe, expect, it } from "vitest";
import { cdfsOf, mapSummaryOf, readMapSummary } from "../../../lib/jobs/mapSummary";
import { cdfPoints } from "../../../lib/io/cdf";
import { floorsOf, quantiseCentiDb } from "../../../lib/io/mapRaster";
import { prepareEngine } from "../../../lib/radio/engine";
import { generateBenchScenario } from "../../bench/benchScenario";

describe("mapSummaryOf", () => {
  const scenario = generateBenchScenario({ seed: 31, sizeM: 400, sites: 2, gridSizeM: 10 });
  const engine = prepareEngine(scenario);
  const after = engine.evaluate([{ cellId: scenario.cells[0].id, parameter: "azimuthDeg", value: 200 }]);
  const layers = {
    bestRsrpBefore: quantiseCentiDb(engine.baseline.kpis.perGrid.bestRsrpDbm),
    bestRsrpAfter: quantiseCentiDb(after.kpis.perGrid.bestRsrpDbm),
    sinrBefore: quantiseCentiDb(engine.baseline.kpis.perGrid.sinrDb),
    sinrAfter: quantiseCentiDb(after.kpis.perGrid.sinrDb),
  };

  it("mapSummaryOf(grid, layers) holds the grid's floors and plane and the CDFs cdfPoints draws from the stored layers", () => {
    const summary = mapSummaryOf(engine.grid, layers);
    expect(summary.floors).toEqual(floorsOf(engine.grid));
    expect(summary.floors.length).toBeGreaterThan(1);
    const { originX, originY, cellSize, width, height } = engine.grid.plane;
    expect(summary.plane).toEqual({ originX, originY, cellSize, width, height });
    expect(summary.cdfs.bestRsrp.after).toEqual(cdfPoints(layers.bestRsrpAfter));
    expect(summary.cdfs.sinr.before).toEqual(cdfPoints(layers.sinrBefore));
    expect(summary.cdfs.bestRsrp.before).not.toEqual(summary.cdfs.bestRsrp.after);
  });

  it("readMapSummary gives back what went through the JSON column unchanged", () => {
    const stored = JSON.parse(JSON.stringify({ network: {}, map: mapSummaryOf(engine.grid, layers) }));
    expect(readMapSummary(stored)).toEqual(mapSummaryOf(engine.grid, layers));
    expect(readMapSummary(stored)!.cdfs).toEqual(cdfsOf(layers));
  });

  it("readMapSummary returns null for summaries stored before it existed or of another shape", () => {
    const good = JSON.parse(JSON.stringify(mapSummaryOf(engine.grid, layers)));
    expect(readMapSummary(null)).toBeNull();
    expect(readMapSummary({ network: {} })).toBeNull();
    expect(readMapSummary({ map: { ...good, floors: [0, -1] } })).toBeNull();
    expect(readMapSummary({ map: { ...good, plane: { ...good.plane, width: null } } })).toBeNull();
    expect(readMapSummary({ map: { ...good, cdfs: { bestRsrp: good.cdfs.bestRsrp } } })).toBeNull();
    expect(readMapSummary({ map: { ...good, cdfs: { ...good.cdfs, sinr: { before: [{ value: "x", fraction: 0 }], after: [] } } } })).toBeNull();
  });
});
