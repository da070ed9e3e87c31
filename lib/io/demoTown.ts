// The demo scenario: Quillhaven, an invented coastal town (no real place, operator,
// vendor or person). Everything is drawn from one seeded generator, so the same
// seed always gives the same (deep-equal) scenario.
//
// Layout, local metres, x east and y north, 1600 m × 1200 m:
//   south      the sea, below a wavy shoreline, and a beach rising inland
//   shore      the old harbour: dense low-rise (1–3 floors)
//   x ≈ 760    the high street, running north from the harbour (2–5 floors)
//   centre     the business core east of the high street: towers (6–15 floors)
//   north-west the campus: large rotated blocks (2–6 floors)
//   north-east the hill (summit ~60–80 m) with contour-following houses
//   elsewhere  mixed residential on the street grid

import type {
  AntennaModel,
  Building,
  Cell,
  Cluster,
  Point,
  Raster,
  Scenario,
  Site,
} from "../radio/scenario";
import { DEFAULT_SETTINGS } from "../radio/scenario";
import { DEMO_ANTENNA_MODELS, DEMO_BEAM_SETS } from "./demoCatalogue";
import { createRandom, type Random } from "./random";

export const DEMO_TOWN_NAME = "Quillhaven";

const WIDTH_M = 1600;
const HEIGHT_M = 1200;
const RASTER_CELL_M = 10;
const FLOOR_HEIGHT_M = 3;
/** Buildings keep this distance from the shoreline (quay and beach road). */
const SHORE_SETBACK_M = 40;
/** Minimum clear gap between two buildings, metres. */
const BUILDING_GAP_M = 2;
const SUMMIT: Point = { x: 1490, y: 1110 };
/** The hilltop stays a park: no buildings within this radius of the summit. */
const SUMMIT_PARK_M = 100;
const HIGH_STREET_X = 760;
const CORE_CENTRE: Point = { x: 960, y: 560 };
const CAMPUS_CENTRE: Point = { x: 320, y: 910 };

// ---------------------------------------------------------------------------
// Demo users: one per role plus a second engineer. Invented names; the e-mail
// domain uses the reserved ".test" top-level domain (RFC 2606). No passwords:
// the database seed creates them.

export type DemoRole = "engineer" | "owner" | "field" | "viewer" | "admin";

export interface DemoUser {
  id: string;
  name: string;
  email: string;
  role: DemoRole;
}

export const DEMO_USERS: readonly DemoUser[] = [
  { id: "user-engineer-1", name: "Avery Lanternby", email: "avery.lanternby@beamgate.test", role: "engineer" },
  { id: "user-engineer-2", name: "Mateo Brackwynn", email: "mateo.brackwynn@beamgate.test", role: "engineer" },
  { id: "user-owner-1", name: "Noor Tidewell", email: "noor.tidewell@beamgate.test", role: "owner" },
  { id: "user-field-1", name: "Ilse Marrowgate", email: "ilse.marrowgate@beamgate.test", role: "field" },
  { id: "user-viewer-1", name: "Oona Fenwright", email: "oona.fenwright@beamgate.test", role: "viewer" },
  { id: "user-admin-1", name: "Ravi Tallowmere", email: "ravi.tallowmere@beamgate.test", role: "admin" },
];

// ---------------------------------------------------------------------------
// Small helpers

/**
 * Rounds to a number of decimals and never returns −0 (−0 would not survive a CSV
 * round trip as itself). Dividing the rounded integer by 10^decimals is correctly
 * rounded in IEEE arithmetic, so 12.3 prints as "12.3", not "12.299999999999999".
 */
function roundTo(value: number, decimals: number): number {
  const f = 10 ** decimals;
  const r = Math.round(value * f) / f;
  return r === 0 ? 0 : r;
}

/** Rounds to the nearest half (exact in binary). */
function roundHalf(value: number): number {
  const r = Math.round(value * 2) / 2;
  return r === 0 ? 0 : r;
}

function clamp(value: number, min: number, max: number): number {
  return value < min ? min : value > max ? max : value;
}

function smoothstep(edge0: number, edge1: number, x: number): number {
  const t = clamp((x - edge0) / (edge1 - edge0), 0, 1);
  return t * t * (3 - 2 * t);
}

function distance(a: Point, b: Point): number {
  return Math.hypot(a.x - b.x, a.y - b.y);
}

// ---------------------------------------------------------------------------
// Town shape: shoreline and ground height as functions of position

