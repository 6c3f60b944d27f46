/**
 * Branch-and-bound search for the best admissible window placement in the
 * continuous plane (shared by the hotspot, top-k and best-field searches).
 *
 * @module
 */

import type { CountMap, Placement, PreparedCase, WindowShape } from "./engine_types.ts";
import { stampWindowCounts } from "./stamp_window_counts.ts";
import { type WindowExtents, windowExtents } from "./window_contains.ts";
import { exactRange } from "./_index_range.ts";
import { bucketFigures, type FigureBuckets, pointsInBox } from "./_figure_buckets.ts";
import { createOverlapIndex } from "./_geometry.ts";

/** Coverage within this of the minimum counts as admissible (floating-point slack). */
export const ADMIT_EPS = 1e-9;

/** Exact area queries on V (µm plane). */
export interface AreaIndex {
  rect(bbox: [number, number, number, number]): number;
  disk(center: [number, number], radius: number): number;
}

/** Everything the search reuses across picks. */
export interface SearchState {
  xUm: Float64Array;
  yUm: Float64Array;
  mpp: { mppX: number; mppY: number };
  map: CountMap;
  window: WindowShape;
  e: WindowExtents;
  isRect: boolean;
  /** Upper bound of the count of any window centred in the stride cell of each grid centre. */
  bound: Int32Array;
  /** Added to a grid centre's coverage to bound the coverage of any window in its stride cell. */
  coverageSlack: number;
  overlap: AreaIndex;
  buckets: FigureBuckets;
  /** Statistics of the last search, for tests and benchmarks. */
  stats: { blocks: number; candidates: number; coverageQueries: number };
}

/** Prepares a search over `map`'s window. */
export function createSearch(
  prepared: Pick<PreparedCase, "xUm" | "yUm" | "slide" | "validUm">,
  map: CountMap,
  overlap?: AreaIndex,
): SearchState {
  const window = map.window;
  const e = windowExtents(window);
  const isRect = window.shape === "rect";
  const s = map.grid.strideUm;
  // Any centre in the closed stride cell [c ± s/2]² has its window inside the
  // window enlarged by one stride (rect) or by s·√2/2 in radius (circle).
  const grow = s * (1 + 1e-9);
  let enlarged: WindowShape;
  let slack: number;
  if (window.shape === "rect") {
    enlarged = { ...window, widthUm: window.widthUm + grow, heightUm: window.heightUm + grow };
    slack = ((window.widthUm + grow) * (window.heightUm + grow)) / e.areaUm2 - 1;
  } else {
    const r = e.halfX, rg = r + grow * Math.SQRT1_2;
    enlarged = { ...window, diameterUm: 2 * rg };
    slack = (rg * rg) / (r * r) - 1;
  }
  const bound = stampWindowCounts(prepared.xUm, prepared.yUm, enlarged, map.grid);
  return {
    xUm: prepared.xUm,
    yUm: prepared.yUm,
    mpp: { mppX: prepared.slide.mppX, mppY: prepared.slide.mppY },
    map,
    window,
    e,
    isRect,
    bound,
    coverageSlack: slack + (map.coverageError ?? 0) + 1e-6,
    overlap: overlap ?? (createOverlapIndex(prepared.validUm) as AreaIndex),
    buckets: bucketFigures(
      prepared.xUm,
      prepared.yUm,
      Math.max(s, Math.min(e.halfX, e.halfY) / 2),
    ),
    stats: { blocks: 0, candidates: 0, coverageQueries: 0 },
  };
}

/** Exact coverage of the window centred at (cx, cy). */
export function exactCoverage(st: SearchState, cx: number, cy: number): number {
  st.stats.coverageQueries++;
  const { e } = st;
  const a = st.isRect
    ? st.overlap.rect([cx - e.halfX, cy - e.halfY, cx + e.halfX, cy + e.halfY])
    : st.overlap.disk([cx, cy], e.halfX);
  const v = a / e.areaUm2;
  return v < 0 ? 0 : v > 1 ? 1 : v;
}

