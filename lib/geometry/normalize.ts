/**
 * Normalization of polygon winding and repeated positions.
 *
 * Coordinates are level-0 pixels (x right, y down). A normalized ring is
 * closed (first equals last), has no repeated consecutive positions, and its
 * signed shoelace area (see `ringAreaPx2`) is positive for an outer ring and
 * negative for a hole. Rings with fewer than three distinct positions (zero
 * area) are dropped; a polygon whose outer ring is dropped is dropped whole.
 *
 * @module
 */

import type { MultiPolygonPx, PolygonPx, Ring } from "../types.ts";
import { ringAreaPx2 } from "./planar_area.ts";

/**
 * Closes a ring and drops repeated consecutive positions.
 *
 * @param ring Positions, closed or not.
 * @returns A new closed ring, or null when fewer than three distinct positions remain.
 *
 * @example Repeats removed, ring closed
 * ```ts
 * import { cleanRing } from "./normalize.ts";
 * const r = cleanRing([[0, 0], [1, 0], [1, 0], [1, 1]]);
 * if (r === null || r.length !== 4 || r[3].join() !== "0,0") throw new Error(JSON.stringify(r));
 * ```
 */
export function cleanRing(ring: Ring): Ring | null {
  const out: Ring = [];
  for (const p of ring) {
    const last = out[out.length - 1];
    if (last !== undefined && last[0] === p[0] && last[1] === p[1]) continue;
    out.push([p[0], p[1]]);
  }
  // drop the closing duplicate, then close again
  while (out.length > 1) {
    const a = out[0], b = out[out.length - 1];
    if (a[0] === b[0] && a[1] === b[1]) out.pop();
    else break;
  }
  if (out.length < 3) return null;
  out.push([out[0][0], out[0][1]]);
  return out;
}

/**
 * Normalizes one polygon: outer ring positive, holes negative, closed rings,
 * no repeated consecutive positions. Either input winding is accepted.
 *
 * @param p Outer ring first, then holes.
 * @returns The normalized polygon, or `[]` when the outer ring has no area.
 *
 * @example Reversing a clockwise-in-y-up outer ring
 * ```ts
 * import { normalizePolygon } from "./normalize.ts";
 * import { ringAreaPx2 } from "./planar_area.ts";
 * const outer: [number, number][] = [[0, 0], [0, 3], [3, 3], [3, 3], [3, 0], [0, 0]];
 * const [o] = normalizePolygon([outer]);
 * if (ringAreaPx2(o) !== 9 || o.length !== 5) throw new Error(`ring ${JSON.stringify(o)}, area ${ringAreaPx2(o)}`);
 * ```
 */
export function normalizePolygon(p: PolygonPx): PolygonPx {
  return orientPolygon(p, false);
}

/**
 * Like `normalizePolygon`, but with `keepZeroArea` a ring of zero net area
 * with at least three distinct positions is kept as given (a bow-tie has net
 * area 0 yet encloses two triangles; a union repairs it later).
 *
 * @param p Outer ring first, then holes.
 * @param keepZeroArea Keep rings whose signed area is exactly 0.
 * @returns The oriented polygon, or `[]` when the outer ring is dropped.
 *
 * @example A bow-tie is kept for repair
 * ```ts
 * import { orientPolygon } from "./normalize.ts";
 * const bow: [number, number][] = [[0, 0], [2, 2], [2, 0], [0, 2], [0, 0]];
 * if (orientPolygon([bow], true).length !== 1) throw new Error("a zero-area bow tie is kept when asked");
 * if (orientPolygon([bow], false).length !== 0) throw new Error("a zero-area bow tie is dropped by default");
 * ```
 */
export function orientPolygon(p: PolygonPx, keepZeroArea: boolean): PolygonPx {
  if (p.length === 0) return [];
  const outer = cleanRing(p[0]);
  if (outer === null) return [];
  const a = ringAreaPx2(outer);
  if (a === 0 && !keepZeroArea) return [];
  const out: PolygonPx = [a >= 0 ? outer : outer.reverse()];
  for (let i = 1; i < p.length; i++) {
    const h = cleanRing(p[i]);
    if (h === null) continue;
    const ha = ringAreaPx2(h);
    if (ha === 0 && !keepZeroArea) continue;
    out.push(ha <= 0 ? h : h.reverse());
  }
  return out;
}

/**
 * Normalizes every polygon of a multipolygon (see {@linkcode normalizePolygon});
 * polygons without area are dropped.
 *
 * @param mp Polygons, either winding.
 * @returns Normalized polygons.
 *
 * @example Dropping a degenerate polygon
 * ```ts
 * import { normalizeMultiPolygon } from "./normalize.ts";
 * const line: [number, number][] = [[0, 0], [1, 1], [0, 0]];
 * const sq: [number, number][] = [[0, 0], [1, 0], [1, 1], [0, 1], [0, 0]];
 * const n = normalizeMultiPolygon([[line], [sq]]).length;
 * if (n !== 1) throw new Error(`${n} polygons kept; the line has no area and must go`);
 * ```
 */
export function normalizeMultiPolygon(mp: MultiPolygonPx): MultiPolygonPx {
  const out: MultiPolygonPx = [];
  for (const p of mp) {
    const q = normalizePolygon(p);
    if (q.length > 0) out.push(q);
  }
  return out;
}
