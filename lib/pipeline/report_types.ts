/**
 * The shape of `report.json` (schema `hotfield.report/1`).
 *
 * The keys named in the engine issue are a contract: users and outside
 * checks read them. Add keys beside them; never rename or remove one.
 * snake_case keys because the file is read from many languages.
 *
 * @module
 */

import type { CaseClassification } from "../standards/classify.ts";
import type { CountUncertainty } from "../standards/uncertainty.ts";

/** Schema id written into every report. */
export const REPORT_SCHEMA = "hotfield.report/1" as const;

/** The counting window (standard area). */
export type ReportWindow =
  | {
    shape: "rect";
    area_mm2: number;
    width_um: number;
    height_um: number;
    aspect?: [number, number];
  }
  | { shape: "circle"; area_mm2: number; diameter_um: number };

/** Options the counts depend on. */
export interface ReportSettings {
  stride_um: number;
  min_coverage: number;
  min_score: number;
  count_labels: string[];
  /** Beside the contract. */
  top_k?: number;
  scheme?: string | null;
  simulations?: number;
  seed?: number;
}

/** Figure tallies, as in `hotfield inspect`. */
export interface ReportFigures {
  total: number;
  counted: number;
  outside_valid: number;
  below_score: number;
  by_label?: Record<string, number>;
}

/** One placed window (the hotspot, a top-k entry or one of a best-n set). */
export interface ReportPlacement {
  center_px: [number, number];
  count: number;
  coverage: number;
  per_mm2: number;
  /** Beside the contract. */
  center_um?: [number, number];
  rank?: number;
  /**
   * Hotspot only: how far (µm) the centre can move before the count changes
   * (3 decimals). The centre is printed with the fewest decimals (2 to 9) at
   * which a recount gives `count`.
   */
  margin_um?: number;
}

/** Summary of counts over every admissible grid position. */
export interface ReportDistribution {
  positions: number;
  min: number | null;
  q1: number | null;
  median: number | null;
  q3: number | null;
  max: number | null;
  mean: number | null;
  /** Beside the contract: how quantiles were computed, e.g. "R-7 (linear interpolation)". */
  quantile_method?: string;
  /** Beside the contract: histogram of counts, index = count, value = positions. */
  histogram?: number[];
}

/** One reader's field checked against the map. */
export interface ReportField {
  reader: string;
  center_px: [number, number];
  count: number;
  coverage: number;
  percentile: number | null;
  /** Beside the contract. */
  kind?: "point" | "polygon";
  shortfall?: number | null;
  area_mm2?: number;
  count_scaled_to_window?: number | null;
  feature_index?: number;
}

/** Classification against a scheme's cut-off (see `classifyCounts`). */
export type ReportClassification = CaseClassification;

/** Counting uncertainty of the hotspot count (see `countUncertainty`). */
export type ReportUncertainty = CountUncertainty;

/** The whole valid area's count of a small sample (see `ReportJson.whole_area`). */
export interface ReportWholeArea {
  /** Counted figures in the whole valid region. */
  count: number;
  /** Area of the valid region, mm². */
  area_mm2: number;
  /** count / area_mm2. */
  per_mm2: number;
  /** per_mm2 × the window area: what a window of the standard area would hold at this density. */
  count_per_window_area: number;
}

/** The whole report. */
export interface ReportJson {
  schema: typeof REPORT_SCHEMA;
  case: string;
  window: ReportWindow;
  settings: ReportSettings;
  valid_area_mm2: number;
  figures: ReportFigures;
  hotspot: ReportPlacement | null;
  distribution: ReportDistribution;
  fields: ReportField[];
  classification: ReportClassification | null;
  uncertainty?: ReportUncertainty | null;
  warnings: string[];
  /**
   * One plain sentence (or two): the hotspot count, the cut-off it meets or
   * misses, the grade, and whether a reader's field choice could change it.
   */
  verdict?: string;
  /**
   * Problems that make the count meaningless (figures present but none
   * counted, coordinates in the wrong unit); each is also in `warnings`. When
   * any is present the case is left unclassified unless `--allow-empty`.
   */
  count_problems?: string[];
  /**
   * When no standard window fits (a small sample): the whole valid area's
   * count, its area (mm², 6 decimals), density (per mm², 4 decimals) and
   * that density times the window area (2 decimals). Not a hotspot count.
   * Null when a hotspot exists.
   */
  whole_area?: ReportWholeArea | null;
  /** Beside the contract. */
  hotfield_version?: string;
  inputs?: { kind: string; path: string; sha256: string }[];
  mpp?: [number, number];
  top?: ReportPlacement[];
  best_fields?: {
    n: number;
    field_area_mm2: number;
    shape: "rect" | "circle";
    total: number;
    fields: ReportPlacement[];
    guarantee: string;
  } | null;
  map?: {
    nx: number;
    ny: number;
    origin_px: [number, number];
    stride_px: [number, number];
    discretization: string;
  };
  [extra: string]: unknown;
}