interface TownShape {
  shoreY(x: number): number;
  groundM(x: number, y: number): number;
}

function makeShape(rng: Random): TownShape {
  const p1 = rng.uniform(0, 2 * Math.PI);
  const p2 = rng.uniform(0, 2 * Math.PI);
  const u1 = rng.uniform(0, 2 * Math.PI);
  const u2 = rng.uniform(0, 2 * Math.PI);
  const hillM = rng.uniform(58, 64);
  const shoreY = (x: number): number =>
    170 + 25 * Math.sin((2 * Math.PI * x) / 640 + p1) + 12 * Math.sin((2 * Math.PI * x) / 230 + p2);
  const groundM = (x: number, y: number): number => {
    const d = y - shoreY(x);
    if (d < 0) return 0; // the sea
    // Beach rising 0.4 → 4 m over the first 60 m, then a gentle 1.2 % slope inland.
    const beach = 0.4 + 3.6 * smoothstep(0, 60, d);
    const slope = 0.012 * Math.max(0, d - 60);
    const hill = hillM * Math.exp(-((x - SUMMIT.x) ** 2 + (y - SUMMIT.y) ** 2) / (2 * 230 * 230));
    const undulation = 1.5 * Math.sin(x / 130 + u1) * Math.sin(y / 170 + u2) * smoothstep(0, 80, d);
    return Math.max(0.3, beach + slope + hill + undulation);
  };
  return { shoreY, groundM };
}

function makeRaster(fill: (x: number, y: number) => number): Raster {
  const width = WIDTH_M / RASTER_CELL_M;
  const height = HEIGHT_M / RASTER_CELL_M;
  const values = new Float32Array(width * height);
  for (let row = 0; row < height; row++) {
    const y = (row + 0.5) * RASTER_CELL_M;
    for (let col = 0; col < width; col++) {
      const x = (col + 0.5) * RASTER_CELL_M;
      values[row * width + col] = fill(x, y);
    }
  }
  return { originX: 0, originY: 0, cellSize: RASTER_CELL_M, width, height, values };
}

/** Value of the raster cell containing (x, y), clamped to the raster's edge. */
function rasterAt(raster: Raster, x: number, y: number): number {
  const col = clamp(Math.floor((x - raster.originX) / raster.cellSize), 0, raster.width - 1);
  const row = clamp(Math.floor((y - raster.originY) / raster.cellSize), 0, raster.height - 1);
  return raster.values[row * raster.width + col];
}

// ---------------------------------------------------------------------------
// Zones

type Zone = "harbour" | "highStreet" | "core" | "mixed" | "campus" | "hillside";

function zoneAt(shape: TownShape, x: number, y: number): Zone {
  if (x < 620 && y >= 640) return "campus";
  if (x >= 1160 && y >= 600) return "hillside";
  if (x < 1180 && y - shape.shoreY(x) < 230) return "harbour";
  if (Math.abs(x - HIGH_STREET_X) < 50 && y < 900) return "highStreet";
  if (x >= 800 && x < 1150 && y < 760) return "core";
  return "mixed";
}

// ---------------------------------------------------------------------------
// Rectangles and their placement without overlap

interface Rect {
  cx: number;
  cy: number;
  halfW: number;
  halfD: number;
  /** Rotation of the rectangle's width axis from east, radians (counter-clockwise). */
  angle: number;
}

function corners(r: Rect, grow = 0): Point[] {
  const c = Math.cos(r.angle);
  const s = Math.sin(r.angle);
  const w = r.halfW + grow;
  const d = r.halfD + grow;
  // Counter-clockwise from the local south-west corner.
  return [
    { x: r.cx - w * c + d * s, y: r.cy - w * s - d * c },
    { x: r.cx + w * c + d * s, y: r.cy + w * s - d * c },
    { x: r.cx + w * c - d * s, y: r.cy + w * s + d * c },
    { x: r.cx - w * c - d * s, y: r.cy - w * s + d * c },
  ];
}

/** Separating-axis test for two convex polygons; touching counts as not overlapping. */
function convexOverlap(a: Point[], b: Point[]): boolean {
  for (const poly of [a, b]) {
    for (let i = 0; i < poly.length; i++) {
      const p = poly[i];
      const q = poly[(i + 1) % poly.length];
      const nx = q.y - p.y;
      const ny = p.x - q.x;
      let minA = Infinity, maxA = -Infinity, minB = Infinity, maxB = -Infinity;
      for (const v of a) {
        const t = v.x * nx + v.y * ny;
        if (t < minA) minA = t;
        if (t > maxA) maxA = t;
      }
      for (const v of b) {
        const t = v.x * nx + v.y * ny;
        if (t < minB) minB = t;
        if (t > maxB) maxB = t;
      }
      if (maxA <= minB || maxB <= minA) return false;
    }
  }
  return true;
}

