/**
 * Jupyter display helpers for comparisons (plotly figures with an offline
 * HTML fallback). No `Deno.jupyter` here.
 *
 * @module
 */

import type { ComparisonResult } from "../compare/compare_case.ts";
import type { ComparisonJson, ComparisonSummaryJson } from "../compare/comparison_types.ts";
import {
  blandAltmanFigure,
  comparisonMapFigure,
  countAgreementFigure,
  precisionRecallFigure,
  thresholdFigure,
} from "../report/compare_plots.ts";
import type { PlotFigure } from "../report/plot_style.ts";
import {
  type Displayable,
  JUPYTER_DISPLAY,
  plotlyMimeBundle,
  type ShowPlotOptions,
} from "./show.ts";

function shown(figure: () => PlotFigure, options: ShowPlotOptions): Displayable {
  return { [JUPYTER_DISPLAY]: () => plotlyMimeBundle(figure(), options) } as Displayable;
}

/**
 * Shows one comparison's plot: `"pr"` (precision–recall with the chosen
 * threshold), `"threshold"` (hotspot count against threshold, cut-off and
 * agreeing band) or `"map"` (both hotspots with TP/FP/FN marks).
 *
 * @param result The comparison.
 * @param which Which plot. @default "threshold"
 * @param options plotly.js inlining.
 * @returns A displayable object.
 *
 * @example The threshold plot as a plotly mime bundle
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv, JUPYTER_DISPLAY, showComparison } from "hotfield";
 * const geojson = JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-900", mpp: 0.5 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon",
 *       coordinates: [[[0, 0], [8000, 0], [8000, 8000], [0, 8000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint",
 *       coordinates: [[4000, 4000], [4100, 4000], [4200, 4000]] } },
 *   ],
 * });
 * const parsed = parseAnnotations(geojson, { fileName: "QVT-24-900.geojson" });
 * const csv = "x,y,score\n4002,4000,0.9\n4100,4004,0.8\n6000,6000,0.3\n";
 * const { figures } = parseFiguresCsv(csv, { fileName: "detector.csv", mppX: 0.5, mppY: 0.5 });
 * const result = compareCase({ caseId: "QVT-24-900", ...parsed, sources: [] }, { figures }, {
 *   strideUm: 100, scheme: "canine-mct-2tier",
 * });
 * const bundle = showComparison(result, "threshold", { inlinePlotly: "never" })[JUPYTER_DISPLAY]();
 * if (!("application/vnd.plotly.v1+json" in bundle)) throw new Error("no plotly JSON in the bundle");
 * ```
 */
export function showComparison(
  result: ComparisonResult,
  which: "pr" | "threshold" | "map" = "threshold",
  options: ShowPlotOptions = {},
): Displayable {
  return shown(
    () =>
      which === "pr"
        ? precisionRecallFigure(result.json)
        : which === "map"
        ? comparisonMapFigure(result)
        : thresholdFigure(result.json),
    options,
  );
}

/**
 * Shows a cohort's Bland–Altman plot (`"bland-altman"`) or count agreement
 * scatter (`"agreement"`).
 *
 * @example A Bland–Altman plot of one case
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv, JUPYTER_DISPLAY, showComparisonCohort, summarizeComparisons } from "hotfield";
 * const geojson = JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-900", mpp: 0.5 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon",
 *       coordinates: [[[0, 0], [8000, 0], [8000, 8000], [0, 8000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint",
 *       coordinates: [[4000, 4000], [4100, 4000], [4200, 4000]] } },
 *   ],
 * });
 * const parsed = parseAnnotations(geojson, { fileName: "QVT-24-900.geojson" });
 * const csv = "x,y,score\n4002,4000,0.9\n4100,4004,0.8\n6000,6000,0.3\n";
 * const { figures } = parseFiguresCsv(csv, { fileName: "detector.csv", mppX: 0.5, mppY: 0.5 });
 * const result = compareCase({ caseId: "QVT-24-900", ...parsed, sources: [] }, { figures }, {
 *   strideUm: 100, scheme: "canine-mct-2tier",
 * });
 * const shown = showComparisonCohort([result.json], summarizeComparisons([result.json]), "bland-altman", {
 *   inlinePlotly: "never",
 * });
 * if (!("application/vnd.plotly.v1+json" in shown[JUPYTER_DISPLAY]())) throw new Error("no plotly JSON in the bundle");
 * ```
 */
export function showComparisonCohort(
  comparisons: readonly ComparisonJson[],
  summary: ComparisonSummaryJson,
  which: "bland-altman" | "agreement" = "bland-altman",
  options: ShowPlotOptions = {},
): Displayable {
  return shown(
    () =>
      which === "agreement"
        ? countAgreementFigure(comparisons)
        : blandAltmanFigure(comparisons, summary),
    options,
  );
}
