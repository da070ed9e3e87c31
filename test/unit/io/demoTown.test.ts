import { describe, expect, it } from "vitest";
import { DEMO_USERS, generateDemoTown } from "../../../lib/io/demoTown";
import type { Point, Raster, Scenario } from "../../../lib/radio/scenario";

// Independent geometry for the checks (not the generator's own helpers).

function terrainAt(raster: Raster, p: Point): number {
  const col = Math.min(raster.width - 1, Math.max(0, Math.floor((p.x - raster.originX) / raster.cellSize)));
  const row = Math.min(raster.height - 1, Math.max(0, Math.floor((p.y - raster.originY) / raster.cellSize)));
  return raster.values[row * raster.width + col];
}

/** Ray-casting point-in-polygon test (ring without repeated first point). */
function inside(polygon: Point[], p: Point): boolean {
  let within = false;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const a = polygon[i];
    const b = polygon[j];
    if (a.y > p.y !== b.y > p.y && p.x < ((b.x - a.x) * (p.y - a.y)) / (b.y - a.y) + a.x) within = !within;
  }
  return within;
}

/** Separating-axis test for convex polygons; true only when the interiors overlap. */
function convexInteriorsOverlap(a: Point[], b: Point[]): boolean {
  for (const poly of [a, b]) {
    for (let i = 0; i < poly.length; i++) {
      const p = poly[i];
      const q = poly[(i + 1) % poly.length];
      const axis = { x: q.y - p.y, y: p.x - q.x };
      const project = (v: Point) => v.x * axis.x + v.y * axis.y;
      const pa = a.map(project);
      const pb = b.map(project);
      if (Math.max(...pa) <= Math.min(...pb) + 1e-9 || Math.max(...pb) <= Math.min(...pa) + 1e-9) return false;
    }
  }
  return true;
}

function centroid(poly: Point[]): Point {
  return { x: poly.reduce((s, p) => s + p.x, 0) / poly.length, y: poly.reduce((s, p) => s + p.y, 0) / poly.length };
}

function isConvexRectangle(poly: Point[]): boolean {
  if (poly.length !== 4) return false;
  for (let i = 0; i < 4; i++) {
    const a = poly[i];
    const b = poly[(i + 1) % 4];
    const c = poly[(i + 2) % 4];
    const dot = (b.x - a.x) * (c.x - b.x) + (b.y - a.y) * (c.y - b.y);
    const len = Math.hypot(b.x - a.x, b.y - a.y) * Math.hypot(c.x - b.x, c.y - b.y);
    // Corners are right angles; 1 cm rounding of an 8 m house tilts an edge by up to ~0.0025 rad.
    if (Math.abs(dot / len) > 5e-3) return false;
  }
  return true;
}

const SEEDS = [7, 1, 2, 3, 42, 2024];
const towns = new Map<number, Scenario>(SEEDS.map((s) => [s, generateDemoTown(s)]));

