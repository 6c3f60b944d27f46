/**
 * Fast point-in-region tests for many points.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import { buildBands, classifyPoint, type EdgeBands, flattenEdges } from "./_edges.ts";

/** A prepared region answering point-in-region queries. */
export interface RegionIndex {
  /** True when `(x, y)` is inside the region or exactly on its boundary. */
  containsPoint(x: number, y: number): boolean;
  /** For each `i`, 1 when `(xs[i], ys[i])` is inside or on the boundary, else 0. */
  containsPoints(xs: Float64Array, ys: Float64Array): Uint8Array;
}

/**
 * Prepares a region for point-in-region queries.
 *
 * The region's edges are bucketed into horizontal bands; a query walks the
 * edges of one band only (crossing-number test). Coordinates are any planar
 * unit (level-0 pixels, x right, y down, in hotfield).
 *
 * **Boundary rule:** a point exactly on an edge or vertex (exact cross
 * product zero) counts as inside. Holes exclude their interior; their
 * boundary counts as inside too. The region should be non-overlapping
 * (normalized, e.g. from `buildValidRegion`): overlapping polygons are
 * combined by the even-odd rule.
 *
 * Cost: O(n) to build for n edges; a query costs the number of edges that
 * cross its band (about the number of boundary crossings of a horizontal
 * line, plus a few).
 *
 * @param region Polygons (either winding).
 * @returns The index; the region may be changed afterwards without effect.
 *
 * @example A square with a hole; the boundary is inside
 * ```ts
 * import { createRegionIndex } from "./region_index.ts";
 * const outer: [number, number][] = [[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]];
 * const hole: [number, number][] = [[4, 4], [6, 4], [6, 6], [4, 6], [4, 4]];
 * const index = createRegionIndex([[outer, hole]]);
 * if (!index.containsPoint(1, 1)) throw new Error("inside");
 * if (index.containsPoint(5, 5)) throw new Error("in the hole");
 * if (!index.containsPoint(10, 3) || !index.containsPoint(4, 5)) throw new Error("boundary is inside");
 * const inside = index.containsPoints(new Float64Array([1, 5, 11]), new Float64Array([1, 5, 1]));
 * if (inside.join() !== "1,0,0") throw new Error(inside.join());
 * ```
 */
export function createRegionIndex(region: MultiPolygonPx): RegionIndex {
  const bands: EdgeBands = buildBands(flattenEdges(region));
  return {
    containsPoint(x: number, y: number): boolean {
      return classifyPoint(bands, x, y) !== 0;
    },
    containsPoints(xs: Float64Array, ys: Float64Array): Uint8Array {
      if (xs.length !== ys.length) {
        throw new RangeError(
          `Cannot test points: xs and ys differ in length (${xs.length} and ${ys.length})`,
        );
      }
      const out = new Uint8Array(xs.length);
      for (let i = 0; i < xs.length; i++) out[i] = classifyPoint(bands, xs[i], ys[i]) !== 0 ? 1 : 0;
      return out;
    },
  };
}
