/**
 * Outlines already proven valid by {@linkcode checkOutline}, remembered by
 * identity with a fingerprint of their coordinates, so building the valid
 * region does not search the same million edges for contacts again.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";

const proven = new WeakMap<object, number>();

/**
 * A fingerprint of every coordinate of `polygons` (order-sensitive), so a
 * record outlives no change to the outline: O(positions), far cheaper than
 * the contact search it saves.
 */
function fingerprint(polygons: MultiPolygonPx): number {
  let h = polygons.length;
  for (const p of polygons) {
    h = (h * 31 + p.length) % 4294967291;
    for (const r of p) {
      h = (h * 31 + r.length) % 4294967291;
      for (let i = 0; i < r.length; i++) {
        h = (h * 1000003 + Math.round(r[i][0] * 1024) * 7 + Math.round(r[i][1] * 1024)) %
          4294967291;
      }
    }
  }
  return h;
}

/**
 * Records that `polygons` is a valid outline as it stands (rings meet at
 * most at shared vertices and nest consistently).
 *
 * @example
 * ```ts
 * import { isProvenValid, markProvenValid } from "./proven_outlines.ts";
 * const outline = [[[[0, 0], [4, 0], [4, 4], [0, 4], [0, 0]]]] as [number, number][][][];
 * markProvenValid(outline);
 * if (!isProvenValid(outline)) throw new Error("just recorded");
 * outline[0][0][2] = [5, 5];
 * if (isProvenValid(outline)) throw new Error("a changed outline is no longer proven");
 * ```
 */
export function markProvenValid(polygons: MultiPolygonPx): void {
  proven.set(polygons, fingerprint(polygons));
}

/**
 * Whether `polygons` was recorded by {@linkcode markProvenValid} and has not
 * changed since.
 *
 * @example
 * ```ts
 * import { isProvenValid } from "./proven_outlines.ts";
 * if (isProvenValid([])) throw new Error("nothing recorded");
 * ```
 */
export function isProvenValid(polygons: MultiPolygonPx): boolean {
  const f = proven.get(polygons);
  return f !== undefined && f === fingerprint(polygons);
}
