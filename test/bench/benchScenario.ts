// Seeded generator of synthetic scenarios for the engine benchmark and the engine's unit tests: an invented
// town of rectangular blocks with buildings of several floors, gentle terrain, a few clusters, three-sector
// sites. No real place, operator or vendor.
import type { Building, Cell, Cluster, Point, Scenario, Site } from "../../lib/radio/scenario";
import { DEFAULT_SETTINGS } from "../../lib/radio/scenario";
import { ANTENNA_MODEL_CATALOGUE, BEAM_SET_CATALOGUE } from "../../lib/radio/beamSets";

/** mulberry32: a small seeded PRNG (public-domain algorithm by Tommy Ettinger), uniform in [0, 1). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface BenchScenarioOptions {
  seed: number;
  /** Side of the square area, metres. */
  sizeM: number;
  /** Sites (three cells each). */
  sites: number;
  gridSizeM?: number;
  /** Add a traffic raster. */
  traffic?: boolean;
  /** Block pitch, metres (a block plus its street). */
  blockM?: number;
  /** Highest building, floors. */
  maxFloors?: number;
  /** Build nothing (flat open ground). */
  noBuildings?: boolean;
  /** Flat terrain at 0 m. */
  flat?: boolean;
}

const rect = (x0: number, y0: number, x1: number, y1: number): Point[] => [
  { x: x0, y: y0 },
  { x: x1, y: y0 },
  { x: x1, y: y1 },
  { x: x0, y: y1 },
];

