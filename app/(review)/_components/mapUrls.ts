// Where the maps fetch their rasters: URL templates with "{layer}" and "{floor}" placeholders, the form GridMap
// takes from a server component.

/**
 * Layers of the network as it stands. The version is in the URL only so that the browser's cache is keyed
 * by it (the route serves the latest version).
 */
export function baselineRasterUrl(networkId: string, version: number): string {
  return `/api/network/raster?network=${encodeURIComponent(networkId)}&v=${version}&layer={layer}&floor={floor}`;
}

/** Layers of a finished simulation (before and after). */
export function simulationRasterUrl(simulationId: string): string {
  return `/api/simulations/${encodeURIComponent(simulationId)}/raster?layer={layer}&floor={floor}`;
}
