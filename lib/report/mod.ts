/**
 * Report concern: report.json shape (in `report_types.ts`, re-exported by
 * lib/mod.ts), HTML pages, CSV tables, GeoJSON windows, plot specs as plain
 * data, and the writer of a run's output folder.
 *
 * @module
 */
export {
  ALL_FORMATS,
  generationTime,
  type OutputFormat,
  stableJson,
  writeOutputs,
  type WriteOutputsOptions,
} from "./write_outputs.ts";
export {
  caseHotspotGeoJson,
  hotspotFeatureCollection,
  windowRingPx,
  windowRingUm,
} from "./hotspot_geojson.ts";
export { escapeHtml, jsonForScript } from "./html_escape.ts";
export {
  findPlotlyPath,
  PLOTLY_PACKAGE,
  PLOTLY_VERSION,
  readPlotlyBytes,
  readPlotlyJs,
} from "./plotly_asset.ts";
export {
  admissibleHistogram,
  cohortFigure,
  countMapFigure,
  type CountMapFigureOptions,
  cutoffCount,
  cutoffLabel,
  distributionFigure,
  type HeatmapGrid,
  heatmapGrid,
  MARK_STYLE,
  OKABE_ITO,
  PLOT_CONFIG,
  type PlotFigure,
  READER_STYLES,
  readerName,
  readerStyles,
  windowWords,
} from "./plots.ts";
export { type CaseHtmlContext, renderCaseHtml, REPORT_CAUTIONS } from "./report_html.ts";
export { type CohortHtmlContext, renderCohortIndex } from "./cohort_index.ts";
export {
  CASE_COLUMNS,
  caseRow,
  casesCsv,
  FIELD_COLUMNS,
  fieldRows,
  fieldsCsv,
} from "./report_csv.ts";
