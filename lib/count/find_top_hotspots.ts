/**
 * The k best separate windows.
 *
 * @module
 */

import type { CountMap, Placement, PreparedCase } from "./engine_types.ts";
import { createSearch, searchBest } from "./_hotspot_search.ts";
import type { OverlapIndex } from "../geometry/window_overlap.ts";

/** Options of {@linkcode findTopHotspots}. */
export interface FindTopHotspotsOptions {
  /** Exact area index of V in µm, to reuse. */
  overlap?: OverlapIndex;
}

/**
 * Finds up to k windows that do not overlap (the closed windows are
 * disjoint, so no figure counts in two of them), greedily: the hotspot, then the best placement
 * not overlapping it, and so on.
 *
 * Guarantee: each pick is the best placement (in the sense of
 * {@linkcode findHotspot}: exact over arrangement vertices and grid centres,
 * with the same tie-break) among admissible placements not overlapping the
 * earlier picks; the edges of the earlier picks' exclusion zones are added to
 * the candidates. The set as a whole is not claimed to be the best k-set.
 * Fewer than k are returned when no admissible separate placement is left.
 *
 * @param prepared The prepared case.
 * @param map The count map of the window.
 * @param k How many windows (0 gives none).
 * @returns The windows, best first.
 *
 * @example Two clusters, two windows
 * ```ts
 * import { findTopHotspots } from "./find_top_hotspots.ts";
 * import { computeCountMap } from "./compute_count_map.ts";
 * import { makeWindow } from "./make_window.ts";
 * const sq = [[[0, 0], [6000, 0], [6000, 3000], [0, 3000], [0, 0]]] as [number, number][][];
 * const prepared = {
 *   validUm: [sq], slide: { id: "QVT-24-001", mppX: 1, mppY: 1 },
 *   xUm: new Float64Array([1000, 1100, 1200, 4000, 4100]),
 *   yUm: new Float64Array([1500, 1500, 1500, 1400, 1400]),
 * };
 * // deno-lint-ignore no-explicit-any
 * const map = computeCountMap(prepared as any, makeWindow({ areaMm2: 1, aspect: [1, 1] }), { strideUm: 200 });
 * // deno-lint-ignore no-explicit-any
 * const top = findTopHotspots(prepared as any, map, 2);
 * if (top.length !== 2 || top[0].count !== 3 || top[1].count !== 2) throw new Error();
 * ```
 */
export function findTopHotspots(
  prepared: Pick<PreparedCase, "xUm" | "yUm" | "slide" | "validUm">,
  map: CountMap,
  k: number,
  options: FindTopHotspotsOptions = {},
): Placement[] {
  if (!Number.isInteger(k) || k < 0) {
    throw new RangeError(`Number of windows must be a whole number ≥ 0: got ${k}`);
  }
  const chosen: Placement[] = [];
  if (k === 0) return chosen;
  const st = createSearch(prepared, map, options.overlap);
  while (chosen.length < k) {
    const p = searchBest(st, chosen);
    if (!p) break;
    chosen.push(p);
  }
  return chosen;
}
