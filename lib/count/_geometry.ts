/**
 * The geometry functions the count engine uses, in one place.
 *
 * @module
 */

import type { MultiPolygonPx, RegionPart } from "../types.ts";
import { createOverlapIndex } from "../geometry/window_overlap.ts";
import { multiPolygonAreaPx2 } from "../geometry/planar_area.ts";

export { createRegionIndex } from "../geometry/region_index.ts";
export { multiPolygonAreaPx2, polygonAreaPx2, polygonCentroidPx } from "../geometry/planar_area.ts";
export { createOverlapIndex, polygonOverlapArea } from "../geometry/window_overlap.ts";
export { scaleRegion } from "../geometry/transform.ts";

// TEMPORARY stand-ins until lib/geometry/raster_coverage.ts and valid_region.ts land.
export function rasterizeArea(
  region: MultiPolygonPx,
  xEdges: Float64Array,
  yEdges: Float64Array,
): Float64Array {
  const idx = createOverlapIndex(region);
  const nx = xEdges.length - 1, ny = yEdges.length - 1;
  const out = new Float64Array(Math.max(0, nx) * Math.max(0, ny));
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      out[j * nx + i] = idx.rect([xEdges[i], yEdges[j], xEdges[i + 1], yEdges[j + 1]]);
    }
  }
  return out;
}
export function buildValidRegion(parts: {
  tissue: RegionPart[];
  tumour: RegionPart[];
  exclude: RegionPart[];
}): {
  region: MultiPolygonPx;
  tissueAreaPx2: number;
  tumourAreaPx2: number;
  excludedAreaPx2: number;
  validAreaPx2: number;
  warnings: string[];
} {
  const region = parts.tissue.flatMap((p) => p.polygons);
  const a = multiPolygonAreaPx2(region);
  return {
    region,
    tissueAreaPx2: a,
    tumourAreaPx2: 0,
    excludedAreaPx2: 0,
    validAreaPx2: a,
    warnings: [],
  };
}
