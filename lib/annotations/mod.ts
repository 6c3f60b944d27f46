/**
 * Reading a case: annotation GeoJSON, figures CSV, case files, case ids, and
 * `inspect` summaries. Re-exports only.
 *
 * @module
 */
export { ANNOTATION_ROLES, parseAnnotations } from "./read_annotations.ts";
export type {
  AnnotationRole,
  ParseAnnotationsOptions,
  ParsedAnnotations,
} from "./read_annotations.ts";
export { parseFiguresCsv } from "./read_figures_csv.ts";
export type { ParseFiguresCsvOptions } from "./read_figures_csv.ts";
export { CASE_FILE_VERSION, loadCase, parseCaseFile, readCaseFile } from "./read_case.ts";
export type { CaseInput } from "./read_case.ts";
export { MAX_CASE_ID_LENGTH, safeCaseId } from "./case_id.ts";
export {
  MAX_PLAUSIBLE_MPP,
  mergeSlideMembers,
  MIN_PLAUSIBLE_MPP,
  parseSlideInfo,
} from "./slide_info.ts";
export type { SlideMember, SlideReadOptions } from "./slide_info.ts";
export { formatInspectTable, inspectCase } from "./inspect_case.ts";
export type { InspectOptions, InspectResult } from "./inspect_case.ts";
