/**
 * Upper bounds of a circular window's coverage at every grid centre, for
 * searches that only need to rule centres out (the best field set).
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import type { StrideGrid } from "./engine_types.ts";
import { createRowRasterizer } from "./_geometry.ts";

/** Raster cells rasterized per call. */
const CHUNK_CELLS = 1 << 20;

/** One slab of the staircases: raster rows [t0, t1) about the centre, half widths in cells. */
interface Slab {
  t0: number;
  t1: number;
  /** The outer staircase covers the disk in these rows: columns ±out. */
  out: number;
  /** The inner staircase lies inside the disk in these rows: columns ±inner (0: none). */
  inner: number;
}

/**
 * The slabs of the two staircases about a centre on a raster corner: raster
 * rows t ∈ [−R, R) of height c, grouped while the outer half width varies
 * little, so each centre costs a few rectangle sums whatever the radius.
 */
function slabs(r: number, c: number, R: number): Slab[] {
  const out: Slab[] = [];
  const rows: { o: number; i: number }[] = [];
  for (let t = -R; t < R; t++) {
    const y0 = t * c, y1 = (t + 1) * c;
    const near = y0 <= 0 && y1 >= 0 ? 0 : Math.min(Math.abs(y0), Math.abs(y1));
    const far = Math.max(Math.abs(y0), Math.abs(y1));
    // A margin far above rounding keeps the outer one outside and the inner one inside.
    const o = near >= r ? 0 : Math.ceil(Math.sqrt(r * r - near * near) / c * (1 + 1e-12) + 1e-9);
    const i = far >= r
      ? 0
      : Math.max(0, Math.floor(Math.sqrt(r * r - far * far) / c * (1 - 1e-12) - 1e-9));
    rows.push({ o, i });
  }
  let t = 0;
  while (t < rows.length && rows[t].o === 0) t++;
  while (t < rows.length && rows[t].o > 0) {
    let t1 = t + 1, oMax = rows[t].o, oMin = rows[t].o, iMin = rows[t].i;
    // Grow while the outer width stays within an eighth (at least one cell).
    while (t1 < rows.length && rows[t1].o > 0) {
      const o = rows[t1].o;
      const hi = Math.max(oMax, o), lo = Math.min(oMin, o);
      if (hi - lo > Math.max(1, Math.floor(hi / 8))) break;
      oMax = hi;
      oMin = lo;
      iMin = Math.min(iMin, rows[t1].i);
      t1++;
    }
    out.push({ t0: t - R, t1: t1 - R, out: oMax, inner: iMin });
    t = t1;
  }
  return out;
}

/**
 * area(disk ∩ V) / area(disk) bounded from above at every grid centre, for
 * a disk of radius r.
 *
 * V's exact area in each cell of a raster of cells a stride wide or a few
 * times finer, with grid centres on cell corners (`createRowRasterizer`), is summed with a summed-area
 * table over two staircases of whole cells: an outer one that covers the
 * disk, giving area(V ∩ outer) ≥ area(V ∩ disk), and an inner one inside
 * it, giving area(disk) − area(inner ∖ V) ≥ area(V ∩ disk). The smaller,
 * plus 1e-9 of the disk for rounding, is the bound. Each centre costs a
 * fixed number of rectangle sums (the rows are grouped into slabs), so the
 * whole map costs O(cells + edge pieces); the table is kept for the rows
 * one disk spans only.
 *
 * @param regionUm V, µm.
 * @param grid The grid of centres.
 * @param radiusUm The disk's radius, µm.
 * @param low When given, filled with lower bounds: area(V ∩ inner) and
 *   area(V ∩ outer) − area(outer ∖ disk), the larger, less 1e-9 of the disk.
 * @returns Upper bounds in [0, 1], row-major.
 */
export function circleCoverageBound(
  regionUm: MultiPolygonPx,
  grid: StrideGrid,
  radiusUm: number,
  low?: Float64Array,
): Float64Array {
  const { x0Um, y0Um, strideUm: s, nx, ny } = grid;
  const out = new Float64Array(nx * ny);
  if (regionUm.length === 0) return out;
  const r = radiusUm;
  // Cells of a stride / q, no wider than r/16 (at most 4 per stride): centres
  // stay on cell corners, q apart.
  const q = Math.max(1, Math.min(4, Math.ceil(s / (r / 8))));
  const c = s / q;
  const R = Math.ceil(r / c) + 1;
  const S = slabs(r, c, R);
  const ncx = 2 * R + q * (nx - 1), nRows = 2 * R + q * (ny - 1);
  const X0 = x0Um - R * c, Y0 = y0Um - R * c;
  const xEdges = new Float64Array(ncx + 1);
  for (let m = 0; m <= ncx; m++) xEdges[m] = X0 + m * c;
  const raster = createRowRasterizer(regionUm, xEdges);
  const w = ncx + 1;
  const chunk = Math.max(1, Math.min(256, Math.floor(CHUNK_CELLS / w)));
  // Summed-area table rows T[q] = Σ cells of rows < q, columns < m; a ring of them.
  const cap = 2 * R + 2 + chunk;
  const ring = new Float64Array(cap * w);
  let have = 1; // rows [0, have) of T computed; T[0] = 0
  const row = (q: number) => (q % cap) * w;
  const need = (q: number) => {
    while (have <= q) {
      const r0 = have - 1, r1 = Math.min(nRows, r0 + chunk);
      const yEdges = new Float64Array(r1 - r0 + 1);
      for (let k = 0; k <= r1 - r0; k++) yEdges[k] = Y0 + (r0 + k) * c;
      const cells = raster.rows(yEdges);
      for (let rr = r0; rr < r1; rr++) {
        const prev = row(rr), next = row(rr + 1), base = (rr - r0) * ncx;
        let acc = 0;
        ring[next] = 0;
        for (let m = 0; m < ncx; m++) {
          acc += cells[base + m];
          ring[next + m + 1] = ring[prev + m + 1] + acc;
        }
      }
      have = r1 + 1;
    }
  };
  ring.fill(0, 0, w);
  const area = Math.PI * r * r;
  let innerArea = 0, outerArea = 0;
  for (const s of S) {
    innerArea += (s.t1 - s.t0) * 2 * s.inner * c * c;
    outerArea += (s.t1 - s.t0) * 2 * s.out * c * c;
  }
  for (let j = 0; j < ny; j++) {
    const rc = R + q * j;
    need(rc + R);
    for (let i = 0; i < nx; i++) {
      const mc = R + q * i;
      let outer = 0, inner = 0;
      for (let k = 0; k < S.length; k++) {
        const s = S[k];
        const ra = row(rc + s.t0), rb = row(rc + s.t1);
        const a = mc - s.out, b = mc + s.out;
        outer += ring[rb + b] - ring[ra + b] - ring[rb + a] + ring[ra + a];
        if (s.inner > 0) {
          const p = mc - s.inner, q = mc + s.inner;
          inner += ring[rb + q] - ring[ra + q] - ring[rb + p] + ring[ra + p];
        }
      }
      const bound = Math.min(outer, area - innerArea + inner) / area + 1e-9;
      out[j * nx + i] = bound < 0 ? 0 : bound > 1 ? 1 : bound;
      if (low) {
        // V ∩ inner lies in the disk; V ∩ disk holds V ∩ outer but what lies outside the disk.
        const l = Math.max(inner, outer - (outerArea - area)) / area - 1e-9;
        low[j * nx + i] = l < 0 ? 0 : l > 1 ? 1 : l;
      }
    }
  }
  return out;
}
