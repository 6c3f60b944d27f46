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
 * The cohort at a glance, readable at hundreds of cases: one horizontal bar
 * per case, sorted by hotspot count (highest at the top), with the cut-off of
 * each case's scheme as a mark and exact Poisson 95% limits as error bars
 * when the report has them (left), and the hotspot density per mm² (right,
 * same rows). Cases without a hotspot come last, labelled "no hotspot".
 *
 * @param results Engine results (any order; the figure sorts them).
 * @returns The figure.
 *
 * @example Two cases, sorted with the higher count on top
 * ```ts
 * import { buildCaseResult, cohortFigure, parseAnnotations } from "hotfield";
 * // Two 4 × 3 mm tissue pieces at 1 µm/px, with two and with three figures close together.
 * const result = (caseId: string, figures: number[][]) => {
 *   const parsed = parseAnnotations(JSON.stringify({
 *     type: "FeatureCollection", slide: { id: caseId, mpp: 1 },
 *     features: [
 *       { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *       { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: figures } },
 *     ],
 *   }), { fileName: `${caseId}.geojson` });
 *   return buildCaseResult({ caseId, ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * };
 * const fig = cohortFigure([
 *   result("QVT-24-001", [[1000, 1000], [1100, 1000]]),
 *   result("QVT-24-002", [[2000, 1500], [2100, 1400], [2200, 1500]]),
 * ]);
 * const y = fig.data[0].y as string[];
 * if (y[y.length - 1] !== "QVT-24-002") throw new Error(`top row ${y[y.length - 1]}, expected the higher count`);
 * ```
 */
export function cohortFigure(results: readonly Pick<CaseResult, "report">[]): PlotFigure {
  // Plotly draws the first category at the bottom: sort ascending so the
  // highest count is on top; cases without a hotspot at the very bottom.
  const order = results.map((r, i) => ({ r, i })).sort((a, b) => {
    const ca = a.r.report.hotspot?.count ?? -1, cb = b.r.report.hotspot?.count ?? -1;
    if (ca !== cb) return ca - cb;
    const ia = a.r.report.case, ib = b.r.report.case;
    return ia < ib ? 1 : ia > ib ? -1 : 0;
  }).map(({ r }) => r);
  const ids = order.map((r) => plotText(r.report.case));
  const counts = order.map((r) => r.report.hotspot?.count ?? null);
  const dens = order.map((r) => r.report.hotspot ? roundTo(r.report.hotspot.per_mm2, 3) : null);
  const ci = (
    r: Pick<CaseResult, "report">,
    key: "count_ci95" | "per_mm2_ci95",
    v: number | null,
  ) => {
    const u = r.report.uncertainty;
    if (!u || v === null || !Array.isArray(u[key])) return { plus: null, minus: null };
    return { plus: roundTo(u[key][1] - v, 3), minus: roundTo(v - u[key][0], 3) };
  };
  const countCi = order.map((r, i) => ci(r, "count_ci95", counts[i]));
  const densCi = order.map((r, i) => ci(r, "per_mm2_ci95", dens[i]));
  const hasCi = countCi.some((c) => c.plus !== null);
  const bars = (
    name: string,
    x: (number | null)[],
    err: { plus: number | null; minus: number | null }[],
    axes: [string, string],
    marker: Record<string, unknown>,
    hover: string,
  ) => ({
    type: "bar",
    orientation: "h",
    name,
    y: ids,
    x,
    marker,
    error_x: hasCi
      ? {
        type: "data",
        symmetric: false,
        array: err.map((c) => c.plus),
        arrayminus: err.map((c) => c.minus),
        color: "#333",
        thickness: 1.1,
        width: 2,
      }
      : { visible: false },
    hovertemplate: hover,
    xaxis: axes[0],
    yaxis: axes[1],
  });
  const data: Record<string, unknown>[] = [
    bars(
      "hotspot count",
      counts,
      countCi,
      ["x", "y"],
      { color: OKABE_ITO.blue },
      "%{y}: %{x} figures in the hotspot<extra></extra>",
    ),
  ];
  const cut = order.map((r) => cutoffCount(r.report.classification));
  if (cut.some((c) => c !== null)) {
    data.push({
      type: "scatter",
      mode: "markers",
      name: "cut-off (count per window)",
      y: ids,
      x: cut,
      marker: { symbol: "line-ns-open", size: 14, color: OKABE_ITO.vermillion, line: { width: 3 } },
      text: order.map((r) => plotText(cutoffLabel(r.report.classification))),
      hovertemplate: "%{y}: %{text}<extra></extra>",
      xaxis: "x",
      yaxis: "y",
    });
  }
  data.push(
    bars(
      "hotspot per mm²",
      dens,
      densCi,
      ["x2", "y"],
      { color: OKABE_ITO.skyBlue, pattern: { shape: "/", fgcolor: "#2b6f99", size: 6 } },
      "%{y}: %{x:.2f} figures per mm²<extra></extra>",
    ),
  );
  const annotations = order.flatMap((r, i) =>
    r.report.hotspot ? [] : [{
      y: ids[i],
      yref: "y",
      x: 0,
      xref: "x domain",
      xanchor: "left",
      text: "no hotspot (no window fits)",
      showarrow: false,
      font: { size: 11, color: "#8a4b00" },
    }]
  );
  const rowPx = order.length > 60 ? 14 : 22;
  const layout: Record<string, unknown> = {
    font: PLOT_FONT,
    height: Math.max(340, 150 + rowPx * order.length),
    margin: { l: 20, r: 20, t: 95, b: 50 },
    yaxis: {
      type: "category",
      automargin: true,
      tickfont: { size: order.length > 60 ? 10 : 12 },
    },
    xaxis: {
      domain: [0, 0.62],
      title: { text: "figures in the window" },
      rangemode: "tozero",
      gridcolor: "#e5e5e5",
      side: "top",
    },
    xaxis2: {
      domain: [0.68, 1],
      anchor: "y",
      title: { text: "figures per mm²" },
      rangemode: "tozero",
      gridcolor: "#e5e5e5",
      side: "top",
    },
    annotations,
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ffffff",
    legend: { orientation: "h", x: 0, y: 0, xanchor: "left", yanchor: "top" },
    bargap: 0.3,
  };
  return {
    data,
    layout,
    caption: "Left: figures in each case's hotspot window, highest first" +
      (cut.some((c) => c !== null) ? ", with the cut-off of its scheme (red mark)" : "") +
      (hasCi ? "; error bars are exact Poisson 95% limits" : "") +
      ". Right: the same hotspots as figures per mm².",
  };
}
