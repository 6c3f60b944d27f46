/**
 * Private: a region's edges as flat typed arrays, indexed in horizontal bands.
 *
 * Every ring is oriented on the way in (the first ring of a polygon positive,
 * the others negative, see `planar_area.ts`), so that summing signed per-edge
 * contributions gives areas of the region whatever the input winding.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import { ringAreaPx2 } from "./planar_area.ts";

/** Oriented edges of a region, in flat arrays. */
export interface EdgeSet {
  x0: Float64Array;
  y0: Float64Array;
  x1: Float64Array;
  y1: Float64Array;
  count: number;
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/** Edge sets already made, by region (regions are never changed once built). */
const flattened = new WeakMap<MultiPolygonPx, EdgeSet>();

/**
 * Flattens a region into oriented edges (zero-length edges dropped). The
 * same region object gives the same (shared, read-only) edge set: the
 * engine flattens one region for several rasters and indexes.
 */
export function flattenEdges(region: MultiPolygonPx): EdgeSet {
  let e = flattened.get(region);
  if (e === undefined) {
    e = flattenEdgesOnce(region);
    flattened.set(region, e);
  }
  return e;
}

function flattenEdgesOnce(region: MultiPolygonPx): EdgeSet {
  let n = 0;
  for (const poly of region) for (const ring of poly) n += ring.length;
  const x0 = new Float64Array(n), y0 = new Float64Array(n);
  const x1 = new Float64Array(n), y1 = new Float64Array(n);
  let k = 0;
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const poly of region) {
    for (let r = 0; r < poly.length; r++) {
      const ring = poly[r];
      const m = ring.length;
      if (m < 2) continue;
      const a = ringAreaPx2(ring);
      if (a === 0) continue;
      const reverse = (r === 0) !== (a > 0);
      for (let i = 0; i < m; i++) {
        // the closing edge is implied when the ring is not closed
        const j = i + 1 < m ? i + 1 : 0;
        let p = ring[i], q = ring[j];
        if (reverse) {
          const t = p;
          p = q;
          q = t;
        }
        if (p[0] === q[0] && p[1] === q[1]) continue;
        x0[k] = p[0];
        y0[k] = p[1];
        x1[k] = q[0];
        y1[k] = q[1];
        if (p[0] < minX) minX = p[0];
        if (p[0] > maxX) maxX = p[0];
        if (p[1] < minY) minY = p[1];
        if (p[1] > maxY) maxY = p[1];
        k++;
      }
    }
  }
  return { x0, y0, x1, y1, count: k, minX, minY, maxX, maxY };
}

/**
 * Edges bucketed by horizontal bands of equal height (CSR layout): band b
 * holds the ids `ids[start[b]] … ids[start[b + 1] − 1]` of every edge whose
 * y-range meets the band.
 */
export interface EdgeBands {
  edges: EdgeSet;
  bandCount: number;
  bandHeight: number;
  start: Uint32Array;
  ids: Uint32Array;
}

/** Band index of y, clamped to the valid range. */
export function bandOf(b: EdgeBands, y: number): number {
  const k = Math.floor((y - b.edges.minY) / b.bandHeight);
  return k < 0 ? 0 : k >= b.bandCount ? b.bandCount - 1 : k;
}

/** Lower y of band k (exactly as used when clipping). */
export function bandLo(b: EdgeBands, k: number): number {
  return k === 0 ? b.edges.minY : b.edges.minY + k * b.bandHeight;
}

/** Upper y of band k (exactly as used when clipping). */
export function bandHi(b: EdgeBands, k: number): number {
  return k === b.bandCount - 1 ? b.edges.maxY : b.edges.minY + (k + 1) * b.bandHeight;
}

/**
 * Buckets edges into bands of equal height: about `edgesPerBand` edge starts
 * per band, but bands no lower than `minBandHeight`. With `compact`, fewer
 * bands when edges are tall compared with them, so the lists hold about five
 * entries per edge (zigzag outlines would otherwise list each edge in many
 * bands); only for callers whose results do not depend on where bands cut.
 */
