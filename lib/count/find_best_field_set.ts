/**
 * The best set of n separate single fields.
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
import { computeCountMap } from "./compute_count_map.ts";
import { makeWindow } from "./make_window.ts";
import { createSearch, searchBest } from "./_hotspot_search.ts";
import { DEFAULT_BEST_N, DEFAULT_FIELD_AREA_MM2 } from "../defaults.ts";
import type { OverlapIndex } from "../geometry/window_overlap.ts";

/** Area of one high-power field of field number 22 at a 40× objective, mm²: π·0.275². */

/** Options of {@linkcode findBestFieldSet}. */
export interface FindBestFieldSetOptions {
  /** Number of fields. @default 10 */
  n?: number;
  /** Area of one field, mm². @default 0.2376 (FN 22 at 40×: π·0.275²) */
  fieldAreaMm2?: number;
  /** Field shape. @default "circle" */
  shape?: "rect" | "circle";
  /** Rectangle aspect. @default [4, 3] */
  aspect?: [number, number];
  /** Search grid stride, µm. @default 25 */
  strideUm?: number;
  /** Minimum coverage of each field. @default 0.95 */
  minCoverage?: number;
  /** Exact area index of V in µm, to reuse. */
  overlap?: OverlapIndex;
  /** A count map of the field window already computed, to reuse. */
  map?: CountMap;
  /**
   * The work the search may do, shared with other searches of the case
   * (see `SearchBudget`). @default a fresh budget of `MAX_SEARCH_WORK`
   */
  budget?: SearchBudget;
}

/** Result of {@linkcode findBestFieldSet}. */
export interface BestFieldSet {
  /** The fields, best first; fewer than asked for when no more fit. */
  fields: Placement[];
  /** Sum of the fields' counts. */
  total: number;
  /** The window of one field. */
  window: WindowShape;
  /** In words, what the search guarantees about `total`. */
  guarantee: string;
}

/**
 * Greedy guarantee, in words. See {@linkcode findBestFieldSet}.
 *
 * @example
 * ```ts
 * import { bestFieldGuarantee } from "./find_best_field_set.ts";
 * const words = bestFieldGuarantee("circle");
 * if (!words.includes("1/5")) throw new Error(`the circle guarantee should name its 1/5 bound: ${words}`);
 * ```
 */
export function bestFieldGuarantee(shape: "rect" | "circle"): string {
  const m = shape === "rect" ? 4 : 5;
  return `Greedy: each field is the exact best placement not overlapping earlier fields ` +
    `(over arrangement vertices and grid centres). A ${
      shape === "rect" ? "rectangle" : "circle"
    } ` +
    `can overlap at most ${m} separate windows of its own size, so the total is at least ` +
    `1/${m} of the best possible total of ${shape === "rect" ? "rectangles" : "circles"}`;
}

/**
 * Finds n separate fields (closed windows disjoint) of one field's area with the
 * greatest total count, greedily: the best field, then the best field not
 * overlapping it, and so on.
 *
 * Guarantee: total ≥ OPT/m, with m = 4 for rectangles and m = 5 for circles.
 * Proof sketch: charge each field of an optimal set to the first greedy field
 * it overlaps; when that greedy field was picked the optimal one was still
 * available, so it holds at least as many figures. The optimal fields charged
 * to one greedy field are disjoint and all overlap it; equal axis-aligned
 * rectangles whose interiors meet a W × H rectangle have centres in an open
 * 2W × 2H box, and two in the same W × H quarter would overlap, so at most 4;
 * equal circles meeting a circle of radius r have centres closer than 2r,
 * pairwise at least 2r apart, which forces angular gaps above 60°, so at most
 * 5. Optimal fields overlapping no greedy field (possible only when greedy
 * found all n) each hold at most as many as any greedy field and fill the
 * unused charges. The guarantee inherits the limits of {@linkcode findHotspot}
 * ("exact" over arrangement vertices and grid centres). Fields are closed
 * and disjoint, so no figure counts twice; a field may come within one ulp of
 * another.
 *
 * @param prepared The prepared case.
 * @param options Number of fields, field area and shape, grid.
 * @returns The fields (best first), their total, the field window and the guarantee.
 *
 * @throws {SearchWorkError} When the search passes its work budget (figures spread so
 *   evenly and densely that no window stands out).
 * @example Two fields on a strip of figures
 * ```ts
 * import { findBestFieldSet, parseAnnotations, prepareCase } from "hotfield";
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 2000], [0, 2000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[1000, 1000], [1010, 1000], [3000, 1000]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const prepared = prepareCase({ caseId: "QVT-24-001", ...parsed, sources: [] });
 * const set = findBestFieldSet(prepared, { n: 2, strideUm: 50 });
 * if (set.fields.length !== 2 || set.total !== 3) throw new Error(`${set.fields.length} fields, total ${set.total}`);
 * ```
 */
export function findBestFieldSet(
  prepared: Pick<PreparedCase, "xUm" | "yUm" | "slide" | "validUm">,
  options: FindBestFieldSetOptions = {},
): BestFieldSet {
  const n = options.n ?? DEFAULT_BEST_N;
  if (!Number.isInteger(n) || n < 0) {
    throw new RangeError(`Number of fields must be a whole number ≥ 0: got ${n}`);
  }
  const shape = options.shape ?? "circle";
  const window = options.map?.window ??
    makeWindow({
      areaMm2: options.fieldAreaMm2 ?? DEFAULT_FIELD_AREA_MM2,
      shape,
      aspect: options.aspect,
    });
  const fields: Placement[] = [];
  if (n > 0) {
    const map = options.map ??
      computeCountMap(prepared, window, {
        strideUm: options.strideUm,
        minCoverage: options.minCoverage,
        // The map only prunes the search (which bounds counts itself); every
        // field's coverage is exact. Circles: an upper bound is enough.
        circleCellsPerStride: 1,
        exactAdmissibility: false,
        coverageUpperBound: true,
        counts: window.shape === "rect", // the rectangle search starts from grid counts
      });
    const st = createSearch(prepared, map, options.overlap, options.budget);
    while (fields.length < n) {
      const p = searchBest(st, fields);
      if (!p) break;
      fields.push(p);
    }
  }
  return {
    fields,
    total: fields.reduce((a, p) => a + p.count, 0),
    window,
    guarantee: bestFieldGuarantee(window.shape),
  };
}
