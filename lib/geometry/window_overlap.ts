/**
 * Exact area of a region inside a rectangle, a disk or a polygon.
 *
 * All coordinates are in one planar unit (hotfield's count engine uses
 * micrometres; pixels, x right, y down, work the same). The region should be
 * normalized and non-overlapping (as `buildValidRegion` returns); ring
 * winding is fixed on the way in, so either winding is accepted.
 *
 * Method (rectangle and disk): Green's theorem, area = Σ over edges of a
 * per-edge integral, restricted to the window; each term has a closed form,
 * so the result is exact up to floating-point rounding.
 *
 * @module
 */

import type { BBoxPx, MultiPolygonPx, PolygonPx, Vec2 } from "../types.ts";
import {
  bandHi,
  bandLo,
  bandOf,
  buildBands,
  classifyPoint,
  type EdgeBands,
  flattenEdges,
} from "./_edges.ts";
import { edgeBoxIntegral, edgeDiskArea, edgeSector } from "./_edge_math.ts";
import { multiPolygonAreaPx2 } from "./planar_area.ts";
import { intersectRegions } from "./_pair_ops.ts";
import { normalizeMultiPolygon } from "./normalize.ts";

/** A region prepared for many exact window-overlap queries. */
export interface OverlapIndex {
  /** Area of region ∩ `[minX, maxX] × [minY, maxY]`. */
  rect(bbox: BBoxPx): number;
  /** Area of region ∩ the disk of `radius` about `center`. */
  disk(center: Vec2, radius: number): number;
}

/**
 * Prepares a region for repeated exact overlap queries with rectangles and
 * disks.
 *
 * Edges are bucketed into horizontal bands. A rectangle query visits only the
 * edges in the bands of its y-range, each clipped to the band, and adds
 * ∫ clamp(x − minX, 0, width) dy (Green's theorem). A disk query visits only
 * the edges near the disk: an edge that stays outside the disk contributes
 * exactly its circular sector ½·r²·Δθ, and the sectors of all edges sum to
 * π·r² times the winding number of the centre, so
 * area = π·r²·[centre inside] + Σ_near (triangle(centre, edge) ∩ disk − sector).
 * When the centre lies exactly on the boundary every edge is summed instead.
 *
 * @param region Normalized, non-overlapping polygons (either winding).
 * @returns An object with `rect` and `disk` methods.
 *
 * @example A 100 × 100 square
 * ```ts
 * import { createOverlapIndex } from "hotfield";
 * const sq: [number, number][] = [[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]];
 * const index = createOverlapIndex([[sq]]);
 * if (index.rect([-10, 50, 30, 200]) !== 1500) throw new Error("30 × 50");
 * const quarter = index.disk([0, 0], 10);
 * if (Math.abs(quarter - Math.PI * 25) > 1e-9) throw new Error(String(quarter));
 * ```
 */
export function createOverlapIndex(region: MultiPolygonPx): OverlapIndex {
  const edges = flattenEdges(region);
  const n = edges.count;
  const { x0, y0, x1, y1 } = edges;
  // typical edge height and width (medians of a sample): bands no lower than an
  // edge, and a width above which an edge is "wide"
  const heights: number[] = [], widths: number[] = [];
  const step = Math.max(1, Math.floor(n / 2048));
  for (let i = 0; i < n; i += step) {
    heights.push(Math.abs(y1[i] - y0[i]));
    widths.push(Math.abs(x1[i] - x0[i]));
  }
  const median = (v: number[]) => (v.length === 0 ? 0 : v.sort((p, q) => p - q)[v.length >> 1]);
  const bands = buildBands(edges, 4, median(heights));
  const wideWidth = 8 * median(widths);
  // per band: wide edges first (visited always), then narrow edges by min x,
  // with suffix sums of their signed heights within the band, so that the
  // narrow edges wholly right of a rectangle are added in one step
  const ids = bands.ids;
  const minX = new Float64Array(ids.length);
  const narrowStart = new Uint32Array(bands.bandCount);
  const sufDy = new Float64Array(ids.length + bands.bandCount);
  for (let k = 0; k < bands.bandCount; k++) {
    const s = bands.start[k], f = bands.start[k + 1];
    const wide: number[] = [], narrow: number[] = [];
    for (let p = s; p < f; p++) {
      const i = ids[p];
      (Math.abs(x1[i] - x0[i]) > wideWidth ? wide : narrow).push(i);
    }
    narrow.sort((p, q) => Math.min(x0[p], x1[p]) - Math.min(x0[q], x1[q]));
    let p = s;
    for (const i of wide) ids[p++] = i;
    narrowStart[k] = p;
    for (const i of narrow) ids[p++] = i;
    const lo = bandLo(bands, k), hi = bandHi(bands, k);
    let acc = 0;
    sufDy[f + k] = 0;
    for (let q = f - 1; q >= narrowStart[k]; q--) {
      const i = ids[q];
      minX[q] = x0[i] < x1[i] ? x0[i] : x1[i];
      acc += clippedDy(y0[i], y1[i], lo, hi);
      sufDy[q + k] = acc;
    }
  }
  const idx: SortedBands = { bands, minX, narrowStart, sufDy, wideWidth };
  return {
    rect: (bbox) => rectSorted(idx, bbox),
    disk: (center, radius) => diskSorted(idx, center, radius),
  };
}

