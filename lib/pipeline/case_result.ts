/**
 * What the per-case pipeline takes and gives: report options and the case
 * result (report.json plus what the outputs draw). Plain data only.
 *
 * @module
 */

import type { CaseData } from "../types.ts";
import type { CountMap, Placement, PreparedCase, WindowShape } from "../count/engine_types.ts";
import type { ReportJson } from "./report_types.ts";

/** Everything the engine produced for one case: report.json plus what outputs draw. */
export interface CaseResult {
  /** The report (`report.json`), rounded for stable text. */
  report: ReportJson;
  /** The case ready for counting: counted figures and the valid region in µm. */
  prepared: PreparedCase;
  /** The counting window. */
  window: WindowShape;
  /** Window counts and coverage at every grid centre. */
  map: CountMap;
  /** The exact hotspot, not rounded; null when no placement is admissible. */
  hotspot: Placement | null;
  /** The top separate windows, hotspot first (empty when `top` is 0). */
  top: Placement[];
  /** The best set of separate single fields, best first (empty when `bestN` is 0). */
  bestFields: Placement[];
  /** The window of one of the best separate fields (null when not computed). */
  bestFieldWindow: WindowShape | null;
  /** The case as read, for provenance (sources, fields). */
  caseData: CaseData;
}

/** Options of `buildCaseResult` (what `hotfield report` passes). */
export interface ReportOptions {
  /** Window area, mm². @default 2.37 */
  areaMm2?: number;
  /** Window shape. @default "rect" */
  shape?: "rect" | "circle";
  /** Aspect width : height of a rectangular window. @default [4, 3] */
  aspect?: [number, number];
  /** Spacing of the grid of window centres, µm. @default 25 */
  strideUm?: number;
  /** Least share of a window inside the valid region for a placement to count, (0, 1]. @default 0.95 */
  minCoverage?: number;
  /** Figures with a score below this are not counted (figures without a score pass). @default 0 */
  minScore?: number;
  /** Figure labels that are counted. @default ["mitotic figure"] */
  countLabels?: string[];
  /** Separate top windows to report. @default 3 */
  top?: number;
  /** Number of single fields in the best field set (0 skips it). @default 10 */
  bestN?: number;
  /** Single-field area, mm². @default 0.2376 */
  fieldAreaMm2?: number;
  /** Grading scheme id (see `listSchemes`); none when absent. */
  scheme?: string;
  /** Scan-test simulations with a scheme, 19–100,000; 0 skips the test. @default 999 */
  simulations?: number;
  /** Seed of the simulations. @default 1 */
  seed?: number;
  /** Grid size limit (cells); a larger grid throws `GridSizeError`. @default 25_000_000 */
  maxGridCells?: number;
  /**
   * Work limit of the case's exact placement searches, in figure tests (see
   * `SearchBudget`); past it they throw `SearchWorkError`. @default 750_000_000
   */
  maxSearchWork?: number;
  /**
   * Classify even when nothing was counted (figures present, none counted) or
   * the figures' unit is in doubt; by default such a case is left
   * unclassified. @default false
   */
  allowEmpty?: boolean;
}