interface Placed {
  rect: Rect;
  /** Footprint grown by half the gap, for the overlap test. */
  grown: Point[];
  zone: Zone;
  floors: number;
}

/** Keeps placed footprints in 50 m buckets so each test looks at neighbours only. */
class Placer {
  readonly placed: Placed[] = [];
  private readonly buckets = new Map<number, Placed[]>();
  private static readonly BUCKET_M = 50;

  constructor(private readonly shape: TownShape) {}

  private keys(poly: Point[]): number[] {
    let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
    for (const p of poly) {
      minX = Math.min(minX, p.x);
      maxX = Math.max(maxX, p.x);
      minY = Math.min(minY, p.y);
      maxY = Math.max(maxY, p.y);
    }
    const b = Placer.BUCKET_M;
    const keys: number[] = [];
    for (let i = Math.floor(minX / b); i <= Math.floor(maxX / b); i++) {
      for (let j = Math.floor(minY / b); j <= Math.floor(maxY / b); j++) keys.push(i * 1000 + j);
    }
    return keys;
  }

  /** True when the polygon overlaps no placed footprint (each grown by half the gap). */
  isClear(poly: Point[]): boolean {
    for (const key of this.keys(poly)) {
      for (const other of this.buckets.get(key) ?? []) {
        if (convexOverlap(poly, other.grown)) return false;
      }
    }
    return true;
  }

  /** Land with setback, inside the bounds, outside the summit park. */
  isBuildable(poly: Point[], centre: Point): boolean {
    if (distance(centre, SUMMIT) < SUMMIT_PARK_M) return false;
    for (const p of poly) {
      if (p.x < 10 || p.x > WIDTH_M - 10 || p.y < 10 || p.y > HEIGHT_M - 10) return false;
      if (p.y < this.shape.shoreY(p.x) + SHORE_SETBACK_M) return false;
    }
    return true;
  }

  tryPlace(rect: Rect, zone: Zone, floors: number): boolean {
    const footprint = corners(rect);
    if (!this.isBuildable(footprint, { x: rect.cx, y: rect.cy })) return false;
    const grown = corners(rect, BUILDING_GAP_M / 2);
    if (!this.isClear(grown)) return false;
    const entry: Placed = { rect, grown, zone, floors };
    this.placed.push(entry);
    for (const key of this.keys(grown)) {
      const list = this.buckets.get(key);
      if (list) list.push(entry);
      else this.buckets.set(key, [entry]);
    }
    return true;
  }
}

// ---------------------------------------------------------------------------
// Buildings

function floorsFor(zone: Zone, rng: Random, at: Point): number {
  switch (zone) {
    case "harbour":
      return rng.pick([1, 2, 2, 2, 3, 3]);
    case "highStreet":
      return rng.int(2, 5);
    case "core": {
      // Taller towards the middle of the core.
      const f = Math.round(15 - distance(at, CORE_CENTRE) / 30 + rng.normal(0, 1.5));
      return clamp(f, 6, 15);
    }
    case "mixed":
      return rng.pick([1, 2, 2, 3, 3, 4]);
    case "campus":
      return rng.int(2, 6);
    case "hillside":
      return rng.pick([1, 1, 2, 2, 2, 3]);
  }
}

interface Candidate {
  rect: Rect;
  zone: Zone;
}

/** Street centre lines: irregular spacing, with one line snapped to the high street. */
function streetLines(rng: Random, start: number, end: number, minStep: number, maxStep: number): number[] {
  const lines: number[] = [];
  for (let v = start; v < end; v += rng.uniform(minStep, maxStep)) lines.push(roundTo(v, 0));
  lines.push(end);
  return lines;
}