interface SortedBands {
  bands: EdgeBands;
  minX: Float64Array;
  narrowStart: Uint32Array;
  sufDy: Float64Array;
  wideWidth: number;
}

/** Signed height of the part of an edge from y0 to y1 inside [lo, hi]. */
function clippedDy(y0: number, y1: number, lo: number, hi: number): number {
  const a = y0 < lo ? lo : y0 > hi ? hi : y0;
  const b = y1 < lo ? lo : y1 > hi ? hi : y1;
  return b - a;
}

/** First position in [s, f) whose min x is ≥ v (min x ascending there). */
function lowerBound(minX: Float64Array, s: number, f: number, v: number): number {
  while (s < f) {
    const m = (s + f) >> 1;
    if (minX[m] >= v) f = m;
    else s = m + 1;
  }
  return s;
}

function rectSorted(idx: SortedBands, bbox: BBoxPx): number {
  const [X0, Y0, X1, Y1] = bbox;
  const b = idx.bands;
  const e = b.edges;
  if (!(X1 > X0) || !(Y1 > Y0)) return 0;
  if (X1 <= e.minX || X0 >= e.maxX || Y1 <= e.minY || Y0 >= e.maxY) return 0;
  const { x0, y0, x1, y1 } = e;
  const { minX, narrowStart, sufDy } = idx;
  const ids = b.ids;
  const w = X1 - X0;
  let sum = 0;
  const kEnd = bandOf(b, Y1);
  for (let k = bandOf(b, Y0); k <= kEnd; k++) {
    const blo = bandLo(b, k), bhi = bandHi(b, k);
    const lo = Y0 > blo ? Y0 : blo, hi = Y1 < bhi ? Y1 : bhi;
    if (!(hi > lo)) continue;
    const s = b.start[k], ns = narrowStart[k], f = b.start[k + 1];
    for (let p = s; p < ns; p++) {
      const i = ids[p];
      sum += edgeBoxIntegral(x0[i], y0[i], x1[i], y1[i], X0, X1, lo, hi);
    }
    // narrow edges starting left of X0 − wideWidth end left of X0: they add nothing
    const from = lowerBound(minX, ns, f, X0 - idx.wideWidth);
    const right = lowerBound(minX, from, f, X1);
    const full = lo === blo && hi === bhi;
    for (let p = from; p < (full ? right : f); p++) {
      const i = ids[p];
      const ax = x0[i], bx = x1[i];
      if (ax <= X0 && bx <= X0) continue;
      sum += edgeBoxIntegral(ax, y0[i], bx, y1[i], X0, X1, lo, hi);
    }
    if (full) sum += w * sufDy[right + k];
  }
  return sum;
}

function diskSorted(idx: SortedBands, center: Vec2, r: number): number {
  if (!(r > 0)) return 0;
  const [cx, cy] = center;
  const b = idx.bands;
  const e = b.edges;
  if (cx + r <= e.minX || cx - r >= e.maxX || cy + r <= e.minY || cy - r >= e.maxY) return 0;
  const { x0, y0, x1, y1 } = e;
  const where = classifyPoint(b, cx, cy);
  if (where === 2) {
    let all = 0;
    for (let i = 0; i < e.count; i++) {
      all += edgeDiskArea(x0[i] - cx, y0[i] - cy, x1[i] - cx, y1[i] - cy, r);
    }
    return all;
  }
  let sum = where === 1 ? Math.PI * r * r : 0;
  const ids = b.ids;
  const { minX, narrowStart } = idx;
  const kStart = bandOf(b, cy - r), kEnd = bandOf(b, cy + r);
  const xl = cx - r, xr = cx + r, yl = cy - r, yr = cy + r;
  const visit = (i: number, k: number) => {
    const ay = y0[i], by = y1[i];
    const emin = ay < by ? ay : by, emax = ay < by ? by : ay;
    if (emax < yl || emin > yr) return;
    // visit an edge once: in the first band of the query that holds it
    const first = bandOf(b, emin);
    if ((first > kStart ? first : kStart) !== k) return;
    const ax = x0[i], bx = x1[i];
    if ((ax < xl && bx < xl) || (ax > xr && bx > xr)) return;
    const px = ax - cx, py = ay - cy, qx = bx - cx, qy = by - cy;
    sum += edgeDiskArea(px, py, qx, qy, r) - edgeSector(px, py, qx, qy, r);
  };
  for (let k = kStart; k <= kEnd; k++) {
    const s = b.start[k], ns = narrowStart[k], f = b.start[k + 1];
    for (let p = s; p < ns; p++) visit(ids[p], k);
    for (let p = lowerBound(minX, ns, f, xl - idx.wideWidth); p < f && minX[p] <= xr; p++) {
      visit(ids[p], k);
    }
  }
  return sum;
}

