/**
 * Scaling of regions in the plane.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";

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
