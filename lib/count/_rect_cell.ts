/**
 * The candidates of one stride cell of the rectangle search, produced lazily
 * in search order by a best-first subdivision of the cell.
 *
 * @module
 */

import type { Placement } from "./engine_types.ts";
import { pointsInBox } from "./_figure_buckets.ts";
import { heapPop, heapPush } from "./_heap.ts";
import {
  addWork,
  type Candidate,
  coverageGrowth,
  exactCoverage,
  type SearchState,
  surelyBelow,
} from "./_search_state.ts";

/**
 * A square of centres holds at most this much leaf work (candidates × figures
 * still in doubt) before its candidates are counted one by one.
 */
const LEAF_WORK = 2048;
/** Squares at least this fraction of the stride wide may be ruled out by an exact coverage. */
const QUERY_FRACTION = 1 / 64;

/**
 * One heap entry: a square of centres (kind 0) or the sorted candidates of
 * a counted square (kind 1, the next is `list[at]`). Squares hold the index
 * ranges of the cell's candidate x and y values they own (half-open), the
 * figures surely inside every window centred in them (`sure`), and the
 * figures in doubt (`A`).
 */
interface Item {
  bound: number;
  /** Smallest candidate y, then x, the entry can still give. */
  y: number;
  x: number;
  kind: 0 | 1;
  qx: number;
  qy: number;
  h: number;
  ia0: number;
  ia1: number;
  ib0: number;
  ib1: number;
  sure: number;
  A: Int32Array | null;
  list: Candidate[] | null;
  at: number;
}

/** Heap order: higher bound, then smaller y, then smaller x, squares before lists. */
function before(a: Item, b: Item): boolean {
  if (a.bound !== b.bound) return a.bound > b.bound;
  if (a.y !== b.y) return a.y < b.y;
  if (a.x !== b.x) return a.x < b.x;
  return a.kind < b.kind;
}

/**
 * The candidates of the stride cell of grid centre k at (cx, cy), as the
 * search defines them: every combination of x ∈ {f.x ± W/2} ∪ {cx} ∪
 * {p.x ± W of chosen p} and the same in y that falls in the cell (over the
 * figures near the cell), nudged by ulps so the figures that define them
 * test inside, each with its exact count.
 *
 * `next(minCount)` gives them by descending count, then ascending y, then
 * ascending x, without counting them all: the cell is split into squares
 * of centres, each bounded by the figures surely inside all its windows
 * plus those in doubt, and only squares whose bound reaches the count asked
 * for are split further; a square is counted candidate by candidate once
 * little work is left in it. Squares whose every candidate is inadmissible
 * (exact coverage at the square's centre plus the most it can grow) or
 * overlaps a chosen window are dropped: the search would skip those
 * candidates anyway, so what it finds is unchanged.
 */
export class RectCell {
  #st: SearchState;
  #chosen: Placement[];
  #minCov: number;
  #query: boolean;
  #X: Float64Array;
  #Y: Float64Array;
  #heap: Item[] = [];
  #tol: number;
  #hMin: number;

  /**
   * @param coverageSafe True when every window centred in the cell is surely admissible.
   */
  constructor(
    st: SearchState,
    k: number,
    cx: number,
    cy: number,
    chosen: Placement[],
    minCov: number,
    coverageSafe: boolean,
  ) {
    this.#st = st;
    this.#chosen = chosen;
    this.#minCov = minCov;
    this.#query = !coverageSafe;
    const s = st.map.grid.strideUm;
    const { halfX: hw, halfY: hh } = st.e;
    this.#tol = 1e-6 * (hw + hh);
    this.#hMin = s * QUERY_FRACTION / 2;
    const F = frameFigures(st, cx, cy);
    addWork(st, F.length);
    const [X, Y] = cellValues(st, cx, cy, F, chosen);
    this.#X = X;
    this.#Y = Y;
    const base = st.interior ? st.interior[k] : 0;
    const root = this.#square(cx, cy, s / 2, 0, X.length, 0, Y.length, base, F);
    if (root) this.#push(root);
  }

  /**
   * The next candidate in search order with a count of at least `minCount`,
   * or null when none is left (`minCount` must not decrease between calls).
   */
  next(minCount: number): Candidate | null {
    const heap = this.#heap;
    while (heap.length > 0) {
      const top = heap[0];
      if (top.bound < minCount) return null;
      this.#pop();
      if (top.kind === 1) {
        const list = top.list!;
        const c = list[top.at++];
        if (top.at < list.length) {
          const n = list[top.at];
          top.bound = n.count;
          top.y = n.cy;
          top.x = n.cx;
          this.#push(top);
        }
        return c;
      }
      this.#expand(top, minCount);
    }
    return null;
  }

