/**
 * Planar geometry of slide regions: areas, normalization, the valid counting
 * region, point-in-region tests, exact window overlaps and raster coverage.
 * Coordinates are level-0 pixels (x right, y down) or any other planar unit;
 * nothing here is geodesic. Re-exports only.
 *
 * @module
 */
export {
  multiPolygonAreaPx2,
  polygonAreaPx2,
  polygonCentroidPx,
  ringAreaPx2,
} from "./planar_area.ts";
export { normalizeMultiPolygon, normalizePolygon } from "./normalize.ts";
export { buildValidRegion } from "./valid_region.ts";
export type { ValidRegion, ValidRegionParts } from "./valid_region.ts";
export { createRegionIndex } from "./region_index.ts";
export type { RegionIndex } from "./region_index.ts";
export {
  createOverlapIndex,
  diskOverlapArea,
  polygonOverlapArea,
  rectOverlapArea,
} from "./window_overlap.ts";
export type { OverlapIndex } from "./window_overlap.ts";
export { rasterizeArea, uniformEdges } from "./raster_coverage.ts";
export { regionBBox, scaleRegion } from "./transform.ts";
