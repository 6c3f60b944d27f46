/**
 * The search for the best admissible window placement in the continuous
 * plane (shared by the hotspot, top-k and best-field searches): rectangles
 * here, circles in _circle_search.ts.
 *
 * @module
 */

import type { Placement } from "./engine_types.ts";
import { pointsInBox } from "./_figure_buckets.ts";
import {
  ADMIT_EPS,
  blockForbidden,
  type Candidate,
  coverageGrowth,
  exactCoverage,
  isBetter,
  isSeparate,
  placement,
  type SearchState,
  surelyBelow,
} from "./_search_state.ts";
import { circleSearchBest } from "./_circle_search.ts";

export {
  ADMIT_EPS,
  type AreaIndex,
  createSearch,
  exactCoverage,
  isBetter,
  isSeparate,
  placement,
  type SearchState,
} from "./_search_state.ts";

/**
 * The best admissible placement separate from `chosen` (see find_hotspot.ts
 * for what "best" and "exact" mean), or null when none is admissible.
 */
export function searchBest(st: SearchState, chosen: Placement[] = []): Placement | null {
  st.stats = { blocks: 0, candidates: 0, coverageQueries: 0 };
  if (!st.isRect) return circleSearchBest(st, chosen);
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
    const cands = rectCandidates(st, k, cx, cy, chosen, need);
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
  k: number,
  cx: number,
  cy: number,
  chosen: Placement[],
  minCount: number,
): Candidate[] {
  const { e } = st;
  const s = st.map.grid.strideUm;
  const hw = e.halfX, hh = e.halfY;
  const bx0 = cx - s / 2, bx1 = cx + s / 2, by0 = cy - s / 2, by1 = cy + s / 2;
  const F = frameFigures(st, cx, cy);
  const base = st.interior ? st.interior[k] : 0;
  minCount -= base;
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
      if (c >= minCount) out.push({ cx: X[a], cy: Y[b], count: c + base });
    }
  }
  return out;
}

/**
 * The figures in the box of every window centred in the stride cell of
 * (cx, cy) except the interior ones (counted by `st.interior`): buckets
 * wholly inside the interior are skipped unread, the others tested with the
 * interior stamp's own test.
 */
function frameFigures(st: SearchState, cx: number, cy: number): number[] {
  const s = st.map.grid.strideUm;
  const { halfX: hw, halfY: hh } = st.e;
  const x0 = cx - hw - s, y0 = cy - hh - s, x1 = cx + hw + s, y1 = cy + hh + s;
  if (!st.interior) return pointsInBox(st.buckets, x0, y0, x1, y1);
  const b = st.buckets;
  const [hwIn, hhIn] = st.interiorHalf;
  const out: number[] = [];
  const i0 = Math.max(0, Math.floor((x0 - b.x0) / b.size));
  const i1 = Math.min(b.nbx - 1, Math.floor((x1 - b.x0) / b.size));
  const j0 = Math.max(0, Math.floor((y0 - b.y0) / b.size));
  const j1 = Math.min(b.nby - 1, Math.floor((y1 - b.y0) / b.size));
  // Buckets two away from the interior's edges lie wholly inside it.
  const iIn0 = Math.floor((cx - hwIn - b.x0) / b.size) + 2;
  const iIn1 = Math.floor((cx + hwIn - b.x0) / b.size) - 2;
  const jIn0 = Math.floor((cy - hhIn - b.y0) / b.size) + 2;
  const jIn1 = Math.floor((cy + hhIn - b.y0) / b.size) - 2;
  const xU = b.xUm, yU = b.yUm;
  for (let j = j0; j <= j1; j++) {
    const skipRow = j >= jIn0 && j <= jIn1;
    for (let i = i0; i <= i1; i++) {
      if (skipRow && i === iIn0 && iIn1 >= iIn0) i = iIn1 + 1;
      if (i > i1) break;
      const q = j * b.nbx + i;
      for (let t = b.start[q]; t < b.start[q + 1]; t++) {
        const f = b.order[t];
        const x = xU[f], y = yU[f];
        if (!(x >= x0 && x <= x1 && y >= y0 && y <= y1)) continue;
        if (Math.abs(x - cx) <= hwIn && Math.abs(y - cy) <= hhIn) continue;
        out.push(f);
      }
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
