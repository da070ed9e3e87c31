import { describe, expect, it } from "vitest";
import {
  HIGHLIGHT_WEDGE_SCALE,
  WEDGE_HALF_WIDTH_DEG,
  WEDGE_RADIUS_PX,
  pickAt,
  shownAzimuthDeg,
  toScreen,
  type ScreenView,
} from "../../../../../app/(review)/_components/mapPicking";
import type { MapSiteDto } from "../../../../../app/(review)/_components/types";

// 1 CSS pixel per metre, the world origin at the centre of an 800 × 300 canvas: world (x, y) is canvas (400 + x, 150 − y).
const view: ScreenView = { cx: 0, cy: 0, s: 1, width: 800, height: 300 };

/** The canvas point `distance` pixels from (x, y) towards bearing `deg` (clockwise from north). */
function along(x: number, y: number, deg: number, distance: number) {
  const { px, py } = toScreen(view, x, y);
  const rad = (deg * Math.PI) / 180;
  return { px: px + Math.sin(rad) * distance, py: py - Math.cos(rad) * distance };
}

const threeSectors: MapSiteDto = {
  code: "S1",
  x: 0,
  y: 0,
  cells: [
    { code: "S1-A", azimuthDeg: 0, changed: false },
    { code: "S1-B", azimuthDeg: 120, changed: false },
    { code: "S1-C", azimuthDeg: 240, changed: false },
  ],
};

describe("toScreen(view, x, y)", () => {
  it("toScreen puts the view centre at the canvas centre, east right and north up", () => {
    expect(toScreen(view, 0, 0)).toEqual({ px: 400, py: 150 });
    expect(toScreen(view, 10, 0)).toEqual({ px: 410, py: 150 });
    expect(toScreen(view, 0, 10)).toEqual({ px: 400, py: 140 });
    expect(toScreen({ cx: 100, cy: 50, s: 2, width: 800, height: 300 }, 110, 50)).toEqual({ px: 420, py: 150 });
  });
});

describe("pickAt(sites, view, px, py, stage)", () => {
  it("pickAt picks the cell whose wedge is under the press, for each of three sectors", () => {
    for (const cell of threeSectors.cells) {
      const { px, py } = along(0, 0, cell.azimuthDeg, WEDGE_RADIUS_PX * 0.7);
      expect(pickAt([threeSectors], view, px, py, "after")).toEqual({ kind: "cell", siteCode: "S1", cellCode: cell.code });
    }
  });

  it("pickAt forgives a press a little off a slim wedge, but not one between two wedges", () => {
    const near = along(0, 0, 120 + WEDGE_HALF_WIDTH_DEG + 6, WEDGE_RADIUS_PX * 0.8);
    expect(pickAt([threeSectors], view, near.px, near.py, "after")).toMatchObject({ kind: "cell", cellCode: "S1-B" });
    const between = along(0, 0, 60, WEDGE_RADIUS_PX * 0.8);
    expect(pickAt([threeSectors], view, between.px, between.py, "after")).toBeNull();
  });

  it("pickAt picks nothing past a wedge's tip, and reaches further for a highlighted (longer) wedge", () => {
    const beyond = along(0, 0, 0, WEDGE_RADIUS_PX * HIGHLIGHT_WEDGE_SCALE + 2);
    expect(pickAt([threeSectors], view, beyond.px, beyond.py, "after")).toBeNull();
    const highlighted: MapSiteDto = { ...threeSectors, cells: threeSectors.cells.map((c) => ({ ...c, changed: c.code === "S1-A" })) };
    expect(pickAt([highlighted], view, beyond.px, beyond.py, "after")).toMatchObject({ kind: "cell", cellCode: "S1-A" });
  });

  it("pickAt on a site's dot gives the site with all its cells to choose from", () => {
    const { px, py } = toScreen(view, 0, 0);
    expect(pickAt([threeSectors], view, px + 2, py - 3, "after")).toEqual({ kind: "site", siteCode: "S1", cellCodes: ["S1-A", "S1-B", "S1-C"] });
  });

  it("pickAt lists the cells of a site whose wedges lie on top of each other instead of guessing one", () => {
    const twoCarriers: MapSiteDto = {
      code: "S2",
      x: 0,
      y: 0,
      cells: [
        { code: "S2-L", azimuthDeg: 90, changed: false },
        { code: "S2-H", azimuthDeg: 92, changed: false },
        { code: "S2-S", azimuthDeg: 200, changed: false },
      ],
    };
    const { px, py } = along(0, 0, 91, 20);
    expect(pickAt([twoCarriers], view, px, py, "after")).toEqual({ kind: "site", siteCode: "S2", cellCodes: ["S2-L", "S2-H"] });
  });

  it("pickAt follows the wedges as drawn: the azimuth before the change in the before view", () => {
    const turned: MapSiteDto = { code: "S3", x: 0, y: 0, cells: [{ code: "S3-A", azimuthDeg: 90, azimuthBeforeDeg: 270, changed: true }] };
    expect(shownAzimuthDeg(turned.cells[0], "before")).toBe(270);
    const east = along(0, 0, 90, 20), west = along(0, 0, 270, 20);
    expect(pickAt([turned], view, east.px, east.py, "after")).toMatchObject({ cellCode: "S3-A" });
    expect(pickAt([turned], view, east.px, east.py, "before")).toBeNull();
    expect(pickAt([turned], view, west.px, west.py, "before")).toMatchObject({ cellCode: "S3-A" });
  });

  it("pickAt takes the nearest site when two sites' wedges meet, and works at any scale", () => {
    const zoomed: ScreenView = { cx: 500, cy: 500, s: 0.2, width: 800, height: 300 };
    const a: MapSiteDto = { code: "A", x: 500, y: 500, cells: [{ code: "A-1", azimuthDeg: 90, changed: false }] };
    const b: MapSiteDto = { code: "B", x: 600, y: 500, cells: [{ code: "B-1", azimuthDeg: 270, changed: false }] };
    // the sites are 20 px apart on screen, their wedges pointing at each other: a press between the dots lies on both
    // wedges at the same angle off each, so the nearer site wins
    const pressA = { px: 400 + 9, py: 150 };
    expect(pickAt([a, b], zoomed, pressA.px, pressA.py, "after")).toMatchObject({ cellCode: "A-1" });
    const pressB = { px: 400 + 11, py: 150 };
    expect(pickAt([a, b], zoomed, pressB.px, pressB.py, "after")).toMatchObject({ cellCode: "B-1" });
  });

  it("pickAt finds nothing on an empty map or far from every site", () => {
    expect(pickAt([], view, 400, 150, "after")).toBeNull();
    expect(pickAt([threeSectors], view, 700, 20, "after")).toBeNull();
  });
});