describe("generateDemoTown(seed)", () => {
  it("generateDemoTown(seed) is deterministic: the same seed gives a deep-equal scenario", () => {
    const a = generateDemoTown(7);
    const b = generateDemoTown(7);
    expect(a).toEqual(b);
    expect(a.terrain.values).toBeInstanceOf(Float32Array);
    expect(generateDemoTown()).toEqual(a); // 7 is the default seed
  });

  it("generateDemoTown(seed) gives a different town for a different seed", () => {
    const a = towns.get(7)!;
    const b = towns.get(1)!;
    expect(a.buildings).not.toEqual(b.buildings);
    expect(a.cells).not.toEqual(b.cells);
  });

  it("generateDemoTown() runs in under 200 ms", () => {
    let best = Infinity;
    for (let i = 0; i < 3; i++) {
      const t0 = performance.now();
      generateDemoTown(100 + i);
      best = Math.min(best, performance.now() - t0);
    }
    expect(best).toBeLessThan(200);
  });

  it.each(SEEDS)("seed %i: bounds are 1.6 km × 1.2 km from (0, 0) with 10 m terrain and traffic rasters", (seed) => {
    const s = towns.get(seed)!;
    expect(s.bounds).toEqual({ minX: 0, minY: 0, maxX: 1600, maxY: 1200 });
    for (const r of [s.terrain, s.traffic!]) {
      expect(r).toMatchObject({ originX: 0, originY: 0, cellSize: 10, width: 160, height: 120 });
      expect(r.values).toBeInstanceOf(Float32Array);
      expect(r.values.length).toBe(160 * 120);
    }
  });

  it.each(SEEDS)("seed %i: terrain has sea (0 m) in the south, a beach, and a 60–80 m hill in the north-east", (seed) => {
    const t = towns.get(seed)!.terrain;
    // The southern row is sea, the northern row is land.
    for (let col = 0; col < t.width; col++) {
      expect(t.values[col]).toBe(0);
      expect(t.values[(t.height - 1) * t.width + col]).toBeGreaterThan(0);
    }
    let max = -Infinity;
    let at = 0;
    for (let i = 0; i < t.values.length; i++) if (t.values[i] > max) [max, at] = [t.values[i], i];
    expect(max).toBeGreaterThanOrEqual(60);
    expect(max).toBeLessThanOrEqual(80);
    const col = at % t.width;
    const row = Math.floor(at / t.width);
    expect(col).toBeGreaterThan(t.width / 2);
    expect(row).toBeGreaterThan(t.height / 2);
    // The beach: land within the first 60 m of the shore stays low (under 6 m).
    for (let c = 0; c < t.width; c += 10) {
      let r = 0;
      while (t.values[r * t.width + c] === 0) r++;
      for (let k = 0; k < 5; k++) expect(t.values[(r + k) * t.width + c]).toBeLessThan(6);
    }
  });

  it.each(SEEDS)("seed %i: 300–500 buildings of 1–15 floors, height = 3 m per floor plus a roof margin", (seed) => {
    const s = towns.get(seed)!;
    expect(s.buildings.length).toBeGreaterThanOrEqual(300);
    expect(s.buildings.length).toBeLessThanOrEqual(500);
    const floors = s.buildings.map((b) => b.floors);
    expect(Math.min(...floors)).toBe(1);
    expect(Math.max(...floors)).toBeGreaterThanOrEqual(12);
    expect(Math.max(...floors)).toBeLessThanOrEqual(15);
    for (const b of s.buildings) {
      expect(Number.isInteger(b.floors)).toBe(true);
      const margin = b.heightM - b.floors * 3;
      expect(margin).toBeGreaterThan(0);
      expect(margin).toBeLessThanOrEqual(3);
    }
    expect(new Set(s.buildings.map((b) => b.id)).size).toBe(s.buildings.length);
  });

  it.each(SEEDS)("seed %i: every building is a rectangle within the bounds and on land, some rotated", (seed) => {
    const s = towns.get(seed)!;
    let rotated = 0;
    for (const b of s.buildings) {
      expect(isConvexRectangle(b.footprint)).toBe(true);
      for (const p of b.footprint) {
        expect(p.x).toBeGreaterThanOrEqual(s.bounds.minX);
        expect(p.x).toBeLessThanOrEqual(s.bounds.maxX);
        expect(p.y).toBeGreaterThanOrEqual(s.bounds.minY);
        expect(p.y).toBeLessThanOrEqual(s.bounds.maxY);
        expect(terrainAt(s.terrain, p)).toBeGreaterThan(0);
      }
      const [a, c] = b.footprint;
      if (a.x !== c.x && a.y !== c.y) rotated++;
    }
    expect(rotated).toBeGreaterThan(20);
  });

  it.each(SEEDS)("seed %i: no two buildings overlap", (seed) => {
    const s = towns.get(seed)!;
    const boxes = s.buildings.map((b) => ({
      minX: Math.min(...b.footprint.map((p) => p.x)),
      maxX: Math.max(...b.footprint.map((p) => p.x)),
      minY: Math.min(...b.footprint.map((p) => p.y)),
      maxY: Math.max(...b.footprint.map((p) => p.y)),
    }));
    const overlaps: string[] = [];
    for (let i = 0; i < s.buildings.length; i++) {
      for (let j = i + 1; j < s.buildings.length; j++) {
        const a = boxes[i];
        const b = boxes[j];
        if (a.maxX <= b.minX || b.maxX <= a.minX || a.maxY <= b.minY || b.maxY <= a.minY) continue;
        if (convexInteriorsOverlap(s.buildings[i].footprint, s.buildings[j].footprint)) {
          overlaps.push(`${s.buildings[i].id}/${s.buildings[j].id}`);
        }
      }
    }
    expect(overlaps).toEqual([]);
  });

  it.each(SEEDS)("seed %i: 14–18 sites on land; rooftop sites stand on a roof and mast sites on open ground", (seed) => {
    const s = towns.get(seed)!;
    expect(s.sites.length).toBeGreaterThanOrEqual(14);
    expect(s.sites.length).toBeLessThanOrEqual(18);
    expect(new Set(s.sites.map((x) => x.id)).size).toBe(s.sites.length);
    let rooftops = 0;
    let masts = 0;
    for (const site of s.sites) {
      expect(terrainAt(s.terrain, site)).toBeGreaterThan(0);
      expect(site.groundHeightM).toBeCloseTo(terrainAt(s.terrain, site), 2);
      const under = s.buildings.find((b) => inside(b.footprint, site));
      const heights = s.cells.filter((c) => c.siteId === site.id).map((c) => c.antennaHeightM);
      if (/rooftop/.test(site.name)) {
        rooftops++;
        expect(under).toBeDefined();
        for (const h of heights) expect(h).toBeGreaterThan(under!.heightM);
      } else {
        masts++;
        expect(site.name).toMatch(/mast/);
        expect(under).toBeUndefined();
        for (const h of heights) expect(h).toBeGreaterThanOrEqual(20);
      }
    }
    expect(rooftops).toBeGreaterThan(0);
    expect(masts).toBeGreaterThan(0);
  });

  it.each(SEEDS)("seed %i: every site has 2–3 cells with readable ids and valid hardware values", (seed) => {
    const s = towns.get(seed)!;
    const models = new Map(s.antennaModels.map((m) => [m.id, m]));
    for (const site of s.sites) {
      const n = s.cells.filter((c) => c.siteId === site.id).length;
      expect(n).toBeGreaterThanOrEqual(2);
      expect(n).toBeLessThanOrEqual(3);
    }
    expect(new Set(s.cells.map((c) => c.id)).size).toBe(s.cells.length);
    const siteIds = new Set(s.sites.map((x) => x.id));
    for (const c of s.cells) {
      expect(c.id).toMatch(/^[A-Z]{3}\d{2}-[A-C]$/);
      expect(c.id.startsWith(`${c.siteId}-`)).toBe(true);
      expect(siteIds.has(c.siteId)).toBe(true);
      const m = models.get(c.antennaModelId);
      expect(m).toBeDefined();
      expect(m!.beamSetIds).toContain(c.beamSetId);
      expect(c.azimuthDeg).toBeGreaterThanOrEqual(0);
      expect(c.azimuthDeg).toBeLessThan(360);
      expect(c.electricalTiltDeg).toBeGreaterThanOrEqual(m!.electricalTiltMinDeg);
      expect(c.electricalTiltDeg).toBeLessThanOrEqual(m!.electricalTiltMaxDeg);
      expect(c.mechanicalTiltDeg).toBeGreaterThanOrEqual(m!.mechanicalTiltMinDeg);
      expect(c.mechanicalTiltDeg).toBeLessThanOrEqual(m!.mechanicalTiltMaxDeg);
      expect(c.rsPowerDbm).toBeGreaterThanOrEqual(m!.rsPowerMinDbm);
      expect(c.rsPowerDbm).toBeLessThanOrEqual(m!.rsPowerMaxDbm);
      expect([
        [1800, 20, 15],
        [3500, 40, 30],
      ]).toContainEqual([c.frequencyMHz, c.bandwidthMHz, c.subcarrierSpacingKHz]);
    }
  });

  it.each(SEEDS)("seed %i: every beam set is used, with several antenna models and both bands", (seed) => {
    const s = towns.get(seed)!;
    expect(s.beamSets.length).toBeGreaterThanOrEqual(5);
    for (const set of s.beamSets) expect(s.cells.some((c) => c.beamSetId === set.id)).toBe(true);
    expect(new Set(s.cells.map((c) => c.antennaModelId)).size).toBeGreaterThanOrEqual(3);
    expect(new Set(s.cells.map((c) => c.frequencyMHz))).toEqual(new Set([1800, 3500]));
  });

  it.each(SEEDS)("seed %i: 3–4 disjoint clusters, each holding buildings and a site", (seed) => {
    const s = towns.get(seed)!;
    expect(s.clusters.length).toBeGreaterThanOrEqual(3);
    expect(s.clusters.length).toBeLessThanOrEqual(4);
    for (const cl of s.clusters) {
      expect(cl.polygon.length).toBeGreaterThanOrEqual(3);
      const held = s.buildings.filter((b) => inside(cl.polygon, centroid(b.footprint)));
      expect(held.length, cl.name).toBeGreaterThanOrEqual(5);
      expect(s.sites.some((site) => inside(cl.polygon, site)), cl.name).toBe(true);
    }
    // Every 5 m grid centre belongs to at most one cluster.
    let shared = 0;
    for (let x = 2.5; x < 1600; x += 5) {
      for (let y = 2.5; y < 1200; y += 5) {
        let n = 0;
        for (const cl of s.clusters) if (inside(cl.polygon, { x, y })) n++;
        if (n > 1) shared++;
      }
    }
    expect(shared).toBe(0);
  });

  it.each(SEEDS)("seed %i: the centre is taller and busier than the harbour", (seed) => {
    const s = towns.get(seed)!;
    const cluster = (id: string) => s.clusters.find((c) => c.id === id)!.polygon;
    const meanFloors = (poly: Point[]) => {
      const f = s.buildings.filter((b) => inside(poly, centroid(b.footprint))).map((b) => b.floors);
      return f.reduce((a, b) => a + b, 0) / f.length;
    };
    expect(meanFloors(cluster("centre"))).toBeGreaterThan(meanFloors(cluster("harbour")) + 2);
    const t = s.traffic!;
    const meanTraffic = (poly: Point[]) => {
      let sum = 0;
      let n = 0;
      for (let row = 0; row < t.height; row++) {
        for (let col = 0; col < t.width; col++) {
          if (inside(poly, { x: (col + 0.5) * 10, y: (row + 0.5) * 10 })) {
            sum += t.values[row * t.width + col];
            n++;
          }
        }
      }
      return sum / n;
    };
    expect(meanTraffic(cluster("centre"))).toBeGreaterThan(meanTraffic(cluster("harbour")));
    expect(Math.min(...t.values)).toBeGreaterThanOrEqual(0);
  });
});

describe("DEMO_USERS", () => {
  it("DEMO_USERS has one user per role plus a second engineer, with unique .test e-mails and no passwords", () => {
    const roles = DEMO_USERS.map((u) => u.role).sort();
    expect(roles).toEqual(["admin", "engineer", "engineer", "field", "owner", "viewer"]);
    expect(new Set(DEMO_USERS.map((u) => u.email)).size).toBe(DEMO_USERS.length);
    expect(new Set(DEMO_USERS.map((u) => u.id)).size).toBe(DEMO_USERS.length);
    for (const u of DEMO_USERS) {
      expect(u.email).toMatch(/^[a-z.]+@beamgate\.test$/);
      expect(Object.keys(u).some((k) => /pass|secret|hash/i.test(k))).toBe(false);
    }
  });
});
