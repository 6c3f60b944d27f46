/**
 * State and helpers shared by the rectangle and circle searches for the best
 * admissible window placement.
 *
 * @module
 */

import type {
  CountMap,
  Placement,
  PreparedCase,
  SearchBudget,
  WindowShape,
} from "./engine_types.ts";
import { stampWindowCounts } from "./stamp_window_counts.ts";
import { type WindowExtents, windowExtents } from "./window_contains.ts";
import { bucketFigures, type FigureBuckets } from "./_figure_buckets.ts";
import { createOverlapIndex } from "./_geometry.ts";
import { umToPx } from "../units.ts";
import { SearchWorkError } from "../errors.ts";
import { MAX_SEARCH_WORK } from "../defaults.ts";

/** Coverage within this of the minimum counts as admissible (floating-point slack). */
export const ADMIT_EPS = 1e-9;

/**
 * Cells opened on one search state before quarter bounds are made (see
 * {@linkcode cellTightBound}): clustered slides, even of a million
 * figures, seldom open this many; evenly spread figures open far more.
 */
const QUARTERS_AFTER = 4096;

/** Exact area queries on V (µm plane). */
export interface AreaIndex {
  rect(bbox: [number, number, number, number]): number;
  disk(center: [number, number], radius: number): number;
}

/** Everything the search reuses across picks. */
export interface SearchState {
  xUm: Float64Array;
  yUm: Float64Array;
  mpp: { mppX: number; mppY: number };
  map: CountMap;
  window: WindowShape;
  e: WindowExtents;
  isRect: boolean;
  /** Upper bound of the count of any window centred in the stride cell of each grid centre. */
  bound: Int32Array;
  /**
   * Rectangles: per grid centre, the figures inside every window centred in
   * its stride cell (those within `interiorHalf` of the centre), or null.
   */
  interior: Int32Array | null;
  interiorHalf: [number, number];
  /** Added to a grid centre's coverage to bound the coverage of any window in its stride cell. */
  coverageSlack: number;
  overlap: AreaIndex;
  buckets: FigureBuckets;
  /** Circles: buckets one stride wide, made on first use (see _circle_cell.ts). */
  fine: FigureBuckets | null;
  /** Statistics of the last search, for tests and benchmarks. */
  stats: { blocks: number; candidates: number; coverageQueries: number };
  /**
   * Exact coverages already computed, one per memo square of side
   * `memoUm` (the lowest kept): coverage moves by at most |dx|/W + |dy|/H
   * (rect) or 2·|d|/(π·r) (circle) when the centre moves, so a candidate
   * near a low one is inadmissible without a query.
   */
  memo: Map<number, [number, number, number]>;
  memoUm: number;
  /**
   * The circle search's open squares and candidates, kept between picks.
   * Opaque here (its type lives in _circle_search.ts) so the two files do not
   * import each other.
   */
  circle: object | null;
  /** The rectangle search's orders of grid centres and cells, kept between picks. */
  rect: { centres: Int32Array; cells: Int32Array } | null;
  /** The work every search on this state may do, shared with the case's other searches (see {@linkcode addWork}). */
  budget: SearchBudget;
  /** Cells opened by every search on this state so far. */
  opened: number;
  /**
   * Quarter bounds are made once this many cells were opened and the
   * searches spent `quartersWork` on this state: about what making them
   * costs (a stamp of the figures on four times the cells), so they are
   * made only where they can pay. Tests set both to 0.
   */
  quartersAfter: number;
  quartersWork: number;
  /** `budget.spent` when this state was made. */
  spentBefore: number;
  /** Count bounds of the quarters of each stride cell, once made (see {@linkcode cellTightBound}). */
  quarters: Int32Array | null;
}

