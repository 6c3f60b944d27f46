/**
 * Applies a grading scheme and the counting statistics to one case: the
 * report's `classification` and `uncertainty` blocks.
 *
 * @module
 */

import type { ReportClassification, ReportJson, ReportUncertainty } from "./report_types.ts";
import type { CountMap, PreparedCase, WindowShape } from "../count/engine_types.ts";
import { getScheme } from "../standards/list_schemes.ts";
import { classifyCounts } from "../standards/classify.ts";
import { countUncertainty } from "../standards/uncertainty.ts";
import { scanTest } from "../count/scan_test.ts";
import { DEFAULT_SEED, DEFAULT_SIMULATIONS } from "../defaults.ts";

export { getScheme };

/** What {@linkcode applyStandards} reads: the report so far, the prepared case and its map. */
export interface ApplyStandardsInput {
  report: ReportJson;
  prepared: PreparedCase;
  map: CountMap;
  window: WindowShape;
}

/** Options of {@linkcode applyStandards}. */
export interface ApplyStandardsOptions {
  /** Scheme id (see `listSchemes()`). */
  schemeId: string;
  /**
   * Scan-test simulations, 19–100,000; 0 skips the scan test (`scan_p` null).
   * @default 999
   */
  simulations?: number;
  /** Seed of the scan test. @default 1 */
  seed?: number;
}

/**
 * Classifies the case against a scheme and computes its counting uncertainty.
 *
 * The hotspot count is the report's `hotspot.count` (0 when there is none).
 * The scan test runs on the map's grid and admissible positions.
 *
 * @param input Report, prepared case, count map and window.
 * @param options Scheme id, simulations and seed.
 * @returns `classification`, `uncertainty` and warnings.
 * @throws {RangeError} For an unknown scheme id or simulations out of range.
 *
 * @example A hand-made map of 2 × 1 positions
 * ```ts
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { applyStandards } from "./apply_standards.ts";
 * // A 4 × 3 mm tissue piece at 1 µm/px with three figures, counted in 1 mm² squares.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const result = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, {
 *   areaMm2: 1, aspect: [1, 1], strideUm: 100, bestN: 0,
 * });
 * // The report, prepared case, map and window of a result are what applyStandards reads.
 * const r = applyStandards(result, { schemeId: "canine-mct-2tier", simulations: 99 });
 * if (r.classification?.class !== "below" || r.classification.tier !== "low") {
 *   throw new Error(`2 figures per 1 mm² should be below 7 per 2.37 mm²: ${r.classification?.class}`);
 * }
 * if (r.uncertainty?.simulations !== 99) throw new Error(`${r.uncertainty?.simulations} simulations, expected 99`);
 * ```
 */
export function applyStandards(
  input: ApplyStandardsInput,
  options: ApplyStandardsOptions,
): {
  classification: ReportClassification | null;
  uncertainty: ReportUncertainty | null;
  warnings: string[];
} {
  const scheme = getScheme(options.schemeId);
  if (input.report.hotspot === null) {
    // No admissible window means no standard-area count to grade.
    return {
      classification: null,
      uncertainty: null,
      warnings: [
        `Not classified against "${scheme.id}": no window placement is admissible, so there is no standard-area count`,
      ],
    };
  }
  const simulations = options.simulations ?? DEFAULT_SIMULATIONS;
  const seed = options.seed ?? DEFAULT_SEED;
  const { report, prepared, map, window } = input;
  const { classification, warnings } = classifyCounts({
    hotspotCount: report.hotspot?.count ?? null,
    q1: report.distribution.q1,
    windowAreaMm2: window.areaMm2,
    counts: map.counts,
    admissible: map.admissible,
  }, scheme);
  const count = report.hotspot?.count ?? 0;
  let scanP: number | null = null;
  if (simulations !== 0) {
    const scan = scanTest({
      validUm: prepared.validUm,
      totalCount: prepared.xUm.length,
      map,
      window,
    }, { simulations, seed });
    scanP = scan.p;
    warnings.push(...scan.warnings);
  }
  const uncertainty = countUncertainty(count, window.areaMm2, {
    minCount: classification.min_count_for_window as number,
    scanP,
    simulations: simulations === 0 ? 0 : simulations,
    seed,
  });
  return { classification, uncertainty, warnings };
}
