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
 * Approximations, chosen for speed (999 simulations of 250,000 figures in
 * seconds, not minutes):
 * - V is rasterized into square cells of about 100 µm (whole multiples or
 *   fractions of the scanned stride), with the area of V in each cell (exact
 *   along x, 8 sample rows per cell along y). Cell counts are multinomial with
 *   probabilities proportional to those areas (drawn as Poisson counts and
 *   corrected to the exact total N); within a cell a figure is uniform over
 *   the whole cell, so near V's boundary it may land up to a cell outside V.
 * - Rectangular windows: simulated counts are exact for the simulated points
 *   (each point, placed on a 256 × 256 sub-grid of its cell, adds 1 to the
 *   block of grid positions whose closed window holds it; 2-D prefix sums).
 * - Circular windows: a simulated point counts at its cell's node, and the
 *   count is interpolated between the two node disks whose sizes bracket the
 *   circle's area (so the simulated window has the window's area; the
 *   simulated maximum may be fractional).
 * - On large grids only every k-th grid position (in x and y) is scanned,
 *   for the observed and the simulated maxima alike; `gridStep` reports k.
 *   The observed statistic is then the maximum over those positions.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import type { StrideGrid, WindowShape } from "./engine_types.ts";
import { seededRandom } from "../random.ts";
import { DEFAULT_SIMULATIONS } from "../defaults.ts";

