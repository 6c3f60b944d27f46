/**
 * Monte Carlo scan test of the hotspot: is the highest window count more than
 * a uniform rate over the valid region would give?
 *
 * The published method is the spatial scan statistic (Kulldorff M. A spatial
 * scan statistic. Commun Stat Theory Methods 1997;26(6):1481-1496). hotfield
 * uses one fixed window size: the statistic is the maximum count over the
 * admissible positions of the count map's fixed-size window grid. Under the
 * null, the same total N of figures is placed uniformly over the valid region
 * V, the maximum is recomputed, and p = (1 + #sims ≥ observed) / (1 + sims).
 *
 * Approximations, chosen for speed (999 simulations of 250,000 figures in a
 * few seconds):
 * - V is rasterized into square cells of the grid stride, centred on grid
 *   nodes, with the area of V in each cell (exact along x, 8 sample rows per
 *   cell along y). A simulated figure picks a cell with probability
 *   proportional to that area (Walker's alias method) and then a uniform spot
 *   in the whole cell, so near V's boundary a figure may land just outside V.
 * - Rectangular windows: simulated counts are exact for the simulated points
 *   (each point adds 1 to the block of grid positions whose closed window
 *   holds it; 2-D prefix sums).
 * - Circular windows: a simulated point counts at its cell's grid node, and a
 *   window holds the nodes within its radius (error up to half a stride).
 * - On very large grids only every k-th grid position (in x and y) is
 *   scanned, for the observed and the simulated maxima alike; `gridStep`
 *   reports k.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import type { StrideGrid, WindowShape } from "../count/engine_types.ts";
import { seededRandom } from "../demo/random.ts";

/** Least and greatest number of simulations accepted. */
export const SCAN_SIMULATIONS_MIN = 19;
export const SCAN_SIMULATIONS_MAX = 100_000;

/** What {@linkcode scanTest} reads. */
export interface ScanTestInput {
  /** Valid region V in micrometres. */
  validUm: MultiPolygonPx;
  /** Number of counted figures N in V. */
  totalCount: number;
  /** The observed count map: grid, counts and admissible flags (row-major j·nx + i). */
  map: { grid: StrideGrid; counts: ArrayLike<number>; admissible: ArrayLike<number> };
  /** The counting window. */
  window: WindowShape;
}

/** Options of {@linkcode scanTest}. */
export interface ScanTestOptions {
  /** Number of simulations, 19–100,000. @default 999 */
  simulations?: number;
  /** Seed of the generator. @default 1 */
  seed?: number;
  /**
   * Work budget per simulation (position × stencil-row visits); larger grids
   * are scanned at every k-th position.
   * @default 4_000_000
   */
  workBudget?: number;
}

/** Result of {@linkcode scanTest}. */
export interface ScanTestResult {
  /** Monte Carlo p-value (1 + #sims ≥ observed) / (1 + sims). */
  p: number;
  /** Observed maximum admissible window count (on the scanned positions). */
  observed: number;
  simulations: number;
  seed: number;
  /** Number of simulations whose maximum was ≥ observed. */
  atLeastObserved: number;
  /** Maximum window count of every simulation. */
  simulatedMax: Int32Array;
  /** Every k-th grid position was scanned (1 = all). */
  gridStep: number;
  /** Plain words: statistic and approximations. */
  method: string;
  warnings: string[];
}

/**
 * Runs the Monte Carlo scan test (see the module notes for the method and its
 * approximations).
 *
 * @param input Valid region, total count, count map and window.
 * @param options Simulations, seed and work budget.
 * @returns p-value, observed maximum and simulated maxima.
 * @throws {RangeError} When simulations is not a whole number in 19–100,000 or
 * the map's arrays do not match its grid.
 *
 * @example A strong focus in one corner
 * ```ts
 * import { scanTest } from "./scan_test.ts";
 * const grid = { x0Um: 50, y0Um: 50, strideUm: 100, nx: 10, ny: 10 };
 * const counts = new Int32Array(100); counts[0] = 40;
 * const r = scanTest({
 *   validUm: [[[[0, 0], [1000, 0], [1000, 1000], [0, 1000], [0, 0]]]],
 *   totalCount: 50,
 *   map: { grid, counts, admissible: new Uint8Array(100).fill(1) },
 *   window: { shape: "rect", areaMm2: 0.01, widthUm: 100, heightUm: 100, aspect: [1, 1] },
 * }, { simulations: 99, seed: 7 });
 * if (r.p !== 0.01) throw new Error(String(r.p));
 * ```
 */