/** Prepares a search over `map`'s window. */
export function createSearch(
  prepared: Pick<PreparedCase, "xUm" | "yUm" | "slide" | "validUm">,
  map: CountMap,
  overlap?: AreaIndex,
  budget: SearchBudget = newSearchBudget(),
): SearchState {
  const window = map.window;
  const e = windowExtents(window);
  const isRect = window.shape === "rect";
  const s = map.grid.strideUm;
  // Any centre in the closed stride cell [c ± s/2]² has its window inside the
  // window enlarged by one stride (rect) or by s·√2/2 in radius (circle).
  const grow = s * (1 + 1e-9);
  let enlarged: WindowShape;
  let slack: number;
  if (window.shape === "rect") {
    enlarged = { ...window, widthUm: window.widthUm + grow, heightUm: window.heightUm + grow };
    slack = ((window.widthUm + grow) * (window.heightUm + grow)) / e.areaUm2 - 1;
  } else {
    const r = e.halfX, rg = r + grow * Math.SQRT1_2;
    enlarged = { ...window, diameterUm: 2 * rg };
    slack = (rg * rg) / (r * r) - 1;
  }
  const bound = stampWindowCounts(prepared.xUm, prepared.yUm, enlarged, map.grid);
  // Rectangles: figures within the window shrunk by one stride (less a
  // margin far above rounding) are inside every window centred in the
  // stride cell; their grid count is added without looking at them.
  let interior: Int32Array | null = null;
  let interiorHalf: [number, number] = [0, 0];
  if (window.shape === "rect") {
    const m = 1e-6 * (window.widthUm + window.heightUm);
    const wIn = window.widthUm - s - 2 * m, hIn = window.heightUm - s - 2 * m;
    if (wIn > s && hIn > s) {
      const shrunk: WindowShape = { ...window, widthUm: wIn, heightUm: hIn };
      const eIn = windowExtents(shrunk);
      interior = stampWindowCounts(prepared.xUm, prepared.yUm, shrunk, map.grid);
      interiorHalf = [eIn.halfX, eIn.halfY];
    }
  }
  // Rectangles fetch only the frame of a window, so small buckets pay; a
  // cap keeps the bucket table in proportion to the figures.
  const extent = figureExtent(prepared.xUm, prepared.yUm);
  let size = isRect ? s : Math.max(s, Math.min(e.halfX, e.halfY) / 2);
  const cap = Math.max(1 << 20, 4 * prepared.xUm.length);
  while ((extent[0] / size + 1) * (extent[1] / size + 1) > cap) size *= 2;
  return {
    interior,
    interiorHalf,
    xUm: prepared.xUm,
    yUm: prepared.yUm,
    mpp: { mppX: prepared.slide.mppX, mppY: prepared.slide.mppY },
    map,
    window,
    e,
    isRect,
    bound,
    coverageSlack: slack + (map.coverageError ?? 0) + 1e-6,
    overlap: overlap ?? (createOverlapIndex(prepared.validUm) as AreaIndex),
    buckets: bucketFigures(prepared.xUm, prepared.yUm, size),
    fine: null,
    stats: { blocks: 0, candidates: 0, coverageQueries: 0 },
    memo: new Map(),
    memoUm: s / 4,
    circle: null,
    rect: null,
    opened: 0,
    quartersAfter: QUARTERS_AFTER,
    quartersWork: quarterStampCost(prepared.xUm.length, map.grid, e, isRect),
    spentBefore: budget.spent,
    quarters: null,
    budget,
  };
}

/** A fresh budget of `limit` figure tests. */
export function newSearchBudget(limit: number = MAX_SEARCH_WORK): SearchBudget {
  return { spent: 0, limit };
}

/**
 * Adds `n` figure tests (or steps of like cost) to the work of the searches
 * on `st`, and stops them with a {@linkcode SearchWorkError} past the
 * limit. The work, not the time, is counted, so the same input stops at the
 * same place on every machine.
 */
export function addWork(st: SearchState, n: number): void {
  const b = st.budget;
  b.spent += n;
  if (b.spent <= b.limit) return;
  const w = st.window;
  const what = w.shape === "rect"
    ? `a ${fmtUm(w.widthUm)} × ${fmtUm(w.heightUm)} µm window`
    : `a circular field ${fmtUm(w.diameterUm)} µm across`;
  throw new SearchWorkError(
    `The exact search for the best placement of ${what} stopped at its work limit ` +
      `(${b.limit.toLocaleString("en-US")} figure tests): the ${
        st.xUm.length.toLocaleString("en-US")
      } counted figures are spread so evenly and densely that no window stands out, which ` +
      `mitotic figures do not do (are these all nuclei, or detections before a score cut-off?); ` +
      `count fewer, e.g. with a higher minimum score or fewer labels`,
  );
}

