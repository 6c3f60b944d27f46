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
 * import { classifyReport } from "./classify_report.ts";
 * import { getScheme } from "../standards/list_schemes.ts";
 * import type { ReportJson } from "./report_types.ts";
 * const report = {
 *   window: { shape: "circle", area_mm2: 2.37, diameter_um: 1737.1 },
 *   hotspot: { center_px: [0, 0], count: 3, coverage: 1, per_mm2: 1.27 },
 *   distribution: { positions: 2, min: 2, q1: 2.25, median: 2.5, q3: 2.75, max: 3, mean: 2.5 },
 * } as unknown as ReportJson;
 * const map = { counts: new Int32Array([2, 3]), admissible: new Uint8Array([1, 1]) };
 * const { classification } = classifyReport(report, getScheme("canine-mct-2tier"), map);
 * if (classification.class !== "below") throw new Error();
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
