// Writes a whole network (import or demo seed) in one transaction: it lands complete or
// not at all.
import type { Prisma } from "../open";
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
}

export interface SavedNetwork {
  networkId: string;
  versionNumber: number;
}

/** Creates a network with version 1 from a scenario. Fails if the name exists. */
export async function createNetwork(
  prisma: Prisma,
  scenario: Scenario,
  options: SaveNetworkOptions,
): Promise<SavedNetwork> {
  const at = options.at ?? new Date();
  return prisma.$transaction(
    async (tx) => {
      const network = await tx.network.create({
        data: {
          name: scenario.name,
          originLon: scenario.origin?.lon ?? null,
          originLat: scenario.origin?.lat ?? null,
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
      const modelIds = new Map<string, string>();
      for (const model of scenario.antennaModels) {
        const { id, beamSetIds, ...rest } = model;
        const row = await tx.antennaModel.create({ data: { ...rest, networkId, code: id, beamSetCodes: beamSetIds } });
        modelIds.set(id, row.id);
      }
      const siteIds = new Map<string, string>();
      for (const site of scenario.sites) {
        const row = await tx.site.create({
          data: { networkId, code: site.id, name: site.name, x: site.x, y: site.y, groundHeightM: site.groundHeightM },
        });
        siteIds.set(site.id, row.id);
      }
      for (const cell of scenario.cells) {
        const siteId = siteIds.get(cell.siteId);
        const antennaModelId = modelIds.get(cell.antennaModelId);
        if (!siteId) throw new RangeError(`cell ${cell.id}: unknown site ${cell.siteId}`);
        if (!antennaModelId) throw new RangeError(`cell ${cell.id}: unknown antenna model ${cell.antennaModelId}`);
        await tx.cell.create({
          data: {
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
            history: {
              create: CELL_PARAMETERS.map((parameter) => ({
                parameter,
                value: encodeParameterValue(cell[parameter]),
                validFrom: at,
                fromVersion: 1,
              })),
            },
          },
        });
      }
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
    },
    { timeout: 120_000, maxWait: 30_000 },
  );
}
