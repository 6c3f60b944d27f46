/**
 * hotfield: standardized-area mitotic counting on whole-slide annotations.
 *
 * From annotated figures (points with labels and scores) and tissue, tumour
 * and exclusion outlines, hotfield counts figures in a standard-area window
 * (2.37 mm² by default) at every position over the valid tumour tissue,
 * finds the exact hotspot, summarizes the spread of counts, checks readers'
 * fields against it and classifies the case under a grading scheme, with
 * the uncertainty of the count. It supports, never replaces, a pathologist's
 * diagnosis: follow local guidelines and licensed practice.
 *
 * Slide coordinates are level-0 pixels (x right, y down); lengths are in µm
 * and areas in mm² (names carry their unit: `areaMm2`, `strideUm`, `centerPx`).
 *
 * @example From annotations to a report
 * ```ts
 * import { buildCaseResult, type CaseData, parseAnnotations } from "hotfield";
 *
 * // A 4 × 3 mm tissue piece at 0.5 µm/px with three mitotic figures close together.
 * const geojson = JSON.stringify({
 *   type: "FeatureCollection",
 *   slide: { id: "QVT-24-900", mpp: 0.5 },
 *   features: [
 *     {
 *       type: "Feature", properties: { role: "tissue" },
 *       geometry: { type: "Polygon", coordinates: [[[0, 0], [8000, 0], [8000, 6000], [0, 6000], [0, 0]]] },
 *     },
 *     ...[[4000, 3000], [4100, 3050], [4200, 2950]].map((c) => ({
 *       type: "Feature", properties: { role: "figure", label: "mitotic figure" },
 *       geometry: { type: "Point", coordinates: c },
 *     })),
 *   ],
 * });
 * // Files go through loadCase(); text already in memory through parseAnnotations().
 * const parsed = parseAnnotations(geojson, { fileName: "QVT-24-900.geojson" });
 * const caseData: CaseData = { caseId: "QVT-24-900", ...parsed, sources: [] };
 * const { report } = buildCaseResult(caseData, { bestN: 0, strideUm: 100 });
 * if (report.hotspot?.count !== 3) throw new Error(`hotspot count ${report.hotspot?.count}`);
 * ```
 *
 * @module
 */

// Shared plain-data types and units.
export type {
  BBoxPx,
  CaseData,
  CaseSettings,
  CaseSource,
  FieldSpec,
  FigureSet,
  MultiPolygonPx,
  PolygonPx,
  RegionPart,
  RgbImage,
  Ring,
  SlideInfo,
  TissueSource,
  Vec2,
} from "./types.ts";
export { type Mpp, px2ToMm2, pxToUm, umToPx } from "./units.ts";

export { HOTFIELD_VERSION } from "./version.ts";
export {
  DEFAULT_ASPECT,
  DEFAULT_BEST_N,
  DEFAULT_COUNT_LABELS,
  DEFAULT_FIELD_AREA_MM2,
  DEFAULT_MIN_COVERAGE,
  DEFAULT_MIN_SCORE,
  DEFAULT_SIMULATIONS,
  DEFAULT_STRIDE_UM,
  DEFAULT_TOP,
  DEFAULT_WINDOW_AREA_MM2,
} from "./defaults.ts";

// Planar geometry (never geodesic).
export { multiPolygonAreaPx2, polygonAreaPx2 } from "./geometry/planar_area.ts";
export {
  buildValidRegion,
  type ValidRegion,
  type ValidRegionParts,
} from "./geometry/valid_region.ts";
export { createRegionIndex, type RegionIndex } from "./geometry/region_index.ts";
export { regionBBox } from "./geometry/region_bbox.ts";
export { createOverlapIndex, type OverlapIndex } from "./geometry/window_overlap.ts";

// Statistics.
export { garwoodInterval } from "./stats/garwood.ts";
export { type Agreement, binaryKappa, cohenKappa } from "./stats/kappa.ts";

// Reading a case.
export {
  parseAnnotations,
  type ParseAnnotationsOptions,
  type ParsedAnnotations,
} from "./annotations/read_annotations.ts";
export { parseFiguresCsv, type ParseFiguresCsvOptions } from "./annotations/read_figures_csv.ts";
export { type CaseInput, loadCase, parseCaseFile, readCaseFile } from "./annotations/read_case.ts";
export type { SlideMember } from "./annotations/slide_info.ts";

