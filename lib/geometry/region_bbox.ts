/**
 * The bounding box of a region: the one bounding-box helper of hotfield.
 *
 * @module
 */

import type { BBoxPx, MultiPolygonPx } from "../types.ts";

/**
 * Axis-aligned bounding box of a region: the least and greatest x and y over
 * every position of every ring (holes included, so a ring may be passed
 * alone as `[[ring]]`).
 *
 * Works in any planar unit (pixels in, pixels out; µm in, µm out). The box is
 * closed: a region of one position has a box of zero width and height.
 *
 * @param region Polygons, e.g. in level-0 pixels.
 * @returns `[minX, minY, maxX, maxY]`, or null when the region has no
 *   position at all (no polygons, or only empty rings).
 *
 * @example The box of a triangle, and of nothing
 * ```ts
 * import { regionBBox } from "hotfield";
 * const triangle: [number, number][] = [[1, 2], [5, 2], [3, 7], [1, 2]];
 * const box = regionBBox([[triangle]]);
 * if (box?.join() !== "1,2,5,7") throw new Error(`triangle box ${box}`);
 * if (regionBBox([]) !== null) throw new Error("an empty region must have no box");
 * ```
 */
export function regionBBox(region: MultiPolygonPx): BBoxPx | null {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const poly of region) {
    for (const ring of poly) {
      for (const p of ring) {
        const x = p[0], y = p[1];
        if (x < minX) minX = x;
        if (x > maxX) maxX = x;
        if (y < minY) minY = y;
        if (y > maxY) maxY = y;
      }
    }
  }
  return minX <= maxX ? [minX, minY, maxX, maxY] : null;
}
