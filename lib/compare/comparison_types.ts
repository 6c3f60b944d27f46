/**
 * The shape of `comparison.json` (schema `hotfield.comparison/1`) and of the
 * cohort summary `comparison-summary.json`.
 *
 * The keys named in the comparison issue are a contract: users and outside
 * checks read them. Keys beside them are marked "beside the contract"; never
 * rename or remove a contract key. snake_case keys because the files are
 * read from many languages.
 *
 * @module
 */

import type { MatchMode } from "./match_figures.ts";

/** Schema id written into every comparison. */
export const COMPARISON_SCHEMA = "hotfield.comparison/1" as const;

/** Schema id of the cohort summary (beside the contract). */
export const COMPARISON_SUMMARY_SCHEMA = "hotfield.comparison-summary/1" as const;

/** Detection counts and scores at one threshold. */
export interface DetectionJson {
  /** Reference figures taking part (counted label, inside the valid region). */
  reference: number;
  /** Candidate figures taking part (counted label, inside the valid region, score ≥ threshold). */
  candidate: number;
  /** True positives: paired candidates. */
  tp: number;
  /** False positives: unpaired candidates. */
  fp: number;
  /** False negatives: unpaired reference figures. */
  fn: number;
  /** tp / (tp + fp); null when there are no candidates. */
  precision: number | null;
  /** tp / (tp + fn); null when there are no reference figures. */
  recall: number | null;
  /** 2·tp / (2·tp + fp + fn); null only when both sets are empty. */
  f1: number | null;
}

/** One threshold of the curve. */
export interface CurvePointJson {
  /** Candidates with score ≥ threshold take part (a candidate without a score always does). */
  threshold: number;
  /** True positives at this threshold. */
  tp: number;
  /** False positives at this threshold. */
  fp: number;
  /** False negatives at this threshold. */
  fn: number;
  /** tp / (tp + fp); null when no candidate passes. */
  precision: number | null;
  /** tp / (tp + fn); null without reference figures. */
  recall: number | null;
  /** 2·tp / (2·tp + fp + fn); null only when both sets are empty. */
  f1: number | null;
  /** Exact hotspot count of the candidates with score ≥ threshold; null when no window is admissible. */
  hotspot_count: number | null;
  /** Beside the contract: candidates at or above the threshold. */
  candidate?: number;
  /** Beside the contract: the candidate's class at this threshold (with a scheme). */
  class?: string | null;
  /** Beside the contract: the candidate's tier at this threshold (with a scheme). */
  tier?: string | null;
}

/** A hotspot as the comparison gives it. */
export interface ComparisonPlacementJson {
  /** Window centre, level-0 pixels (to 0.01). */
  center_px: [number, number];
  /** Figures in the closed window. */
  count: number;
  /** Beside the contract: window centre, µm. */
  center_um?: [number, number];
  /** Beside the contract: fraction of the window inside the valid region. */
  coverage?: number;
  /** Beside the contract: count per mm². */
  per_mm2?: number;
}

/** The grade block (with a scheme). */
export interface GradeJson {
  /** The scheme id. */
  scheme: string;
  /** The scheme's primary cut-off, per its area basis, as the source states it. */
  cutoff: number;
  /** The reference hotspot's class (below, field-dependent, above); null without a hotspot. */
  reference_class: string | null;
  /** The candidate's class at the operating threshold; null without a hotspot. */
  candidate_class: string | null;
  /** Closed threshold intervals [lo, hi] on the 0.01 grid where the candidate's class equals the reference's. */
  agreeing_thresholds: [number, number][];
  /** Beside the contract: "≥" or ">". */
  cutoff_rule?: string;
  /** Beside the contract: the least window count meeting the cut-off. */
  min_count_for_window?: number;
  /** Beside the contract: tiers of the two hotspots. */
  reference_tier?: string | null;
  /** Beside the contract. */
  candidate_tier?: string | null;
  /** Beside the contract: what the classes mean. */
  definition?: string;
}