/** Lots on the street grid, each tagged with the zone at its centre. */
function gridCandidates(shape: TownShape, rng: Random): Candidate[] {
  const xs = streetLines(rng, 0, WIDTH_M, 105, 125);
  // Snap the nearest line to the high street.
  let nearest = 0;
  for (let i = 1; i < xs.length; i++) {
    if (Math.abs(xs[i] - HIGH_STREET_X) < Math.abs(xs[nearest] - HIGH_STREET_X)) nearest = i;
  }
  xs[nearest] = HIGH_STREET_X;
  const ys = streetLines(rng, 0, HEIGHT_M, 85, 100);
  const halfStreet = (x: number): number => (x === HIGH_STREET_X ? 11 : 6);

  const out: Candidate[] = [];
  for (let i = 0; i + 1 < xs.length; i++) {
    for (let j = 0; j + 1 < ys.length; j++) {
      const x0 = xs[i] + halfStreet(xs[i]);
      const x1 = xs[i + 1] - halfStreet(xs[i + 1]);
      const y0 = ys[j] + 6;
      const y1 = ys[j + 1] - 6;
      if (x1 - x0 < 30 || y1 - y0 < 30) continue;
      const blockZone = zoneAt(shape, (x0 + x1) / 2, (y0 + y1) / 2);
      if (blockZone === "core") {
        // Towers: one per quadrant of the block.
        const mx = (x0 + x1) / 2;
        const my = (y0 + y1) / 2;
        for (const [qx0, qx1] of [[x0, mx], [mx, x1]]) {
          for (const [qy0, qy1] of [[y0, my], [my, y1]]) {
            const halfW = Math.min(rng.uniform(11, 19), (qx1 - qx0) / 2 - 3);
            const halfD = Math.min(rng.uniform(11, 18), (qy1 - qy0) / 2 - 3);
            const cx = (qx0 + qx1) / 2 + rng.uniform(-2, 2);
            const cy = (qy0 + qy1) / 2 + rng.uniform(-2, 2);
            out.push({ rect: { cx, cy, halfW, halfD, angle: 0 }, zone: zoneAt(shape, cx, cy) });
          }
        }
        continue;
      }
      // Frontage lots along the four edges of the block, set back 2 m from the kerb.
      const edges = [
        { ax: x0, ay: y0, ux: 1, uy: 0, length: x1 - x0 }, // south edge, walking east
        { ax: x1, ay: y0, ux: 0, uy: 1, length: y1 - y0 }, // east edge, walking north
        { ax: x1, ay: y1, ux: -1, uy: 0, length: x1 - x0 }, // north edge, walking west
        { ax: x0, ay: y1, ux: 0, uy: -1, length: y1 - y0 }, // west edge, walking south
      ];
      for (const e of edges) {
        // Inward normal: the edge direction turned 90° counter-clockwise.
        const nx = -e.uy;
        const ny = e.ux;
        let along = rng.uniform(2, 6);
        while (along < e.length - 8) {
          const probe = zoneAt(shape, e.ax + e.ux * along + nx * 10, e.ay + e.uy * along + ny * 10);
          const [wMin, wMax, dMin, dMax] =
            probe === "highStreet" ? [12, 20, 14, 20] : probe === "harbour" ? [9, 15, 9, 13] : [11, 18, 10, 15];
          const width = Math.min(rng.uniform(wMin, wMax), e.length - along - 2);
          const depth = rng.uniform(dMin, dMax);
          const mid = along + width / 2;
          const cx = e.ax + e.ux * mid + nx * (2 + depth / 2);
          const cy = e.ay + e.uy * mid + ny * (2 + depth / 2);
          // Width runs along the edge; for north–south edges the rectangle is turned 90°.
          const rect: Rect =
            e.uy === 0
              ? { cx, cy, halfW: width / 2, halfD: depth / 2, angle: 0 }
              : { cx, cy, halfW: depth / 2, halfD: width / 2, angle: 0 };
          const zone = zoneAt(shape, cx, cy);
          // Core, campus and hillside lots are laid out by their own rules.
          if (zone !== "core" && zone !== "campus" && zone !== "hillside") out.push({ rect, zone });
          along += width + rng.uniform(2.5, 6);
        }
      }
    }
  }
  return out;
}

function placeFromCandidates(placer: Placer, rng: Random, candidates: Candidate[], zone: Zone, target: number): void {
  let placed = 0;
  for (const c of rng.shuffle(candidates.filter((k) => k.zone === zone))) {
    if (placed >= target) break;
    if (placer.tryPlace(c.rect, zone, floorsFor(zone, rng, { x: c.rect.cx, y: c.rect.cy }))) placed++;
  }
}