export function scanTest(input: ScanTestInput, options: ScanTestOptions = {}): ScanTestResult {
  const simulations = options.simulations ?? 999;
  const seed = options.seed ?? 1;
  if (
    !Number.isInteger(simulations) || simulations < SCAN_SIMULATIONS_MIN ||
    simulations > SCAN_SIMULATIONS_MAX
  ) {
    throw new RangeError(
      `Simulations must be a whole number from ${SCAN_SIMULATIONS_MIN} to 100,000: got ${simulations}`,
    );
  }
  const { grid, counts, admissible } = input.map;
  const { nx, ny, strideUm: s } = grid;
  if (counts.length !== nx * ny || admissible.length !== nx * ny) {
    throw new RangeError(
      `Count map arrays must have nx·ny = ${nx * ny} entries: got ${counts.length} and ` +
        `${admissible.length}`,
    );
  }
  const n = input.totalCount;
  if (!Number.isInteger(n) || n < 0) {
    throw new RangeError(`Total count must be a whole number ≥ 0: got ${n}`);
  }
  const warnings: string[] = [];
  const window = input.window;
  const isRect = window.shape === "rect";
  const halfW = isRect ? window.widthUm / 2 : window.diameterUm / 2;
  const halfH = isRect ? window.heightUm / 2 : window.diameterUm / 2;
  const rowsPerPosition = isRect ? 2 : 2 * Math.floor(halfH / s) + 1;
  const budget = options.workBudget ?? 4_000_000;
  let step = 1;
  while ((nx / step) * (ny / step) * rowsPerPosition > budget) step++;
  const mx = Math.ceil(nx / step);
  const my = Math.ceil(ny / step);
  if (step > 1) {
    warnings.push(
      `Scan test: the grid of ${nx} × ${ny} positions was scanned at every ${step}th position ` +
        `(${mx} × ${my}) to keep it fast`,
    );
  }

  // Evaluated positions (sub-lattice) and the observed maximum on them.
  const evalAdmissible = new Uint8Array(mx * my);
  let observed = 0;
  for (let jj = 0; jj < my; jj++) {
    for (let ii = 0; ii < mx; ii++) {
      const k = jj * step * nx + ii * step;
      if (admissible[k]) {
        evalAdmissible[jj * mx + ii] = 1;
        if (counts[k] > observed) observed = counts[k];
      }
    }
  }

  // Cells centred on grid nodes, covering V's bounding box.
  const bbox = regionBBox(input.validUm);
  const kx0 = Math.floor((bbox[0] - grid.x0Um) / s + 0.5);
  const kx1 = Math.floor((bbox[2] - grid.x0Um) / s + 0.5);
  const ky0 = Math.floor((bbox[1] - grid.y0Um) / s + 0.5);
  const ky1 = Math.floor((bbox[3] - grid.y0Um) / s + 0.5);
  const cw = Math.max(1, kx1 - kx0 + 1);
  const ch = Math.max(1, ky1 - ky0 + 1);
  const cellX0 = grid.x0Um + (kx0 - 0.5) * s;
  const cellY0 = grid.y0Um + (ky0 - 0.5) * s;
  const area = cellAreas(input.validUm, cellX0, cellY0, s, cw, ch, 8);
  const alias = buildAlias(area);

  const simulatedMax = new Int32Array(simulations);
  const random = seededRandom(seed);
  let atLeast = 0;
  if (n === 0 || alias === null) {
    // Nothing to place: every simulated maximum is 0.
    atLeast = observed <= 0 ? simulations : 0;
  } else if (isRect) {
    const diff = new Int32Array((mx + 1) * (my + 1));
    const w1 = mx + 1;
    for (let sim = 0; sim < simulations; sim++) {
      diff.fill(0);
      for (let q = 0; q < n; q++) {
        const cell = drawCell(alias, random);
        const cy = (cell / cw) | 0;
        const cx = cell - cy * cw;
        const x = cellX0 + (cx + random()) * s - grid.x0Um;
        const y = cellY0 + (cy + random()) * s - grid.y0Um;
        // Closed window: |x − centre| ≤ W/2 → centre index range [lo, hi].
        let ilo = Math.ceil((x - halfW) / s);
        let ihi = Math.floor((x + halfW) / s);
        let jlo = Math.ceil((y - halfH) / s);
        let jhi = Math.floor((y + halfH) / s);
        if (ilo < 0) ilo = 0;
        if (jlo < 0) jlo = 0;
        if (ihi > nx - 1) ihi = nx - 1;
        if (jhi > ny - 1) jhi = ny - 1;
        if (ilo > ihi || jlo > jhi) continue;
        const a = Math.ceil(ilo / step), b = Math.floor(ihi / step);
        const c = Math.ceil(jlo / step), d = Math.floor(jhi / step);
        if (a > b || c > d) continue;
        diff[c * w1 + a]++;
        diff[c * w1 + b + 1]--;
        diff[(d + 1) * w1 + a]--;
        diff[(d + 1) * w1 + b + 1]++;
      }
      // 2-D prefix sums give the count at every evaluated position.
      let max = 0;
      for (let jj = 0; jj < my; jj++) {
        let run = 0;
        for (let ii = 0; ii < mx; ii++) {
          const k = jj * w1 + ii;
          run += diff[k];
          const v = run + (jj > 0 ? diff[k - w1] : 0);
          diff[k] = v;
          if (evalAdmissible[jj * mx + ii] && v > max) max = v;
        }
      }
      simulatedMax[sim] = max;
      if (max >= observed) atLeast++;
    }
  } else {
    // Circle: stencil of grid nodes within the radius, row prefix sums over cells.
    const r = halfW;
    const reach = Math.floor(r / s);
    const half = new Int32Array(2 * reach + 1);
    for (let dj = -reach; dj <= reach; dj++) {
      half[dj + reach] = Math.floor(Math.sqrt(Math.max(0, r * r - dj * s * dj * s)) / s + 1e-9);
    }
    const cellCounts = new Int32Array(cw * ch);
    const prefix = new Int32Array(ch * (cw + 1));
    for (let sim = 0; sim < simulations; sim++) {
      cellCounts.fill(0);
      for (let q = 0; q < n; q++) cellCounts[drawCell(alias, random)]++;
      for (let cy = 0; cy < ch; cy++) {
        let run = 0;
        const base = cy * (cw + 1);
        prefix[base] = 0;
        for (let cx = 0; cx < cw; cx++) {
          run += cellCounts[cy * cw + cx];
          prefix[base + cx + 1] = run;
        }
      }
      let max = 0;
      for (let jj = 0; jj < my; jj++) {
        const j = jj * step;
        for (let ii = 0; ii < mx; ii++) {
          if (!evalAdmissible[jj * mx + ii]) continue;
          const i = ii * step;
          const ci = i - kx0;
          let v = 0;
          for (let dj = -reach; dj <= reach; dj++) {
            const cy = j + dj - ky0;
            if (cy < 0 || cy >= ch) continue;
            const h = half[dj + reach];
            let lo = ci - h, hi = ci + h;
            if (lo < 0) lo = 0;
            if (hi > cw - 1) hi = cw - 1;
            if (lo > hi) continue;
            const base = cy * (cw + 1);
            v += prefix[base + hi + 1] - prefix[base + lo];
          }
          if (v > max) max = v;
        }
      }
      simulatedMax[sim] = max;
      if (max >= observed) atLeast++;
    }
  }
  for (let sim = 0; n === 0 && sim < simulations; sim++) simulatedMax[sim] = 0;
  return {
    p: (1 + atLeast) / (1 + simulations),
    observed,
    simulations,
    seed,
    atLeastObserved: atLeast,
    simulatedMax,
    gridStep: step,
    method:
      "Monte Carlo scan test: statistic = maximum admissible window count on the fixed-size " +
      `window grid; ${simulations} simulations of ${n} figures placed uniformly over V ` +
      `(cells of ${s} µm weighted by the area of V in each, uniform within a cell)` +
      (isRect ? "" : "; circle counts at cell nodes (error up to half a stride)") +
      (step > 1 ? `; every ${step}th grid position scanned` : ""),
    warnings,
  };
}

