/**
 * The adapter from a finished report to the standards' classifier.
 *
 * @module
 */

import {
  type CaseClassification,
  classifyCounts,
  type ClassifyOptions,
} from "../standards/classify.ts";
import type { GradingScheme } from "../standards/scheme_types.ts";
import type { ReportJson } from "./report_types.ts";

/**
 * Classifies a finished report (hotspot count and lower quartile) against a scheme,
 * with the map's counts for `fraction_at_or_above`.
 *
 * @example A report and a tiny map
 * ```ts
 * import { buildCaseResult, classifyReport, getScheme, parseAnnotations } from "hotfield";
 * // A 4 × 3 mm tissue piece at 1 µm/px with three figures, reported without a scheme.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const { report, map } = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, {
 *   strideUm: 100, bestN: 0,
 * });
 * // Classify the finished report afterwards, under any scheme.
 * const { classification } = classifyReport(report, getScheme("canine-mct-2tier"), map);
 * if (classification.class !== "below") throw new Error(`3 figures against ≥ 7: ${classification.class}`);
 * ```
 */
export function classifyReport(
  report: ReportJson,
  scheme: GradingScheme,
  map: { counts: ArrayLike<number>; admissible: ArrayLike<number> },
  options: ClassifyOptions = {},
): { classification: CaseClassification; warnings: string[] } {
  return classifyCounts(
    {
      hotspotCount: report.hotspot?.count ?? null,
      q1: report.distribution.q1,
      windowAreaMm2: report.window.area_mm2,
      counts: map.counts,
      admissible: map.admissible,
    },
    scheme,
    options,
  );
}
