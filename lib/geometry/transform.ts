/**
 * Scaling and bounding boxes of regions in the plane.
 *
 * @module
 */

import type { BBoxPx, MultiPolygonPx } from "../types.ts";

/**
 * Scales every position by `(sx, sy)` about the origin, e.g. to go from
 * level-0 pixels to micrometres with `sx = mppX`, `sy = mppY`.
 *
 * Positive factors keep the winding (outer rings stay positive); if exactly
 * one factor is negative the rings are reversed so the result stays
 * normalized.
 *
 * @param region Polygons in pixels.
 * @param sx Factor along x.
 * @param sy Factor along y.
 * @returns A new region; the input is not changed.
 * @throws {RangeError} When a factor is zero or not finite.
 *
 * @example Pixels to micrometres with unequal mpp
 * ```ts
 * import { scaleRegion } from "./transform.ts";
 * const sq: [number, number][] = [[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]];
 * const [[ring]] = scaleRegion([[sq]], 0.25, 0.5);
 * if (ring[2][0] !== 2.5 || ring[2][1] !== 5) throw new Error();
 * ```
 */
export function scaleRegion(region: MultiPolygonPx, sx: number, sy: number): MultiPolygonPx {
  if (!Number.isFinite(sx) || !Number.isFinite(sy) || sx === 0 || sy === 0) {
    throw new RangeError(
      `Cannot scale a region: factors must be finite and nonzero, got ${sx}, ${sy}`,
    );
  }
  const flip = (sx < 0) !== (sy < 0);
  return region.map((poly) =>
    poly.map((ring) => {
      const r = ring.map(([x, y]) => [x * sx, y * sy] as [number, number]);
      return flip ? r.reverse() : r;
    })
  );
}

/**
 * Axis-aligned bounding box of a region.
 *
 * @param region Polygons in pixels.
 * @returns `[minX, minY, maxX, maxY]`; for an empty region
 *   `[Infinity, Infinity, -Infinity, -Infinity]`.
 *
 * @example The box of a triangle
 * ```ts
 * import { regionBBox } from "./transform.ts";
 * const tri: [number, number][] = [[1, 2], [5, 2], [3, 7], [1, 2]];
 * const b = regionBBox([[tri]]);
 * if (b.join() !== "1,2,5,7") throw new Error(b.join());
 * ```
 */
export function regionBBox(region: MultiPolygonPx): BBoxPx {
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
  return [minX, minY, maxX, maxY];
}
