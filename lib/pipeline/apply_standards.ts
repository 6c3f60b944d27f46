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
 * import { applyStandards } from "./apply_standards.ts";
 * import type { CountMap, PreparedCase, WindowShape } from "../count/engine_types.ts";
 * import type { ReportJson } from "./report_types.ts";
 * const window: WindowShape = { shape: "rect", areaMm2: 2.37, widthUm: 1777.6, heightUm: 1333.2, aspect: [4, 3] };
 * const map = {
 *   grid: { x0Um: 888.8, y0Um: 666.6, strideUm: 1777.6, nx: 2, ny: 1 }, window,
 *   counts: new Int32Array([8, 1]), coverage: new Float32Array([1, 1]),
 *   admissible: new Uint8Array([1, 1]), minCoverage: 0.9, positions: 2, discretization: "",
 * } as CountMap;
 * const prepared = {
 *   validUm: [[[[0, 0], [3555.2, 0], [3555.2, 1333.2], [0, 1333.2], [0, 0]]]],
 *   xUm: new Float64Array(9).fill(100), yUm: new Float64Array(9).fill(100),
 * } as unknown as PreparedCase;
 * const report = {
 *   window: { shape: "rect", area_mm2: 2.37, width_um: 1777.6, height_um: 1333.2 },
 *   hotspot: { center_px: [0, 0], count: 8, coverage: 1, per_mm2: 3.38 },
 *   distribution: { positions: 2, min: 1, q1: 2.75, median: 4.5, q3: 6.25, max: 8, mean: 4.5 },
 * } as unknown as ReportJson;
 * const r = applyStandards({ report, prepared, map, window }, { schemeId: "canine-mct-2tier", simulations: 99 });
 * if (r.classification?.tier !== "high" || r.uncertainty?.simulations !== 99) throw new Error();
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
