/**
 * Private: intersection of regions whose boundaries do not meet, and
 * grouping of rings into polygons.
 *
 * When no edge of A touches or crosses an edge of B, every ring of A lies
 * wholly inside or wholly outside B (and vice versa), and the boundary of
 * A ∩ B is made of the A-rings inside B and the B-rings inside A (A − B is
 * A ∩ the complement of B, see `_pair_ops.ts`). One point-in-region test
 * per ring decides, after which the rings are grouped
 * into polygons again (each hole goes to the smallest outer ring around it).
 *
 * @module
 */

import type { MultiPolygonPx, PolygonPx, Ring } from "../types.ts";
import { buildBands, classifyPoint, type EdgeBands, flattenEdges } from "./_edges.ts";
import { ringAreaPx2 } from "./planar_area.ts";
import { regionBBox } from "./region_bbox.ts";

type BBox = [number, number, number, number];

function ringBBox(r: Ring): BBox {
  // Rings handed here have nonzero area, so they have a box.
  return regionBBox([[r]])!;
}

/**
 * Bounding box of a region for the pair operations. An empty region gets the
 * inverted box `[∞, ∞, −∞, −∞]`: it meets no box and leaves a union of boxes
 * unchanged, so the callers need no special case.
 */
export function bboxOf(mp: MultiPolygonPx): BBox {
  return regionBBox(mp) ?? [Infinity, Infinity, -Infinity, -Infinity];
}

/** Whether two closed boxes meet (touching counts). */
export function boxesMeet(p: BBox, q: BBox): boolean {
  return p[0] <= q[2] && q[0] <= p[2] && p[1] <= q[3] && q[1] <= p[3];
}

/** Crossing-number test of a point against one ring; 0 outside, 1 inside, 2 on it. */
export function pointInRing(r: Ring, x: number, y: number): 0 | 1 | 2 {
  let inside = 0;
  for (let i = 0, n = r.length - 1; i < n; i++) {
    const ax = r[i][0], ay = r[i][1], bx = r[i + 1][0], by = r[i + 1][1];
    if ((ay > y) !== (by > y)) {
      const cr = (bx - ax) * (y - ay) - (by - ay) * (x - ax);
      if (cr === 0) return 2;
      if ((cr > 0) === (by > ay)) inside ^= 1;
    } else if (ay === y && by === y) {
      if ((x >= ax && x <= bx) || (x >= bx && x <= ax)) return 2;
    } else if ((ay === y && ax === x) || (by === y && bx === x)) {
      return 2;
    }
  }
  return inside as 0 | 1;
}

/** A point of the ring that is strictly inside or outside `b` (rings that do not meet b). */
function classifyRing(b: EdgeBands, r: Ring): 0 | 1 {
  for (let i = 0; i < r.length - 1; i++) {
    const c = classifyPoint(b, r[i][0], r[i][1]);
    if (c !== 2) return c;
  }
  // every vertex on the boundary cannot happen without contact; treat as outside
  return 0;
}

/**
 * Groups oriented rings (outer positive, holes negative, none crossing) into
 * polygons. Holes go to the smallest outer ring containing them.
 */
export function assembleRings(rings: Ring[]): MultiPolygonPx {
  const outers: { ring: Ring; area: number; box: BBox; holes: Ring[] }[] = [];
  const holes: Ring[] = [];
  for (const r of rings) {
    const a = ringAreaPx2(r);
    if (a > 0) outers.push({ ring: r, area: a, box: ringBBox(r), holes: [] });
    else if (a < 0) holes.push(r);
  }
  for (const h of holes) {
    const hb = ringBBox(h);
    let best = -1;
    for (let o = 0; o < outers.length; o++) {
      const ob = outers[o].box;
      if (hb[0] < ob[0] || hb[1] < ob[1] || hb[2] > ob[2] || hb[3] > ob[3]) continue;
      if (best >= 0 && outers[o].area >= outers[best].area) continue;
      let where: 0 | 1 | 2 = 2;
      for (let i = 0; i < h.length - 1 && where === 2; i++) {
        where = pointInRing(outers[o].ring, h[i][0], h[i][1]);
      }
      if (where !== 0) best = o;
    }
    if (best >= 0) outers[best].holes.push(h);
  }
  return outers.map((o) => [o.ring, ...o.holes] as PolygonPx);
}

/** A ∩ B for regions whose boundaries do not meet (normalized inputs). */
export function intersectDisjointBoundaries(a: MultiPolygonPx, b: MultiPolygonPx): MultiPolygonPx {
  const ia = buildBands(flattenEdges(a), 4, 0, true);
  const ib = buildBands(flattenEdges(b), 4, 0, true);
  const keep: Ring[] = [];
  for (const p of a) for (const r of p) if (classifyRing(ib, r) === 1) keep.push(r);
  for (const p of b) for (const r of p) if (classifyRing(ia, r) === 1) keep.push(r);
  return assembleRings(keep);
}
