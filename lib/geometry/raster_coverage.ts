/**
 * Exact area of a region in every cell of a rectilinear grid.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import { type EdgeSet, flattenEdges } from "./_edges.ts";

/**
 * Grid positions `start + i·step` for i = 0 … n − 1, each computed directly
 * (never by repeated addition, so rounding does not accumulate).
 *
 * @param start First value.
 * @param step Distance between values.
 * @param n Number of values.
 * @returns The positions.
 *
 * @example Eleven edges for ten cells of width 0.1
 * ```ts
 * import { uniformEdges } from "./raster_coverage.ts";
 * const e = uniformEdges(0, 0.1, 11);
 * if (e.length !== 11 || e[10] !== 1 || e[3] !== 0.30000000000000004) throw new Error(String(e[3]));
 * ```
 */
export function uniformEdges(start: number, step: number, n: number): Float64Array {
  const out = new Float64Array(Math.max(0, n));
  for (let i = 0; i < out.length; i++) out[i] = start + i * step;
  return out;
}

/** Largest c in [0, n−1] with e[c] <= v (e strictly increasing, v within [e[0], e[n]]). */
function locate(e: Float64Array, n: number, v: number, step: number): number {
  let c = Math.floor((v - e[0]) / step);
  if (c < 0) c = 0;
  else if (c > n - 1) c = n - 1;
  if (e[c] <= v && (c === n - 1 || v < e[c + 1])) return c;
  // non-uniform spacing: binary search
  let lo = 0, hi = n - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (e[mid] <= v) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

function checkEdges(e: Float64Array, name: string): void {
  if (e.length < 2) {
    throw new RangeError(
      `Cannot rasterize a region: ${name} needs at least 2 values, got ${e.length}`,
    );
  }
  for (let i = 1; i < e.length; i++) {
    if (!(e[i] > e[i - 1])) {
      throw new RangeError(
        `Cannot rasterize a region: ${name} must be strictly increasing, but value ${i} is ${
          e[i]
        } after ${e[i - 1]}`,
      );
    }
  }
}

/**
 * Exact area of region ∩ cell for every cell of a grid.
 *
 * Cell (i, j) is `[xEdges[i], xEdges[i + 1]] × [yEdges[j], yEdges[j + 1]]`;
 * the result is row-major, index `j·nx + i` with `nx = xEdges.length − 1`.
 * The edges must increase strictly but need not be uniform. Parts of the
 * region outside the grid are ignored.
 *
 * Method: signed-area accumulation per row band, as in scanline font
 * rasterizers. With outer rings positive (shoelace) and holes negative, the
 * area of the region in a cell is −Σ over edges of
 * ∫ clamp(x₁ − x(y), 0, w) dy, x₁ the cell's right side and w its width. Each
 * edge is cut at row and column lines; a piece inside a cell adds its
 * trapezoid to that cell and its signed height to every cell to its right
 * (pieces left of the grid pass their height to the whole row); a prefix sum
 * along each row finishes it. Exact up to rounding, O(cells + edge pieces).
 * Overlapping polygons would be counted twice: pass a normalized region.
 *
 * @param region Normalized, non-overlapping polygons (either winding).
 * @param xEdges Column boundaries, strictly increasing.
 * @param yEdges Row boundaries, strictly increasing.
 * @returns Area per cell, in the coordinate unit squared.
 * @throws {RangeError} When an edge list has fewer than 2 values or does not increase.
 *
 * @example A 3 × 2 square over a 2 × 2 grid of unit cells
 * ```ts
 * import { rasterizeArea } from "./raster_coverage.ts";
 * const sq: [number, number][] = [[0.5, 0], [3.5, 0], [3.5, 2], [0.5, 2], [0.5, 0]];
 * const a = rasterizeArea([[sq]], new Float64Array([0, 1, 2]), new Float64Array([0, 1, 2]));
 * if (a.join() !== "0.5,1,0.5,1") throw new Error(a.join());
 * ```
 */
export function rasterizeArea(
  region: MultiPolygonPx,
  xEdges: Float64Array,
  yEdges: Float64Array,
): Float64Array {
  checkEdges(xEdges, "xEdges");
  checkEdges(yEdges, "yEdges");
  return createRowRasterizer(region, xEdges).rows(yEdges).slice();
}

/** Rasterizes consecutive bands of rows of one grid (see {@linkcode createRowRasterizer}). */
export interface RowRasterizer {
  /**
   * Area of region ∩ cell for the rows between `yEdges` (strictly
   * increasing), row-major with `xEdges.length − 1` cells a row. The array
   * is reused by the next call.
   */
  rows(yEdges: Float64Array): Float64Array;
}

/**
 * {@linkcode rasterizeArea} for a grid taken a band of rows at a time: the
 * region's edges are flattened once, and bands asked for from top to bottom
 * visit only the edges that reach them, so memory stays in proportion to the
 * band while the whole grid costs O(cells + edge pieces + edges).
 *
 * Every row's values are exactly those `rasterizeArea` gives for a grid
 * holding that row (a row depends only on its own two y edges, and edges are
 * summed in the same order), whichever bands it is asked in.
 *
 * @param region Normalized, non-overlapping polygons (either winding).
 * @param xEdges Column boundaries, strictly increasing.
 * @returns The rasterizer.
 * @throws {RangeError} When `xEdges` has fewer than 2 values or does not
 *   increase (and, from `rows`, the same for its `yEdges`).
 *
 * @example Two bands give the same cells as one grid
 * ```ts
 * import { createRowRasterizer, rasterizeArea } from "./raster_coverage.ts";
 * const sq: [number, number][] = [[0.5, 0], [3.5, 0], [3.5, 2.5], [0.5, 2.5], [0.5, 0]];
 * const xs = new Float64Array([0, 1, 2]);
 * const whole = rasterizeArea([[sq]], xs, new Float64Array([0, 1, 2, 3]));
 * const r = createRowRasterizer([[sq]], xs);
 * const top = Array.from(r.rows(new Float64Array([0, 1])));
 * const rest = Array.from(r.rows(new Float64Array([1, 2, 3])));
 * if ([...top, ...rest].join() !== Array.from(whole).join()) throw new Error("bands differ");
 * ```
 */
export function createRowRasterizer(region: MultiPolygonPx, xEdges: Float64Array): RowRasterizer {
  checkEdges(xEdges, "xEdges");
  const e = flattenEdges(region);
  const nx = xEdges.length - 1;
  // Edges bucketed by their lower y (each bucket in edge order), and the
  // list of edges reaching the current band kept in edge order (sums must
  // add in the same order as ever). Bands asked top to bottom take each
  // edge once.
  const lowY = new Float64Array(e.count), highY = new Float64Array(e.count);
  let sloped = 0;
  for (let k = 0; k < e.count; k++) {
    const a = e.y0[k], b = e.y1[k];
    lowY[k] = a < b ? a : b;
    highY[k] = a < b ? b : a;
    if (a !== b) sloped++;
  }
  const nb = Math.max(1, Math.min(1 << 16, sloped >> 3));
  const yMin = e.minY, ySpan = e.maxY - e.minY;
  const bucketOf = (y: number) => {
    const b = ySpan > 0 ? Math.floor(((y - yMin) / ySpan) * nb) : 0;
    return b < 0 ? 0 : b >= nb ? nb - 1 : b;
  };
  const bStart = new Int32Array(nb + 1);
  for (let k = 0; k < e.count; k++) if (e.y0[k] !== e.y1[k]) bStart[bucketOf(lowY[k]) + 1]++;
  for (let b = 0; b < nb; b++) bStart[b + 1] += bStart[b];
  const bFill = bStart.slice(0, nb);
  const byLow = new Int32Array(sloped);
  for (let k = 0; k < e.count; k++) if (e.y0[k] !== e.y1[k]) byLow[bFill[bucketOf(lowY[k])]++] = k;
  const taken = new Uint8Array(e.count);
  const bucketDone = (b: number) => {
    for (let t = bStart[b]; t < bStart[b + 1]; t++) if (!taken[byLow[t]]) return false;
    return true;
  };
  let next = 0; // buckets before this one are wholly taken
  let active = new Int32Array(0);
  let lastY0 = -Infinity, lastYN = -Infinity;
  let area = new Float64Array(0), cover = new Float64Array(0), out = new Float64Array(0);
  return {
    rows(yEdges: Float64Array): Float64Array {
      checkEdges(yEdges, "yEdges");
      const ny = yEdges.length - 1;
      const Y0 = yEdges[0], YN = yEdges[ny];
      if (Y0 < lastY0 || YN < lastYN) {
        // Out of order: start the edge list again.
        next = 0;
        taken.fill(0);
        active = new Int32Array(0);
      }
      lastY0 = Y0;
      lastYN = YN;
      // New edges: those starting above YN in buckets from `next` on.
      const fresh: number[] = [];
      const last = bucketOf(YN);
      for (let b = next; b <= last; b++) {
        for (let t = bStart[b]; t < bStart[b + 1]; t++) {
          const k = byLow[t];
          if (!taken[k] && lowY[k] < YN) {
            taken[k] = 1;
            fresh.push(k);
          }
        }
      }
      // Buckets wholly below YN are done.
      while (next < nb && (next < last || (next === last && bucketDone(next)))) next++;
      const add = Int32Array.from(fresh).sort();
      const merged = new Int32Array(active.length + add.length);
      let a = 0, b = 0, c = 0;
      while (a < active.length || b < add.length) {
        const k = b >= add.length || (a < active.length && active[a] < add[b])
          ? active[a++]
          : add[b++];
        if (highY[k] > Y0) merged[c++] = k;
      }
      active = merged.subarray(0, c);
      const cells = nx * ny;
      if (area.length < cells) {
        area = new Float64Array(cells);
        cover = new Float64Array(cells);
        out = new Float64Array(cells);
      } else {
        area.fill(0, 0, cells);
        cover.fill(0, 0, cells);
      }
      rasterRows(e, active, xEdges, yEdges, area, cover, out);
      return out.subarray(0, cells);
    },
  };
}

/**
 * The scanline accumulation of {@linkcode rasterizeArea} over the edges
 * `ids` (in that order) into zeroed `area` and `cover`, finished into `out`.
 */
function rasterRows(
  e: EdgeSet,
  ids: Int32Array,
  xEdges: Float64Array,
  yEdges: Float64Array,
  area: Float64Array,
  cover: Float64Array,
  out: Float64Array,
): void {
  const nx = xEdges.length - 1, ny = yEdges.length - 1;
  const leftCover = new Float64Array(ny);
  const X0 = xEdges[0], XN = xEdges[nx], Y0 = yEdges[0], YN = yEdges[ny];
  const xStep = (XN - X0) / nx, yStep = (YN - Y0) / ny;

  // one piece inside row j, from (xa, ya) to (xb, yb), carrying signed height h
  const rowPiece = (j: number, xa: number, ya: number, xb: number, yb: number, h: number) => {
    const base = j * nx;
    // the part left of the grid
    if (xa <= X0 && xb <= X0) {
      leftCover[j] -= h;
      return;
    }
    if (xa >= XN && xb >= XN) return;
    // clip to [X0, XN] and put the left remainder into leftCover
    if (xa < X0 || xb < X0) {
      const dyTotal = yb - ya;
      const yc = ya + (X0 - xa) / (xb - xa) * dyTotal;
      if (xa < X0) {
        leftCover[j] -= h * (yc - ya) / dyTotal;
        h *= (yb - yc) / dyTotal;
        ya = yc;
        xa = X0;
      } else {
        leftCover[j] -= h * (yb - yc) / dyTotal;
        h *= (yc - ya) / dyTotal;
        yb = yc;
        xb = X0;
      }
    }
    if (xa > XN || xb > XN) {
      const d = yb - ya;
      const yc = ya + (XN - xa) / (xb - xa) * d;
      if (xa > XN) {
        h *= (yb - yc) / d;
        ya = yc;
        xa = XN;
      } else {
        h *= (yc - ya) / d;
        yb = yc;
        xb = XN;
      }
    }
    const dy = yb - ya;
    if (dy === 0 || h === 0) return;
    const hPerY = h / dy;
    if (xa === xb) {
      const c = locate(xEdges, nx, xa, xStep);
      area[base + c] -= h * (xEdges[c + 1] - xa);
      cover[base + c] -= h;
      return;
    }
    if (xb > xa) {
      let c = locate(xEdges, nx, xa, xStep);
      let px = xa, py = ya;
      for (;;) {
        const right = xEdges[c + 1];
        if (xb <= right || c === nx - 1) {
          const hp = hPerY * (yb - py);
          area[base + c] -= hp * (right - (px + xb) / 2);
          cover[base + c] -= hp;
          break;
        }
        const y = ya + (right - xa) / (xb - xa) * dy;
        const hp = hPerY * (y - py);
        area[base + c] -= hp * (right - (px + right) / 2);
        cover[base + c] -= hp;
        px = right;
        py = y;
        c++;
      }
    } else {
      let c = locate(xEdges, nx, xa, xStep);
      if (c > 0 && xEdges[c] === xa) c--;
      let px = xa, py = ya;
      for (;;) {
        const left = xEdges[c];
        const right = xEdges[c + 1];
        if (xb >= left || c === 0) {
          const hp = hPerY * (yb - py);
          area[base + c] -= hp * (right - (px + xb) / 2);
          cover[base + c] -= hp;
          break;
        }
        const y = ya + (left - xa) / (xb - xa) * dy;
        const hp = hPerY * (y - py);
        area[base + c] -= hp * (right - (px + left) / 2);
        cover[base + c] -= hp;
        px = left;
        py = y;
        c--;
      }
    }
  };

  const { x0, y0, x1, y1 } = e;
  for (let q = 0; q < ids.length; q++) {
    const k = ids[q];
    let ax = x0[k], ay = y0[k], bx = x1[k], by = y1[k];
    if (ay === by) continue;
    let sign = 1;
    if (ay > by) {
      // walk downwards in y; the sign keeps the edge's direction
      let t = ax;
      ax = bx;
      bx = t;
      t = ay;
      ay = by;
      by = t;
      sign = -1;
    }
    if (by <= Y0 || ay >= YN) continue;
    const slope = (bx - ax) / (by - ay);
    const ys = ay < Y0 ? Y0 : ay, ye = by > YN ? YN : by;
    let j = locate(yEdges, ny, ys, yStep);
    let py = ys, px = ys === ay ? ax : ax + (ys - ay) * slope;
    for (;;) {
      const rowTop = yEdges[j + 1];
      if (ye <= rowTop || j === ny - 1) {
        const qx = ye === by ? bx : ax + (ye - ay) * slope;
        rowPiece(j, px, py, qx, ye, sign * (ye - py));
        break;
      }
      const qx = ax + (rowTop - ay) * slope;
      rowPiece(j, px, py, qx, rowTop, sign * (rowTop - py));
      px = qx;
      py = rowTop;
      j++;
    }
  }
  for (let j = 0; j < ny; j++) {
    let run = leftCover[j];
    const base = j * nx;
    for (let i = 0; i < nx; i++) {
      out[base + i] = area[base + i] + run * (xEdges[i + 1] - xEdges[i]);
      run += cover[base + i];
    }
  }
}
