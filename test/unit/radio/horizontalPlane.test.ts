import { describe, expect, it } from "vitest";
import { buildHorizontalPlane, planePositionAt } from "../../../lib/radio/horizontalPlane";
import { tinyScenario } from "./scenarioFixtures";

describe("buildHorizontalPlane", () => {
  const plane = buildHorizontalPlane(tinyScenario());
  it("buildHorizontalPlane covers the bounds with gridSizeM positions", () => {
    expect([plane.width, plane.height]).toEqual([20, 12]);
  });
  it("rasterises the building (centre test) into buildingIndex and the building-height map", () => {
    const inside = planePositionAt(plane, 42.5, 22.5), outside = planePositionAt(plane, 37.5, 22.5);
    expect(plane.buildingIndex[inside]).toBe(0);
    expect(plane.buildingIndex[outside]).toBe(-1);
    expect(plane.surfaceHeight[inside]).toBe(20);
    expect(plane.surfaceHeight[outside]).toBe(10);
    let count = 0;
    for (const b of plane.buildingIndex) if (b === 0) count++;
    expect(count).toBe(16);
  });
  it("assigns cluster −1 outside every polygon", () => {
    expect(plane.clusterIndex[planePositionAt(plane, 77.5, 7.5)]).toBe(0);
    expect(plane.clusterIndex[planePositionAt(plane, 12.5, 7.5)]).toBe(-1);
  });
  it("refuses a building with no floors and a negative traffic value, naming them", () => {
    const bad = tinyScenario();
    bad.buildings[0] = { ...bad.buildings[0], floors: 0 };
    expect(() => buildHorizontalPlane(bad)).toThrow(/building "B1": floors/);
    const traffic = { originX: 0, originY: 0, cellSize: 100, width: 1, height: 1, values: new Float32Array([-1]) };
    expect(() => buildHorizontalPlane(tinyScenario({ traffic }))).toThrow(/traffic/);
  });
});
