/** count concern barrel: re-exports only. @module */
export * from "./tally_figures.ts";
export * from "./make_window.ts";
export {
  countInWindow,
  windowContains,
  type WindowExtents,
  windowExtents,
} from "./window_contains.ts";
export * from "./stride_grid.ts";
export * from "./stamp_window_counts.ts";
export * from "./prepare_case.ts";
export * from "./compute_count_map.ts";
export * from "./find_hotspot.ts";
export * from "./find_top_hotspots.ts";
export * from "./find_best_field_set.ts";
export * from "./summarize_distribution.ts";
export * from "./percentile_rank.ts";
export * from "./check_fields.ts";
export {
  bestFieldSetOptions,
  buildCaseResult,
  type CaseResultParts,
  finishCaseResult,
  prepareCaseFor,
  reportPlacement,
  reportWindow,
  startCaseResult,
} from "./build_case_result.ts";
