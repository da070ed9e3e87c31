// Writes a whole network (import or demo seed) in one transaction: it lands complete or
// not at all.
import type { Prisma } from "../open";
import type { Tx } from "../audit";
import type { Scenario } from "../../radio/scenario";
import { CELL_PARAMETERS } from "../../radio/scenario";
import { float32ToBytes } from "../rasterBytes";
import { encodeParameterValue } from "./values";

export interface SaveNetworkOptions {
  kind: "seed" | "import";
  note: string;
  actorId?: string;
  /** Valid-from of the first parameter values (default now). */
  at?: Date;
  /** The UTM zone and hemisphere an import projected lon/lat positions with. */
  projection?: { utmZone: number; utmHemisphere: "north" | "south" };
}

export interface SavedNetwork {
  networkId: string;
  versionNumber: number;
}

/** Creates a network with version 1 from a scenario, in a transaction of its own. Fails if the name exists. */
export async function createNetwork(
  prisma: Prisma,
  scenario: Scenario,
  options: SaveNetworkOptions,
): Promise<SavedNetwork> {
  return prisma.$transaction((tx) => createNetworkTx(tx, scenario, options), { timeout: 120_000, maxWait: 30_000 });
}

/**
 * Creates a network inside the caller's transaction, so that what records it (an audit event)
 * lands with it. Rows go in with createMany: one statement per table, not one per row.
 */
export async function createNetworkTx(tx: Tx, scenario: Scenario, options: SaveNetworkOptions): Promise<SavedNetwork> {
  const at = options.at ?? new Date();
  const network = await tx.network.create({
    data: {
      name: scenario.name,
      originLon: scenario.origin?.lon ?? null,
      originLat: scenario.origin?.lat ?? null,
      utmZone: options.projection?.utmZone ?? null,
      utmHemisphere: options.projection?.utmHemisphere ?? null,
      ...scenario.bounds,
      settings: { create: { ...scenario.settings } },
      versions: {
        create: { number: 1, kind: options.kind, note: options.note, createdById: options.actorId, createdAt: at },
      },
    },
  });
  const networkId = network.id;

  await tx.beamSet.createMany({
    data: scenario.beamSets.map((set) => ({
      networkId,
      code: set.id,
      name: set.name,
      description: set.description,
      beams: set.beams.map((beam) => ({ ...beam })),
    })),
  });
  const models = await tx.antennaModel.createManyAndReturn({
    data: scenario.antennaModels.map(({ id, beamSetIds, ...rest }) => ({ ...rest, networkId, code: id, beamSetCodes: beamSetIds })),
    select: { id: true, code: true },
  });
  const modelIds = new Map(models.map((row) => [row.code, row.id]));
  const sites = await tx.site.createManyAndReturn({
    data: scenario.sites.map((site) => ({
      networkId,
      code: site.id,
      name: site.name,
      x: site.x,
      y: site.y,
      groundHeightM: site.groundHeightM,
    })),
    select: { id: true, code: true },
  });
  const siteIds = new Map(sites.map((row) => [row.code, row.id]));
  const cellRows = scenario.cells.map((cell) => {
    const siteId = siteIds.get(cell.siteId);
    const antennaModelId = modelIds.get(cell.antennaModelId);
    if (!siteId) throw new RangeError(`cell ${cell.id}: unknown site ${cell.siteId}`);
    if (!antennaModelId) throw new RangeError(`cell ${cell.id}: unknown antenna model ${cell.antennaModelId}`);
    return {
      networkId,
      siteId,
      antennaModelId,
      code: cell.id,
      antennaHeightM: cell.antennaHeightM,
      frequencyMHz: cell.frequencyMHz,
      bandwidthMHz: cell.bandwidthMHz,
      subcarrierSpacingKHz: cell.subcarrierSpacingKHz,
      azimuthDeg: cell.azimuthDeg,
      mechanicalTiltDeg: cell.mechanicalTiltDeg,
      electricalTiltDeg: cell.electricalTiltDeg,
      beamSetCode: cell.beamSetId,
      rsPowerDbm: cell.rsPowerDbm,
    };
  });
  const cells = await tx.cell.createManyAndReturn({ data: cellRows, select: { id: true, code: true } });
  const cellIds = new Map(cells.map((row) => [row.code, row.id]));
  await tx.cellParameterValue.createMany({
    data: scenario.cells.flatMap((cell) =>
      CELL_PARAMETERS.map((parameter) => ({
        cellId: cellIds.get(cell.id)!,
        parameter,
        value: encodeParameterValue(cell[parameter]),
        validFrom: at,
        fromVersion: 1,
      })),
    ),
  });
  await tx.building.createMany({
    data: scenario.buildings.map((building) => ({
      networkId,
      code: building.id,
      footprint: building.footprint.map((p) => [p.x, p.y]),
      heightM: building.heightM,
      floors: building.floors,
    })),
  });
  await tx.cluster.createMany({
    data: scenario.clusters.map((cluster) => ({
      networkId,
      code: cluster.id,
      name: cluster.name,
      polygon: cluster.polygon.map((p) => [p.x, p.y]),
    })),
  });
  const rasters = [{ kind: "terrain", raster: scenario.terrain }];
  if (scenario.traffic) rasters.push({ kind: "traffic", raster: scenario.traffic });
  for (const { kind, raster } of rasters) {
    await tx.raster.create({
      data: {
        networkId,
        kind,
        originX: raster.originX,
        originY: raster.originY,
        cellSize: raster.cellSize,
        width: raster.width,
        height: raster.height,
        values: float32ToBytes(raster.values),
      },
    });
  }
  return { networkId, versionNumber: 1 };
}
