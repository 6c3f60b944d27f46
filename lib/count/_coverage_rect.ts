/**
 * Exact coverage of a rectangle window at every grid centre.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import type { StrideGrid } from "./engine_types.ts";
import { createRowRasterizer, type RowRasterizer } from "./_geometry.ts";

/**
 * Band size, in raster cells, up to which bands grow (each band's sums start
 * from zero; rounding depends on where they do, so this stays as it was).
 */
const BAND_CELLS = 4_000_000;
/** Raster cells rasterized per call. */
const CHUNK_CELLS = 1 << 20;

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
 * exact per-cell areas from the row rasterizer summed with a summed-area
 * table give exact coverage (up to floating-point rounding).
 *
 * Bands of grid rows, each with its own table: a band's table runs from the
 * top edge of its first window to the bottom edge of its last. Only one row
 * of the table is held: the rows are walked downwards, each window row's
 * top-edge values are kept until its bottom edge is reached. Cell rows are
 * rasterized once, a few at a time, and kept (as row prefix sums) while a
 * later band still needs them: memory is O(window height × width of the
 * raster), time O(cells of the raster + windows). Bands hold at least twice
 * a window's rows; up to {@linkcode BAND_CELLS} they grow as before, so the
 * sums (and so every rounding) are the same as with the earlier, wholly
 * stored tables.
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
  const w = nxE; // table width: nxE entries per row (nxE − 1 cells)
  // Cell rows under one window, and window rows open at once.
  let span = 0, open = 1;
  for (let j = 0, k = 0; j < ny; j++) {
    if (Y.hi[j] - Y.lo[j] > span) span = Y.hi[j] - Y.lo[j];
    while (k < ny && Y.lo[k] < Y.hi[j]) k++;
    if (k - j > open) open = k - j;
  }
  const rows = new PrefixRows(regionUm, X.edges, Y.edges, span);
  const sat = new Float64Array(w);
  // Per open window row: the table's values at its windows' left and right edges on its top edge.
  const topA = new Float64Array(open * nx), topB = new Float64Array(open * nx);
  const xa = X.lo, xb = X.hi;
  let j0 = 0;
  while (j0 < ny) {
    let j1 = j0 + 1;
    while (
      j1 < ny &&
      ((Y.hi[j1] - Y.lo[j0] + 1) * nxE <= BAND_CELLS || Y.hi[j1] - Y.lo[j0] <= 2 * span)
    ) j1++;
    const base = Y.lo[j0];
    const top = Y.hi[j1 - 1];
    sat.fill(0);
    let jTop = j0, jBottom = j0;
    for (let r = 0; r <= top - base; r++) {
      if (r > 0) {
        const p = rows.get(base + r - 1);
        for (let c = 1; c < nxE; c++) sat[c] = sat[c] + p[c];
      }
      // Bottoms first: a row's slot is free for a top edge on the same line.
      while (jBottom < jTop && Y.hi[jBottom] - base === r) {
        const o = (jBottom % open) * nx, row = jBottom * nx;
        for (let i = 0; i < nx; i++) {
          const v = (sat[xb[i]] - topB[o + i] - sat[xa[i]] + topA[o + i]) / area;
          out[row + i] = v < 0 ? 0 : v > 1 ? 1 : v;
        }
        jBottom++;
      }
      while (jTop < j1 && Y.lo[jTop] - base === r) {
        const o = (jTop % open) * nx;
        for (let i = 0; i < nx; i++) {
          topA[o + i] = sat[xa[i]];
          topB[o + i] = sat[xb[i]];
        }
        jTop++;
      }
    }
    j0 = j1;
  }
  return out;
}

/**
 * Row prefix sums of the raster (cell rows between consecutive y edges),
 * rasterized a few rows at a time and kept in a ring while a band may still
 * ask for them: entry c of row r is the area in cells 0 … c − 1 of row r
 * (entry 0 unused), summed left to right.
 */
class PrefixRows {
  #raster: RowRasterizer;
  #yEdges: Float64Array;
  #w: number;
  #chunk: number;
  #cap: number;
  #ring: Float64Array;
  /** Rows [#lo, #hi) are in the ring. */
  #lo = 0;
  #hi = 0;

  constructor(region: MultiPolygonPx, xEdges: Float64Array, yEdges: Float64Array, span: number) {
    this.#raster = createRowRasterizer(region, xEdges);
    this.#yEdges = yEdges;
    this.#w = xEdges.length;
    this.#chunk = Math.max(8, Math.min(256, Math.floor(CHUNK_CELLS / this.#w)));
    // A band starts at most span + 1 rows above the row the last one reached.
    this.#cap = span + 4 + this.#chunk;
    this.#ring = new Float64Array(this.#cap * this.#w);
  }

  /** The prefix row of cell row r (valid until the next call). */
  get(r: number): Float64Array {
    if (r < this.#lo) {
      throw new RangeError(`Raster row ${r} is no longer held (rows ${this.#lo}…${this.#hi})`);
    }
    while (r >= this.#hi) this.#fill();
    const w = this.#w, at = (r % this.#cap) * w;
    return this.#ring.subarray(at, at + w);
  }

  #fill(): void {
    const r0 = this.#hi;
    const r1 = Math.min(this.#yEdges.length - 1, r0 + this.#chunk);
    const cells = this.#raster.rows(this.#yEdges.subarray(r0, r1 + 1));
    const w = this.#w, n = w - 1;
    for (let r = r0; r < r1; r++) {
      const at = (r % this.#cap) * w, cr = (r - r0) * n;
      let acc = 0;
      for (let c = 1; c < w; c++) {
        acc += cells[cr + c - 1];
        this.#ring[at + c] = acc;
      }
    }
    this.#hi = r1;
    this.#lo = Math.max(0, r1 - this.#cap);
  }
}
