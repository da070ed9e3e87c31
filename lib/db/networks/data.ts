// Reads of the network model. Returns plain objects (the model's own Scenario, or small
// DTOs for pages), never raw rows.
import type { Prisma } from "../open";
import type { Cell, CellParameter, ModelSettings, Scenario } from "../../radio/scenario";
import type { KpiSettings as KpiSettingsRow } from "../generated/client";
import { CELL_PARAMETERS } from "../../radio/scenario";
import { bytesToFloat32 } from "../rasterBytes";
import { decodeParameterValue } from "./values";

export interface NetworkSummary {
  id: string;
  name: string;
  latestVersion: number;
  sites: number;
  cells: number;
  buildings: number;
  clusters: { code: string; name: string }[];
}

export async function listNetworks(prisma: Prisma): Promise<NetworkSummary[]> {
  const networks = await prisma.network.findMany({
    orderBy: { createdAt: "asc" },
    include: {
      _count: { select: { sites: true, cells: true, buildings: true } },
      clusters: { select: { code: true, name: true }, orderBy: { code: "asc" } },
      versions: { select: { number: true }, orderBy: { number: "desc" }, take: 1 },
    },
  });
  return networks.map((n) => ({
    id: n.id,
    name: n.name,
    latestVersion: n.versions[0]?.number ?? 0,
    sites: n._count.sites,
    cells: n._count.cells,
    buildings: n._count.buildings,
    clusters: n.clusters,
  }));
}

export async function latestVersionNumber(prisma: Prisma, networkId: string): Promise<number> {
  const version = await prisma.networkVersion.findFirst({
    where: { networkId },
    orderBy: { number: "desc" },
    select: { number: true },
  });
  if (!version) throw new RangeError(`network ${networkId} has no version`);
  return version.number;
}

/** Which moment of the temporal record to read: a version number or a date. */
export type AsOf = { version: number } | { date: Date } | undefined;

export interface CellRow {
  id: string;
  code: string;
  siteCode: string;
  siteName: string;
  x: number;
  y: number;
  antennaModel: string;
  antennaHeightM: number;
  frequencyMHz: number;
  bandwidthMHz: number;
  subcarrierSpacingKHz: number;
  azimuthDeg: number;
  mechanicalTiltDeg: number;
  electricalTiltDeg: number;
  beamSetId: string;
  rsPowerDbm: number;
}

/** The cells with their parameters as of a version or date (current when asOf is undefined). */
export async function listCells(prisma: Prisma, networkId: string, asOf?: AsOf): Promise<CellRow[]> {
  const cells = await prisma.cell.findMany({
    where: { networkId },
    orderBy: { code: "asc" },
    include: { site: true, antennaModel: { select: { code: true } } },
  });
  const values = asOf ? await parameterValuesAsOf(prisma, networkId, asOf) : undefined;
  const rows: CellRow[] = [];
  for (const cell of cells) {
    const row: CellRow = {
      id: cell.id,
      code: cell.code,
      siteCode: cell.site.code,
      siteName: cell.site.name,
      x: cell.site.x,
      y: cell.site.y,
      antennaModel: cell.antennaModel.code,
      antennaHeightM: cell.antennaHeightM,
      frequencyMHz: cell.frequencyMHz,
      bandwidthMHz: cell.bandwidthMHz,
      subcarrierSpacingKHz: cell.subcarrierSpacingKHz,
      azimuthDeg: cell.azimuthDeg,
      mechanicalTiltDeg: cell.mechanicalTiltDeg,
      electricalTiltDeg: cell.electricalTiltDeg,
      beamSetId: cell.beamSetCode,
      rsPowerDbm: cell.rsPowerDbm,
    };
    if (values) {
      const own = values.get(cell.id);
      // A cell with no value at that moment did not exist yet.
      if (!own || own.size < CELL_PARAMETERS.length) continue;
      for (const [parameter, value] of own) (row as unknown as Record<string, unknown>)[parameter] = value;
    }
    rows.push(row);
  }
  return rows;
}

async function parameterValuesAsOf(prisma: Prisma, networkId: string, asOf: NonNullable<AsOf>) {
  const where =
    "version" in asOf
      ? { fromVersion: { lte: asOf.version }, OR: [{ toVersion: null }, { toVersion: { gt: asOf.version } }] }
      : { validFrom: { lte: asOf.date }, OR: [{ validTo: null }, { validTo: { gt: asOf.date } }] };
  const rows = await prisma.cellParameterValue.findMany({
    where: { cell: { networkId }, ...where },
    select: { cellId: true, parameter: true, value: true },
  });
  const byCell = new Map<string, Map<CellParameter, number | string>>();
  for (const row of rows) {
    const parameter = row.parameter as CellParameter;
    let own = byCell.get(row.cellId);
    if (!own) byCell.set(row.cellId, (own = new Map()));
    own.set(parameter, decodeParameterValue(parameter, row.value));
  }
  return byCell;
}

/** A cell row as the coverage model sees the cell (codes as ids). */
export function cellOfRow(row: CellRow): Cell {
  return {
    id: row.code,
    siteId: row.siteCode,
    antennaModelId: row.antennaModel,
    antennaHeightM: row.antennaHeightM,
    azimuthDeg: row.azimuthDeg,
    mechanicalTiltDeg: row.mechanicalTiltDeg,
    electricalTiltDeg: row.electricalTiltDeg,
    beamSetId: row.beamSetId,
    rsPowerDbm: row.rsPowerDbm,
    frequencyMHz: row.frequencyMHz,
    bandwidthMHz: row.bandwidthMHz,
    subcarrierSpacingKHz: row.subcarrierSpacingKHz,
  };
}

