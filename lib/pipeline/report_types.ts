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

/**
 * The counting window (the standard area): a rectangle of `width_um` ×
 * `height_um` (width along slide x) or a circle of `diameter_um`. Lengths are
 * in µm rounded to 0.01; `area_mm2` is the area asked for, as given.
 */
export type ReportWindow =
  | {
    /** A rectangle, sides parallel to the slide axes. */
    shape: "rect";
    /** Window area, mm², as asked for (not rounded). */
    area_mm2: number;
    /** Width along slide x, µm, rounded to 0.01. */
    width_um: number;
    /** Height along slide y, µm, rounded to 0.01. */
    height_um: number;
    /** Aspect width : height as given, e.g. `[4, 3]`. */
    aspect?: [number, number];
  }
  | {
    /** A circle. */
    shape: "circle";
    /** Window area, mm², as asked for (not rounded). */
    area_mm2: number;
    /** Diameter, µm, rounded to 0.01. */
    diameter_um: number;
  };

/** The options the counts depend on, as used (after any case-file settings). */
export interface ReportSettings {
  /** Spacing of the grid of window centres, µm. */
  stride_um: number;
  /** Least share of a window inside the valid region for a placement to count (0–1]. */
  min_coverage: number;
  /** Figures with a score below this are not counted; figures without a score pass. */
  min_score: number;
  /** The figure labels that are counted. */
  count_labels: string[];
  /** How many separate top windows were asked for (0: none). */
  top_k?: number;
  /** Id of the grading scheme applied; null when none was asked for. */
  scheme?: string | null;
  /** Scan-test simulations; present only when a scheme and simulations were given. */
  simulations?: number;
  /** Seed of the scan test; present only when a scheme and a seed were given. */
  seed?: number;
}

/** Figure tallies: every figure point sorted by why it is or is not counted. */
export interface ReportFigures {
  /** Every figure point in the case, of any label. */
  total: number;
  /** Points with a counted label, a score that passes and inside the valid region. */
  counted: number;
  /** Points with a counted label and a passing score, but outside the valid region. */
  outside_valid: number;
  /** Points with a counted label whose score is below `min_score`. */
  below_score: number;
  /** Every figure point by label, counted or not. */
  by_label?: Record<string, number>;
}

/**
 * One placed window: the hotspot, a top-k window or one of the best separate
 * fields. Centres are given in level-0 pixels and in µm from the slide origin
 * (x right, y down).
 */
export interface ReportPlacement {
  /**
   * Window centre in level-0 pixels, rounded to 0.01 px. For the hotspot the
   * centre is written with the fewest decimals (2, 3, 4, 6 or 9) at which a
   * recount of the window there still gives `count`.
   */
  center_px: [number, number];
  /** Counted figures in the closed window (a figure on the edge is inside). */
  count: number;
  /** Share of the window's area inside the valid region, 0–1, rounded to 6 decimals. */
  coverage: number;
  /** `count` divided by the window area, figures per mm², rounded to 4 decimals. */
  per_mm2: number;
  /** Window centre in µm from the slide origin, rounded as `center_px` is. */
  center_um?: [number, number];
  /** Rank among the top windows or the best fields, from 1; absent for `hotspot`. */
  rank?: number;
  /**
   * Hotspot only: how far (µm) the centre can move in any direction before
   * the count changes, rounded to 3 decimals and capped at half the window.
   */
  margin_um?: number;
}

/**
 * The spread of window counts over every admissible grid position (a window
 * placed at random among the admissible places). Every statistic is null
 * when no position is admissible.
 */
export interface ReportDistribution {
  /** Number of admissible grid positions. */
  positions: number;
  /** Least admissible window count; null without positions. */
  min: number | null;
  /** Lower quartile, rounded to 4 decimals; null without positions. */
  q1: number | null;
  /** Median, rounded to 4 decimals; null without positions. */
  median: number | null;
  /** Upper quartile, rounded to 4 decimals; null without positions. */
  q3: number | null;
  /** Greatest admissible window count (the hotspot's count on the grid); null without positions. */
  max: number | null;
  /** Mean window count, rounded to 4 decimals; null without positions. */
  mean: number | null;
  /** How the quartiles were computed, e.g. "R-7 (linear interpolation)". */
  quantile_method?: string;
  /** Histogram of counts: `histogram[c]` = admissible positions whose window holds c figures. */
  histogram?: number[];
}