export function generateBenchScenario(options: BenchScenarioOptions): Scenario {
  const rnd = seededRandom(options.seed);
  const size = options.sizeM;
  const block = options.blockM ?? 100;
  const maxFloors = options.maxFloors ?? 12;
  const street = 20;
  const settings = { ...DEFAULT_SETTINGS, gridSizeM: options.gridSizeM ?? DEFAULT_SETTINGS.gridSizeM };

  // ---- terrain: a 25 m raster of gentle hills
  const tCell = 25;
  const tw = Math.ceil(size / tCell) + 1;
  const terrainValues = new Float32Array(tw * tw);
  const phase = rnd() * 6;
  for (let r = 0; r < tw; r++) {
    for (let c = 0; c < tw; c++) {
      terrainValues[r * tw + c] = options.flat ? 0 : 12 + 6 * Math.sin(c * tCell / 420 + phase) * Math.cos(r * tCell / 350) + 0.002 * c * tCell;
    }
  }
  const terrain = { originX: 0, originY: 0, cellSize: tCell, width: tw, height: tw, values: terrainValues };

  // ---- buildings: 1–4 per block, taller toward the centre
  const buildings: Building[] = [];
  if (!options.noBuildings) {
    for (let by = 0; by + block <= size; by += block) {
      for (let bx = 0; bx + block <= size; bx += block) {
        if (rnd() < 0.12) continue; // parks and squares
        const inner = block - street;
        const x0 = bx + street / 2, y0 = by + street / 2;
        const centre = 1 - Math.hypot(bx + block / 2 - size / 2, by + block / 2 - size / 2) / (size * 0.72);
        const split = rnd() < 0.5 ? 1 : 2;
        for (let i = 0; i < split; i++) {
          for (let j = 0; j < 2; j++) {
            if (rnd() < 0.35) continue;
            const w = inner / split, h = inner / 2;
            const mx = 2 + rnd() * 4, my = 2 + rnd() * 4;
            const floors = Math.max(1, Math.min(maxFloors, Math.round(1 + rnd() * 4 + centre * centre * (maxFloors - 3) * rnd())));
            buildings.push({
              id: `B${buildings.length + 1}`,
              footprint: rect(x0 + i * w + mx, y0 + j * h + my, x0 + (i + 1) * w - mx, y0 + (j + 1) * h - my),
              heightM: floors * 3 + 1 + rnd() * 2,
              floors,
            });
          }
        }
      }
    }
  }

  // ---- clusters: old town (centre), north, south-west, and a diagonal corridor
  const clusters: Cluster[] = [
    { id: "K-centre", name: "Old town", polygon: rect(size * 0.35, size * 0.35, size * 0.65, size * 0.65) },
    { id: "K-north", name: "North quarter", polygon: [{ x: 0, y: size * 0.7 }, { x: size, y: size * 0.75 }, { x: size, y: size }, { x: 0, y: size }] },
    { id: "K-southwest", name: "Harbour", polygon: [{ x: 0, y: 0 }, { x: size * 0.4, y: 0 }, { x: size * 0.3, y: size * 0.3 }, { x: 0, y: size * 0.35 }] },
    { id: "K-corridor", name: "Ring road", polygon: [{ x: size * 0.7, y: 0 }, { x: size * 0.78, y: 0 }, { x: size * 0.95, y: size * 0.6 }, { x: size * 0.87, y: size * 0.6 }] },
  ];

  // ---- sites on a jittered lattice, three sectors each
  const sites: Site[] = [];
  const cells: Cell[] = [];
  const perRow = Math.ceil(Math.sqrt(options.sites));
  const pitch = size / perRow;
  const models = ANTENNA_MODEL_CATALOGUE.filter((m) => m.id !== "panel-4x2");
  for (let k = 0; k < options.sites; k++) {
    const r = Math.floor(k / perRow), c = k % perRow;
    const x = Math.min(size - 1, Math.max(1, (c + 0.5 + (rnd() - 0.5) * 0.4 + (r % 2 ? 0.25 : -0.25)) * pitch));
    const y = Math.min(size - 1, Math.max(1, (r + 0.5 + (rnd() - 0.5) * 0.4) * pitch));
    const site: Site = { id: `S${k + 1}`, name: `Mast ${k + 1}`, x, y, groundHeightM: 0 };
    // the mast stands on the terrain
    const tc = Math.min(tw - 1, Math.round(x / tCell - 0.5)), tr = Math.min(tw - 1, Math.round(y / tCell - 0.5));
    site.groundHeightM = terrainValues[Math.max(0, tr) * tw + Math.max(0, tc)];
    sites.push(site);
    const rot = rnd() * 120;
    const height = 25 + Math.round(rnd() * 15);
    for (let s = 0; s < 3; s++) {
      const model = models[(k + s) % models.length];
      const beamSetId = model.beamSetIds[Math.floor(rnd() * model.beamSetIds.length)];
      cells.push({
        id: `S${k + 1}-${s + 1}`,
        siteId: site.id,
        antennaModelId: model.id,
        antennaHeightM: height,
        // rounding 359.96 up would give 360, outside [0, 360)
        azimuthDeg: (Math.round(((rot + s * 120) % 360) * 10) / 10) % 360,
        mechanicalTiltDeg: Math.round(rnd() * 4),
        electricalTiltDeg: 2 + Math.round(rnd() * 6),
        beamSetId,
        rsPowerDbm: 15 + Math.round(rnd() * 4),
        frequencyMHz: 3500,
        bandwidthMHz: 40,
        subcarrierSpacingKHz: 30,
      });
    }
  }

  let traffic: Scenario["traffic"];
  if (options.traffic) {
    const cellSize = 50, w = Math.ceil(size / cellSize);
    const values = new Float32Array(w * w);
    for (let i = 0; i < values.length; i++) values[i] = Math.floor(rnd() * 10);
    traffic = { originX: 0, originY: 0, cellSize, width: w, height: w, values };
  }

  return {
    name: `bench-${options.seed}`,
    bounds: { minX: 0, minY: 0, maxX: size, maxY: size },
    terrain,
    traffic,
    antennaModels: ANTENNA_MODEL_CATALOGUE.map((m) => ({ ...m, beamSetIds: [...m.beamSetIds] })),
    beamSets: BEAM_SET_CATALOGUE.map((b) => ({ ...b, beams: b.beams.map((x) => ({ ...x })) })),
    sites,
    cells,
    buildings,
    clusters,
    settings,
  };
}
