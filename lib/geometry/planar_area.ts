/**
 * Planar (flat) areas and centroids by the shoelace formula.
 *
 * Coordinates are level-0 slide pixels, x right, y down, or any other planar
 * unit; areas come out in that unit squared. Never geodesic.
 *
 * Sign convention: the signed area of a ring is
 * ½ Σ (x_i·y_{i+1} − x_{i+1}·y_i). With y pointing down, a positive ring runs
 * clockwise as seen on screen (counter-clockwise in y-up mathematical axes).
 * hotfield calls that orientation "outer"; holes are negative.
 *
 * @module
 */

import type { MultiPolygonPx, PolygonPx, Ring, Vec2 } from "../types.ts";

/**
 * Signed shoelace area of a ring.
 *
 * Positive when the ring runs clockwise on screen in (x right, y down)
 * coordinates, i.e. the orientation hotfield uses for outer rings. The ring
 * may be closed (first equals last) or not; the closing edge is implied.
 * Computed relative to the first vertex to keep rounding small far from the
 * origin.
 *
 * @param ring Positions `[x, y]`.
 * @returns Signed area in the coordinate unit squared (0 for fewer than 3 positions).
 *
 * @example A 4 × 3 rectangle
 * ```ts
 * import { ringAreaPx2 } from "./planar_area.ts";
 * const r: [number, number][] = [[0, 0], [4, 0], [4, 3], [0, 3], [0, 0]];
 * if (ringAreaPx2(r) !== 12) throw new Error("outer ring should be +12");
 * if (ringAreaPx2([...r].reverse()) !== -12) throw new Error("reversed should be -12");
 * ```
 */
export function ringAreaPx2(ring: Ring): number {
  const n = ring.length;
  if (n < 3) return 0;
  const x0 = ring[0][0], y0 = ring[0][1];
  let s = 0;
  let px = 0, py = 0;
  for (let i = 1; i < n; i++) {
    const qx = ring[i][0] - x0, qy = ring[i][1] - y0;
    s += px * qy - qx * py;
    px = qx;
    py = qy;
  }
  // closing edge back to the first vertex (0, 0) adds px·0 − 0·py = 0
  return s / 2;
}

/**
 * Area of a polygon: |outer| − Σ |holes|, whatever the rings' winding.
 *
 * @param polygon Outer ring first, then holes (pixels).
 * @returns Area in px² (0 for an empty polygon).
 *
 * @example A 10 × 10 square with a 2 × 2 hole
 * ```ts
 * import { polygonAreaPx2 } from "hotfield";
 * const outer: [number, number][] = [[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]];
 * const hole: [number, number][] = [[4, 4], [6, 4], [6, 6], [4, 6], [4, 4]];
 * const area = polygonAreaPx2([outer, hole]);
 * if (area !== 96) throw new Error(`100 px² minus a 4 px² hole gave ${area}`);
 * ```
 */
export function polygonAreaPx2(polygon: PolygonPx): number {
  if (polygon.length === 0) return 0;
  let a = Math.abs(ringAreaPx2(polygon[0]));
  for (let i = 1; i < polygon.length; i++) a -= Math.abs(ringAreaPx2(polygon[i]));
  return a;
}

/**
 * Area of a multipolygon: the sum of its polygons' areas (polygons are
 * assumed not to overlap, as in a normalized region).
 *
 * @param mp Polygons in pixels.
 * @returns Area in px² (0 for an empty list).
 *
 * @example Two unit squares
 * ```ts
 * import { multiPolygonAreaPx2 } from "hotfield";
 * const sq = (x: number): [number, number][] => [[x, 0], [x + 1, 0], [x + 1, 1], [x, 1], [x, 0]];
 * const area = multiPolygonAreaPx2([[sq(0)], [sq(5)]]);
 * if (area !== 2) throw new Error(`two unit squares gave ${area} px²`);
 * ```
 */
export function multiPolygonAreaPx2(mp: MultiPolygonPx): number {
  let a = 0;
  for (const p of mp) a += polygonAreaPx2(p);
  return a;
}

/**
 * Area centroid of a polygon with holes (holes subtract).
 *
 * Uses the first vertex of the outer ring as local origin for accuracy.
 * A polygon of zero area returns the mean of its outer ring's positions.
 *
 * @param polygon Outer ring first, then holes (pixels, either winding).
 * @returns The centroid `[x, y]` in pixels.
 *
 * @example A square's centre, and the shift caused by a hole
 * ```ts
 * import { polygonCentroidPx } from "./planar_area.ts";
 * const sq: [number, number][] = [[0, 0], [4, 0], [4, 4], [0, 4], [0, 0]];
 * const [cx, cy] = polygonCentroidPx([sq]);
 * if (cx !== 2 || cy !== 2) throw new Error(`centroid ${cx}, ${cy}; expected 2, 2`);
 * const hole: [number, number][] = [[2, 0], [4, 0], [4, 4], [2, 4], [2, 0]].map(([x, y]) =>
 *   [x * 0.5 + 2, y * 0.5 + 1] as [number, number]
 * );
 * const [hx] = polygonCentroidPx([sq, hole]);
 * if (!(hx < 2)) throw new Error("a hole on the right moves the centroid left");
 * ```
 */
export function polygonCentroidPx(polygon: PolygonPx): Vec2 {
  if (polygon.length === 0 || polygon[0].length === 0) return [NaN, NaN];
  const ox = polygon[0][0][0], oy = polygon[0][0][1];
  let aSum = 0, cxSum = 0, cySum = 0;
  for (let r = 0; r < polygon.length; r++) {
    const ring = polygon[r];
    const n = ring.length;
    let a = 0, cx = 0, cy = 0;
    for (let i = 0; i < n; i++) {
      const p = ring[i], q = ring[(i + 1) % n];
      const px = p[0] - ox, py = p[1] - oy, qx = q[0] - ox, qy = q[1] - oy;
      const c = px * qy - qx * py;
      a += c;
      cx += (px + qx) * c;
      cy += (py + qy) * c;
    }
    // outer counts positive, holes negative, whatever their winding
    const sign = (r === 0 ? 1 : -1) * (a < 0 ? -1 : 1);
    aSum += sign * a / 2;
    cxSum += sign * cx / 6;
    cySum += sign * cy / 6;
  }
  if (aSum === 0) {
    const ring = polygon[0];
    let sx = 0, sy = 0;
    for (const p of ring) {
      sx += p[0];
      sy += p[1];
    }
    return [sx / ring.length, sy / ring.length];
  }
  return [ox + cxSum / aSum, oy + cySum / aSum];
}