function fmtUm(v: number): string {
  return Math.round(v).toLocaleString("en-US");
}

/**
 * A bound of the count of any window centred in the stride cell of grid
 * centre k, at most `st.bound[k]`: once the searches on `st` have opened
 * many cells and done about as much work as the finer grid costs, the largest of the cell's four quarter bounds, each the grid
 * count of the window enlarged by half a stride at the quarter's centre (a
 * grid of half the stride, offset by a quarter). Their excess over the
 * counts is half the cell bound's. That matters when figures are spread
 * evenly: then no window stands out, many cells have a bound above the
 * best count and far fewer have a quarter that does, so far fewer cells
 * are opened. Clustered figures seldom open enough cells to pay for the
 * finer grid (four times the cells; made once per state, its cost added
 * to the budget).
 */
export function cellTightBound(st: SearchState, k: number): number {
  if (!st.quarters) {
    if (st.opened < st.quartersAfter || st.budget.spent - st.spentBefore < st.quartersWork) {
      return st.bound[k];
    }
    addWork(st, st.quartersWork);
    st.quarters = quarterBounds(st);
  }
  const nx = st.map.grid.nx, nq = 2 * nx, q = 2 * Math.floor(k / nx) * nq + 2 * (k % nx);
  const a = st.quarters;
  return Math.min(st.bound[k], Math.max(a[q], a[q + 1], a[q + nq], a[q + nq + 1]));
}

/**
 * About what the quarter bounds cost, in figure tests: a rectangle stamp
 * touches each figure once, a circle stamp once per row of the finer grid
 * the disk spans; the grid itself is four times the cells.
 */
function quarterStampCost(
  figures: number,
  grid: { nx: number; ny: number; strideUm: number },
  e: WindowExtents,
  isRect: boolean,
): number {
  const rows = isRect ? 1 : (4 * e.halfY) / grid.strideUm;
  return figures * rows + 4 * grid.nx * grid.ny;
}

/** The quarter bounds: a stamp of the window enlarged as createSearch does, for half the stride. */
function quarterBounds(st: SearchState): Int32Array {
  const { grid } = st.map;
  const s = grid.strideUm, w = st.window;
  const grow = (s / 2) * (1 + 1e-9);
  const enlarged: WindowShape = w.shape === "rect"
    ? { ...w, widthUm: w.widthUm + grow, heightUm: w.heightUm + grow }
    : { ...w, diameterUm: 2 * (st.e.halfX + grow * Math.SQRT1_2) };
  return stampWindowCounts(st.xUm, st.yUm, enlarged, {
    x0Um: grid.x0Um - s / 4,
    y0Um: grid.y0Um - s / 4,
    strideUm: s / 2,
    nx: 2 * grid.nx,
    ny: 2 * grid.ny,
  });
}

/** Width and height of the figures' bounding box, µm. */
function figureExtent(x: Float64Array, y: Float64Array): [number, number] {
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (let k = 0; k < x.length; k++) {
    if (x[k] < x0) x0 = x[k];
    if (x[k] > x1) x1 = x[k];
    if (y[k] < y0) y0 = y[k];
    if (y[k] > y1) y1 = y[k];
  }
  return x.length === 0 ? [0, 0] : [x1 - x0, y1 - y0];
}

function memoKey(st: SearchState, cx: number, cy: number): number {
  const g = st.memoUm, { x0Um, y0Um } = st.map.grid;
  // 2^26 columns: keys stay exact integers for any slide the grid can hold.
  return Math.floor((cy - y0Um) / g) * 67108864 + Math.floor((cx - x0Um) / g);
}

/** Most the coverage can grow when the centre moves by (dx, dy). */
export function coverageGrowth(st: SearchState, dx: number, dy: number): number {
  const { e } = st;
  return st.isRect
    ? Math.abs(dx) / (2 * e.halfX) + Math.abs(dy) / (2 * e.halfY)
    : (2 * Math.hypot(dx, dy)) / (Math.PI * e.halfX);
}