/** The whole network as the coverage model sees it, as of a version or date. */
export async function loadScenario(prisma: Prisma, networkId: string, asOf?: AsOf): Promise<Scenario> {
  const network = await prisma.network.findUniqueOrThrow({
    where: { id: networkId },
    include: { settings: true, antennaModels: true, beamSets: true, sites: true, buildings: true, clusters: true, rasters: true },
  });
  if (!network.settings) throw new RangeError(`network ${network.name} has no KPI settings`);
  const terrainRow = network.rasters.find((r) => r.kind === "terrain");
  if (!terrainRow) throw new RangeError(`network ${network.name} has no terrain raster`);
  const trafficRow = network.rasters.find((r) => r.kind === "traffic");
  const toRaster = (row: typeof terrainRow) => ({
    originX: row.originX,
    originY: row.originY,
    cellSize: row.cellSize,
    width: row.width,
    height: row.height,
    values: bytesToFloat32(row.values, row.width * row.height),
  });
  const cells: Cell[] = (await listCells(prisma, networkId, asOf)).map(cellOfRow);
  const byCode = <T extends { code: string }>(rows: T[]) => [...rows].sort((a, b) => (a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
  const points = (json: unknown) => (json as [number, number][]).map(([x, y]) => ({ x, y }));
  return {
    name: network.name,
    bounds: { minX: network.minX, minY: network.minY, maxX: network.maxX, maxY: network.maxY },
    ...(network.originLon !== null && network.originLat !== null
      ? { origin: { lon: network.originLon, lat: network.originLat } }
      : {}),
    terrain: toRaster(terrainRow),
    ...(trafficRow ? { traffic: toRaster(trafficRow) } : {}),
    antennaModels: byCode(network.antennaModels).map(({ id: _id, networkId: _nid, code, beamSetCodes, ...rest }) => ({
      ...rest,
      id: code,
      beamSetIds: beamSetCodes,
    })),
    beamSets: byCode(network.beamSets).map((set) => ({
      id: set.code,
      name: set.name,
      description: set.description,
      beams: set.beams as unknown as Scenario["beamSets"][number]["beams"],
    })),
    sites: byCode(network.sites).map((site) => ({
      id: site.code,
      name: site.name,
      x: site.x,
      y: site.y,
      groundHeightM: site.groundHeightM,
    })),
    cells,
    buildings: byCode(network.buildings).map((b) => ({ id: b.code, footprint: points(b.footprint), heightM: b.heightM, floors: b.floors })),
    clusters: byCode(network.clusters).map((c) => ({ id: c.code, name: c.name, polygon: points(c.polygon) })),
    settings: settingsOf(network.settings),
  };
}

function settingsOf(row: KpiSettingsRow): ModelSettings {
  const { networkId: _n, updatedAt: _u, ...settings } = row;
  return { ...settings, environment: settings.environment as ModelSettings["environment"], buildingLoss: settings.buildingLoss as ModelSettings["buildingLoss"] };
}

/** A network's KPI thresholds and model options. */
export async function getKpiSettings(prisma: Prisma, networkId: string): Promise<ModelSettings> {
  const row = await prisma.kpiSettings.findUnique({ where: { networkId } });
  if (!row) throw new RangeError(`network ${networkId} has no KPI settings`);
  return settingsOf(row);
}

export interface AntennaModelDto {
  code: string;
  name: string;
  electricalTiltMinDeg: number;
  electricalTiltMaxDeg: number;
  mechanicalTiltMinDeg: number;
  mechanicalTiltMaxDeg: number;
  rsPowerMinDbm: number;
  rsPowerMaxDbm: number;
  beamSetCodes: string[];
}

export interface BeamSetDto {
  code: string;
  name: string;
  description: string;
  beamCount: number;
}

/** The hardware ranges and beam sets a request builder offers, per network. */
export async function listHardware(prisma: Prisma, networkId: string): Promise<{ antennaModels: AntennaModelDto[]; beamSets: BeamSetDto[] }> {
  const [models, sets] = await Promise.all([
    prisma.antennaModel.findMany({ where: { networkId }, orderBy: { code: "asc" } }),
    prisma.beamSet.findMany({ where: { networkId }, orderBy: { code: "asc" } }),
  ]);
  return {
    antennaModels: models.map((m) => ({
      code: m.code,
      name: m.name,
      electricalTiltMinDeg: m.electricalTiltMinDeg,
      electricalTiltMaxDeg: m.electricalTiltMaxDeg,
      mechanicalTiltMinDeg: m.mechanicalTiltMinDeg,
      mechanicalTiltMaxDeg: m.mechanicalTiltMaxDeg,
      rsPowerMinDbm: m.rsPowerMinDbm,
      rsPowerMaxDbm: m.rsPowerMaxDbm,
      beamSetCodes: m.beamSetCodes,
    })),
    beamSets: sets.map((s) => ({ code: s.code, name: s.name, description: s.description, beamCount: (s.beams as unknown[]).length })),
  };
}