/** Least and greatest number of simulations accepted. */
export const SCAN_SIMULATIONS_MIN = 19;
export const SCAN_SIMULATIONS_MAX = 100_000;
const DEFAULT_WORK_BUDGET = 1_500_000;
const DEFAULT_MAX_RECT_POSITIONS = 250_000;
/** Side of the sampling cells, µm (rounded to whole strides or whole fractions of one). */
const CELL_UM = 100;

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
   * Circles: work budget per simulation (position × stencil-row visits);
   * larger grids are scanned at every k-th position.
   * @default 1_500_000
   */
  workBudget?: number;
  /**
   * Rectangles: most positions scanned; larger grids are scanned at every
   * k-th position.
   * @default 250_000
   */
  maxRectPositions?: number;
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
  /** Maximum window count of every simulation (fractional for circles, see notes). */
  simulatedMax: Float64Array;
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
  const simulations = options.simulations ?? DEFAULT_SIMULATIONS;
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
  // Scanned positions: every step-th grid centre along x and y (a sub-lattice
  // of stride S), chosen so one simulation stays within the work budget and,
  // for rectangles, the difference array stays small enough for the cache.
  const budget = options.workBudget ?? DEFAULT_WORK_BUDGET;
  const maxRectPositions = options.maxRectPositions ?? DEFAULT_MAX_RECT_POSITIONS;
  let step = 1;
  const cost = (k: number) =>
    isRect ? (nx / k) * (ny / k) / maxRectPositions : (nx / k) * (ny / k) *
      (2 * Math.floor(halfH / ((s * k) / Math.max(1, Math.ceil((s * k) / CELL_UM)))) + 1) /
      budget;
  while (cost(step) > 1) step++;
  const S = s * step;
  const mx = Math.ceil(nx / step);
  const my = Math.ceil(ny / step);

  // Observed maximum on the scanned positions.
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

  // Cells over V's bounding box, about 100 µm: for rectangles m scanned
  // strides (m may be a fraction 1/q of a large stride) with edges on nodes;
  // for circles F = S/q centred on the nodes of a lattice of spacing F that
  // holds the scanned nodes (a point then counts at its node).
  const bbox = regionBBox(input.validUm);
  const q = Math.max(1, Math.ceil(S / CELL_UM));
  const m = isRect ? (S <= CELL_UM ? Math.max(1, Math.round(CELL_UM / S)) : 1 / q) : 1 / q;
  const C = m * S;
  let cellX0: number, cellY0: number, kx0: number, ky0: number;
  if (isRect) {
    // kx0, ky0: the cells' origin in scanned-lattice units.
    const cx0 = Math.floor((bbox[0] - grid.x0Um) / C);
    const cy0 = Math.floor((bbox[1] - grid.y0Um) / C);
    cellX0 = grid.x0Um + cx0 * C;
    cellY0 = grid.y0Um + cy0 * C;
    kx0 = cx0 * m;
    ky0 = cy0 * m;
  } else {
    // kx0, ky0: index of the first cell's node on the fine lattice (spacing C).
    kx0 = Math.floor((bbox[0] - grid.x0Um) / C + 0.5);
    ky0 = Math.floor((bbox[1] - grid.y0Um) / C + 0.5);
    cellX0 = grid.x0Um + (kx0 - 0.5) * C;
    cellY0 = grid.y0Um + (ky0 - 0.5) * C;
  }
  const cw = Math.max(1, Math.ceil((bbox[2] - cellX0) / C));
  const ch = Math.max(1, Math.ceil((bbox[3] - cellY0) / C));
  const area = cellAreas(input.validUm, cellX0, cellY0, C, cw, ch, 8);
  const alias = buildAlias(area);

  const simulatedMax = new Float64Array(simulations);
  const random = seededRandom(seed);
  let atLeast = 0;
  if (n === 0 || alias === null) {
    // Nothing to place: every simulated maximum is 0.
    atLeast = observed <= 0 ? simulations : 0;
  } else if (isRect) {
    const simulate = rectSimulator({
      alias,
      weights: area,
      cw,
      ch,
      m,
      kx0,
      ky0,
      mx,
      my,
      halfX: halfW / S,
      halfY: halfH / S,
      evalAdmissible,
      n,
    });
    for (let sim = 0; sim < simulations; sim++) {
      const max = simulate(random);
      simulatedMax[sim] = max;
      if (max >= observed) atLeast++;
    }
  } else {
    // Circle: a point counts at its cell's node; the window holds the nodes
    // within a distance threshold (half-widths per row). No threshold gives
    // exactly the circle's area, so the count is interpolated between the
    // largest inner and smallest outer disk of whole rings:
    // v = v_in + w·(v_out − v_in) with w matching the area.
    const st = diskStencils(halfW / C);
    const reach = st.reach, hIn = st.halfIn, hOut = st.halfOut, wRing = st.weight;
    const cellCounts = new Int32Array(cw * ch);
    const prefix = new Int32Array(ch * (cw + 1));
    const drawCounts = cellCountSampler(area, alias, n);
    for (let sim = 0; sim < simulations; sim++) {
      drawCounts(cellCounts, random);
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
        for (let ii = 0; ii < mx; ii++) {
          if (!evalAdmissible[jj * mx + ii]) continue;
          const ci = ii * q - kx0;
          let vIn = 0, vOut = 0;
          for (let dj = -reach; dj <= reach; dj++) {
            const cy = jj * q + dj - ky0;
            if (cy < 0 || cy >= ch) continue;
            const base = cy * (cw + 1);
            const ho = hOut[dj + reach];
            let lo = ci - ho, hi = ci + ho;
            if (lo < 0) lo = 0;
            if (hi > cw - 1) hi = cw - 1;
            if (lo <= hi) vOut += prefix[base + hi + 1] - prefix[base + lo];
            const h = hIn[dj + reach];
            if (h < 0) continue;
            lo = ci - h;
            hi = ci + h;
            if (lo < 0) lo = 0;
            if (hi > cw - 1) hi = cw - 1;
            if (lo <= hi) vIn += prefix[base + hi + 1] - prefix[base + lo];
          }
          const v = vIn + wRing * (vOut - vIn);
          if (v > max) max = v;
        }
      }
      simulatedMax[sim] = max;
      if (max >= observed) atLeast++;
    }
  }
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
      `(cells of ${round(C, 3)} µm weighted by the area of V in each, uniform within a cell)` +
      (isRect
        ? ""
        : `; circle counts at cell nodes, interpolated between two node disks to the window's area`) +
      (step > 1 ? `; every ${step}th grid position along x and y scanned (${mx} × ${my})` : ""),
    warnings,
  };
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/**
 * Draws multinomial(n, w) cell counts. Cell counts are drawn as independent Poisson(n·w_c) variates (w_c = the
 * cell's share of V's area) and then made to total exactly n: surplus figures
 * are removed uniformly at random, missing ones added by the alias method, so
 * the counts are multinomial(n, w) as for n independent uniform figures.
 */
