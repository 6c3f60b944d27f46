/**
 * The count map: exact window counts and coverage at every stride-grid centre.
 *
 * @module
 */

import type { CountMap, PreparedCase, WindowShape } from "./engine_types.ts";
import { makeStrideGrid, strideGridSize } from "./stride_grid.ts";
import { stampWindowCounts } from "./stamp_window_counts.ts";
import { windowExtents } from "./window_contains.ts";
import { rectCoverage } from "./_coverage_rect.ts";
import { circleCoverage, circleRaster } from "./_coverage_circle.ts";
import { circleCoverageBound } from "./_coverage_bound.ts";
import { createOverlapIndex, regionBBox } from "./_geometry.ts";
import { DEFAULT_MAX_GRID_CELLS, DEFAULT_MIN_COVERAGE, DEFAULT_STRIDE_UM } from "../defaults.ts";
import { roundTo } from "../numbers.ts";
import { GridSizeError } from "../errors.ts";

/** At most this many circle centres get an exact coverage (each is one disk query). */
const MAX_EXACT_CIRCLE_REFINEMENTS = 200_000;

/** Options of {@linkcode computeCountMap}. */
export interface ComputeCountMapOptions {
  /** Distance between grid centres, µm. @default 25 */
  strideUm?: number;
  /** Minimum fraction of the window inside the valid region for a centre to count. @default 0.95 */
  minCoverage?: number;
  /** Largest grid allowed (cells). @default 25_000_000 */
  maxGridCells?: number;
  /**
   * Circles only: raster cells per stride for coverage (1–4); coarser is
   * faster with a larger stated error. @default the smallest giving cells ≤ r/64, at most 4
   */
  circleCellsPerStride?: number;
  /**
   * Circles only: recompute exactly the centres whose raster coverage is
   * within the error bound of the minimum. @default true
   */
  exactAdmissibility?: boolean;
  /**
   * False skips counting and leaves every count at 0, for searches that need
   * only the grid and the coverage (they bound counts themselves). @default true
   */
  counts?: boolean;
  /**
   * Circles only: give each centre's coverage as an upper bound (a staircase
   * of whole raster cells about the disk, O(cells)), not a raster estimate,
   * for searches that only use coverage to rule centres out, and a lower
   * bound in `coverageLow`; `admissible` is then left empty. @default false
   */
  coverageUpperBound?: boolean;
}

/** Default stride, µm. */
/** Default minimum coverage. */
/** Default grid size limit. */
/** Approximate bytes the engine holds per grid cell (counts, coverage, bounds, work arrays). */
export const BYTES_PER_GRID_CELL = 40;

/**
 * Grid, margin and size the count map of `prepared` would use, without computing it.
 *
 * @example An empty region gives a single-cell grid
 * ```ts
 * import { planCountGrid } from "./compute_count_map.ts";
 * import { makeWindow } from "hotfield";
 * const plan = planCountGrid([], makeWindow({}), 25, 0.95);
 * if (plan.cells !== 1) throw new Error(`an empty region plans ${plan.cells} cells, not 1`);
 * ```
 */
export function planCountGrid(
  validUm: PreparedCase["validUm"],
  window: WindowShape,
  strideUm: number,
  minCoverage: number,
): { bboxUm: [number, number, number, number]; marginUm: [number, number]; cells: number } {
  const e = windowExtents(window);
  const bounds = regionBBox(validUm);
  if (bounds === null) return { bboxUm: [0, 0, 0, 0], marginUm: [0, 0], cells: 1 };
  const bboxUm = bounds;
  // A centre outside bbox(V) sees at most half its window inside V, so for
  // minCoverage > 0.5 the box (plus one stride, so the stride cells around the
  // centres tile all of it) holds every admissible centre.
  const marginUm: [number, number] = minCoverage > 0.5
    ? [strideUm, strideUm]
    : [e.halfX + strideUm, e.halfY + strideUm];
  return { bboxUm, marginUm, cells: strideGridSize(bboxUm, strideUm, marginUm) };
}