/**
 * Whether the closed window at (cx, cy) is disjoint from every `chosen`
 * closed window (so no figure is counted in two of them): rect |dx| > W or
 * |dy| > H, circle dx² + dy² > (2r)².
 */
export function isSeparate(st: SearchState, cx: number, cy: number, chosen: Placement[]): boolean {
  const { e } = st;
  for (const p of chosen) {
    const dx = cx - p.centerUm[0], dy = cy - p.centerUm[1];
    if (st.isRect) {
      if (Math.abs(dx) <= 2 * e.halfX && Math.abs(dy) <= 2 * e.halfY) return false;
    } else if (dx * dx + dy * dy <= 4 * e.radius2) return false;
  }
  return true;
}

/** Builds a placement record. */
export function placement(
  st: SearchState,
  cx: number,
  cy: number,
  count: number,
  coverage: number,
): Placement {
  return {
    centerUm: [cx, cy],
    centerPx: [cx / st.mpp.mppX, cy / st.mpp.mppY],
    count,
    coverage,
    perMm2: count / st.window.areaMm2,
  };
}

/** True when a is better than b: higher count, higher coverage (1e-9), smaller y, smaller x. */
export function isBetter(a: Placement, b: Placement | null): boolean {
  if (b === null) return true;
  if (a.count !== b.count) return a.count > b.count;
  const ca = Math.round(a.coverage * 1e9), cb = Math.round(b.coverage * 1e9);
  if (ca !== cb) return ca > cb;
  if (a.centerUm[1] !== b.centerUm[1]) return a.centerUm[1] < b.centerUm[1];
  return a.centerUm[0] < b.centerUm[0];
}

interface Candidate {
  cx: number;
  cy: number;
  count: number;
}

/**
 * The best admissible placement separate from `chosen` (see find_hotspot.ts
 * for what "best" and "exact" mean), or null when none is admissible.
 */
export function searchBest(st: SearchState, chosen: Placement[] = []): Placement | null {
  st.stats = { blocks: 0, candidates: 0, coverageQueries: 0 };
  const { map } = st;
  const { nx, ny, x0Um, y0Um, strideUm: s } = map.grid;
  const minCov = map.minCoverage - ADMIT_EPS;
  let best: Placement | null = null;

  // Start from the best admissible grid centres (exact coverage re-checked).
  let top = -1;
  for (let k = 0; k < nx * ny; k++) {
    if (map.admissible[k] && map.counts[k] > top) {
      const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
      if (isSeparate(st, cx, cy, chosen)) top = map.counts[k];
    }
  }
  if (top >= 0) {
    let tried = 0;
    for (let k = 0; k < nx * ny && tried < 32; k++) {
      if (!map.admissible[k] || map.counts[k] !== top) continue;
      const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
      if (!isSeparate(st, cx, cy, chosen)) continue;
      tried++;
      const cov = exactCoverage(st, cx, cy);
      if (cov >= minCov) {
        const p = placement(st, cx, cy, top, cov);
        if (isBetter(p, best)) best = p;
      }
    }
  }

  // Blocks (stride cells around grid centres) that could still win.
  const floor = best ? best.count : -1;
  const blocks: number[] = [];
  for (let k = 0; k < nx * ny; k++) {
    if (st.bound[k] <= floor) continue;
    if (map.coverage[k] + st.coverageSlack < minCov) continue;
    if (chosen.length > 0 && blockForbidden(st, k, chosen)) continue;
    blocks.push(k);
  }
  blocks.sort((a, b) => st.bound[b] - st.bound[a] || a - b);
  for (const k of blocks) {
    if (best && st.bound[k] <= best.count) break;
    st.stats.blocks++;
    const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
    const cands = st.isRect
      ? rectCandidates(st, cx, cy, chosen)
      : circleCandidates(st, cx, cy, chosen);
    st.stats.candidates += cands.length;
    cands.sort((a, b) => b.count - a.count || a.cy - b.cy || a.cx - b.cx);
    const covBound = map.coverage[k] + st.coverageSlack;
    for (const c of cands) {
      if (best) {
        if (c.count < best.count) break;
        // Equal counts only win on coverage; skip when this block cannot beat it.
        if (c.count === best.count && covBound <= best.coverage + 1e-9) break;
      }
      if (!isSeparate(st, c.cx, c.cy, chosen)) continue;
      const cov = exactCoverage(st, c.cx, c.cy);
      if (cov < minCov) continue;
      const p = placement(st, c.cx, c.cy, c.count, cov);
      if (isBetter(p, best)) best = p;
    }
  }
  return best;
}