// The count engine.
export type {
  CircleWindow,
  CountMap,
  FieldCheck,
  FigureTally,
  Placement,
  PreparedCase,
  RectWindow,
  SearchBudget,
  StrideGrid,
  WindowShape,
} from "./count/engine_types.ts";
export { makeWindow, type MakeWindowOptions } from "./count/make_window.ts";
export { prepareCase, type PrepareCaseOptions } from "./count/prepare_case.ts";
export { computeCountMap, type ComputeCountMapOptions } from "./count/compute_count_map.ts";
export { findHotspot, type FindHotspotOptions } from "./count/find_hotspot.ts";
export { findTopHotspots, type FindTopHotspotsOptions } from "./count/find_top_hotspots.ts";
export {
  type BestFieldSet,
  findBestFieldSet,
  type FindBestFieldSetOptions,
} from "./count/find_best_field_set.ts";
export { type Distribution, summarizeDistribution } from "./count/summarize_distribution.ts";
export { percentileRank } from "./count/percentile_rank.ts";
export { checkFields, type CheckFieldsOptions } from "./count/check_fields.ts";
export {
  scanTest,
  type ScanTestInput,
  type ScanTestOptions,
  type ScanTestResult,
} from "./count/scan_test.ts";

// Standards: field optics, grading schemes, classes, uncertainty.
export type {
  AreaBasis,
  ConfidenceMark,
  CountingInstruction,
  GradingScheme,
  LowerBound,
  SchemeSource,
  SchemeTier,
} from "./standards/scheme_types.ts";
export { getScheme, listSchemes } from "./standards/list_schemes.ts";
export {
  convertCount,
  type FieldOfView,
  fieldOfView,
  type FieldOfViewOptions,
  fieldsForArea,
} from "./standards/field_of_view.ts";
export { nottinghamScore } from "./standards/nottingham.ts";
export {
  type CaseClassification,
  classifyCounts,
  type ClassifyCountsInput,
  type ClassifyOptions,
  rateForBasis,
  type TierClassification,
  tierForRate,
} from "./standards/classify.ts";
export {
  type CountUncertainty,
  countUncertainty,
  type CountUncertaintyOptions,
} from "./standards/uncertainty.ts";

// The per-case pipeline and report.json.
export type { CaseResult, ReportOptions } from "./pipeline/case_result.ts";
export { buildCaseResult } from "./pipeline/build_case_result.ts";
export { classifyReport } from "./pipeline/classify_report.ts";
export {
  formatInspectTable,
  inspectCase,
  type InspectOptions,
  type InspectResult,
} from "./pipeline/inspect_case.ts";
export {
  REPORT_SCHEMA,
  type ReportAreas,
  type ReportBestFields,
  type ReportClassification,
  type ReportDistribution,
  type ReportField,
  type ReportFigures,
  type ReportJson,
  type ReportMap,
  type ReportPlacement,
  type ReportProvenance,
  type ReportSettings,
  type ReportUncertainty,
  type ReportWholeArea,
  type ReportWindow,
} from "./pipeline/report_types.ts";

// Outputs.
export {
  type OutputFormat,
  writeOutputs,
  type WriteOutputsOptions,
} from "./report/write_outputs.ts";
export { REPORT_CAUTIONS } from "./report/report_html.ts";
export { CASE_COLUMNS, caseRow } from "./report/report_csv.ts";
export { cohortFigure } from "./report/cohort_figure.ts";
export { countMapFigure, type CountMapFigureOptions } from "./report/count_map_figure.ts";
export { distributionFigure } from "./report/distribution_figure.ts";

export type { PlotFigure } from "./report/plot_style.ts";

// Batch runs and cohort folders (nightly runs, manifests, shards, run history).
export {
  type CaseReports,
  type CohortFilesOptions,
  readCaseReports,
  writeCohortFiles,
} from "./report/write_cohort.ts";
export type { BatchCase, CaseOutcome, CaseSummary } from "./batch/batch_types.ts";
export { type BatchResult, runBatch, type RunBatchOptions } from "./batch/run_batch.ts";
export { readManifest } from "./batch/read_manifest.ts";
export { folderCases } from "./batch/case_sources.ts";

export { type Shard } from "./batch/shard.ts";
export { type RunInfo } from "./batch/run_history.ts";

// Notebooks.
export {
  type Displayable,
  JUPYTER_DISPLAY,
  type MimeBundle,
  type PlotlyInlining,
  showCohort,
  showCountMap,
  showDistribution,
  type ShowPlotOptions,
  showTable,
  type ShowTableOptions,
} from "./display/show.ts";

// Demo data.
export { demoCaseInputs } from "./demo/run_demo.ts";
export { demoSchemes } from "./demo/demo_recipes.ts";