/**
 * Computes the count map of a prepared case for one window.
 *
 * Grid: centres at origin + i·stride covering bbox(V) grown by one stride
 * (µm plane), the origin being the grown box minimum rounded down to a multiple of the stride so maps of
 * shifted cases agree (see {@linkcode makeStrideGrid}); when `minCoverage` ≤
 * 0.5 the box is grown by half the window on each side. Counts are exact at
 * every centre (closed windows, {@linkcode stampWindowCounts}). Coverage is
 * area(window ∩ V) / area(window): exact for rectangles (see `rectCoverage`),
 * on a raster of stride/q cells for circles with the bound stated in
 * `discretization`. A centre is admissible when coverage ≥ `minCoverage`.
 *
 * @param prepared The prepared case (figures and V in µm).
 * @param window The counting window.
 * @param options Stride, minimum coverage, grid limit.
 * @returns The map.
 * @throws {RangeError} When the stride or minimum coverage is out of range.
 * @throws {GridSizeError} (a RangeError) When the grid would exceed
 *   `maxGridCells`; the message gives the number of cells and the memory it
 *   would need.
 *
 * @example A 2 × 2 mm square of tissue with one figure in the middle
 * ```ts
 * import { computeCountMap, makeWindow, parseAnnotations, prepareCase } from "hotfield";
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [2000, 0], [2000, 2000], [0, 2000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[1000, 1000]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const prepared = prepareCase({ caseId: "QVT-24-001", ...parsed, sources: [] });
 * const map = computeCountMap(prepared, makeWindow({ areaMm2: 1, aspect: [1, 1] }), { strideUm: 100 });
 * const k = 11 * map.grid.nx + 11; // centre (1000, 1000); the grid starts at −100
 * if (map.counts[k] !== 1 || Math.abs(map.coverage[k] - 1) > 1e-6 || map.positions !== 121 || map.grid.nx !== 23) {
 *   throw new Error(`count ${map.counts[k]}, coverage ${map.coverage[k]}, ${map.positions} positions`);
 * }
 * ```
 */