/**
 * One reader's field checked against the map: a point field is the standard
 * window centred there, a polygon field the area drawn.
 */
export interface ReportField {
  /** The reader's name as given in the file ("" when none). */
  reader: string;
  /** Centre in level-0 pixels (a polygon's centroid), rounded to 0.01 px. */
  center_px: [number, number];
  /** Counted figures in the field (closed: a figure on the edge is inside). */
  count: number;
  /** Share of the field's area inside the valid region, 0–1, rounded to 6 decimals. */
  coverage: number;
  /**
   * Mid-rank percentile of `count` among the admissible positions' counts,
   * 0–100, rounded to 2 decimals: 100 × (#below + ½ × #equal) / positions.
   * Null when no position is admissible.
   */
  percentile: number | null;
  /** What the reader marked: a centre (`point`), a drawn area (`polygon`), separate areas (`polygons`) or circular fields (`circles`). */
  kind?: "point" | "polygon" | "polygons" | "circles";
  /** Hotspot count − the field's comparison count (scaled when `count_scaled_to_window` is set); null without a hotspot. */
  shortfall?: number | null;
  /** Area of the field, mm², rounded to 6 decimals (the window area for a point field). */
  area_mm2?: number;
  /**
   * For a polygon whose area is more than 5% off the window's: `count` ×
   * window area / polygon area, rounded to 4 decimals; null otherwise.
   */
  count_scaled_to_window?: number | null;
  /** Index of the field's feature in the annotation file, from 0. */
  feature_index?: number;
  /** Beside the contract: separate parts counted together (1 for a point or polygon). */
  parts?: number;
  /** Beside the contract: diameter of each circular field, mm (`circles`). */
  field_diameter_mm?: number;
  /** Beside the contract: when the field was read (ISO 8601), as given. */
  date?: string;
  /** Beside the contract: the field's own grade under the report's scheme. */
  grade?: ReportFieldGrade;
}

/** A reader's field graded on its own count and area (with `--scheme`). */
export interface ReportFieldGrade {
  /** Scheme id. */
  scheme: string;
  /** The field's count converted to the scheme's area basis. */
  count_per_scheme_basis: number;
  /** `above` when the field's count meets the scheme's cut-off, else `below`. */
  class: "above" | "below";
  /** The tier the field's count falls in. */
  tier: string;
}

/** Classification against a scheme's cut-off (see `classifyCounts`). */
export type ReportClassification = CaseClassification;

/** Counting uncertainty of the hotspot count (see `countUncertainty`). */
export type ReportUncertainty = CountUncertainty;

/** The whole valid area's count of a small sample (see `ReportJson.whole_area`). */
export interface ReportWholeArea {
  /** Counted figures in the whole valid region. */
  count: number;
  /** Area of the valid region, mm², rounded to 6 decimals. */
  area_mm2: number;
  /** `count` / `area_mm2`, figures per mm², rounded to 4 decimals. */
  per_mm2: number;
  /**
   * `per_mm2` × the window area, rounded to 2 decimals: what a window of the
   * standard area would hold at this density. Not a hotspot count.
   */
  count_per_window_area: number;
}

/** The best set of separate single fields (see `findBestFieldSet`). */
export interface ReportBestFields {
  /** Number of fields asked for. */
  n: number;
  /** Area of one field, mm², as used. */
  field_area_mm2: number;
  /** Shape of one field. */
  shape: "rect" | "circle";
  /** Counted figures in all the fields together. */
  total: number;
  /** The fields, best first (`rank` from 1); fewer than `n` when no more fit. */
  fields: ReportPlacement[];
  /** In words, what the search guarantees about `total` (exact, or within a bound). */
  guarantee: string;
}

