/**
 * The cohort at a glance as a plotly.js figure (plain data).
 *
 * @module
 */

import type { CaseResult } from "../pipeline/case_result.ts";
import { cutoffCount, cutoffLabel, plotText } from "./plot_labels.ts";
import { OKABE_ITO, PLOT_FONT, type PlotFigure } from "./plot_style.ts";
import { roundTo } from "../numbers.ts";

/**
 * The cohort at a glance: hotspot count of each case against its cut-off
 * (top) and the hotspot density per mm² (bottom), with exact Poisson 95%
 * limits as error bars when the report has them. Cases without a hotspot
 * are named on the axis with no bar.
 *
 * @param results Engine results, drawn in the order given.
 * @returns The figure.
 *
 * @example Two cases, two bars
 * ```ts
 * import { cohortFigure } from "./cohort_figure.ts";
 * const r = (id: string, count: number) => ({
 *   report: { case: id, hotspot: { count, per_mm2: count / 2.37 }, classification: null },
 * });
 * const fig = cohortFigure([r("QVT-24-001", 12), r("QVT-24-002", 3)] as never);
 * if ((fig.data[0].y as number[]).join() !== "12,3") throw new Error();
 * ```
 */
export function cohortFigure(results: readonly Pick<CaseResult, "report">[]): PlotFigure {
  const ids = results.map((r) => plotText(r.report.case));
  const counts = results.map((r) => r.report.hotspot?.count ?? null);
  const dens = results.map((r) => r.report.hotspot ? roundTo(r.report.hotspot.per_mm2, 3) : null);
  const ci = (
    r: Pick<CaseResult, "report">,
    key: "count_ci95" | "per_mm2_ci95",
    v: number | null,
  ) => {
    const u = r.report.uncertainty;
    if (!u || v === null || !Array.isArray(u[key])) return { plus: null, minus: null };
    return { plus: roundTo(u[key][1] - v, 3), minus: roundTo(v - u[key][0], 3) };
  };
  const countCi = results.map((r, i) => ci(r, "count_ci95", counts[i]));
  const densCi = results.map((r, i) => ci(r, "per_mm2_ci95", dens[i]));
  const hasCi = countCi.some((c) => c.plus !== null);
  const data: Record<string, unknown>[] = [{
    type: "bar",
    name: "hotspot count",
    x: ids,
    y: counts,
    marker: { color: OKABE_ITO.blue },
    error_y: hasCi
      ? {
        type: "data",
        symmetric: false,
        array: countCi.map((c) => c.plus),
        arrayminus: countCi.map((c) => c.minus),
        color: "#333",
        thickness: 1.2,
      }
      : { visible: false },
    hovertemplate: "%{x}: %{y} figures in the hotspot<extra></extra>",
    xaxis: "x",
    yaxis: "y",
  }];
  const cut = results.map((r) => cutoffCount(r.report.classification));
  if (cut.some((c) => c !== null)) {
    data.push({
      type: "scatter",
      mode: "markers",
      name: "cut-off (count per window)",
      x: ids,
      y: cut,
      marker: { symbol: "line-ew-open", size: 34, color: OKABE_ITO.vermillion, line: { width: 3 } },
      text: results.map((r) => plotText(cutoffLabel(r.report.classification))),
      hovertemplate: "%{x}: %{text}<extra></extra>",
      xaxis: "x",
      yaxis: "y",
    });
  }
  data.push({
    type: "bar",
    name: "hotspot per mm²",
    x: ids,
    y: dens,
    marker: { color: OKABE_ITO.skyBlue, pattern: { shape: "/", fgcolor: "#2b6f99", size: 6 } },
    error_y: hasCi
      ? {
        type: "data",
        symmetric: false,
        array: densCi.map((c) => c.plus),
        arrayminus: densCi.map((c) => c.minus),
        color: "#333",
        thickness: 1.2,
      }
      : { visible: false },
    hovertemplate: "%{x}: %{y:.2f} figures per mm²<extra></extra>",
    xaxis: "x2",
    yaxis: "y2",
  });
  const annotations = results.flatMap((r, i) =>
    r.report.hotspot ? [] : [{
      x: ids[i],
      xref: "x",
      y: 0.5,
      yref: "y domain",
      text: "no hotspot",
      showarrow: false,
      bgcolor: "rgba(255,255,255,0.85)",
      font: { size: 12, color: "#8a4b00" },
    }]
  );
  const layout: Record<string, unknown> = {
    title: { text: "Hotspot counts by case", x: 0, y: 0.985, yanchor: "top" },
    font: PLOT_FONT,
    height: 580,
    margin: { l: 70, r: 20, t: 95, b: 90 },
    grid: { rows: 2, columns: 1, pattern: "independent", roworder: "top to bottom" },
    xaxis: { type: "category", tickangle: -30, automargin: true },
    xaxis2: { type: "category", tickangle: -30, automargin: true, matches: "x" },
    yaxis: { title: { text: "figures in the window" }, rangemode: "tozero", gridcolor: "#e5e5e5" },
    yaxis2: { title: { text: "figures per mm²" }, rangemode: "tozero", gridcolor: "#e5e5e5" },
    annotations,
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ffffff",
    legend: { orientation: "h", x: 0, y: 1.03, xanchor: "left", yanchor: "bottom" },
    bargap: 0.35,
  };
  return {
    data,
    layout,
    caption: "Top: figures in each case's hotspot window" +
      (cut.some((c) => c !== null) ? " with the cut-off of its scheme" : "") +
      (hasCi ? "; error bars are exact Poisson 95% limits" : "") +
      ". Bottom: the same hotspots as figures per mm².",
  };
}
