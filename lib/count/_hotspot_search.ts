/**
 * The search for the best admissible window placement in the continuous
 * plane (shared by the hotspot, top-k and best-field searches): rectangles
 * here, circles in _circle_search.ts.
 *
 * @module
 */

import type { Placement } from "./engine_types.ts";
import {
  ADMIT_EPS,
  blockForbidden,
  cellTightBound,
  coverageGrowth,
  exactCoverage,
  isBetter,
  isSeparate,
  placement,
  type SearchState,
  surelyBelow,
} from "./_search_state.ts";
import { circleSearchBest } from "./_circle_search.ts";
import { RectCell } from "./_rect_cell.ts";

export {
  ADMIT_EPS,
  type AreaIndex,
  createSearch,
  exactCoverage,
  isBetter,
  isSeparate,
  newSearchBudget,
  placement,
  type SearchState,
} from "./_search_state.ts";

/**
 * The best admissible placement separate from `chosen` (see find_hotspot.ts
 * for what "best" and "exact" mean), or null when none is admissible.
 *
 * Rectangles: the best admissible grid centres first (up to 32 of the top
 * count, exact coverage re-checked), then the stride cells by descending
 * bound (row-major among equal bounds) while a cell's bound is above the
 * best count; in each cell the candidates come by descending count, then y,
 * then x (see {@linkcode RectCell}). The orders of grid centres and cells
 * are sorted once per search and kept between picks; a pick walks them
 * only as far as its bounds allow.
 */
export function searchBest(st: SearchState, chosen: Placement[] = []): Placement | null {
  st.stats = { blocks: 0, candidates: 0, coverageQueries: 0 };
  if (!st.isRect) return circleSearchBest(st, chosen);
  const { map } = st;
  const { nx, x0Um, y0Um, strideUm: s } = map.grid;
  const minCov = map.minCoverage - ADMIT_EPS;
  const order = rectOrders(st);
  let best: Placement | null = null;

  // Start from the best admissible grid centres (exact coverage re-checked).
  const byCount = order.centres;
  let t = 0;
  for (; t < byCount.length; t++) {
    const k = byCount[t];
    if (isSeparate(st, x0Um + (k % nx) * s, y0Um + Math.floor(k / nx) * s, chosen)) break;
  }
  if (t < byCount.length) {
    const top = map.counts[byCount[t]];
    let tried = 0;
    for (; t < byCount.length && tried < 32; t++) {
      const k = byCount[t];
      if (map.counts[k] !== top) break;
      const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
      if (!isSeparate(st, cx, cy, chosen)) continue;
      tried++;
      const cov = exactCoverage(st, cx, cy);
      if (cov >= minCov) {
        const p = placement(st, cx, cy, top, cov);
        if (isBetter(p, best)) best = p;
      }
    }
  }

  // Cells that could still win, by descending bound.
  const reachUm = s / 2 + 4e-6 * Math.max(st.e.halfX, st.e.halfY);
  const blocks = order.cells;
  for (let b = 0; b < blocks.length; b++) {
    const k = blocks[b];
    if (st.bound[k] <= (best ? best.count : -1)) break;
    // No candidate of the cell can reach the best count (a tie could still win).
    if (best && cellTightBound(st, k) < best.count) continue;
    if (chosen.length > 0 && blockForbidden(st, k, chosen)) continue;
    st.stats.blocks++;
    st.opened++;
    const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
    // One exact query bounds every centre of the cell (candidates may sit a
    // circle tolerance outside it) more tightly than the map's slack.
    const cov0 = exactCoverage(st, cx, cy), grow = coverageGrowth(st, reachUm, reachUm);
    const covCell = cov0 + grow + 1e-7;
    if (covCell < minCov) continue;
    const covBound = Math.min(map.coverage[k] + st.coverageSlack, covCell);
    const cell = new RectCell(st, k, cx, cy, chosen, minCov, cov0 - grow - 1e-7 >= minCov);
    for (;;) {
      // Equal counts can only win on coverage: ask for more when this cell cannot beat it.
      const need = best ? (covBound <= best.coverage + 1e-9 ? best.count + 1 : best.count) : 0;
      const c = cell.next(need);
      if (!c) break;
      st.stats.candidates++;
      if (!isSeparate(st, c.cx, c.cy, chosen)) continue;
      if (surelyBelow(st, c.cx, c.cy, minCov)) continue;
      const cov = exactCoverage(st, c.cx, c.cy);
      if (cov < minCov) continue;
      const p = placement(st, c.cx, c.cy, c.count, cov);
      if (isBetter(p, best)) best = p;
    }
  }
  return best;
}

/**
 * The rectangle search's kept orders: admissible grid centres by descending
 * count, and the cells whose coverage may reach the minimum by descending
 * bound, both row-major among equals (counting sorts).
 */
function rectOrders(st: SearchState): { centres: Int32Array; cells: Int32Array } {
  if (st.rect) return st.rect;
  const { map } = st;
  const n = map.grid.nx * map.grid.ny;
  const minCov = map.minCoverage - ADMIT_EPS;
  const slack = st.coverageSlack, cov = map.coverage;
  st.rect = {
    centres: sortDescending(map.counts, n, (k) => map.admissible[k] === 1),
    cells: sortDescending(st.bound, n, (k) => cov[k] + slack >= minCov),
  };
  return st.rect;
}

/** Indices k < n with keep(k), by descending value[k], ascending k among equals. */
function sortDescending(
  value: Int32Array,
  n: number,
  keep: (k: number) => boolean,
): Int32Array {
  let max = 0, kept = 0;
  for (let k = 0; k < n; k++) {
    if (!keep(k)) continue;
    kept++;
    if (value[k] > max) max = value[k];
  }
  const start = new Int32Array(max + 2);
  for (let k = 0; k < n; k++) if (keep(k)) start[max - value[k] + 1]++;
  for (let v = 0; v <= max; v++) start[v + 1] += start[v];
  const out = new Int32Array(kept);
  for (let k = 0; k < n; k++) if (keep(k)) out[start[max - value[k]]++] = k;
  return out;
}