function cellCountSampler(
  weights: Float64Array,
  alias: AliasTable,
  n: number,
): (counts: Int32Array, random: () => number) => void {
  const nCells = weights.length;
  // Poisson means per cell, split into pieces of at most 500 so e^−λ stays > 0.
  let total = 0;
  for (let c = 0; c < nCells; c++) total += weights[c];
  const cells: number[] = [];
  for (let c = 0; c < nCells; c++) if (weights[c] > 0) cells.push(c);
  const lam = new Float64Array(cells.length);
  const pieces = new Int32Array(cells.length);
  const expNeg = new Float64Array(cells.length);
  for (let q = 0; q < cells.length; q++) {
    const l = (n * weights[cells[q]]) / total;
    pieces[q] = Math.max(1, Math.ceil(l / 500));
    lam[q] = l / pieces[q];
    expNeg[q] = Math.exp(-lam[q]);
  }
  // Most cells lie wholly inside V and share one mean: for it, a table of the
  // Poisson distribution function with a guide table (Chen & Asau's indexed
  // search) replaces the term-by-term inversion.
  let full = 0;
  for (let q = 0; q < cells.length; q++) if (lam[q] > full) full = lam[q];
  const isFull = new Uint8Array(cells.length);
  for (let q = 0; q < cells.length; q++) {
    if (pieces[q] === 1 && Math.abs(lam[q] - full) <= 1e-9 * full) isFull[q] = 1;
  }
  const cdf: number[] = [];
  if (full > 0 && full <= 500) {
    let p = Math.exp(-full), f = p;
    cdf.push(f);
    for (let j = 1; f < 1 - 1e-15 && j < 100000; j++) {
      p *= full / j;
      f += p;
      cdf.push(f);
    }
    cdf[cdf.length - 1] = Infinity; // the last entry catches the remaining tail
  }
  const table = new Float64Array(cdf);
  const guideSize = 256;
  const guide = new Int32Array(guideSize);
  for (let g = 0, k = 0; g < guideSize && table.length > 0; g++) {
    while (table[k] < g / guideSize) k++;
    guide[g] = k;
  }
  const useTable = table.length > 0;
  const { prob, alias: other } = alias;
  return (counts, random) => {
    counts.fill(0);
    let drawn = 0;
    for (let q = 0; q < cells.length; q++) {
      let k = 0;
      if (useTable && isFull[q]) {
        const u = random();
        k = guide[(u * guideSize) | 0];
        while (u > table[k]) k++;
      } else {
        const l = lam[q];
        for (let piece = pieces[q]; piece > 0; piece--) {
          // Inversion: smallest j with F(j) ≥ u.
          const u = random();
          let p = expNeg[q];
          let f = p;
          let j = 0;
          while (u > f && j < 100000) {
            j++;
            p *= l / j;
            f += p;
          }
          k += j;
        }
      }
      counts[cells[q]] = k;
      drawn += k;
    }
    if (drawn > n) removeUniformly(counts, drawn, drawn - n, random);
    for (; drawn < n; drawn++) {
      const u = random() * nCells;
      const i = u | 0;
      counts[u - i < prob[i] ? i : other[i]]++;
    }
  };
}

/**
 * One simulation of the rectangle statistic: cell counts, then cell by cell
 * (row-major, so the difference array is written nearly in order) each
 * figure gets a uniform spot in its cell (on a 256 × 256 sub-grid) and adds 1
 * to the block of scanned positions whose closed window holds it. Positions
 * are in scanned-lattice units (node i at x0 + i·S).
 */