function placeCampus(placer: Placer, rng: Random, target: number): void {
  const axis = rng.uniform(15, 35) * (Math.PI / 180);
  let placed = 0;
  for (let attempt = 0; attempt < 600 && placed < target; attempt++) {
    const u = rng.uniform(-280, 280);
    const v = rng.uniform(-240, 240);
    const cx = CAMPUS_CENTRE.x + u * Math.cos(axis) - v * Math.sin(axis);
    const cy = CAMPUS_CENTRE.y + u * Math.sin(axis) + v * Math.cos(axis);
    const rect: Rect = {
      cx,
      cy,
      halfW: rng.uniform(12, 30),
      halfD: rng.uniform(7, 13),
      angle: axis + (rng.chance(0.3) ? Math.PI / 2 : 0),
    };
    const inside = corners(rect).every((p) => p.x > 30 && p.x < 610 && p.y > 650 && p.y < 1170);
    if (!inside) continue;
    if (placer.tryPlace(rect, "campus", floorsFor("campus", rng, { x: rect.cx, y: rect.cy }))) placed++;
  }
}

function placeHillside(placer: Placer, rng: Random, target: number): void {
  let placed = 0;
  for (let attempt = 0; attempt < 3000 && placed < target; attempt++) {
    const cx = rng.uniform(1170, 1580);
    const cy = rng.uniform(610, 1180);
    // Houses follow the contours: the long side perpendicular to the slope.
    const toSummit = Math.atan2(SUMMIT.y - cy, SUMMIT.x - cx);
    const rect: Rect = {
      cx,
      cy,
      halfW: rng.uniform(5, 8),
      halfD: rng.uniform(4, 6),
      angle: toSummit + Math.PI / 2 + rng.normal(0, 0.08),
    };
    if (!corners(rect).every((p) => p.x > 1165 && p.y > 605)) continue;
    // Houses need a wider gap than the town's terraces.
    if (!placer.isClear(corners(rect, 2))) continue;
    if (placer.tryPlace(rect, "hillside", floorsFor("hillside", rng, { x: rect.cx, y: rect.cy }))) placed++;
  }
}

function toBuilding(p: Placed, index: number, rng: Random): Building {
  const roofMarginM = rng.uniform(0.5, 2.5);
  return {
    id: `B${String(index + 1).padStart(4, "0")}`,
    footprint: corners(p.rect).map((c) => ({ x: roundTo(c.x, 2), y: roundTo(c.y, 2) })),
    heightM: roundTo(p.floors * FLOOR_HEIGHT_M + roofMarginM, 1),
    floors: p.floors,
  };
}

// ---------------------------------------------------------------------------
// Sites and cells

type Band = "1800" | "3500" | "mixed";

interface SitePlan {
  id: string;
  label: string;
  target: Point | ((shape: TownShape) => Point);
  kind: "rooftop" | "mast";
  /** Lowest floor count of a usable roof; a rooftop plan picks the tallest roof in reach. */
  minFloors: number;
  cells: 2 | 3;
  band: Band;
  /** For two-cell sites: the corridor bearing (degrees) the cells face along, both ways. */
  corridorDeg?: number;
  preferBeamSet?: string;
}

const shoreAt = (x: number, inland: number) => (shape: TownShape): Point => ({ x, y: shape.shoreY(x) + inland });