export function buildBands(
  edges: EdgeSet,
  edgesPerBand = 4,
  minBandHeight = 0,
  compact = false,
): EdgeBands {
  const n = edges.count;
  const span = edges.maxY - edges.minY;
  let bandCount = n === 0 || !(span > 0)
    ? 1
    : Math.max(1, Math.min(1 << 16, Math.ceil(n / edgesPerBand)));
  if (minBandHeight > 0 && span > 0) {
    bandCount = Math.max(1, Math.min(bandCount, Math.floor(span / minBandHeight)));
  }
  if (compact && span > 0 && n > 0) {
    let tall = 0;
    for (let e = 0; e < n; e++) tall += Math.abs(edges.y1[e] - edges.y0[e]);
    if (tall > 0) bandCount = Math.max(1, Math.min(bandCount, Math.floor((4 * n * span) / tall)));
  }
  const bandHeight = bandCount === 1 ? (span > 0 ? span : 1) : span / bandCount;
  if (!(bandHeight > 0)) bandCount = 1;
  const b: EdgeBands = {
    edges,
    bandCount,
    bandHeight: bandHeight > 0 ? bandHeight : 1,
    start: new Uint32Array(bandCount + 1),
    ids: new Uint32Array(0),
  };
  const lo = new Uint32Array(n), hi = new Uint32Array(n);
  const counts = new Uint32Array(bandCount + 1);
  const { y0, y1 } = edges;
  for (let e = 0; e < n; e++) {
    const a = y0[e] < y1[e] ? y0[e] : y1[e];
    const c = y0[e] < y1[e] ? y1[e] : y0[e];
    const l = bandOf(b, a), h = bandOf(b, c);
    lo[e] = l;
    hi[e] = h;
    for (let k = l; k <= h; k++) counts[k]++;
  }
  let total = 0;
  for (let k = 0; k < bandCount; k++) {
    b.start[k] = total;
    total += counts[k];
  }
  b.start[bandCount] = total;
  const ids = new Uint32Array(total);
  const fill = b.start.slice(0, bandCount);
  for (let e = 0; e < n; e++) {
    for (let k = lo[e]; k <= hi[e]; k++) ids[fill[k]++] = e;
  }
  b.ids = ids;
  return b;
}

/**
 * Classifies a point against the banded edges: 0 outside, 1 inside, 2 on
 * the boundary (crossing-number rule with the half-open test `y0 > y` !==
 * `y1 > y`; a point on an edge, by exact cross product, is "boundary").
 */
export function classifyPoint(b: EdgeBands, x: number, y: number): 0 | 1 | 2 {
  const e = b.edges;
  if (!(x >= e.minX && x <= e.maxX && y >= e.minY && y <= e.maxY)) return 0;
  const k = bandOf(b, y);
  const { x0, y0, x1, y1 } = e;
  const ids = b.ids;
  let inside = 0;
  for (let s = b.start[k], t = b.start[k + 1]; s < t; s++) {
    const i = ids[s];
    const ay = y0[i], by = y1[i];
    if ((ay > y) !== (by > y)) {
      const ax = x0[i], bx = x1[i];
      const cr = (bx - ax) * (y - ay) - (by - ay) * (x - ax);
      if (cr === 0) return 2;
      // the edge crosses the horizontal line through y to the right of x
      // when the cross product's sign matches the edge's direction
      if ((cr > 0) === (by > ay)) inside ^= 1;
    } else if (ay === y && by === y) {
      const ax = x0[i], bx = x1[i];
      if ((x >= ax && x <= bx) || (x >= bx && x <= ax)) return 2;
    } else if ((ay === y && x0[i] === x) || (by === y && x1[i] === x)) {
      return 2;
    }
  }
  return inside as 0 | 1;
}