/** Bounding box [minX, minY, maxX, maxY] of a region. */
function regionBBox(region: MultiPolygonPx): [number, number, number, number] {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const poly of region) {
    for (const ring of poly) {
      for (const [x, y] of ring) {
        if (x < minX) minX = x;
        if (x > maxX) maxX = x;
        if (y < minY) minY = y;
        if (y > maxY) maxY = y;
      }
    }
  }
  if (!Number.isFinite(minX)) return [0, 0, 0, 0];
  return [minX, minY, maxX, maxY];
}

/**
 * Area of a region in each cell of a cw × ch raster of square cells of side
 * `s` from (x0, y0): even–odd scanlines at `sub` rows per cell (exact along x,
 * midpoint rule along y).
 */
function cellAreas(
  region: MultiPolygonPx,
  x0: number,
  y0: number,
  s: number,
  cw: number,
  ch: number,
  sub: number,
): Float64Array {
  const area = new Float64Array(cw * ch);
  const rows = ch * sub;
  const dy = s / sub;
  const crossings: number[][] = Array.from({ length: rows }, () => []);
  for (const poly of region) {
    for (const ring of poly) {
      for (let e = 0; e + 1 < ring.length; e++) {
        const [ax, ay] = ring[e];
        const [bx, by] = ring[e + 1];
        if (ay === by) continue;
        const yLo = Math.min(ay, by), yHi = Math.max(ay, by);
        // Rows whose sample line y_r = y0 + (r + ½)·dy lies in [yLo, yHi).
        const r0 = Math.max(0, Math.ceil((yLo - y0) / dy - 0.5));
        const r1 = Math.min(rows - 1, Math.ceil((yHi - y0) / dy - 0.5) - 1);
        for (let r = r0; r <= r1; r++) {
          const y = y0 + (r + 0.5) * dy;
          if (y < yLo || y >= yHi) continue;
          crossings[r].push(ax + ((y - ay) / (by - ay)) * (bx - ax));
        }
      }
    }
  }
  for (let r = 0; r < rows; r++) {
    const xs = crossings[r];
    if (xs.length < 2) continue;
    xs.sort((a, b) => a - b);
    const cy = Math.floor(r / sub);
    for (let k = 0; k + 1 < xs.length; k += 2) {
      const a = (xs[k] - x0) / s, b = (xs[k + 1] - x0) / s;
      let ca = Math.max(0, Math.floor(a));
      const cb = Math.min(cw - 1, Math.floor(b));
      for (; ca <= cb; ca++) {
        const len = Math.min(b, ca + 1) - Math.max(a, ca);
        if (len > 0) area[cy * cw + ca] += len * s * dy;
      }
    }
  }
  return area;
}

