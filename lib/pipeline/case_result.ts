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
  report: ReportJson;
  prepared: PreparedCase;
  window: WindowShape;
  map: CountMap;
  hotspot: Placement | null;
  top: Placement[];
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
  /** @default "rect" */
  shape?: "rect" | "circle";
  /** @default [4, 3] */
  aspect?: [number, number];
  /** @default 25 */
  strideUm?: number;
  /** @default 0.95 */
  minCoverage?: number;
  /** @default 0 */
  minScore?: number;
  /** @default ["mitotic figure"] */
  countLabels?: string[];
  /** Separate top windows to report. @default 3 */
  top?: number;
  /** Number of single fields in the best field set (0 skips it). @default 10 */
  bestN?: number;
  /** Single-field area, mm². @default 0.2376 */
  fieldAreaMm2?: number;
  /** Grading scheme id; none when absent. */
  scheme?: string;
  /** Monte Carlo simulations for the scheme's uncertainty. */
  simulations?: number;
  /** Seed of the simulations. */
  seed?: number;
  /** Grid size limit (cells). @default 25_000_000 */
  maxGridCells?: number;
  /**
   * Classify even when nothing was counted (figures present, none counted) or
   * the figures' unit is in doubt; by default such a case is left
   * unclassified. @default false
   */
  allowEmpty?: boolean;
}
