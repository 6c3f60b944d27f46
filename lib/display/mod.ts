/**
 * Display concern: Jupyter mime bundles for hotfield results (plotly JSON
 * with an offline HTML fallback, tables). No `Deno.jupyter` here.
 *
 * @module
 */
export {
  type Displayable,
  JUPYTER_DISPLAY,
  type MimeBundle,
  type PlotlyInlining,
  plotlyMimeBundle,
  resetPlotlyInlining,
  showCohort,
  showCountMap,
  showDistribution,
  type ShowPlotOptions,
  showTable,
  type ShowTableOptions,
} from "./show.ts";