/** Site plans in priority order; the first N are built (N = 14…18 from the seed). */
const SITE_PLANS: SitePlan[] = [
  { id: "CEN01", label: "Centre", target: { x: 960, y: 560 }, kind: "rooftop", minFloors: 8, cells: 3, band: "3500", preferBeamSet: "high-rise-stack" },
  { id: "HBR01", label: "Harbour", target: shoreAt(300, 110), kind: "rooftop", minFloors: 2, cells: 3, band: "1800" },
  { id: "HIL01", label: "Hillside", target: { x: 1440, y: 1040 }, kind: "mast", minFloors: 0, cells: 3, band: "1800" },
  { id: "CMP01", label: "Campus", target: { x: 320, y: 910 }, kind: "rooftop", minFloors: 3, cells: 3, band: "3500", preferBeamSet: "dual-layer" },
  { id: "CEN02", label: "High Street", target: { x: 760, y: 500 }, kind: "rooftop", minFloors: 2, cells: 2, band: "3500", corridorDeg: 0, preferBeamSet: "corridor-narrow" },
  { id: "HBR02", label: "Harbour", target: shoreAt(700, 60), kind: "mast", minFloors: 0, cells: 3, band: "mixed" },
  { id: "EST01", label: "East", target: { x: 1380, y: 400 }, kind: "mast", minFloors: 0, cells: 3, band: "1800" },
  { id: "CEN03", label: "Centre", target: { x: 1080, y: 690 }, kind: "rooftop", minFloors: 6, cells: 3, band: "3500", preferBeamSet: "horizontal-sweep-8" },
  { id: "MID01", label: "Uptown", target: { x: 880, y: 990 }, kind: "rooftop", minFloors: 2, cells: 3, band: "mixed" },
  { id: "HBR03", label: "Harbour", target: shoreAt(1050, 110), kind: "rooftop", minFloors: 2, cells: 2, band: "3500", corridorDeg: 80, preferBeamSet: "corridor-narrow" },
  { id: "HIL02", label: "Hillside", target: { x: 1260, y: 780 }, kind: "rooftop", minFloors: 2, cells: 3, band: "1800", preferBeamSet: "wide-pair" },
  { id: "WST01", label: "West", target: { x: 120, y: 540 }, kind: "mast", minFloors: 0, cells: 3, band: "1800" },
  { id: "CMP02", label: "Campus", target: { x: 520, y: 1100 }, kind: "rooftop", minFloors: 2, cells: 2, band: "3500", corridorDeg: 30 },
  { id: "CEN04", label: "Centre", target: { x: 860, y: 430 }, kind: "rooftop", minFloors: 6, cells: 3, band: "3500", preferBeamSet: "high-rise-stack" },
  { id: "HBR04", label: "Harbour", target: shoreAt(80, 80), kind: "mast", minFloors: 0, cells: 2, band: "1800", corridorDeg: 90 },
  { id: "EST02", label: "East", target: { x: 1530, y: 560 }, kind: "mast", minFloors: 0, cells: 2, band: "mixed", corridorDeg: 0 },
  { id: "MID02", label: "Uptown", target: { x: 660, y: 1140 }, kind: "mast", minFloors: 0, cells: 3, band: "mixed" },
  { id: "HIL03", label: "Hillside", target: { x: 1540, y: 840 }, kind: "rooftop", minFloors: 2, cells: 2, band: "3500", corridorDeg: 160 },
];

function centroid(poly: Point[]): Point {
  let x = 0;
  let y = 0;
  for (const p of poly) {
    x += p.x;
    y += p.y;
  }
  return { x: x / poly.length, y: y / poly.length };
}

/** Finds an open-ground point near the target for a mast: on land, clear of every building. */
function findMastPoint(shape: TownShape, buildings: Building[], rng: Random, target: Point): Point | undefined {
  for (let attempt = 0; attempt < 200; attempt++) {
    const radius = 5 + attempt * 1.5;
    const p = {
      x: roundTo(target.x + rng.uniform(-radius, radius), 1),
      y: roundTo(target.y + rng.uniform(-radius, radius), 1),
    };
    if (p.x < 20 || p.x > WIDTH_M - 20 || p.y < 20 || p.y > HEIGHT_M - 20) continue;
    if (p.y < shape.shoreY(p.x) + 15) continue;
    // A 6 m square pad around the mast must be free of buildings.
    const pad = corners({ cx: p.x, cy: p.y, halfW: 3, halfD: 3, angle: 0 });
    if (buildings.some((b) => convexOverlap(pad, b.footprint))) continue;
    return p;
  }
  return undefined;
}

/** Reference-signal power per resource element from a total power, dBm:
 *  P_RS = P_total − 10·log10(N_subcarriers); common practice (equal power per subcarrier). */
function rsPowerDbm(totalDbm: number, bandwidthMHz: number, scsKHz: number, model: AntennaModel): number {
  // Usable subcarriers ≈ 90 % of the channel (LTE 20 MHz: 1200 of 1333).
  const subcarriers = Math.round((0.9 * bandwidthMHz * 1000) / scsKHz);
  return clamp(roundTo(totalDbm - 10 * Math.log10(subcarriers), 1), model.rsPowerMinDbm, model.rsPowerMaxDbm);
}