interface AliasTable {
  prob: Float64Array;
  alias: Int32Array;
  n: number;
}

/** Walker's alias table (Vose's construction) over non-negative weights; null when all are 0. */
function buildAlias(weights: Float64Array): AliasTable | null {
  const n = weights.length;
  let total = 0;
  for (let i = 0; i < n; i++) total += weights[i];
  if (!(total > 0)) return null;
  const prob = new Float64Array(n);
  const alias = new Int32Array(n);
  const scaled = new Float64Array(n);
  const small: number[] = [], large: number[] = [];
  for (let i = 0; i < n; i++) {
    scaled[i] = (weights[i] * n) / total;
    (scaled[i] < 1 ? small : large).push(i);
  }
  while (small.length && large.length) {
    const l = small.pop()!, g = large.pop()!;
    prob[l] = scaled[l];
    alias[l] = g;
    scaled[g] = scaled[g] + scaled[l] - 1;
    (scaled[g] < 1 ? small : large).push(g);
  }
  for (const g of large) prob[g] = 1;
  for (const l of small) prob[l] = 1; // rounding leftovers
  let firstPositive = 0;
  while (weights[firstPositive] === 0) firstPositive++;
  for (let i = 0; i < n; i++) {
    if (weights[i] === 0 && prob[i] === 1) {
      prob[i] = 0;
      alias[i] = firstPositive;
    }
  }
  return { prob, alias, n };
}

function drawCell(t: AliasTable, random: () => number): number {
  const u = random() * t.n;
  const i = u | 0;
  return u - i < t.prob[i] ? i : t.alias[i];
}