/** Whether every centre of the stride cell of grid centre k overlaps a chosen window. */
function blockForbidden(st: SearchState, k: number, chosen: Placement[]): boolean {
  const { nx, x0Um, y0Um, strideUm: s } = st.map.grid;
  const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
  const { e } = st;
  for (const p of chosen) {
    const dx = Math.abs(cx - p.centerUm[0]), dy = Math.abs(cy - p.centerUm[1]);
    if (st.isRect) {
      if (dx + s / 2 < 2 * e.halfX && dy + s / 2 < 2 * e.halfY) return true;
    } else if (Math.hypot(dx, dy) + s * Math.SQRT1_2 < 2 * e.halfX) return true;
  }
  return false;
}

/** Moves v by whole ulps towards `toward` until `ok(v)` (at most 64 steps). */
function nudge(v: number, toward: number, ok: (v: number) => boolean): number | null {
  for (let t = 0; t < 64; t++) {
    if (ok(v)) return v;
    v = nextToward(v, toward);
  }
  return ok(v) ? v : null;
}

const f64 = new Float64Array(1);
const u64 = new BigInt64Array(f64.buffer);
function nextToward(v: number, toward: number): number {
  if (v === toward || Number.isNaN(v)) return v;
  if (v === 0) return toward > 0 ? Number.MIN_VALUE : -Number.MIN_VALUE;
  f64[0] = v;
  u64[0] += (toward > v) === (v > 0) ? 1n : -1n;
  return f64[0];
}

/** Sorted unique values. */
function uniqueSorted(values: number[]): Float64Array {
  const a = Float64Array.from(values).sort();
  let m = 0;
  for (let i = 0; i < a.length; i++) if (m === 0 || a[i] !== a[m - 1]) a[m++] = a[i];
  return a.slice(0, m);
}