/**
 * True when the window at (cx, cy), and at every centre within `extraUm` of
 * it along each axis, is surely below `minCov`, from exact coverages
 * memoised nearby; the margin covers rounding in both areas.
 */
export function surelyBelow(
  st: SearchState,
  cx: number,
  cy: number,
  minCov: number,
  extraUm = 0,
): boolean {
  const g = st.memoUm, { x0Um, y0Um } = st.map.grid;
  const ix = Math.floor((cx - x0Um) / g), iy = Math.floor((cy - y0Um) / g);
  for (let j = iy - 1; j <= iy + 1; j++) {
    for (let i = ix - 1; i <= ix + 1; i++) {
      const m = st.memo.get(j * 67108864 + i);
      if (!m) continue;
      const dx = Math.abs(cx - m[0]) + extraUm, dy = Math.abs(cy - m[1]) + extraUm;
      if (m[2] + coverageGrowth(st, dx, dy) + 1e-7 < minCov) return true;
    }
  }
  return false;
}

/** Exact coverage of the window centred at (cx, cy). */
export function exactCoverage(st: SearchState, cx: number, cy: number): number {
  st.stats.coverageQueries++;
  addWork(st, 64);
  const { e } = st;
  const a = st.isRect
    ? st.overlap.rect([cx - e.halfX, cy - e.halfY, cx + e.halfX, cy + e.halfY])
    : st.overlap.disk([cx, cy], e.halfX);
  const v = a / e.areaUm2;
  const cov = v < 0 ? 0 : v > 1 ? 1 : v;
  const key = memoKey(st, cx, cy), m = st.memo.get(key);
  if (!m || cov < m[2]) st.memo.set(key, [cx, cy, cov]);
  return cov;
}

/**
 * Whether the closed window at (cx, cy) is disjoint from every `chosen`
 * closed window (so no figure is counted in two of them): rect |dx| > W or
 * |dy| > H, circle dx² + dy² > (2r)².
 */
export function isSeparate(st: SearchState, cx: number, cy: number, chosen: Placement[]): boolean {
  const { e } = st;
  for (const p of chosen) {
    const dx = cx - p.centerUm[0], dy = cy - p.centerUm[1];
    if (st.isRect) {
      if (Math.abs(dx) <= 2 * e.halfX && Math.abs(dy) <= 2 * e.halfY) return false;
    } else if (dx * dx + dy * dy <= 4 * e.radius2) return false;
  }
  return true;
}

/** Builds a placement record. */
export function placement(
  st: SearchState,
  cx: number,
  cy: number,
  count: number,
  coverage: number,
): Placement {
  return {
    centerUm: [cx, cy],
    centerPx: umToPx([cx, cy], st.mpp),
    count,
    coverage,
    perMm2: count / st.window.areaMm2,
  };
}

/** True when a is better than b: higher count, higher coverage (1e-9), smaller y, smaller x. */
export function isBetter(a: Placement, b: Placement | null): boolean {
  if (b === null) return true;
  if (a.count !== b.count) return a.count > b.count;
  const ca = Math.round(a.coverage * 1e9), cb = Math.round(b.coverage * 1e9);
  if (ca !== cb) return ca > cb;
  if (a.centerUm[1] !== b.centerUm[1]) return a.centerUm[1] < b.centerUm[1];
  return a.centerUm[0] < b.centerUm[0];
}

/** A placement with its exact count. */
export interface Candidate {
  cx: number;
  cy: number;
  count: number;
}

/** Whether every centre of the stride cell of grid centre k overlaps a chosen window. */
export function blockForbidden(st: SearchState, k: number, chosen: Placement[]): boolean {
  const { nx, x0Um, y0Um, strideUm: s } = st.map.grid;
  const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
  const { e } = st;
  for (const p of chosen) {
    const dx = Math.abs(cx - p.centerUm[0]), dy = Math.abs(cy - p.centerUm[1]);
    if (st.isRect) {
      if (dx + s / 2 < 2 * e.halfX && dy + s / 2 < 2 * e.halfY) return true;
    } else if (Math.hypot(dx, dy) + s * Math.SQRT1_2 < 2 * e.halfX) return true;
  }
  return false;
}