/**
 * Exact area of region ∩ the closed rectangle `[minX, maxX] × [minY, maxY]`.
 *
 * For many queries on one region use {@linkcode createOverlapIndex}.
 *
 * @param region Normalized, non-overlapping polygons (either winding).
 * @param rect `[minX, minY, maxX, maxY]`; an empty or inverted box gives 0.
 * @returns The overlap area in the coordinate unit squared.
 *
 * @example Half of a square
 * ```ts
 * import { rectOverlapArea } from "./window_overlap.ts";
 * const sq: [number, number][] = [[0, 0], [4, 0], [4, 4], [0, 4], [0, 0]];
 * const area = rectOverlapArea([[sq]], [2, -1, 9, 9]);
 * if (area !== 8) throw new Error(`the right half of a 4 × 4 square is 8, got ${area}`);
 * ```
 */
export function rectOverlapArea(region: MultiPolygonPx, rect: BBoxPx): number {
  const [X0, Y0, X1, Y1] = rect;
  if (!(X1 > X0) || !(Y1 > Y0)) return 0;
  const e = flattenEdges(region);
  let sum = 0;
  for (let i = 0; i < e.count; i++) {
    sum += edgeBoxIntegral(e.x0[i], e.y0[i], e.x1[i], e.y1[i], X0, X1, Y0, Y1);
  }
  return sum;
}

/**
 * Exact area of region ∩ the disk of `radius` about `center`.
 *
 * Sum over edges of the signed area of triangle(centre, edge) ∩ disk, each in
 * closed form (straight part inside the circle plus circular sectors).
 * For many queries on one region use {@linkcode createOverlapIndex}.
 *
 * @param region Normalized, non-overlapping polygons (either winding).
 * @param center Disk centre `[x, y]`.
 * @param radius Disk radius (≤ 0 gives 0).
 * @returns The overlap area in the coordinate unit squared.
 *
 * @example A disk inside a large square has area π·r²
 * ```ts
 * import { diskOverlapArea } from "./window_overlap.ts";
 * const sq: [number, number][] = [[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]];
 * const a = diskOverlapArea([[sq]], [50, 50], 10);
 * if (Math.abs(a - Math.PI * 100) > 1e-9) throw new Error(String(a));
 * ```
 */
export function diskOverlapArea(region: MultiPolygonPx, center: Vec2, radius: number): number {
  if (!(radius > 0)) return 0;
  const e = flattenEdges(region);
  const [cx, cy] = center;
  let sum = 0;
  for (let i = 0; i < e.count; i++) {
    sum += edgeDiskArea(e.x0[i] - cx, e.y0[i] - cy, e.x1[i] - cx, e.y1[i] - cy, radius);
  }
  return sum;
}

/**
 * Area of region ∩ polygon, by a planar set intersection followed by the
 * shoelace area. Rings are split at their crossings, which are rounded to
 * doubles once, so the result is exact up to that rounding (about 1e-15
 * relative); degenerate contacts (shared edges or vertices) go through a
 * general polygon clipper. The polygon should be simple (not self-crossing).
 *
 * @param region Normalized, non-overlapping polygons (either winding).
 * @param polygon A simple polygon, outer ring first, then holes.
 * @returns The overlap area in the coordinate unit squared.
 *
 * @example Two overlapping squares
 * ```ts
 * import { polygonOverlapArea } from "./window_overlap.ts";
 * const sq = (o: number): [number, number][] => [[o, o], [o + 4, o], [o + 4, o + 4], [o, o + 4], [o, o]];
 * const area = polygonOverlapArea([[sq(0)]], [sq(2)]);
 * if (Math.abs(area - 4) > 1e-12) throw new Error(`two 4 × 4 squares offset by 2 share 4, got ${area}`);
 * ```
 */
export function polygonOverlapArea(region: MultiPolygonPx, polygon: PolygonPx): number {
  if (region.length === 0 || polygon.length === 0) return 0;
  const p = normalizeMultiPolygon([polygon]);
  if (p.length === 0) return 0;
  // Several fields are checked against one region: normalize it once.
  let r = normalizedRegions.get(region);
  if (r === undefined) {
    r = normalizeMultiPolygon(region);
    normalizedRegions.set(region, r);
  }
  return multiPolygonAreaPx2(intersectRegions(r, p));
}

/** Regions already normalized, by region (regions are never changed once built). */
const normalizedRegions = new WeakMap<MultiPolygonPx, MultiPolygonPx>();
