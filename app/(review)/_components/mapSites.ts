// Sites for the maps: every cell as a wedge, pointing where it will point after the change
// (and where it pointed before, for the "before" view); the request's cells marked.
import type { CellRow } from "@/lib/db/networks/data";
import type { CellParameter } from "@/lib/radio/scenario";
import type { MapSiteDto } from "./types";

/**
 * `marked`: the cells to highlight, by default those of the items (the request builder passes the cells
 * chosen so far, which may not have a changed value yet).
 */
export function mapSitesOf(
  cells: readonly CellRow[],
  items: readonly { cellId: string; parameter: CellParameter; newValue: number | string }[],
  marked?: ReadonlySet<string>,
): MapSiteDto[] {
  const changedCells = marked ?? new Set(items.map((item) => item.cellId));
  const newAzimuth = new Map(items.filter((i) => i.parameter === "azimuthDeg").map((i) => [i.cellId, Number(i.newValue)]));
  const sites = new Map<string, MapSiteDto>();
  for (const cell of cells) {
    let site = sites.get(cell.siteCode);
    if (!site) sites.set(cell.siteCode, (site = { code: cell.siteCode, x: cell.x, y: cell.y, cells: [] }));
    const after = newAzimuth.get(cell.code);
    site.cells.push({
      code: cell.code,
      azimuthDeg: after ?? cell.azimuthDeg,
      ...(after !== undefined ? { azimuthBeforeDeg: cell.azimuthDeg } : {}),
      changed: changedCells.has(cell.code),
    });
  }
  return [...sites.values()];
}
