/**
 * Exact window counts at every grid centre, in O(points + grid).
 *
 * @module
 */

import type { StrideGrid, WindowShape } from "./engine_types.ts";
import { windowExtents } from "./window_contains.ts";
import { exactRange } from "./_index_range.ts";

/**
 * Counts, for every centre of `grid`, the points inside the closed window
 * centred there (µm plane, x right, y down; a point on the edge is inside).
 *
 * Each point "stamps" the grid centres whose window contains it instead of
 * each window scanning the points. For a rectangle that set is a contiguous
 * range of columns times a contiguous range of rows; the ranges are estimated
 * with floor/ceil and their ends fixed with the same test as
 * {@linkcode windowContains}, then added to a 2D difference array whose
 * prefix sums (a summed-area table) give the counts. For a circle, every grid
 * row within the radius gets the exact contiguous column range
 * (dx² + dy² ≤ r², same expression as `windowContains`) in a per-row
 * difference array. Cost: O(points) for rectangles, O(points · 2r/stride) for
 * circles, plus O(grid).
 *
 * @param xUm Point x, µm.
 * @param yUm Point y, µm.
 * @param window The window (its size; the centre is each grid centre).
 * @param grid The grid of centres.
 * @returns Counts, row-major (index j·nx + i).
 *
 * @example Three points, a 2 × 2 µm square window, unit grid
 * ```ts
 * import { stampWindowCounts } from "./stamp_window_counts.ts";
 * const counts = stampWindowCounts(
 *   new Float64Array([1, 2, 2]), new Float64Array([1, 1, 2]),
 *   { shape: "rect", areaMm2: 4e-6, widthUm: 2, heightUm: 2, aspect: [1, 1] },
 *   { x0Um: 0, y0Um: 0, strideUm: 1, nx: 4, ny: 4 },
 * );
 * // centre (2, 2) holds all three (two of them on its edge)
 * if (counts[2 * 4 + 2] !== 3 || counts[0] !== 1 || counts[3] !== 1) {
 *   throw new Error(`counts at (2, 2), (0, 0), (3, 0): ${counts[10]}, ${counts[0]}, ${counts[3]}`);
 * }
 * ```
 */
export function stampWindowCounts(
  xUm: Float64Array,
  yUm: Float64Array,
  window: WindowShape,
  grid: StrideGrid,
): Int32Array {
  const { x0Um: x0, y0Um: y0, strideUm: s, nx, ny } = grid;
  const e = windowExtents(window);
  const n = xUm.length;
  const w1 = nx + 1;
  if (window.shape === "rect") {
    const hw = e.halfX, hh = e.halfY;
    const diff = new Int32Array(w1 * (ny + 1));
    for (let k = 0; k < n; k++) {
      const x = xUm[k], y = yUm[k];
      // Same as exactRange with the windowContains test, inlined (a hot loop).
      const i0 = fixLow(
        Math.ceil((x - hw - x0) / s),
        Math.floor((x + hw - x0) / s),
        nx,
        x,
        x0,
        s,
        hw,
      );
      if (i0 < 0) continue;
      const i1 = fixHigh(i0, Math.floor((x + hw - x0) / s), nx, x, x0, s, hw);
      const j0 = fixLow(
        Math.ceil((y - hh - y0) / s),
        Math.floor((y + hh - y0) / s),
        ny,
        y,
        y0,
        s,
        hh,
      );
      if (j0 < 0) continue;
      const j1 = fixHigh(j0, Math.floor((y + hh - y0) / s), ny, y, y0, s, hh);
      diff[j0 * w1 + i0]++;
      diff[j0 * w1 + i1 + 1]--;
      diff[(j1 + 1) * w1 + i0]--;
      diff[(j1 + 1) * w1 + i1 + 1]++;
    }
    return integrate2d(diff, nx, ny);
  }
  const r = e.halfX, r2 = e.radius2;
  const diff = new Int32Array(w1 * ny);
  // Estimates by multiplication (the ends are fixed with the exact test anyway).
  const inv = 1 / s;
  for (let k = 0; k < n; k++) {
    const x = xUm[k], y = yUm[k];
    const [j0, j1] = exactRange(
      Math.ceil((y - r - y0) * inv),
      Math.floor((y + r - y0) * inv),
      ny,
      (j) => Math.abs(y - (y0 + j * s)) <= r,
    );
    const xl = x - x0;
    for (let j = j0; j <= j1; j++) {
      const dy = y - (y0 + j * s);
      const dy2 = dy * dy;
      const half = Math.sqrt(Math.max(0, r2 - dy2));
      // Same as exactRange with the windowContains test, inlined: this loop
      // runs points × rows times.
      let i0 = Math.max(0, Math.min(nx - 1, Math.ceil((xl - half) * inv)));
      let i1 = Math.max(0, Math.min(nx - 1, Math.floor((xl + half) * inv)));
      let dx = 0;
      if (i0 > i1) {
        const mid = i0;
        dx = x - (x0 + mid * s);
        if (dx * dx + dy2 <= r2) i0 = i1 = mid;
        else {
          dx = x - (x0 + (mid - 1) * s);
          if (mid - 1 >= 0 && dx * dx + dy2 <= r2) i0 = i1 = mid - 1;
          else {
            dx = x - (x0 + (mid + 1) * s);
            if (mid + 1 < nx && dx * dx + dy2 <= r2) i0 = i1 = mid + 1;
            else continue;
          }
        }
      }
      for (;;) {
        if (i0 <= 0) break;
        dx = x - (x0 + (i0 - 1) * s);
        if (!(dx * dx + dy2 <= r2)) break;
        i0--;
      }
      for (;;) {
        if (i0 > i1) break;
        dx = x - (x0 + i0 * s);
        if (dx * dx + dy2 <= r2) break;
        i0++;
      }
      for (;;) {
        if (i1 >= nx - 1) break;
        dx = x - (x0 + (i1 + 1) * s);
        if (!(dx * dx + dy2 <= r2)) break;
        i1++;
      }
      for (;;) {
        if (i1 < i0) break;
        dx = x - (x0 + i1 * s);
        if (dx * dx + dy2 <= r2) break;
        i1--;
      }
      if (i0 > i1) continue;
      diff[j * w1 + i0]++;
      diff[j * w1 + i1 + 1]--;
    }
  }
  const counts = new Int32Array(nx * ny);
  for (let j = 0; j < ny; j++) {
    let acc = 0;
    const row = j * w1, out = j * nx;
    for (let i = 0; i < nx; i++) {
      acc += diff[row + i];
      counts[out + i] = acc;
    }
  }
  return counts;
}

