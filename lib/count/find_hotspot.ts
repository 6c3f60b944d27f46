/**
 * The exact hotspot: the admissible window placement with the most figures.
 *
 * @module
 */

import type { CountMap, Placement, PreparedCase, SearchBudget } from "./engine_types.ts";
import { createSearch, searchBest } from "./_hotspot_search.ts";
import type { OverlapIndex } from "../geometry/window_overlap.ts";

/** Options of {@linkcode findHotspot}. */
export interface FindHotspotOptions {
  /** Exact area index of V in µm (from `createOverlapIndex(prepared.validUm)`), to reuse. */
  overlap?: OverlapIndex;
  /**
   * The work the search may do, shared with other searches of the case
   * (see `SearchBudget`). @default a fresh budget of `MAX_SEARCH_WORK`
   */
  budget?: SearchBudget;
}

/**
 * Finds the hotspot: the placement of the map's window, anywhere in the
 * continuous plane (not only on the grid), with the greatest count among
 * placements whose coverage area(window ∩ V)/area(window) is at least the
 * map's `minCoverage`.
 *
 * **Method.** The count is piecewise constant over centre space. With closed
 * windows, the set of centres whose window holds a given set of figures is
 * closed, and its maximum is reached at one of its vertices, where window
 * edges touch figures: for rectangles centres (f.x ± W/2, g.y ± H/2) over
 * figures f, g; for circles centres with two figures on the rim (the
 * intersections of radius-r circles about figures within 2r) and, as
 * fallback, one figure on the rim. Every admissible grid centre is a
 * candidate as well, so the hotspot is never below the best grid placement.
 * Search is branch and bound over the stride cells around grid centres: the
 * windows centred in one cell all lie inside the window enlarged by one
 * stride (rect (W+s)×(H+s), circle radius r + s·√2/2), so its grid count
 * bounds the cell's counts, and its area bounds the cell's coverage. Cells
 * are visited by descending bound and the search stops when the bound is not
 * above the best count found. For rectangles, the figures inside every
 * window of a cell (those within the window shrunk by a stride) come from a
 * second grid count, so only the frame of each window is read. For circles
 * the search is best-first over one queue of cells and ever smaller squares
 * of centres; a square carries the figures surely inside all its windows as
 * a number and only those near the rim as a list, and its bound (the two
 * together) tightens as it is split. Each candidate is counted exactly with
 * the window test (`windowContains`); its coverage is computed exactly
 * (`createOverlapIndex`) only when it could beat the best.
 *
 * **What "exact" means.** The result is the global maximum count over all
 * admissible placements that are vertices of the figure arrangement or grid
 * centres. Every maximal set of figures a closed window can hold is held at
 * such a vertex, so the count is the true maximum whenever the best set's
 * vertex is admissible. Limitation: when the coverage limit cuts through a
 * cell of the arrangement so that none of its vertices (and no grid centre
 * in it) is admissible, that cell's count is missed; the hotspot is then
 * still the best of all admissible vertices and grid centres. Floating-point
 * vertices are nudged by ulps so the figures that define them test inside;
 * the reported count is always the exact count of the reported window.
 *
 * **Tie-break** (deterministic): higher count, then higher coverage (rounded
 * to 1e-9), then smaller y, then smaller x, among the candidates examined.
 * Rectangles: cells are visited by bound, then row-major, and the search
 * stops at the first cell whose bound equals the best count, so equal-count
 * placements in cells not visited are not compared. Circles: after the first
 * admissible placement of the best count, up to 32 more already listed
 * placements of that count are compared (none when the first has coverage 1).
 *
 * Centres are returned in µm and level-0 pixels; `perMm2` is count ÷ the
 * window area in mm².
 *
 * @param prepared The prepared case.
 * @param map The count map of the window (its stride sets the search cells).
 * @param options An overlap index to reuse.
 * @returns The hotspot, or null when no placement is admissible.
 *
 * @throws {SearchWorkError} When the search passes its work budget (figures spread so
 *   evenly and densely that no window stands out).
 * @example Three figures, the best 1 × 1 mm window holds two
 * ```ts
 * import { computeCountMap, findHotspot, makeWindow, parseAnnotations, prepareCase } from "hotfield";
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [5000, 0], [5000, 5000], [0, 5000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[1000, 1000], [1990, 1990], [4000, 1000]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const prepared = prepareCase({ caseId: "QVT-24-001", ...parsed, sources: [] });
 * const map = computeCountMap(prepared, makeWindow({ areaMm2: 1, aspect: [1, 1] }), { strideUm: 250 });
 * const hotspot = findHotspot(prepared, map);
 * if (hotspot?.count !== 2 || hotspot.coverage !== 1) throw new Error(`hotspot ${JSON.stringify(hotspot)}`);
 * ```
 */
export function findHotspot(
  prepared: Pick<PreparedCase, "xUm" | "yUm" | "slide" | "validUm">,
  map: CountMap,
  options: FindHotspotOptions = {},
): Placement | null {
  return searchBest(createSearch(prepared, map, options.overlap, options.budget));
}
