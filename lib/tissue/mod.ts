/**
 * Tissue masks: PNG decoding, size checks and contour tracing into slide
 * pixel polygons. Re-exports only.
 *
 * @module
 */
export { checkMaskSize, decodeMaskPng, maskToPolygons, maskToRegionPart } from "./read_mask.ts";
export type {
  DecodeMaskOptions,
  Mask,
  MaskToPolygonsOptions,
  MaskToRegionPartOptions,
} from "./read_mask.ts";
