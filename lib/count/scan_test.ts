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
import { buildAlias, cellAreas } from "./_scan_sampling.ts";
import { regionBBox } from "./_geometry.ts";
import { rectSimulator } from "./_scan_rect.ts";
import { circleSimulator } from "./_scan_circle.ts";
import { roundTo } from "../numbers.ts";

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
  /** Number of simulations run. */
  simulations: number;
  /** Seed of the simulations. */
  seed: number;
  /** Number of simulations whose maximum was ≥ observed. */
  atLeastObserved: number;
  /** Maximum window count of every simulation (fractional for circles, see notes). */
  simulatedMax: Float64Array;
  /** Every k-th grid position was scanned (1 = all). */
  gridStep: number;
  /** Plain words: statistic and approximations. */
  method: string;
  /** Problems with the test's input, in words. */
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
 * import { scanTest } from "hotfield";
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
  // An empty V places nothing (no alias table below), so any box will do.
  const bbox = regionBBox(input.validUm) ?? [0, 0, 0, 0];
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
  } else {
    const simulate = isRect
      ? rectSimulator({
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
      })
      : circleSimulator({
        alias,
        weights: area,
        cw,
        ch,
        q,
        kx0,
        ky0,
        mx,
        my,
        radiusNodes: halfW / C,
        evalAdmissible,
        n,
      });
    for (let sim = 0; sim < simulations; sim++) {
      const max = simulate(random);
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
      `(cells of ${roundTo(C, 3)} µm weighted by the area of V in each, uniform within a cell)` +
      (isRect
        ? ""
        : `; circle counts at cell nodes, interpolated between two node disks to the window's area`) +
      (step > 1 ? `; every ${step}th grid position along x and y scanned (${mx} × ${my})` : ""),
    warnings,
  };
}
