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
 * @example
 * ```ts
 * import { showComparison } from "hotfield";
 * const s = showComparison({ json: { min_score: 0, hotspot: { reference: null }, grade: null, curve: [] } } as never,
 *   "threshold", { inlinePlotly: "never" });
 * if (!s) throw new Error();
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
 * @example
 * ```ts
 * import { showComparisonCohort } from "hotfield";
 * const s = showComparisonCohort([], { bland_altman: { n: 0, bias: null, lower: null, upper: null } } as never);
 * if (!s) throw new Error();
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