/** First index with a[i] >= v. */
function lowerBound(a: Float64Array, v: number): number {
  let lo = 0, hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Rectangle candidates in the stride cell of (cx, cy): every combination of
 * x ∈ {f.x ± W/2} ∪ {cx} ∪ {p.x ± W of chosen p} and the same in y that falls
 * in the cell, counted exactly by stamping each figure's contiguous candidate
 * ranges into a small difference array.
 */
function rectCandidates(st: SearchState, cx: number, cy: number, chosen: Placement[]): Candidate[] {
  const { e } = st;
  const s = st.map.grid.strideUm;
  const hw = e.halfX, hh = e.halfY;
  const bx0 = cx - s / 2, bx1 = cx + s / 2, by0 = cy - s / 2, by1 = cy + s / 2;
  const F = pointsInBox(st.buckets, cx - hw - s, cy - hh - s, cx + hw + s, cy + hh + s);
  const xs: number[] = [cx], ys: number[] = [cy];
  for (const k of F) {
    const fx = st.xUm[k], fy = st.yUm[k];
    for (const v0 of [fx - hw, fx + hw]) {
      if (v0 < bx0 || v0 > bx1) continue;
      const v = nudge(v0, fx, (v) => Math.abs(fx - v) <= hw);
      if (v !== null) xs.push(v);
    }
    for (const v0 of [fy - hh, fy + hh]) {
      if (v0 < by0 || v0 > by1) continue;
      const v = nudge(v0, fy, (v) => Math.abs(fy - v) <= hh);
      if (v !== null) ys.push(v);
    }
  }
  for (const p of chosen) {
    const [px, py] = p.centerUm;
    for (const v0 of [px - 2 * hw, px + 2 * hw]) {
      if (v0 < bx0 || v0 > bx1) continue;
      const away = v0 < px ? -Infinity : Infinity;
      const v = nudge(v0, away, (v) => Math.abs(v - px) > 2 * hw);
      if (v !== null) xs.push(v);
    }
    for (const v0 of [py - 2 * hh, py + 2 * hh]) {
      if (v0 < by0 || v0 > by1) continue;
      const away = v0 < py ? -Infinity : Infinity;
      const v = nudge(v0, away, (v) => Math.abs(v - py) > 2 * hh);
      if (v !== null) ys.push(v);
    }
  }
  const X = uniqueSorted(xs), Y = uniqueSorted(ys);
  const nX = X.length, nY = Y.length, w1 = nX + 1;
  const diff = new Int32Array(w1 * (nY + 1));
  for (const k of F) {
    const fx = st.xUm[k], fy = st.yUm[k];
    const [a0, a1] = exactRange(
      lowerBound(X, fx - hw),
      lowerBound(X, fx + hw) - 1,
      nX,
      (a) => Math.abs(fx - X[a]) <= hw,
    );
    if (a0 > a1) continue;
    const [b0, b1] = exactRange(
      lowerBound(Y, fy - hh),
      lowerBound(Y, fy + hh) - 1,
      nY,
      (b) => Math.abs(fy - Y[b]) <= hh,
    );
    if (b0 > b1) continue;
    diff[b0 * w1 + a0]++;
    diff[b0 * w1 + a1 + 1]--;
    diff[(b1 + 1) * w1 + a0]--;
    diff[(b1 + 1) * w1 + a1 + 1]++;
  }
  const out: Candidate[] = [];
  const col = new Int32Array(nX);
  for (let b = 0; b < nY; b++) {
    let acc = 0;
    for (let a = 0; a < nX; a++) {
      acc += diff[b * w1 + a];
      col[a] += acc;
      out.push({ cx: X[a], cy: Y[b], count: col[a] });
    }
  }
  return out;
}

/** Intersections of circles (a, ra) and (b, rb). */
function circleIntersections(
  ax: number,
  ay: number,
  ra: number,
  bx: number,
  by: number,
  rb: number,
): [number, number][] {
  const dx = bx - ax, dy = by - ay;
  const d2 = dx * dx + dy * dy;
  if (d2 === 0) return [];
  const d = Math.sqrt(d2);
  if (d > ra + rb || d < Math.abs(ra - rb)) return [];
  const l = (ra * ra - rb * rb + d2) / (2 * d);
  const h = Math.sqrt(Math.max(0, ra * ra - l * l));
  const mx = ax + (l * dx) / d, my = ay + (l * dy) / d;
  const ux = -dy / d, uy = dx / d;
  return [[mx + h * ux, my + h * uy], [mx - h * ux, my - h * uy]];
}

/**
 * Circle candidates in the stride cell of (cx, cy): centres with two figures
 * on the rim (pairwise circle intersections, nudged inward until both test
 * inside), single-figure placements (the rim point nearest the cell centre),
 * the grid centre, and points on the boundary of the zone excluded by each
 * chosen window. Each is counted exactly with the window test.
 */
function circleCandidates(
  st: SearchState,
  cx: number,
  cy: number,
  chosen: Placement[],
): Candidate[] {
  const { e } = st;
  const s = st.map.grid.strideUm;
  const r = e.halfX, r2 = e.radius2;
  const reach = r + s;
  const F0 = pointsInBox(st.buckets, cx - reach, cy - reach, cx + reach, cy + reach);
  const F: number[] = [];
  const A: number[] = [];
  const band = s * Math.SQRT1_2 * (1 + 1e-9) + 1e-9 * r;
  for (const k of F0) {
    const d = Math.hypot(st.xUm[k] - cx, st.yUm[k] - cy);
    if (d > reach) continue;
    F.push(k);
    if (Math.abs(d - r) <= band) A.push(k);
  }
  const fx = new Float64Array(F.map((k) => st.xUm[k]));
  const fy = new Float64Array(F.map((k) => st.yUm[k]));
  const tol = 1e-9 * s;
  const inCell = (x: number, y: number) =>
    Math.abs(x - cx) <= s / 2 + tol && Math.abs(y - cy) <= s / 2 + tol;
  const inside = (px: number, py: number, k: number) => {
    const dx = st.xUm[k] - px, dy = st.yUm[k] - py;
    return dx * dx + dy * dy <= r2;
  };
  const pts: [number, number][] = [[cx, cy]];
  for (let a = 0; a < A.length; a++) {
    const f = A[a];
    const ax = st.xUm[f], ay = st.yUm[f];
    // Single figure on the rim, nearest the cell centre.
    const d = Math.hypot(cx - ax, cy - ay);
    if (d > 0) {
      for (const shrink of [1 - 1e-12, 1 - 1e-9]) {
        const px = ax + (cx - ax) * (r / d) * shrink, py = ay + (cy - ay) * (r / d) * shrink;
        if (inside(px, py, f)) {
          if (inCell(px, py)) pts.push([px, py]);
          break;
        }
      }
    }
    for (let b = a + 1; b < A.length; b++) {
      const g = A[b];
      const gx = st.xUm[g], gy = st.yUm[g];
      const dd = (gx - ax) * (gx - ax) + (gy - ay) * (gy - ay);
      if (dd > 4 * r2 || dd === 0) continue;
      const mx = (ax + gx) / 2, my = (ay + gy) / 2;
      for (const [px0, py0] of circleIntersections(ax, ay, r, gx, gy, r)) {
        if (!inCell(px0, py0)) continue;
        for (const shrink of [1 - 1e-12, 1 - 1e-9, 1 - 1e-7]) {
          const px = mx + (px0 - mx) * shrink, py = my + (py0 - my) * shrink;
          if (inside(px, py, f) && inside(px, py, g)) {
            pts.push([px, py]);
            break;
          }
        }
      }
    }
  }
  for (const p of chosen) {
    const [qx, qy] = p.centerUm;
    const dq = Math.hypot(cx - qx, cy - qy);
    if (Math.abs(dq - 2 * r) > band + s) continue;
    const push = (px0: number, py0: number, need?: number) => {
      for (const grow of [1e-12, 1e-9, 1e-7]) {
        const px = px0 + (px0 - qx) * grow, py = py0 + (py0 - qy) * grow;
        const dx = px - qx, dy = py - qy;
        if (dx * dx + dy * dy <= 4 * r2) continue;
        if (need !== undefined && !inside(px, py, need)) return;
        if (inCell(px, py)) pts.push([px, py]);
        return;
      }
    };
    if (dq > 0) push(qx + (cx - qx) * (2 * r / dq), qy + (cy - qy) * (2 * r / dq));
    for (const f of A) {
      for (const [px, py] of circleIntersections(qx, qy, 2 * r, st.xUm[f], st.yUm[f], r)) {
        if (inCell(px, py)) push(px, py, f);
      }
    }
  }
  const out: Candidate[] = [];
  for (const [px, py] of pts) {
    let n = 0;
    for (let t = 0; t < fx.length; t++) {
      const dx = fx[t] - px, dy = fy[t] - py;
      if (dx * dx + dy * dy <= r2) n++;
    }
    out.push({ cx: px, cy: py, count: n });
  }
  return out;
}
