/**
 * Coverage of a circular window at every grid centre, on a fine raster.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import type { StrideGrid } from "./engine_types.ts";
import { rasterizeArea } from "./_geometry.ts";

/** Raster cells per band (bounds memory at about 8 bytes × this). */
const BAND_CELLS = 6_000_000;

/** The raster used for circle coverage and its error bound. */
export interface CircleRaster {
  /** Raster cells per stride (cells are stride / q wide). */
  q: number;
  /** Cell size, µm. */
  cellUm: number;
  /** Bound on |coverage error| (fraction of the window area). */
  errorBound: number;
}

/**
 * Picks the raster: cells of stride/q with q the smallest integer making a
 * cell no wider than r/128, at most 4 (memory and time grow with q²), so grid
 * centres fall on cell corners and every centre sees the same row spans.
 */
export function circleRaster(
  strideUm: number,
  radiusUm: number,
  cellsPerStride?: number,
): CircleRaster {
  const q = cellsPerStride !== undefined
    ? Math.max(1, Math.min(4, Math.round(cellsPerStride)))
    : Math.max(1, Math.min(4, Math.ceil(strideUm / (radiusUm / 128))));
  const c = strideUm / q;
  // Cells met by a circle of radius r: at most 8(r/c + 1); each contributes at most c².
  const errorBound = Math.min(1, 8 * (radiusUm / c + 1) * c * c / (Math.PI * radiusUm * radiusUm));
  return { q, cellUm: c, errorBound };
}

/**
 * area(disk ∩ V) / area(disk) at every grid centre, approximately.
 *
 * V's exact area per raster cell (`rasterizeArea`) is summed over the disk
 * taken as row spans: in each raster row the chord at the row's mid-height,
 * whole cells inside it and the two end cells by the fraction of their width
 * the chord covers. The error is confined to raster cells crossed by the
 * circle, so |error| ≤ {@linkcode circleRaster}`().errorBound`.
 */
export function circleCoverage(
  regionUm: MultiPolygonPx,
  grid: StrideGrid,
  radiusUm: number,
  cellsPerStride?: number,
): Float64Array {
  const { x0Um, y0Um, strideUm: s, nx, ny } = grid;
  const out = new Float64Array(nx * ny);
  if (regionUm.length === 0) return out;
  const { q, cellUm: c } = circleRaster(s, radiusUm, cellsPerStride);
  const R = Math.ceil(radiusUm / c) + 1;
  // Row pattern relative to a centre on a cell corner: rows t ∈ [−R, R).
  const k = new Int32Array(2 * R), f = new Float64Array(2 * R);
  for (let t = -R; t < R; t++) {
    const dy = (t + 0.5) * c;
    const h2 = radiusUm * radiusUm - dy * dy;
    if (h2 <= 0) continue;
    const u = Math.sqrt(h2) / c;
    const kk = Math.ceil(u);
    k[t + R] = kk;
    f[t + R] = u - (kk - 1);
  }
  const ncx = 2 * R + q * (nx - 1); // raster columns
  const X0 = x0Um - R * c, Y0 = y0Um - R * c;
  const xEdges = new Float64Array(ncx + 1);
  for (let m = 0; m <= ncx; m++) xEdges[m] = X0 + m * c;
  const area = Math.PI * radiusUm * radiusUm;
  const w = ncx + 1;
  let j0 = 0;
  while (j0 < ny) {
    let j1 = j0 + 1;
    while (j1 < ny && (q * (j1 - j0) + 2 * R) * w <= BAND_CELLS) j1++;
    const rowBase = q * j0; // raster row of the band's first row (n_j − R)
    const nRows = q * (j1 - 1 - j0) + 2 * R;
    const yEdges = new Float64Array(nRows + 1);
    for (let r = 0; r <= nRows; r++) yEdges[r] = Y0 + (rowBase + r) * c;
    const cells = rasterizeArea(regionUm, xEdges, yEdges);
    // Per-row prefix sums with a leading zero: P[r][m] = Σ_{m' < m} cell(r, m').
    const P = new Float64Array(nRows * w);
    for (let r = 0; r < nRows; r++) {
      let acc = 0;
      for (let m = 0; m < ncx; m++) {
        acc += cells[r * ncx + m];
        P[r * w + m + 1] = acc;
      }
    }
    for (let j = j0; j < j1; j++) {
      const rc = q * (j - j0) + R; // raster row just below the centre line
      for (let i = 0; i < nx; i++) {
        const mc = R + q * i; // raster column boundary at the centre
        let sum = 0;
        for (let t = -R; t < R; t++) {
          const kk = k[t + R];
          if (kk === 0) continue;
          const row = (rc + t) * w;
          // Whole cells −kk+1 … kk−2 relative to the centre column boundary.
          sum += P[row + mc + kk - 1] - P[row + mc - kk + 1];
          const ff = f[t + R];
          const left = P[row + mc - kk + 1] - P[row + mc - kk];
          const right = P[row + mc + kk] - P[row + mc + kk - 1];
          sum += ff * (left + right);
        }
        const v = sum / area;
        out[j * nx + i] = v < 0 ? 0 : v > 1 ? 1 : v;
      }
    }
    j0 = j1;
  }
  return out;
}