  /** Splits a square in four, or counts its candidates. */
  #expand(q: Item, minCount: number): void {
    const st = this.#st;
    const nX = q.ia1 - q.ia0, nY = q.ib1 - q.ib0;
    const A = q.A!;
    if (nX * nY * A.length <= LEAF_WORK || nX * nY === 1 || q.h < this.#hMin / 65536) {
      this.#count(q, minCount);
      return;
    }
    if (this.#query && q.h >= this.#hMin) {
      const t = q.h + this.#tol;
      if (surelyBelow(st, q.qx, q.qy, this.#minCov, t)) return;
      const cov = exactCoverage(st, q.qx, q.qy);
      if (cov + coverageGrowth(st, t, t) + 1e-7 < this.#minCov) return;
    }
    const X = this.#X, Y = this.#Y;
    const mx = lowerBound(X, q.qx, q.ia0, q.ia1), my = lowerBound(Y, q.qy, q.ib0, q.ib1);
    const c = q.h / 2;
    const xs: [number, number, number][] = [[q.qx - c, q.ia0, mx], [q.qx + c, mx, q.ia1]];
    const ys: [number, number, number][] = [[q.qy - c, q.ib0, my], [q.qy + c, my, q.ib1]];
    for (const [yc, b0, b1] of ys) {
      if (b0 >= b1) continue;
      for (const [xc, a0, a1] of xs) {
        if (a0 >= a1) continue;
        const child = this.#square(xc, yc, c, a0, a1, b0, b1, q.sure, A);
        if (child && child.bound >= minCount) this.#push(child);
      }
    }
  }

  /**
   * A square of centres (qx, qy, half side h) owning candidates
   * X[a0..a1) × Y[b0..b1): the figures of P surely inside all its windows
   * are added to `sure`, those in doubt kept; null when every centre in it
   * overlaps a chosen window.
   */
  #square(
    qx: number,
    qy: number,
    h: number,
    a0: number,
    a1: number,
    b0: number,
    b1: number,
    sure: number,
    P: ArrayLike<number>,
  ): Item | null {
    const st = this.#st;
    const { halfX: hw, halfY: hh } = st.e;
    const tol = this.#tol;
    const reach = h + tol;
    for (const p of this.#chosen) {
      if (
        Math.abs(qx - p.centerUm[0]) + reach < 2 * hw &&
        Math.abs(qy - p.centerUm[1]) + reach < 2 * hh
      ) return null;
    }
    addWork(st, P.length);
    const inX = hw - h - tol, inY = hh - h - tol, outX = hw + h + tol, outY = hh + h + tol;
    const xU = st.xUm, yU = st.yUm;
    const keep = new Int32Array(P.length);
    let m = 0;
    for (let t = 0; t < P.length; t++) {
      const f = P[t];
      const dx = Math.abs(xU[f] - qx), dy = Math.abs(yU[f] - qy);
      if (dx <= inX && dy <= inY) sure++;
      else if (dx <= outX && dy <= outY) keep[m++] = f;
    }
    return {
      bound: sure + m,
      y: this.#Y[b0],
      x: this.#X[a0],
      kind: 0,
      qx,
      qy,
      h,
      ia0: a0,
      ia1: a1,
      ib0: b0,
      ib1: b1,
      sure,
      A: keep.slice(0, m),
      list: null,
      at: 0,
    };
  }

  /** Counts every candidate of a square exactly and queues those reaching `minCount`. */
  #count(q: Item, minCount: number): void {
    const st = this.#st;
    const { halfX: hw, halfY: hh } = st.e;
    const X = this.#X, Y = this.#Y;
    const { ia0, ia1, ib0, ib1 } = q;
    const nX = ia1 - ia0, nY = ib1 - ib0, w1 = nX + 1;
    const diff = new Int32Array(w1 * (nY + 1));
    const A = q.A!;
    addWork(st, A.length + nX * nY);
    const xU = st.xUm, yU = st.yUm;
    for (let t = 0; t < A.length; t++) {
      const f = A[t];
      const fx = xU[f], fy = yU[f];
      // The window test picks a contiguous run of candidates on each axis.
      let a0 = 0;
      while (a0 < nX && !(Math.abs(fx - X[ia0 + a0]) <= hw)) a0++;
      if (a0 === nX) continue;
      let a1 = a0;
      while (a1 + 1 < nX && Math.abs(fx - X[ia0 + a1 + 1]) <= hw) a1++;
      let b0 = 0;
      while (b0 < nY && !(Math.abs(fy - Y[ib0 + b0]) <= hh)) b0++;
      if (b0 === nY) continue;
      let b1 = b0;
      while (b1 + 1 < nY && Math.abs(fy - Y[ib0 + b1 + 1]) <= hh) b1++;
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
        const c = (col[a] += acc) + q.sure;
        if (c >= minCount) out.push({ cx: X[ia0 + a], cy: Y[ib0 + b], count: c });
      }
    }
    if (out.length === 0) return;
    // Stable: equal counts stay in (y, x) order.
    out.sort((a, b) => b.count - a.count);
    const h = out[0];
    this.#push({
      bound: h.count,
      y: h.cy,
      x: h.cx,
      kind: 1,
      qx: 0,
      qy: 0,
      h: 0,
      ia0: 0,
      ia1: 0,
      ib0: 0,
      ib1: 0,
      sure: 0,
      A: null,
      list: out,
      at: 0,
    });
  }

  #push(it: Item): void {
    heapPush(this.#heap, it, before);
  }

  #pop(): void {
    heapPop(this.#heap, before);
  }
}

/** First index i in [lo, hi) with a[i] >= v (hi when none). */
function lowerBound(a: Float64Array, v: number, lo: number, hi: number): number {
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * The candidate x and y values of the cell of (cx, cy), sorted and unique:
 * {cx} ∪ {f.x ± W/2 in the cell, nudged} ∪ {chosen p.x ± W in the cell,
 * nudged away from p}, and the same in y, over the frame figures F.
 */
function cellValues(
  st: SearchState,
  cx: number,
  cy: number,
  F: number[],
  chosen: Placement[],
): [Float64Array, Float64Array] {
  const s = st.map.grid.strideUm;
  const hw = st.e.halfX, hh = st.e.halfY;
  const bx0 = cx - s / 2, bx1 = cx + s / 2, by0 = cy - s / 2, by1 = cy + s / 2;
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
  return [uniqueSorted(xs), uniqueSorted(ys)];
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

/** Sorted unique values. */
function uniqueSorted(values: number[]): Float64Array {
  const a = Float64Array.from(values).sort();
  let m = 0;
  for (let i = 0; i < a.length; i++) if (m === 0 || a[i] !== a[m - 1]) a[m++] = a[i];
  return a.slice(0, m);
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
