/**
 * The geometry functions the count engine uses, in one place.
 *
 * @module
 */

export { createRegionIndex } from "../geometry/region_index.ts";
export { multiPolygonAreaPx2, polygonAreaPx2, polygonCentroidPx } from "../geometry/planar_area.ts";
export {
  createOverlapIndex,
  diskOverlapArea,
  polygonOverlapArea,
} from "../geometry/window_overlap.ts";
export { regionBBox } from "../geometry/region_bbox.ts";
export {
  createRowRasterizer,
  rasterizeArea,
  type RowRasterizer,
} from "../geometry/raster_coverage.ts";
export { buildValidRegion } from "../geometry/valid_region.ts";