/**
 * First index i in [0, n) with |v − (o + i·s)| ≤ h, from the estimate
 * [estLo, estHi] (as {@linkcode exactRange}, for one axis of a rectangle), or
 * −1 when there is none.
 */
function fixLow(
  estLo: number,
  estHi: number,
  n: number,
  v: number,
  o: number,
  s: number,
  h: number,
): number {
  let lo = Math.max(0, Math.min(n - 1, estLo));
  const hi = Math.max(0, Math.min(n - 1, estHi));
  if (lo > hi) {
    const mid = lo;
    if (Math.abs(v - (o + mid * s)) <= h) lo = mid;
    else if (mid - 1 >= 0 && Math.abs(v - (o + (mid - 1) * s)) <= h) lo = mid - 1;
    else if (mid + 1 < n && Math.abs(v - (o + (mid + 1) * s)) <= h) lo = mid + 1;
    else return -1;
    while (lo > 0 && Math.abs(v - (o + (lo - 1) * s)) <= h) lo--;
    return lo;
  }
  while (lo > 0 && Math.abs(v - (o + (lo - 1) * s)) <= h) lo--;
  while (lo <= hi && !(Math.abs(v - (o + lo * s)) <= h)) lo++;
  if (lo <= hi) return lo;
  // Everything in the estimate failed; a range can still start just past it.
  return hi + 1 < n && Math.abs(v - (o + (hi + 1) * s)) <= h ? hi + 1 : -1;
}

/** Last index of the range that starts at `lo` (see {@linkcode fixLow}). */
function fixHigh(
  lo: number,
  estHi: number,
  n: number,
  v: number,
  o: number,
  s: number,
  h: number,
): number {
  let hi = Math.max(lo, Math.min(n - 1, estHi));
  while (hi < n - 1 && Math.abs(v - (o + (hi + 1) * s)) <= h) hi++;
  while (hi > lo && !(Math.abs(v - (o + hi * s)) <= h)) hi--;
  return hi;
}

/** Prefix sums of a (nx+1)×(ny+1) difference array into an nx×ny array. */
function integrate2d(diff: Int32Array, nx: number, ny: number): Int32Array {
  const w1 = nx + 1;
  const counts = new Int32Array(nx * ny);
  const col = new Int32Array(nx);
  for (let j = 0; j < ny; j++) {
    let acc = 0;
    const row = j * w1, out = j * nx;
    for (let i = 0; i < nx; i++) {
      acc += diff[row + i];
      col[i] += acc;
      counts[out + i] = col[i];
    }
  }
  return counts;
}
