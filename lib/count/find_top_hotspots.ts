/**
 * The k best separate windows.
 *
 * @module
 */

import type { CountMap, Placement, PreparedCase, SearchBudget } from "./engine_types.ts";
import { createSearch, searchBest } from "./_hotspot_search.ts";
import type { OverlapIndex } from "../geometry/window_overlap.ts";

/** Options of {@linkcode findTopHotspots}. */
export interface FindTopHotspotsOptions {
  /** Exact area index of V in µm, to reuse. */
  overlap?: OverlapIndex;
  /**
   * The work the search may do, shared with other searches of the case
   * (see `SearchBudget`). @default a fresh budget of `MAX_SEARCH_WORK`
   */
  budget?: SearchBudget;
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
 * @throws {SearchWorkError} When the search passes its work budget (figures spread so
 *   evenly and densely that no window stands out).
 * @example Two clusters, two windows
 * ```ts
 * import { computeCountMap, findTopHotspots, makeWindow, parseAnnotations, prepareCase } from "hotfield";
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [6000, 0], [6000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[1000, 1500], [1100, 1500], [1200, 1500], [4000, 1400], [4100, 1400]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const prepared = prepareCase({ caseId: "QVT-24-001", ...parsed, sources: [] });
 * const map = computeCountMap(prepared, makeWindow({ areaMm2: 1, aspect: [1, 1] }), { strideUm: 200 });
 * const top = findTopHotspots(prepared, map, 2);
 * const counts = top.map((p) => p.count).join();
 * if (counts !== "3,2") throw new Error(`top window counts ${counts}, expected 3,2`);
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
  const st = createSearch(prepared, map, options.overlap, options.budget);
  while (chosen.length < k) {
    const p = searchBest(st, chosen);
    if (!p) break;
    chosen.push(p);
  }
  return chosen;
}