/** `comparison.json`. */
export interface ComparisonJson {
  /** Always `hotfield.comparison/1`. */
  schema: typeof COMPARISON_SCHEMA;
  /** Case id (the folder name of the outputs). */
  case: string;
  /** Matching radius, µm. */
  radius_um: number;
  /** `optimal` or `greedy`. */
  matching: MatchMode;
  /** The operating threshold of `detection`, `hotspot.candidate` and `grade.candidate_class`. */
  min_score: number;
  /** Counts and scores at the operating threshold. */
  detection: DetectionJson;
  /** The 101 thresholds 0.00 … 1.00 (one point without scores). */
  curve: CurvePointJson[];
  /** All-point interpolated AP (PASCAL VOC, 2010 on) over every distinct score; null without scores or references. */
  average_precision: number | null;
  /** Best F1 over the curve's thresholds (ties: the lowest threshold). */
  best_f1: { threshold: number | null; f1: number | null };
  /** Both hotspots and how they relate. */
  hotspot: {
    reference: ComparisonPlacementJson | null;
    candidate: ComparisonPlacementJson | null;
    /** Distance between the two hotspot centres, µm; null when either is missing. */
    distance_um: number | null;
    /** Reference figures inside the candidate's hotspot window. */
    reference_count_at_candidate: number | null;
    /** Beside the contract: candidate figures (at the operating threshold) inside the reference's hotspot window. */
    candidate_count_at_reference?: number | null;
  };
  /** Classes against the scheme; null without a scheme. */
  grade: GradeJson | null;
  /** Recoverable problems, in words. */
  warnings: string[];
  /** Beside the contract: which figures take part, in words. */
  scope?: string;
  /** Beside the contract: how each number was computed. */
  methods?: Record<string, string>;
  /** Beside the contract: window and grid of the hotspots. */
  settings?: {
    window: Record<string, unknown>;
    stride_um: number;
    min_coverage: number;
    count_labels: string[];
    same_slide: boolean;
  };
  /** Beside the contract: figure tallies of both inputs. */
  figures?: {
    reference: Record<string, unknown>;
    candidate: Record<string, unknown> & { without_score: number };
  };
  /** Beside the contract. */
  mpp?: [number, number];
  /** Beside the contract: valid area, mm². */
  valid_area_mm2?: number;
  /** Beside the contract: input files with their sha256. */
  inputs?: { role: string; kind: string; path: string; sha256: string }[];
  /** Beside the contract: the hotfield version. */
  hotfield_version?: string;
}

/** `comparison-summary.json` of a cohort. */
export interface ComparisonSummaryJson {
  /** Beside the contract. */
  schema?: typeof COMPARISON_SUMMARY_SCHEMA;
  /** tp, fp and fn summed over the cases, and the scores of the sums. */
  pooled: {
    tp: number;
    fp: number;
    fn: number;
    precision: number | null;
    recall: number | null;
    f1: number | null;
  };
  /** Mean of the cases' F1 (cases with an F1). */
  mean_case_f1: number | null;
  /** Hotspot counts, candidate − reference, over cases where both have a hotspot. */
  bland_altman: {
    n: number;
    bias: number | null;
    lower: number | null;
    upper: number | null;
    sd?: number | null;
  };
  /** Share of graded cases whose candidate class equals the reference class; null without graded cases. */
  class_agreement: number | null;
  /** Cohen's kappa of the classes over graded cases; null when undefined. */
  kappa: number | null;
  /** Beside the contract. */
  cases?: number;
  /** Beside the contract: pairs that failed, with the message. */
  failed?: { id: string; reference: string; candidate: string; error: string }[];
  /** Beside the contract: cases with both classes known. */
  graded_cases?: number;
  /** Beside the contract: the reference × candidate class table (rows the reference). */
  class_table?: { classes: string[]; counts: number[][] };
  /** Beside the contract: how each number was computed. */
  methods?: Record<string, string>;
  /** Beside the contract: the hotfield version. */
  hotfield_version?: string;
}
