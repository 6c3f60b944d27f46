/**
 * The distribution of window counts of a case as a plotly.js figure (plain data).
 *
 * @module
 */

import type { CaseResult } from "../pipeline/case_result.ts";
import { roundTo } from "../numbers.ts";
import { cutoffCount, cutoffLabel, figureWords, plotText, readerName } from "./plot_labels.ts";
import { MARK_STYLE, OKABE_ITO, PLOT_FONT, type PlotFigure, readerStyles } from "./plot_style.ts";

/**
 * Histogram of admissible window counts: index = count, value = number of positions.
 *
 * @example
 * ```ts
 * import { admissibleHistogram } from "./distribution_figure.ts";
 * // Counts 0, 2, 2 at admissible positions; the 5 is at an inadmissible one.
 * const h = admissibleHistogram({
 *   map: { counts: new Int32Array([0, 2, 2, 5]), admissible: new Uint8Array([1, 1, 1, 0]) },
 * });
 * if (h.join() !== "1,0,2") throw new Error(`histogram ${h.join()}, expected 1,0,2`);
 * ```
 */
export function admissibleHistogram(
  result: { map: Pick<CaseResult["map"], "counts" | "admissible"> },
): number[] {
  const { counts, admissible } = result.map;
  const hist: number[] = [];
  for (let k = 0; k < counts.length; k++) {
    if (!admissible[k]) continue;
    const c = counts[k];
    while (hist.length <= c) hist.push(0);
    hist[c]++;
  }
  return hist;
}

/**
 * The distribution of window counts over every admissible position (bars),
 * with the classification's cut-off (dashed line) when there is one, the
 * hotspot (solid line) and each reader's field (marker per reader).
 *
 * @param result The engine result.
 * @returns The figure.
 *
 * @example Bars count positions per count
 * ```ts
 * import { buildCaseResult, distributionFigure, parseAnnotations } from "hotfield";
 * import { admissibleHistogram } from "./distribution_figure.ts";
 * // A 4 × 3 mm tissue piece at 1 µm/px with three figures.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const result = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const fig = distributionFigure(result);
 * const bars = (fig.data[0].y as number[]).join();
 * if (bars !== admissibleHistogram(result).join()) throw new Error(`bars ${bars}`);
 * if (!fig.caption.includes(`${result.report.distribution.positions} admissible`)) throw new Error(fig.caption);
 * ```
 */
export function distributionFigure(result: CaseResult): PlotFigure {
  const hist = admissibleHistogram(result);
  const total = hist.reduce((a, b) => a + b, 0);
  const data: Record<string, unknown>[] = [{
    type: "bar",
    name: "window positions",
    x: hist.map((_, i) => i),
    y: hist,
    marker: { color: "#8da0b6", line: { color: "#4a5a6e", width: 0.6 } },
    hovertemplate: "%{x} figures: %{y} positions<extra></extra>",
  }];
  const peak = Math.max(1, ...hist);
  const shapes: Record<string, unknown>[] = [];
  const annotations: Record<string, unknown>[] = [];
  const cutoff = cutoffCount(result.report.classification);
  if (cutoff !== null) {
    const at = Number.isInteger(cutoff) ? cutoff - 0.5 : cutoff;
    shapes.push({
      type: "line",
      x0: at,
      x1: at,
      y0: 0,
      y1: 1,
      yref: "paper",
      line: { color: OKABE_ITO.black, width: 2, dash: "dash" },
    });
    annotations.push({
      x: at,
      y: 1,
      yref: "paper",
      text: plotText(cutoffLabel(result.report.classification)),
      showarrow: false,
      xanchor: "left",
      yanchor: "bottom",
      font: { size: 12 },
    });
  }
  if (result.hotspot) {
    data.push({
      type: "scatter",
      mode: "lines",
      name: `hotspot: ${result.hotspot.count}`,
      x: [result.hotspot.count, result.hotspot.count],
      y: [0, peak * 1.08],
      line: { color: MARK_STYLE.hotspot.color, width: 3 },
      hovertemplate: `hotspot: ${figureWords(result.hotspot.count)}<extra></extra>`,
    });
  }
  const fields = result.report.fields;
  const styles = readerStyles(fields.map((f) => f.reader));
  let n = 0;
  for (const [reader, style] of styles) {
    const mine = fields.filter((f) => f.reader === reader);
    const name = plotText(readerName(reader));
    data.push({
      type: "scatter",
      mode: "markers",
      name: `field of ${name}`,
      // A field of another area sits where its count scaled to the window would.
      x: mine.map((f) => roundTo(f.count_scaled_to_window ?? f.count, 3)),
      y: mine.map(() => peak * (1.16 + 0.07 * n)),
      marker: {
        symbol: style.symbol,
        size: 12,
        color: style.color,
        line: { color: "#1a1a1a", width: 1 },
      },
      text: mine.map((f) =>
        `${name}: ${figureWords(f.count)}` +
        (typeof f.count_scaled_to_window === "number"
          ? ` (${f.count_scaled_to_window.toFixed(1)} scaled to the window)`
          : "") +
        (f.percentile === null ? "" : `, percentile ${f.percentile.toFixed(1)}`)
      ),
      hovertemplate: "%{text}<extra></extra>",
    });
    n++;
  }
  if (total === 0) {
    annotations.push({
      x: 0.5,
      y: 0.5,
      xref: "paper",
      yref: "paper",
      text: "No admissible window position",
      showarrow: false,
      font: { size: 16, color: "#8a4b00" },
    });
  }
  const layout: Record<string, unknown> = {
    title: { text: `Counts of all admissible windows: ${plotText(result.report.case)}`, x: 0 },
    font: PLOT_FONT,
    height: 380,
    margin: { l: 70, r: 20, t: 60, b: 55 },
    bargap: 0.08,
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ffffff",
    xaxis: {
      title: { text: "figures in the window" },
      rangemode: "tozero",
      ticks: "outside",
      gridcolor: "#e5e5e5",
    },
    yaxis: {
      title: { text: "grid positions" },
      rangemode: "tozero",
      gridcolor: "#e5e5e5",
    },
    shapes,
    annotations,
    legend: { orientation: "h", x: 0, y: -0.22, xanchor: "left", yanchor: "top" },
  };
  return {
    data,
    layout,
    caption: total === 0
      ? "No admissible window position, so there is no distribution to draw."
      : `How many of the ${total} admissible window positions hold each count.`,
  };
}
