/**
 * Exact coverage of a rectangle window at every grid centre.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import type { StrideGrid } from "./engine_types.ts";
import { rasterizeArea } from "./_geometry.ts";

/** Cells per rasterization band (bounds memory at about 2 × 8 bytes × this). */
const BAND_CELLS = 4_000_000;

/** Sorted unique edges {c_i − h, c_i + h} and, per centre, the indices of its two edges. */
function mergedEdges(
  c0: number,
  s: number,
  n: number,
  h: number,
): { edges: Float64Array; lo: Int32Array; hi: Int32Array } {
  const all = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const c = c0 + i * s;
    all[2 * i] = c - h;
    all[2 * i + 1] = c + h;
  }
  all.sort();
  let m = 0;
  for (let k = 0; k < all.length; k++) {
    if (m === 0 || all[k] !== all[m - 1]) all[m++] = all[k];
  }
  const edges = all.slice(0, m);
  const lo = new Int32Array(n), hi = new Int32Array(n);
  const find = (v: number): number => {
    let a = 0, b = m - 1;
    while (a < b) {
      const mid = (a + b) >> 1;
      if (edges[mid] < v) a = mid + 1;
      else b = mid;
    }
    return a;
  };
  for (let i = 0; i < n; i++) {
    const c = c0 + i * s;
    lo[i] = find(c - h);
    hi[i] = find(c + h);
  }
  return { edges, lo, hi };
}

/**
 * area(window ∩ V) / area(window) for a W × H rectangle at every grid centre.
 *
 * The plane is cut at every window edge {cx_i ± W/2} × {cy_j ± H/2}; each
 * window is then a union of whole cells of that non-uniform grid, so the
 * exact per-cell areas from `rasterizeArea` summed with a summed-area table
 * give exact coverage (up to floating-point rounding). Processed in bands of
 * grid rows to bound memory.
 */
export function rectCoverage(
  regionUm: MultiPolygonPx,
  grid: StrideGrid,
  halfX: number,
  halfY: number,
): Float64Array {
  const { x0Um, y0Um, strideUm: s, nx, ny } = grid;
  const out = new Float64Array(nx * ny);
  if (regionUm.length === 0) return out;
  const area = 4 * halfX * halfY;
  const X = mergedEdges(x0Um, s, nx, halfX);
  const Y = mergedEdges(y0Um, s, ny, halfY);
  const nxE = X.edges.length;
  let j0 = 0;
  while (j0 < ny) {
    // Grow the band while its edge rows fit the budget.
    let j1 = j0 + 1;
    while (j1 < ny && (Y.hi[j1] - Y.lo[j0] + 1) * nxE <= BAND_CELLS) j1++;
    const base = Y.lo[j0];
    const top = Y.hi[j1 - 1];
    const yEdges = Y.edges.subarray(base, top + 1);
    const nyE = yEdges.length;
    const cells = rasterizeArea(regionUm, X.edges, yEdges);
    const w = nxE; // SAT width: nxE entries per row (nxE − 1 cells)
    const sat = new Float64Array(w * nyE);
    for (let r = 1; r < nyE; r++) {
      let acc = 0;
      const cr = (r - 1) * (nxE - 1);
      for (let c = 1; c < nxE; c++) {
        acc += cells[cr + c - 1];
        sat[r * w + c] = sat[(r - 1) * w + c] + acc;
      }
    }
    for (let j = j0; j < j1; j++) {
      const ra = (Y.lo[j] - base) * w, rb = (Y.hi[j] - base) * w;
      const o = j * nx;
      for (let i = 0; i < nx; i++) {
        const a = X.lo[i], b = X.hi[i];
        const v = (sat[rb + b] - sat[ra + b] - sat[rb + a] + sat[ra + a]) / area;
        out[o + i] = v < 0 ? 0 : v > 1 ? 1 : v;
      }
    }
    j0 = j1;
  }
  return out;
}