// Reader audit and grading a count made at the microscope (readers area).
export type { FieldKind } from "./types.ts";
export { wilsonInterval } from "./stats/wilson.ts";
export { type CountGrade, gradeCount, type GradeCountOptions } from "./standards/grade_count.ts";
export type { ReportFieldGrade } from "./pipeline/report_types.ts";
export {
  type AuditField,
  type AuditReport,
  readerAudit,
  type ReaderAuditRow,
  type ReaderFieldEntry,
} from "./cohort/reader_audit.ts";
export { readersCsv } from "./report/readers_csv.ts";

export { showReaderFields } from "./display/show_readers.ts";

// Slide files and tissue detection (slide area): OpenSlide reading, PNG/JPEG
// thumbnails, tissue found on a low-resolution image, its GeoJSON and display,
// and the generated slides of tests and demo.
export {
  isOpenSlideAvailable,
  openSlide,
  type SlideFile,
  type SlideLevel,
  type SlideMpp,
} from "./slide/open_slide.ts";

export { otsuThreshold } from "./tissue/otsu_threshold.ts";
export type { Mask } from "./tissue/read_mask.ts";
export {
  detectTissue,
  type DetectTissueOptions,
  TISSUE_METHOD,
  TISSUE_METHOD_VERSION,
  type TissueDetection,
} from "./tissue/detect_tissue.ts";
export {
  detectSlideTissue,
  readSlideImage,
  type ReadSlideImageOptions,
  type SlideFileFacts,
  type SlideImage,
  tissueFeatureCollection,
} from "./annotations/read_slide_file.ts";

export { showTissue } from "./display/show_tissue.ts";
export {
  type SyntheticLevel,
  type SyntheticSlide,
  type SyntheticSlideOptions,
  writeSyntheticSlide,
} from "./demo/synthetic_slide.ts";
export { type SlideDemoCase, writeSlideDemoCase } from "./demo/slide_demo.ts";

// Comparing a detector with a reference, down to the grade (lib/compare/ and its
// outputs, plots and notebook helpers; issue "Comparing a detector with a reference").
export {
  COMPARISON_SCHEMA,
  COMPARISON_SUMMARY_SCHEMA,
  type ComparisonJson,
  type ComparisonPlacementJson,
  type ComparisonSummaryJson,
  type CurvePointJson,
  type DetectionJson,
  type GradeJson,
} from "./compare/comparison_types.ts";
export {
  DEFAULT_MATCH_RADIUS_UM,
  type FigureMatching,
  matchFigures,
  type MatchFiguresOptions,
  type MatchMode,
  type PointsUm,
  type ScoredPointsUm,
} from "./compare/match_figures.ts";
export {
  averagePrecision,
  type DetectionScores,
  detectionScores,
  type RankedPoint,
} from "./compare/detection_scores.ts";
export {
  type CandidateSet,
  compareCase,
  type CompareOptions,
  type ComparisonResult,
} from "./compare/compare_case.ts";
export { readCandidates, type ReadCandidatesOptions } from "./compare/read_candidates.ts";
export {
  compareCohort,
  type CompareCohortOptions,
  type ComparisonFailure,
  type ManifestRow,
  parseComparisonManifest,
  summarizeComparisons,
} from "./compare/compare_cohort.ts";
export { type BlandAltman, blandAltman } from "./stats/bland_altman.ts";

export {
  writeComparisonCase,
  writeComparisonCohort,
  type WriteComparisonOptions,
} from "./report/write_comparison.ts";
export { showComparison, showComparisonCohort } from "./display/show_comparison.ts";

// Hostile input (hardening area): the input limits, the outline check the
// reader applies, the cohort's reserved names, and the errors of refused
// inputs and failed writes.
export {
  MAX_CASE_FILE_BYTES,
  MAX_COUNTED_FIGURES,
  MAX_FIGURE_POINTS,
  MAX_IMAGE_PIXELS,
  MAX_JSON_CONTAINERS,
  MAX_MASK_FILE_BYTES,
  MAX_REGION_VERTICES,
  MAX_SEARCH_WORK,
  MAX_SLIDE_EXTENT_MM,
  MAX_TEXT_INPUT_BYTES,
} from "./defaults.ts";
export {
  type CheckedOutline,
  checkOutline,
  type RingProblem,
  type RingProblemKind,
} from "./geometry/polygon_validity.ts";
export { isReservedCaseId, RESERVED_CASE_IDS } from "./annotations/case_id.ts";
export { InputSizeError } from "./io/read_input.ts";
export { SearchWorkError } from "./errors.ts";
export { OutputWriteError } from "./io/output_transaction.ts";
