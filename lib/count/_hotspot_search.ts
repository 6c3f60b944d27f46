/**
 * Branch-and-bound search for the best admissible window placement in the
 * continuous plane (shared by the hotspot, top-k and best-field searches).
 *
 * @module
 */

import type { CountMap, Placement, PreparedCase, WindowShape } from "./engine_types.ts";
import { stampWindowCounts } from "./stamp_window_counts.ts";
import { type WindowExtents, windowExtents } from "./window_contains.ts";
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
  /**
   * Exact coverages already computed, one per memo square of side
   * `memoUm` (the lowest kept): coverage moves by at most |dx|/W + |dy|/H
   * (rect) or 2·|d|/(π·r) (circle) when the centre moves, so a candidate
   * near a low one is inadmissible without a query.
   */
  memo: Map<number, [number, number, number]>;
  memoUm: number;
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
    memo: new Map(),
    memoUm: s / 4,
  };
}

function memoKey(st: SearchState, cx: number, cy: number): number {
  const g = st.memoUm, { x0Um, y0Um } = st.map.grid;
  // 2^26 columns: keys stay exact integers for any slide the grid can hold.
  return Math.floor((cy - y0Um) / g) * 67108864 + Math.floor((cx - x0Um) / g);
}

/** Most the coverage can grow when the centre moves by (dx, dy). */
function coverageGrowth(st: SearchState, dx: number, dy: number): number {
  const { e } = st;
  return st.isRect
    ? Math.abs(dx) / (2 * e.halfX) + Math.abs(dy) / (2 * e.halfY)
    : (2 * Math.hypot(dx, dy)) / (Math.PI * e.halfX);
}

/**
 * True when the window at (cx, cy) is surely below `minCov`, from exact
 * coverages memoised nearby; the margin covers rounding in both areas.
 */
function surelyBelow(st: SearchState, cx: number, cy: number, minCov: number): boolean {
  const g = st.memoUm, { x0Um, y0Um } = st.map.grid;
  const ix = Math.floor((cx - x0Um) / g), iy = Math.floor((cy - y0Um) / g);
  for (let j = iy - 1; j <= iy + 1; j++) {
    for (let i = ix - 1; i <= ix + 1; i++) {
      const m = st.memo.get(j * 67108864 + i);
      if (m && m[2] + coverageGrowth(st, cx - m[0], cy - m[1]) + 1e-7 < minCov) return true;
    }
  }
  return false;
}