export function computeCountMap(
  prepared: Pick<PreparedCase, "validUm" | "xUm" | "yUm">,
  window: WindowShape,
  options: ComputeCountMapOptions = {},
): CountMap {
  const strideUm = options.strideUm ?? DEFAULT_STRIDE_UM;
  const minCoverage = options.minCoverage ?? DEFAULT_MIN_COVERAGE;
  const maxGridCells = options.maxGridCells ?? DEFAULT_MAX_GRID_CELLS;
  if (!Number.isFinite(strideUm) || strideUm <= 0) {
    throw new RangeError(`Stride must be a positive number of µm: got ${strideUm}`);
  }
  if (!(minCoverage > 0 && minCoverage <= 1)) {
    throw new RangeError(`Minimum coverage must be in (0, 1]: got ${minCoverage}`);
  }
  const plan = planCountGrid(prepared.validUm, window, strideUm, minCoverage);
  if (plan.cells > maxGridCells) {
    const mb = Math.ceil(plan.cells * BYTES_PER_GRID_CELL / 1e6);
    throw new GridSizeError(
      `The count grid at a stride of ${strideUm} µm would have ${plan.cells} cells ` +
        `(about ${mb} MB), more than the limit of ${maxGridCells}: use a larger stride`,
    );
  }
  const grid = makeStrideGrid(plan.bboxUm, { strideUm, marginUm: plan.marginUm });
  const counts = options.counts === false
    ? new Int32Array(grid.nx * grid.ny)
    : stampWindowCounts(prepared.xUm, prepared.yUm, window, grid);
  const e = windowExtents(window);
  let cover64: Float64Array;
  let low64: Float64Array | undefined;
  let discretization: string;
  let coverageError = 0;
  if (window.shape === "rect") {
    cover64 = rectCoverage(prepared.validUm, grid, e.halfX, e.halfY);
    discretization = `Counts are exact at every centre of a ${strideUm} µm grid; ` +
      "coverage is exact (V's area in the cells cut by every window edge, summed); " +
      `a hotspot between grid centres can hold more figures (the exact hotspot is searched separately)`;
  } else if (options.coverageUpperBound) {
    low64 = new Float64Array(grid.nx * grid.ny);
    cover64 = circleCoverageBound(prepared.validUm, grid, e.halfX, low64);
    discretization = `Counts are exact at every centre of a ${strideUm} µm grid; ` +
      "circle coverage is an upper bound from whole raster cells about the disk";
  } else {
    const raster = circleRaster(strideUm, e.halfX, options.circleCellsPerStride);
    coverageError = raster.errorBound;
    const exact = options.exactAdmissibility !== false;
    // Centres whose raster coverage is too close to the minimum to decide
    // get exact bounds from the raster cells (whole cells exactly, the cells
    // the rim crosses between what V and the disk must and may share); those
    // still in doubt are recomputed exactly, so admissibility is exact.
    const decided = new Uint8Array(exact ? grid.nx * grid.ny : 0);
    cover64 = circleCoverage(
      prepared.validUm,
      grid,
      e.halfX,
      raster.q,
      exact ? { minCoverage, marginOf: raster.errorBound, decided } : undefined,
    );
    const overlap = createOverlapIndex(prepared.validUm);
    let refined = 0, undecided = 0, bounded = 0;
    for (let k = 0; k < cover64.length && exact; k++) {
      if (Math.abs(cover64[k] - minCoverage) > raster.errorBound) continue;
      if (decided[k]) {
        bounded++;
        continue;
      }
      if (refined >= MAX_EXACT_CIRCLE_REFINEMENTS) {
        undecided++;
        continue;
      }
      const cx = grid.x0Um + (k % grid.nx) * strideUm;
      const cy = grid.y0Um + Math.floor(k / grid.nx) * strideUm;
      const v = overlap.disk([cx, cy], e.halfX) / e.areaUm2;
      cover64[k] = v < 0 ? 0 : v > 1 ? 1 : v;
      refined++;
    }
    discretization = `Counts are exact at every centre of a ${strideUm} µm grid; ` +
      `circle coverage is summed on ${roundTo(raster.cellUm, 3)} µm raster cells, ` +
      `error at most ${roundTo(100 * raster.errorBound, 2)}% of the window area ` +
      "(the cells the circle crosses); " + (options.exactAdmissibility === false
        ? "admissibility follows the raster values; "
        : "centres within that margin of the minimum coverage " +
          `were decided by exact bounds from the raster cells (${bounded}) or recomputed exactly (${refined}${
            undecided > 0 ? `; ${undecided} more left on the raster value` : ""
          }), so admissibility is exact; `) +
      "the hotspot's coverage is computed exactly";
  }
  const n = grid.nx * grid.ny;
  const coverage = new Float32Array(n);
  const bound = window.shape === "circle" && options.coverageUpperBound === true;
  const admissible = new Uint8Array(bound ? 0 : n);
  let positions = 0;
  for (let k = 0; k < n; k++) {
    coverage[k] = cover64[k];
    // A bound stays a bound in single precision.
    if (bound && coverage[k] < cover64[k]) coverage[k] = Math.min(1, cover64[k] + 1e-6);
    else if (!bound && cover64[k] >= minCoverage) {
      admissible[k] = 1;
      positions++;
    }
  }
  const map: CountMap = {
    grid,
    window,
    counts,
    coverage,
    admissible,
    minCoverage,
    positions,
    discretization,
    coverageError,
  };
  if (low64) {
    // A lower bound stays one in single precision.
    const low = new Float32Array(n);
    for (let k = 0; k < n; k++) {
      low[k] = low64[k];
      if (low[k] > low64[k]) low[k] = Math.max(0, low64[k] - 1e-6);
    }
    map.coverageLow = low;
  }
  return map;
}