function buildSitesAndCells(
  shape: TownShape,
  terrain: Raster,
  buildings: Building[],
  rng: Random,
): { sites: Site[]; cells: Cell[] } {
  const models = new Map(DEMO_ANTENNA_MODELS.map((m) => [m.id, m]));
  const siteCount = rng.int(14, 18);
  const sites: Site[] = [];
  const cells: Cell[] = [];
  const usedRoofs = new Set<string>();
  const labelCounts = new Map<string, number>();

  for (const plan of SITE_PLANS) {
    if (sites.length >= siteCount) break;
    const base = typeof plan.target === "function" ? plan.target(shape) : plan.target;
    const target = { x: base.x + rng.uniform(-15, 15), y: base.y + rng.uniform(-15, 15) };

    // Rooftop: the tallest free roof with enough floors within 150 m; else a mast.
    let position: Point | undefined;
    let antennaHeightM = 0;
    let kind = plan.kind;
    if (plan.kind === "rooftop") {
      let best: Building | undefined;
      for (const b of buildings) {
        if (b.floors < plan.minFloors || usedRoofs.has(b.id)) continue;
        const c = centroid(b.footprint);
        if (distance(c, target) > 150) continue;
        // Prefer height, then closeness.
        if (!best || b.heightM - distance(c, target) / 20 > best.heightM - distance(centroid(best.footprint), target) / 20) best = b;
      }
      if (best) {
        usedRoofs.add(best.id);
        const c = centroid(best.footprint);
        position = { x: roundTo(c.x, 2), y: roundTo(c.y, 2) };
        antennaHeightM = roundTo(best.heightM + rng.uniform(2, 5), 1);
      } else {
        kind = "mast";
      }
    }
    if (!position) {
      position = findMastPoint(shape, buildings, rng, target);
      if (!position) continue;
      antennaHeightM = roundHalf(rng.uniform(25, 35));
      kind = "mast";
    }

    const n = (labelCounts.get(plan.label) ?? 0) + 1;
    labelCounts.set(plan.label, n);
    const site: Site = {
      id: plan.id,
      name: `${plan.label} ${n} ${kind}`,
      x: position.x,
      y: position.y,
      // Rounded like the terrain itself, so sites.csv reads "8.42", not the Float32 expansion.
      groundHeightM: roundTo(rasterAt(terrain, position.x, position.y), 2),
    };
    sites.push(site);

    // Azimuths: three sectors 120° apart, or a corridor pair facing both ways.
    const azimuths: number[] = [];
    if (plan.cells === 3) {
      const start = rng.uniform(0, 120);
      for (let k = 0; k < 3; k++) azimuths.push(start + 120 * k);
    } else {
      const axis = (plan.corridorDeg ?? rng.uniform(0, 180)) + rng.uniform(-5, 5);
      azimuths.push(axis, axis + 180);
    }

    azimuths.forEach((azimuth, k) => {
      const band: "1800" | "3500" = plan.band === "mixed" ? (k % 2 === 0 ? "3500" : "1800") : plan.band;
      let modelId: string;
      if (band === "1800") modelId = rng.chance(0.6) ? "passive-8x1-1800" : "passive-8x2-1800";
      else if (plan.label === "Centre" || plan.label === "Campus") modelId = rng.chance(0.5) ? "active-8x8-3500" : "active-4x8-3500";
      else modelId = rng.chance(0.5) ? "compact-2x4-3500" : "active-4x8-3500";
      const model = models.get(modelId)!;
      const beamSetId =
        plan.preferBeamSet && model.beamSetIds.includes(plan.preferBeamSet) ? plan.preferBeamSet : rng.pick(model.beamSetIds);
      const tall = antennaHeightM > 30;
      const electricalTiltDeg = clamp(roundHalf(rng.uniform(tall ? 4 : 2, tall ? 9 : 7)), model.electricalTiltMinDeg, model.electricalTiltMaxDeg);
      const mechanicalTiltDeg = clamp(rng.int(0, 4), model.mechanicalTiltMinDeg, model.mechanicalTiltMaxDeg);
      const frequencyMHz = band === "1800" ? 1800 : 3500;
      const bandwidthMHz = band === "1800" ? 20 : 40;
      const subcarrierSpacingKHz = band === "1800" ? 15 : 30;
      const totalDbm = modelId === "compact-2x4-3500" ? rng.uniform(38, 41) : band === "1800" ? rng.uniform(43, 46) : rng.uniform(49, 53);
      cells.push({
        id: `${plan.id}-${String.fromCharCode(65 + k)}`,
        siteId: plan.id,
        antennaModelId: modelId,
        antennaHeightM,
        azimuthDeg: roundTo(((azimuth % 360) + 360) % 360, 0) % 360,
        mechanicalTiltDeg,
        electricalTiltDeg,
        beamSetId,
        rsPowerDbm: rsPowerDbm(totalDbm, bandwidthMHz, subcarrierSpacingKHz, model),
        frequencyMHz,
        bandwidthMHz,
        subcarrierSpacingKHz,
      });
    });
  }

  // Make sure the demo shows every beam set at least once: give an unused set to a
  // cell that supports it and whose current set is shared with another cell.
  for (const set of DEMO_BEAM_SETS) {
    if (cells.some((c) => c.beamSetId === set.id)) continue;
    const counts = new Map<string, number>();
    for (const c of cells) counts.set(c.beamSetId, (counts.get(c.beamSetId) ?? 0) + 1);
    const donor = cells.find(
      (c) => models.get(c.antennaModelId)!.beamSetIds.includes(set.id) && (counts.get(c.beamSetId) ?? 0) > 1,
    );
    if (donor) donor.beamSetId = set.id;
  }
  return { sites, cells };
}