/** Exact coverage of the window centred at (cx, cy). */
export function exactCoverage(st: SearchState, cx: number, cy: number): number {
  st.stats.coverageQueries++;
  const { e } = st;
  const a = st.isRect
    ? st.overlap.rect([cx - e.halfX, cy - e.halfY, cx + e.halfX, cy + e.halfY])
    : st.overlap.disk([cx, cy], e.halfX);
  const v = a / e.areaUm2;
  const cov = v < 0 ? 0 : v > 1 ? 1 : v;
  const key = memoKey(st, cx, cy), m = st.memo.get(key);
  if (!m || cov < m[2]) st.memo.set(key, [cx, cy, cov]);
  return cov;
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
  const reachUm = s / 2 + 4e-6 * Math.max(st.e.halfX, st.e.halfY);
  for (const k of blocks) {
    if (best && st.bound[k] <= best.count) break;
    st.stats.blocks++;
    const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
    // One exact query bounds every centre of the cell (candidates may sit a
    // circle tolerance outside it) more tightly than the map's slack.
    const covCell = exactCoverage(st, cx, cy) + coverageGrowth(st, reachUm, reachUm) + 1e-7;
    if (covCell < minCov) continue;
    const covBound = Math.min(map.coverage[k] + st.coverageSlack, covCell);
    // Equal counts can only win on coverage: ask for more when this cell cannot beat it.
    const need = best ? (covBound <= best.coverage + 1e-9 ? best.count + 1 : best.count) : 0;
    const cands = st.isRect
      ? rectCandidates(st, cx, cy, chosen, need)
      : circleCandidates(st, cx, cy, chosen, need);
    st.stats.candidates += cands.length;
    cands.sort((a, b) => b.count - a.count || a.cy - b.cy || a.cx - b.cx);
    for (const c of cands) {
      if (best) {
        if (c.count < best.count) break;
        // Equal counts only win on coverage; skip when this block cannot beat it.
        if (c.count === best.count && covBound <= best.coverage + 1e-9) break;
      }
      if (!isSeparate(st, c.cx, c.cy, chosen)) continue;
      if (surelyBelow(st, c.cx, c.cy, minCov)) continue;
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
function rectCandidates(
  st: SearchState,
  cx: number,
  cy: number,
  chosen: Placement[],
  minCount: number,
): Candidate[] {
  const { e } = st;
  const s = st.map.grid.strideUm;
  const hw = e.halfX, hh = e.halfY;
  const bx0 = cx - s / 2, bx1 = cx + s / 2, by0 = cy - s / 2, by1 = cy + s / 2;
  const F = pointsInBox(st.buckets, cx - hw - s, cy - hh - s, cx + hw + s, cy + hh + s);
  const xs: number[] = [cx], ys: number[] = [cy];
  const xU = st.xUm, yU = st.yUm;
  for (let t = 0; t < F.length; t++) {
    const k = F[t];
    const fx = xU[k], fy = yU[k];
    let v = fx - hw;
    if (v >= bx0 && v <= bx1) pushNudged(xs, v, fx, hw);
    v = fx + hw;
    if (v >= bx0 && v <= bx1) pushNudged(xs, v, fx, hw);
    v = fy - hh;
    if (v >= by0 && v <= by1) pushNudged(ys, v, fy, hh);
    v = fy + hh;
    if (v >= by0 && v <= by1) pushNudged(ys, v, fy, hh);
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
  for (let t = 0; t < F.length; t++) {
    const k = F[t];
    const fx = xU[k], fy = yU[k];
    // Candidates a with |fx − X[a]| ≤ hw: a contiguous run, ends fixed by the test itself.
    let a0 = lowerBound(X, fx - hw), a1 = lowerBound(X, fx + hw) - 1;
    while (a0 > 0 && Math.abs(fx - X[a0 - 1]) <= hw) a0--;
    while (a0 < nX && !(Math.abs(fx - X[a0]) <= hw)) a0++;
    if (a1 < a0 - 1) a1 = a0 - 1;
    while (a1 + 1 < nX && Math.abs(fx - X[a1 + 1]) <= hw) a1++;
    while (a1 >= a0 && !(Math.abs(fx - X[a1]) <= hw)) a1--;
    if (a0 > a1) continue;
    let b0 = lowerBound(Y, fy - hh), b1 = lowerBound(Y, fy + hh) - 1;
    while (b0 > 0 && Math.abs(fy - Y[b0 - 1]) <= hh) b0--;
    while (b0 < nY && !(Math.abs(fy - Y[b0]) <= hh)) b0++;
    if (b1 < b0 - 1) b1 = b0 - 1;
    while (b1 + 1 < nY && Math.abs(fy - Y[b1 + 1]) <= hh) b1++;
    while (b1 >= b0 && !(Math.abs(fy - Y[b1]) <= hh)) b1--;
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
    const row = b * w1;
    for (let a = 0; a < nX; a++) {
      acc += diff[row + a];
      const c = (col[a] += acc);
      if (c >= minCount) out.push({ cx: X[a], cy: Y[b], count: c });
    }
  }
  return out;
}

/** Pushes v, moved by ulps towards f until |f − v| ≤ h (the window test), onto list. */
function pushNudged(list: number[], v: number, f: number, h: number): void {
  for (let t = 0; t < 64; t++) {
    if (Math.abs(f - v) <= h) {
      list.push(v);
      return;
    }
    v = nextToward(v, f);
  }
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
 * Circle candidates in the stride cell of (cx, cy), with at least `minCount`
 * figures: centres with two figures on the rim, single-figure placements, the
 * grid centre, and points on the boundary of the zone excluded by each chosen
 * window. Vertices with a figure f on the rim are found by an angular sweep
 * of the arc of f's radius-r circle that crosses the cell: every other figure
 * g within 2r is inside the window for centre angles in [φ − α, φ + α]
 * (φ the direction of g from f, α = acos(|fg| / 2r)); intervals that cover the
 * whole arc add to a base count, the others give events. The sweep count
 * only orders candidates: each vertex is nudged towards the lens of its two
 * figures until both test inside and is then counted exactly.
 */
function circleCandidates(
  st: SearchState,
  cx: number,
  cy: number,
  chosen: Placement[],
  minCount: number,
): Candidate[] {
  const s = st.map.grid.strideUm;
  const r = st.e.halfX;
  const tol = 1e-6 * r;
  const reach = r + (s / 2 + tol) * Math.SQRT2 + tol;
  const F0 = pointsInBox(st.buckets, cx - reach, cy - reach, cx + reach, cy + reach);
  const out: Candidate[] = [];
  // The grid centre itself.
  let n = 0;
  for (const k of F0) {
    const dx = st.xUm[k] - cx, dy = st.yUm[k] - cy;
    if (dx * dx + dy * dy <= st.e.radius2) n++;
  }
  if (n >= minCount) out.push({ cx, cy, count: n });
  circleCell(st, cx, cy, s / 2, F0, chosen, minCount, out);
  return out;
}

/** Leaves of the circle subdivision are at most this fraction of the stride wide. */
const CIRCLE_LEAF = 1 / 16;

/**
 * Quadtree refinement of one square of centres (half side h): the figures
 * within r + h·√2 bound every count in it; squares whose bound is below
 * `minCount` are dropped, small ones are enumerated by {@linkcode circleLeaf}.
 */
function circleCell(
  st: SearchState,
  cx: number,
  cy: number,
  h: number,
  F0: number[],
  chosen: Placement[],
  minCount: number,
  out: Candidate[],
): void {
  const r = st.e.halfX;
  const tol = 1e-6 * r;
  const reach = r + (h + tol) * Math.SQRT2 + tol;
  const reach2 = reach * reach;
  const F: number[] = [];
  for (let t = 0; t < F0.length; t++) {
    const k = F0[t];
    const dx = st.xUm[k] - cx, dy = st.yUm[k] - cy;
    if (dx * dx + dy * dy <= reach2) F.push(k);
  }
  if (F.length < minCount) return;
  if (h <= st.map.grid.strideUm * CIRCLE_LEAF / 2 || F.length <= 64) {
    circleLeaf(st, cx, cy, h, F, chosen, minCount, out);
    return;
  }
  const q = h / 2;
  circleCell(st, cx - q, cy - q, q, F, chosen, minCount, out);
  circleCell(st, cx + q, cy - q, q, F, chosen, minCount, out);
  circleCell(st, cx - q, cy + q, q, F, chosen, minCount, out);
  circleCell(st, cx + q, cy + q, q, F, chosen, minCount, out);
}

function circleLeaf(
  st: SearchState,
  cx: number,
  cy: number,
  hCell: number,
  F: number[],
  chosen: Placement[],
  minCount: number,
  out: Candidate[],
): void {
  const { e } = st;
  const r = e.halfX, r2 = e.radius2;
  const tol = 1e-6 * r;
  const halfDiag = (hCell + tol) * Math.SQRT2;
  // Figures surely inside (or outside) every window centred in this square
  // need no sweep; only the uncertain ones (A, near the rim) make vertices.
  const A: number[] = [];
  let sureIn = 0;
  for (const k of F) {
    const d = Math.hypot(st.xUm[k] - cx, st.yUm[k] - cy);
    if (Math.abs(d - r) <= halfDiag) A.push(k);
    else if (d < r) sureIn++;
  }
  const fx = new Float64Array(F.map((k) => st.xUm[k]));
  const fy = new Float64Array(F.map((k) => st.yUm[k]));
  const inCell = (x: number, y: number) =>
    Math.abs(x - cx) <= hCell + tol && Math.abs(y - cy) <= hCell + tol;
  const inside = (px: number, py: number, k: number) => {
    const dx = st.xUm[k] - px, dy = st.yUm[k] - py;
    return dx * dx + dy * dy <= r2;
  };
  const exactCount = (px: number, py: number): number => {
    let n = 0;
    for (let t = 0; t < fx.length; t++) {
      const dx = fx[t] - px, dy = fy[t] - py;
      if (dx * dx + dy * dy <= r2) n++;
    }
    return n;
  };
  // Estimated candidates: [x, y, estimate, figure a, figure b] (b = −1 for none).
  const est: [number, number, number, number, number][] = [];
  const TWO_PI = 2 * Math.PI;
  for (const f of A) {
    const ax = st.xUm[f], ay = st.yUm[f];
    // Arc of f's circle within the cell's circumscribed disk: angles θ0 ± δ.
    const dc = Math.hypot(cx - ax, cy - ay);
    if (dc === 0) continue;
    const theta0 = Math.atan2(cy - ay, cx - ax);
    const cosDelta = (r * r + dc * dc - halfDiag * halfDiag) / (2 * r * dc);
    const delta = cosDelta <= -1 ? Math.PI : cosDelta >= 1 ? 0 : Math.acos(cosDelta);
    // Single figure on the rim nearest the cell centre.
    est.push([ax + (cx - ax) * (r / dc), ay + (cy - ay) * (r / dc), Infinity, f, -1]);
    let base = sureIn;
    const events: [number, number, number][] = []; // [angle offset, +1/−1, figure]
    for (let t = 0; t < A.length; t++) {
      const g = A[t];
      if (g === f) {
        base++;
        continue;
      }
      const dx = st.xUm[g] - ax, dy = st.yUm[g] - ay;
      const d2 = dx * dx + dy * dy;
      if (d2 > 4 * r2) continue;
      const d = Math.sqrt(d2);
      const alpha = Math.acos(Math.min(1, d / (2 * r)));
      let off = Math.atan2(dy, dx) - theta0; // φ relative to θ0, in (−π, π]
      off -= TWO_PI * Math.round(off / TWO_PI);
      const lo = off - alpha, hi = off + alpha;
      if (lo <= -delta && hi >= delta) {
        base++;
        continue;
      }
      if (hi < -delta || lo > delta) continue;
      if (lo > -delta) events.push([lo, 1, g]);
      else base++;
      if (hi < delta) events.push([hi, -1, g]);
    }
    // Entries first at equal angles: closed windows hold both at a shared vertex.
    events.sort((p, q) => p[0] - q[0] || q[1] - p[1]);
    let n = base;
    for (const [ang, dir, g] of events) {
      if (dir > 0) n++;
      const count = n;
      if (dir < 0) n--;
      if (count < minCount) continue;
      const th = theta0 + ang;
      est.push([ax + r * Math.cos(th), ay + r * Math.sin(th), count, f, g]);
    }
  }
  for (const p of chosen) {
    const [qx, qy] = p.centerUm;
    const dq = Math.hypot(cx - qx, cy - qy);
    if (Math.abs(dq - 2 * r) > 2 * halfDiag) continue;
    if (dq > 0) {
      est.push([qx + (cx - qx) * (2 * r / dq), qy + (cy - qy) * (2 * r / dq), Infinity, -2, -1]);
    }
    for (const f of A) {
      for (const [px, py] of circleIntersections(qx, qy, 2 * r, st.xUm[f], st.yUm[f], r)) {
        est.push([px, py, Infinity, -2, f]);
      }
    }
  }
  // Nudge each into place and count exactly.
  for (const [px0, py0, , a, b] of est) {
    let pt: [number, number] | null = null;
    if (a === -2) {
      // On an exclusion boundary: step away from the chosen centre.
      pt = null;
      for (const q of chosen) {
        const dx = px0 - q.centerUm[0], dy = py0 - q.centerUm[1];
        if (Math.abs(Math.hypot(dx, dy) - 2 * r) > 1e-6 * r) continue;
        for (const grow of [1e-12, 1e-9, 1e-7]) {
          const px = px0 + dx * grow, py = py0 + dy * grow;
          if ((px - q.centerUm[0]) ** 2 + (py - q.centerUm[1]) ** 2 > 4 * r2) {
            if (b < 0 || inside(px, py, b)) pt = [px, py];
            break;
          }
        }
        break;
      }
    } else if (a >= 0) {
      const ax = st.xUm[a], ay = st.yUm[a];
      // Towards the midpoint of the two figures (or towards f alone).
      const mx = b >= 0 ? (ax + st.xUm[b]) / 2 : ax, my = b >= 0 ? (ay + st.yUm[b]) / 2 : ay;
      for (const shrink of [0, 1e-12, 1e-9, 1e-7]) {
        const px = px0 + (mx - px0) * shrink, py = py0 + (my - py0) * shrink;
        if (inside(px, py, a) && (b < 0 || inside(px, py, b))) {
          pt = [px, py];
          break;
        }
      }
    } else pt = [px0, py0];
    if (!pt || !inCell(pt[0], pt[1])) continue;
    const count = exactCount(pt[0], pt[1]);
    if (count >= minCount) out.push({ cx: pt[0], cy: pt[1], count });
  }
}