/** Where the count map lies on the slide, to redraw it from the report alone. */
export interface ReportMap {
  /** Grid positions along x. */
  nx: number;
  /** Grid positions along y. */
  ny: number;
  /** Centre of the first grid position in level-0 pixels, rounded to 0.01 px. */
  origin_px: [number, number];
  /** Grid spacing along x and y in level-0 pixels, rounded to 4 decimals. */
  stride_px: [number, number];
  /** In words, the map's discretization error (exact for rectangles; a bound for circles). */
  discretization: string;
}

/** Areas of the case's regions, mm², each rounded to 6 decimals (0 when a region is absent). */
export interface ReportAreas {
  /** Union of the tissue outlines. */
  tissue: number;
  /** Union of the tumour outlines. */
  tumour: number;
  /** Area the exclusions removed from tissue ∩ tumour. */
  excluded: number;
  /** Valid region: tissue ∩ tumour − exclusions (a role not given does not restrict). */
  valid: number;
}

/**
 * Where a report came from, written by the commands that write reports
 * (`hotfield report`, `hotfield batch`): what `batch` compares to skip a case
 * that is already done.
 */
export interface ReportProvenance {
  /** The hotfield version that wrote the report. */
  hotfield_version: string;
  /** Every file read for the case, in reading order, with its hex sha256. */
  inputs: { path: string; sha256: string }[];
  /** Hex sha256 of the canonical JSON of the effective settings (see lib/batch/settings.ts). */
  settings_sha256: string;
}

/**
 * The whole report: `report.json`, one per case.
 *
 * Keys are snake_case. The first group (through `warnings`) is the contract;
 * the keys after it are kept beside it and may grow. Lengths are in µm,
 * positions in level-0 pixels (x right, y down), areas in mm².
 */
export interface ReportJson {
  /** Schema id, always {@linkcode REPORT_SCHEMA}. */
  schema: typeof REPORT_SCHEMA;
  /** Case id (file-name safe, see `safeCaseId`). */
  case: string;
  /** The counting window. */
  window: ReportWindow;
  /** The options the counts depend on. */
  settings: ReportSettings;
  /**
   * Area of the valid region (tissue ∩ tumour − exclusions; a role not given
   * does not restrict), mm², rounded to 6 decimals.
   */
  valid_area_mm2: number;
  /** Figure tallies. */
  figures: ReportFigures;
  /**
   * The exact hotspot: the admissible window placement holding the most
   * counted figures, moved off any knife edge. Null when no window placement
   * is admissible (a warning says why; see `whole_area`).
   */
  hotspot: ReportPlacement | null;
  /** The spread of counts over all admissible grid positions. */
  distribution: ReportDistribution;
  /** Each reader's field, in the order of the annotation file. */
  fields: ReportField[];
  /**
   * The class under the scheme in `settings.scheme`; null without a scheme,
   * without a hotspot, or when a count problem leaves the case unclassified.
   */
  classification: ReportClassification | null;
  /** Counting uncertainty of the hotspot count; null whenever `classification` is. */
  uncertainty?: ReportUncertainty | null;
  /** Everything odd about the case, in plain words (empty when nothing is). */
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
   * count, its area and density. Not a hotspot count. Null when a hotspot
   * exists (or the valid area is 0).
   */
  whole_area?: ReportWholeArea | null;
  /** Version of hotfield that wrote the report. */
  hotfield_version?: string;
  /** The files read, with their SHA-256 (hex), in reading order. */
  inputs?: { kind: string; path: string; sha256: string }[];
  /** Micrometres per pixel along x and y, as read. */
  mpp?: [number, number];
  /** Areas of the case's regions. */
  areas_mm2?: ReportAreas;
  /** The top separate windows, hotspot first (`rank` from 1); `settings.top_k` of them at most. */
  top?: ReportPlacement[];
  /** The best set of separate single fields; null when not asked for (`bestN` 0). */
  best_fields?: ReportBestFields | null;
  /** Where the count map lies on the slide. */
  map?: ReportMap;
  /** Where the report came from; added by the commands that write reports. */
  provenance?: ReportProvenance;
  /** Room for keys added later. */
  [extra: string]: unknown;
}