// ---------------------------------------------------------------------------
// Clusters and traffic

function buildClusters(shape: TownShape): Cluster[] {
  const p = (x: number, y: number): Point => ({ x: roundTo(x, 2), y: roundTo(y, 2) });
  const xsHarbour: number[] = [];
  for (let x = 0; x < 1180; x += 40) xsHarbour.push(x);
  xsHarbour.push(1180);
  // Harbour: from 20 m out on the water to 230 m inland, following the shore.
  const harbour = [
    ...xsHarbour.map((x) => p(x, shape.shoreY(x) - 20)),
    ...xsHarbour.slice().reverse().map((x) => p(x, shape.shoreY(x) + 230)),
  ];
  // Centre: 10 m north of the harbour's edge up to y = 760, around the high street and core.
  const xsCentre = [640, ...xsHarbour.filter((x) => x > 640 && x < 1150), 1150];
  const centre = [...xsCentre.map((x) => p(x, shape.shoreY(x) + 240)), p(1150, 760), p(640, 760)];
  return [
    { id: "harbour", name: "Harbour", polygon: harbour },
    { id: "centre", name: "Centre", polygon: centre },
    { id: "campus", name: "Campus", polygon: [p(20, 640), p(620, 640), p(620, 1180), p(20, 1180)] },
    { id: "hillside", name: "Hillside", polygon: [p(1160, 600), p(1590, 600), p(1590, 1190), p(1160, 1190)] },
  ];
}

function buildTraffic(shape: TownShape, rng: Random): Raster {
  return makeRaster((x, y) => {
    if (y < shape.shoreY(x)) return 0.02; // a little traffic from boats
    const core = 2.5 * Math.exp(-((x - CORE_CENTRE.x) ** 2 + (y - CORE_CENTRE.y) ** 2) / (2 * 220 * 220));
    const street = 1.2 * Math.exp(-((x - HIGH_STREET_X) ** 2) / (2 * 40 * 40)) * (y < 900 ? 1 : 0.3);
    const campus = 0.8 * Math.exp(-((x - CAMPUS_CENTRE.x) ** 2 + (y - CAMPUS_CENTRE.y) ** 2) / (2 * 150 * 150));
    return roundTo(0.3 + core + street + campus + 0.1 * rng.next(), 3);
  });
}

// ---------------------------------------------------------------------------

/** Generates the demo town. Deterministic: the same seed gives a deep-equal scenario. */
export function generateDemoTown(seed = 7): Scenario {
  const rng = createRandom(seed);
  const shape = makeShape(rng);
  const terrain = makeRaster((x, y) => roundTo(shape.groundM(x, y), 2));

  const placer = new Placer(shape);
  const candidates = gridCandidates(shape, rng);
  // Order matters: towers and the high street claim their lots first.
  placeFromCandidates(placer, rng, candidates, "core", rng.int(24, 34));
  placeFromCandidates(placer, rng, candidates, "highStreet", rng.int(30, 45));
  placeFromCandidates(placer, rng, candidates, "harbour", rng.int(90, 120));
  placeFromCandidates(placer, rng, candidates, "mixed", rng.int(100, 140));
  placeCampus(placer, rng, rng.int(16, 24));
  placeHillside(placer, rng, rng.int(70, 95));
  const buildings = placer.placed.map((p, i) => toBuilding(p, i, rng));

  const { sites, cells } = buildSitesAndCells(shape, terrain, buildings, rng);

  return {
    name: `${DEMO_TOWN_NAME} (demo)`,
    bounds: { minX: 0, minY: 0, maxX: WIDTH_M, maxY: HEIGHT_M },
    terrain,
    traffic: buildTraffic(shape, rng),
    antennaModels: structuredClone(DEMO_ANTENNA_MODELS),
    beamSets: structuredClone(DEMO_BEAM_SETS),
    sites,
    cells,
    buildings,
    clusters: buildClusters(shape),
    settings: { ...DEFAULT_SETTINGS },
  };
}
