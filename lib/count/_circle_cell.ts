/**
 * The figures of one stride cell of the circle search: how many a window
 * at the cell's centre holds, how many lie surely inside every window
 * centred in the cell, and the list of those in doubt.
 *
 * @module
 */

import { bucketFigures, type FigureBuckets } from "./_figure_buckets.ts";
import { addWork, type SearchState } from "./_search_state.ts";

/** Figures of a circle cell (see {@linkcode circleCellFigures}). */
export interface CircleCellFigures {
  /** Figures in the closed window at the cell's centre. */
  count: number;
  /** Figures surely inside every window centred in the square of half side h. */
  sureIn: number;
  /** Figures in doubt, in the order the coarse bucket grid lists them. */
  A: number[];
}

/**
 * The figures of the square of centres (cx, cy, half side h), as the circle
 * search's square split defines them: with band = (h + tol)·√2 + tol, those
 * nearer than r − band to the centre are surely inside, those within r +
 * band in doubt.
 *
 * Fine buckets (one stride wide) wholly inside the inner disk are counted
 * without reading their figures, so the cost is the rim's figures, not the
 * disk's. The list in doubt is sorted into the order a scan of the coarse
 * buckets (`st.buckets`) would give, which later steps depend on bit for bit.
 */
export function circleCellFigures(
  st: SearchState,
  cx: number,
  cy: number,
  h: number,
): CircleCellFigures {
  const r = st.e.halfX, r2 = st.e.radius2;
  const tol = 1e-6 * r;
  const band = (h + tol) * Math.SQRT2 + tol;
  const lo = r - band, hi = r + band;
  const lo2 = lo > 0 ? lo * lo : -1, hi2 = hi * hi;
  // Whole buckets count as surely inside below this radius (margin far above rounding).
  const inner = lo - 1e-6 * r;
  const inner2 = inner > 0 ? inner * inner : -1;
  const b = fineBuckets(st);
  const xU = st.xUm, yU = st.yUm;
  const i0 = Math.max(0, Math.floor((cx - hi - b.x0) / b.size));
  const i1 = Math.min(b.nbx - 1, Math.floor((cx + hi - b.x0) / b.size));
  const j0 = Math.max(0, Math.floor((cy - hi - b.y0) / b.size));
  const j1 = Math.min(b.nby - 1, Math.floor((cy + hi - b.y0) / b.size));
  let count = 0, sureIn = 0, visited = 0;
  const A: number[] = [];
  for (let j = j0; j <= j1; j++) {
    const ya = b.y0 + j * b.size - cy, yb = ya + b.size;
    const yFar = Math.max(Math.abs(ya), Math.abs(yb));
    const yNear = ya > 0 ? ya : yb < 0 ? -yb : 0;
    for (let i = i0; i <= i1; i++) {
      const q = j * b.nbx + i;
      const t0 = b.start[q], t1 = b.start[q + 1];
      if (t0 === t1) continue;
      const xa = b.x0 + i * b.size - cx, xb = xa + b.size;
      const xFar = Math.max(Math.abs(xa), Math.abs(xb));
      if (xFar * xFar + yFar * yFar < inner2) {
        count += t1 - t0;
        sureIn += t1 - t0;
        continue;
      }
      const xNear = xa > 0 ? xa : xb < 0 ? -xb : 0;
      if (xNear * xNear + yNear * yNear > hi2 * (1 + 1e-9) + tol) continue;
      visited += t1 - t0;
      for (let t = t0; t < t1; t++) {
        const f = b.order[t];
        const dx = xU[f] - cx, dy = yU[f] - cy;
        const d2 = dx * dx + dy * dy;
        if (d2 <= r2) count++;
        if (d2 < lo2) sureIn++;
        else if (d2 <= hi2) A.push(f);
      }
    }
  }
  // Buckets and figures read, and the sort of those in doubt (about 8 tests each, measured).
  addWork(st, (i1 - i0 + 1) * (j1 - j0 + 1) + visited + 8 * A.length);
  return { count, sureIn, A: inCoarseOrder(st.buckets, A) };
}

/** The search's fine buckets, one stride wide (made on first use). */
function fineBuckets(st: SearchState): FigureBuckets {
  if (st.fine) return st.fine;
  const n = st.xUm.length;
  const b = st.buckets;
  let size = st.map.grid.strideUm;
  // Keep the table in proportion to the figures, as the coarse one.
  const w = (b.nbx + 1) * b.size, hgt = (b.nby + 1) * b.size;
  const cap = Math.max(1 << 20, 4 * n);
  while ((w / size + 1) * (hgt / size + 1) > cap) size *= 2;
  st.fine = size >= b.size ? b : bucketFigures(st.xUm, st.yUm, size);
  return st.fine;
}

/** Figures sorted by coarse bucket (row-major), then index: the order of `pointsInBox`. */
function inCoarseOrder(b: FigureBuckets, A: number[]): number[] {
  if (A.length < 2) return A;
  const n = b.xUm.length;
  const keys = new Float64Array(A.length);
  for (let t = 0; t < A.length; t++) {
    const f = A[t];
    const q = Math.floor((b.yUm[f] - b.y0) / b.size) * b.nbx +
      Math.floor((b.xUm[f] - b.x0) / b.size);
    keys[t] = q * n + f;
  }
  keys.sort();
  const out = new Array<number>(A.length);
  for (let t = 0; t < A.length; t++) out[t] = keys[t] % n;
  return out;
}