function rectSimulator(o: {
  alias: AliasTable;
  weights: Float64Array;
  cw: number;
  ch: number;
  m: number;
  kx0: number;
  ky0: number;
  mx: number;
  my: number;
  halfX: number;
  halfY: number;
  evalAdmissible: Uint8Array;
  n: number;
}): (random: () => number) => number {
  const { alias, weights, cw, ch, m, kx0, ky0, mx, my, halfX, halfY, evalAdmissible, n } = o;
  const w1 = mx + 1;
  const diff = new Int32Array(w1 * (my + 1));
  const nCells = cw * ch;
  const cellCounts = new Int32Array(nCells);
  const scale = m / 256;
  const drawCounts = cellCountSampler(weights, alias, n);
  // Node offsets of the window range for each of the 256 sub-grid spots.
  const whole = Number.isInteger(m) && Number.isInteger(kx0) && Number.isInteger(ky0);
  const loX = new Int32Array(256), hiX = new Int32Array(256);
  const loY = new Int32Array(256), hiY = new Int32Array(256);
  for (let b = 0; b < 256; b++) {
    const u = (b + 0.5) * scale;
    loX[b] = Math.ceil(u - halfX);
    hiX[b] = Math.floor(u + halfX);
    loY[b] = Math.ceil(u - halfY);
    hiY[b] = Math.floor(u + halfY);
  }
  return (random) => {
    diff.fill(0);
    drawCounts(cellCounts, random);
    let bits = 0, left = 0;
    for (let cy = 0; cy < ch; cy++) {
      const yBase = ky0 + cy * m;
      for (let cx = 0; cx < cw; cx++) {
        let k = cellCounts[cy * cw + cx];
        if (k === 0) continue;
        const xBase = kx0 + cx * m;
        for (; k > 0; k--) {
          // A spot on a 256 × 256 sub-grid of the cell (8 bits per axis;
          // one 32-bit draw serves two figures).
          if (left === 0) {
            bits = (random() * 4294967296) >>> 0;
            left = 2;
          }
          const bx = bits & 0xff, by = (bits >>> 8) & 0xff;
          bits >>>= 16;
          left--;
          // Closed window: |x − node| ≤ W/2 → node range [lo, hi]; with whole
          // cell origins the offsets come from tables, else computed.
          let ilo: number, ihi: number, jlo: number, jhi: number;
          if (whole) {
            ilo = xBase + loX[bx];
            ihi = xBase + hiX[bx];
            jlo = yBase + loY[by];
            jhi = yBase + hiY[by];
          } else {
            const x = xBase + (bx + 0.5) * scale;
            const y = yBase + (by + 0.5) * scale;
            ilo = Math.ceil(x - halfX);
            ihi = Math.floor(x + halfX);
            jlo = Math.ceil(y - halfY);
            jhi = Math.floor(y + halfY);
          }
          if (ilo < 0) ilo = 0;
          if (jlo < 0) jlo = 0;
          if (ihi > mx - 1) ihi = mx - 1;
          if (jhi > my - 1) jhi = my - 1;
          if (ilo > ihi || jlo > jhi) continue;
          diff[jlo * w1 + ilo]++;
          diff[jlo * w1 + ihi + 1]--;
          diff[(jhi + 1) * w1 + ilo]--;
          diff[(jhi + 1) * w1 + ihi + 1]++;
        }
      }
    }
    // In-place 2-D prefix sums give the count at every scanned position.
    let max = 0;
    for (let jj = 0; jj < my; jj++) {
      let run = 0;
      for (let ii = 0; ii < mx; ii++) {
        const k = jj * w1 + ii;
        run += diff[k];
        const v = run + (jj > 0 ? diff[k - w1] : 0);
        diff[k] = v;
        if (v > max && evalAdmissible[jj * mx + ii]) max = v;
      }
    }
    return max;
  };
}

/**
 * Removes `remove` of the `total` figures in `counts`, each subset of that
 * size equally likely: distinct ranks in [0, total), then one sweep.
 */
function removeUniformly(
  counts: Int32Array,
  total: number,
  remove: number,
  random: () => number,
): void {
  const chosen = new Set<number>();
  while (chosen.size < remove) chosen.add(Math.floor(random() * total));
  const ranks = [...chosen].sort((a, b) => a - b);
  let r = 0, before = 0;
  for (let c = 0; c < counts.length && r < ranks.length; c++) {
    const k = counts[c];
    let drop = 0;
    while (r < ranks.length && ranks[r] < before + k) {
      drop++;
      r++;
    }
    counts[c] = k - drop;
    before += k;
  }
}

/**
 * Two disks of grid nodes around a circle of radius `radiusNodes` (in node
 * spacings): the largest whole-ring disk with at most π·r² nodes and the
 * smallest with at least that many, as half-widths per row offset (−1: row
 * empty), and the weight w with n_in + w·(n_out − n_in) = π·r².
 */
function diskStencils(radiusNodes: number): {
  reach: number;
  halfIn: Int32Array;
  halfOut: Int32Array;
  weight: number;
} {
  const target = Math.PI * radiusNodes * radiusNodes;
  const lim = Math.floor(radiusNodes) + 2;
  const d2s: number[] = [];
  for (let a = -lim; a <= lim; a++) for (let b = -lim; b <= lim; b++) d2s.push(a * a + b * b);
  d2s.sort((x, y) => x - y);
  // Whole rings: the count of nodes with d² ≤ t for each distinct t.
  let inD2 = -1, inN = 0, outD2 = 0, outN = 0;
  for (let k = 0; k < d2s.length; k++) {
    if (k + 1 < d2s.length && d2s[k + 1] === d2s[k]) continue;
    if (k + 1 <= target) {
      inD2 = d2s[k];
      inN = k + 1;
    } else {
      outD2 = d2s[k];
      outN = k + 1;
      break;
    }
  }
  const reach = Math.floor(Math.sqrt(outD2));
  const rowHalf = (d2: number) => {
    const half = new Int32Array(2 * reach + 1);
    for (let dj = -reach; dj <= reach; dj++) {
      half[dj + reach] = d2 - dj * dj < 0 ? -1 : Math.floor(Math.sqrt(d2 - dj * dj) + 1e-9);
    }
    return half;
  };
  return {
    reach,
    halfIn: rowHalf(inD2),
    halfOut: rowHalf(outD2),
    weight: outN === inN ? 0 : (target - inN) / (outN - inN),
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
