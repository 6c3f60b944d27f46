/**
 * Compare concern: a detector's figures against a reference case, from
 * pairs of figures up to the grade, for one case or a cohort of pairs.
 * Re-exports only.
 *
 * @module
 */
export * from "./comparison_types.ts";
export * from "./match_figures.ts";
export * from "./detection_scores.ts";
export * from "./compare_case.ts";
export * from "./read_candidates.ts";
export * from "./compare_cohort.ts";
