/**
 * Coverage of a circular window at every grid centre, on a fine raster.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import type { StrideGrid } from "./engine_types.ts";
import { diskOverlapArea, rasterizeArea } from "./_geometry.ts";

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
 * cell no wider than r/64, at most 4 (memory and time grow with q²), so grid
 * centres fall on cell corners and every centre sees the same row spans.
 * The error bound only sets which centres are in doubt; their admissibility
 * is then decided exactly (see {@linkcode circleCoverage}'s `decide`).
 */
export function circleRaster(
  strideUm: number,
  radiusUm: number,
  cellsPerStride?: number,
): CircleRaster {
  const q = cellsPerStride !== undefined
    ? Math.max(1, Math.min(4, Math.round(cellsPerStride)))
    : Math.max(1, Math.min(4, Math.ceil(strideUm / (radiusUm / 64))));
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
 *
 * With `decide`, every centre whose value is within `marginOf` of
 * `minCoverage` also gets exact bounds from the same cells: whole cells
 * inside the disk count exactly, and a cell the rim crosses, with V-area a
 * and disk area d (exact, per cell of the shared row pattern), holds between
 * max(0, a + d − c²) and min(a, d) of both. When the bounds clear the minimum,
 * the centre is marked in `decided` and its value clamped into them.
 */
export function circleCoverage(
  regionUm: MultiPolygonPx,
  grid: StrideGrid,
  radiusUm: number,
  cellsPerStride?: number,
  decide?: DecideOptions,
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
  let pattern: RimPattern | undefined;
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
        let v = sum / area;
        v = v < 0 ? 0 : v > 1 ? 1 : v;
        if (decide && Math.abs(v - decide.minCoverage) <= decide.marginOf) {
          // In doubt: bound the true area from the cells themselves.
          pattern ??= rimPattern(radiusUm, c, R);
          const [lo, hi] = boundDiskArea(pattern, cells, P, ncx, w, rc, mc, c * c);
          const vl = lo / area, vh = hi / area;
          if (vl >= decide.minCoverage + DECIDE_EPS || vh < decide.minCoverage - DECIDE_EPS) {
            decide.decided[j * nx + i] = 1;
            v = v < vl ? vl : v > vh ? vh : v;
            v = v < 0 ? 0 : v > 1 ? 1 : v;
          }
        }
        out[j * nx + i] = v;
      }
    }
    j0 = j1;
  }
  return out;
}

/** What {@linkcode circleCoverage} may decide from cell bounds. */
export interface DecideOptions {
  minCoverage: number;
  /** Centres whose raster value is within this of the minimum are in doubt. */
  marginOf: number;
  /** Set to 1 for each centre whose admissibility the bounds decided. */
  decided: Uint8Array;
}

/** Bounds must clear the minimum by this much to decide (rounding in both areas). */
const DECIDE_EPS = 1e-9;

/**
 * The disk's exact area in each raster cell around a centre on a cell
 * corner: per row t (−R … R−1), the columns of whole cells inside, and the
 * cells the rim crosses with their disk area.
 */
interface RimPattern {
  /** Per row: first and last column (relative to the centre) of whole cells, or lo > hi. */
  inLo: Int32Array;
  inHi: Int32Array;
  /** Rim cells: row, column, disk area in the cell. */
  rimT: Int32Array;
  rimM: Int32Array;
  rimA: Float64Array;
}

function rimPattern(r: number, c: number, R: number): RimPattern {
  const inLo = new Int32Array(2 * R).fill(1), inHi = new Int32Array(2 * R);
  const rt: number[] = [], rm: number[] = [], ra: number[] = [];
  const r2 = r * r;
  for (let t = -R; t < R; t++) {
    const y0 = t * c, y1 = (t + 1) * c;
    const yNear = y0 > 0 ? y0 : y1 < 0 ? y1 : 0, yFar = Math.max(Math.abs(y0), Math.abs(y1));
    let lo = 1, hi = 0;
    for (let m = -R; m < R; m++) {
      const x0 = m * c, x1 = (m + 1) * c;
      const xNear = x0 > 0 ? x0 : x1 < 0 ? x1 : 0, xFar = Math.max(Math.abs(x0), Math.abs(x1));
      if (xNear * xNear + yNear * yNear >= r2) continue; // outside
      if (xFar * xFar + yFar * yFar <= r2) {
        if (lo > hi) lo = hi = m;
        else hi = m;
        continue;
      }
      const sq: [number, number][] = [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
      rt.push(t);
      rm.push(m);
      ra.push(diskOverlapArea([[sq]], [0, 0], r));
    }
    inLo[t + R] = lo;
    inHi[t + R] = hi;
  }
  return {
    inLo,
    inHi,
    rimT: Int32Array.from(rt),
    rimM: Int32Array.from(rm),
    rimA: Float64Array.from(ra),
  };
}

/**
 * Lower and upper bounds of area(V ∩ disk) for the centre at raster row rc,
 * column boundary mc: whole cells count exactly; a rim cell with V-area a and
 * disk area d holds between max(0, a + d − c²) and min(a, d) of both.
 */
function boundDiskArea(
  p: RimPattern,
  cells: Float64Array,
  P: Float64Array,
  ncx: number,
  w: number,
  rc: number,
  mc: number,
  cell2: number,
): [number, number] {
  const R = p.inLo.length / 2;
  let whole = 0;
  for (let t = -R; t < R; t++) {
    const lo = p.inLo[t + R], hi = p.inHi[t + R];
    if (lo > hi) continue;
    const row = (rc + t) * w;
    whole += P[row + mc + hi + 1] - P[row + mc + lo];
  }
  let lo = whole, hi = whole;
  for (let q = 0; q < p.rimA.length; q++) {
    const a = cells[(rc + p.rimT[q]) * ncx + mc + p.rimM[q]], d = p.rimA[q];
    const both = a + d - cell2;
    lo += both > 0 ? both : 0;
    hi += a < d ? a : d;
  }
  return [lo, hi];
}
