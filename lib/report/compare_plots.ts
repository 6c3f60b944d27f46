/**
 * Plot specs (plotly.js figures as plain data) of the comparison pages:
 * precision–recall curve, hotspot count against threshold, the map around
 * both hotspots with TP/FP/FN marks, and the cohort's Bland–Altman and
 * count agreement plots.
 *
 * @module
 */

import type { ComparisonResult } from "../compare/compare_case.ts";
import type { ComparisonJson, ComparisonSummaryJson } from "../compare/comparison_types.ts";
import type { MultiPolygonPx } from "../types.ts";
import { OKABE_ITO, PLOT_FONT, type PlotFigure } from "./plot_style.ts";
import { plotText } from "./plot_labels.ts";
import { windowRingUm } from "./hotspot_geojson.ts";

const BASE_LAYOUT = {
  font: PLOT_FONT,
  paper_bgcolor: "#ffffff",
  plot_bgcolor: "#ffffff",
  margin: { l: 64, r: 24, t: 36, b: 56 },
  legend: { orientation: "h", y: -0.2, x: 0 },
};

/** How the comparison marks are drawn (Okabe–Ito colours, distinct shapes). */
export const COMPARE_STYLE = {
  tp: { color: OKABE_ITO.bluishGreen, symbol: "circle", name: "paired (TP)" },
  fp: { color: OKABE_ITO.orange, symbol: "x", name: "candidate only (FP)" },
  fn: { color: OKABE_ITO.vermillion, symbol: "diamond-open", name: "reference only (FN)" },
  reference: { color: OKABE_ITO.blue, dash: "solid", width: 3 },
  candidate: { color: OKABE_ITO.reddishPurple, dash: "dash", width: 3 },
  agree: "rgba(0,158,115,0.14)",
} as const;

const r1 = (v: number) => Math.round(v * 10) / 10;

/**
 * Precision against recall over the curve's thresholds, with the operating
 * threshold and the best-F1 threshold marked.
 *
 * @param json The comparison.
 * @returns The figure.
 *
 * @example The curve of a small comparison
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv } from "hotfield";
 * import { precisionRecallFigure } from "./compare_plots.ts";
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
 * const fig = precisionRecallFigure(result.json);
 * if (fig.data.length < 2) throw new Error(`expected the curve and the chosen threshold, got ${fig.data.length} traces`);
 * ```
 */
export function precisionRecallFigure(json: ComparisonJson): PlotFigure {
  const pts = json.curve.filter((p) => p.precision !== null && p.recall !== null);
  const data: Record<string, unknown>[] = [{
    type: "scatter",
    mode: "lines+markers",
    name: "thresholds 0.00–1.00",
    x: pts.map((p) => p.recall),
    y: pts.map((p) => p.precision),
    line: { color: OKABE_ITO.blue, width: 2, shape: "linear" },
    marker: { size: 4, color: OKABE_ITO.blue },
    text: pts.map((p) => `threshold ${p.threshold.toFixed(2)}: tp ${p.tp}, fp ${p.fp}, fn ${p.fn}`),
    hovertemplate: "%{text}<br>recall %{x:.3f}, precision %{y:.3f}<extra></extra>",
  }];
  const d = json.detection;
  if (d.precision !== null && d.recall !== null) {
    data.push({
      type: "scatter",
      mode: "markers",
      name: `chosen threshold ${json.min_score}`,
      x: [d.recall],
      y: [d.precision],
      marker: {
        symbol: "star",
        size: 16,
        color: OKABE_ITO.vermillion,
        line: { color: "#fff", width: 1 },
      },
      hovertemplate:
        `chosen threshold ${json.min_score}<br>recall %{x:.3f}, precision %{y:.3f}<extra></extra>`,
    });
  }
  const b = json.best_f1;
  const bp = json.curve.find((p) => p.threshold === b.threshold);
  if (bp && bp.precision !== null && bp.recall !== null && json.curve.length > 1) {
    data.push({
      type: "scatter",
      mode: "markers",
      name: `best F1 ${b.f1?.toFixed(3)} at ${b.threshold?.toFixed(2)}`,
      x: [bp.recall],
      y: [bp.precision],
      marker: { symbol: "square-open", size: 13, color: OKABE_ITO.black, line: { width: 2 } },
      hovertemplate: "best F1<extra></extra>",
    });
  }
  return {
    data,
    layout: {
      ...BASE_LAYOUT,
      height: 420,
      xaxis: {
        title: { text: "recall (share of reference figures found)" },
        range: [-0.02, 1.02],
        zeroline: false,
      },
      yaxis: {
        title: { text: "precision (share of candidates that are paired)" },
        range: [-0.02, 1.02],
        zeroline: false,
      },
    },
    caption: `Precision against recall as the score threshold goes from 0.00 to 1.00 (matching ` +
      `${json.matching}, radius ${json.radius_um} µm). Average precision ` +
      `${json.average_precision === null ? "not defined" : json.average_precision.toFixed(3)}. ` +
      "Thresholds where no candidate remains have no precision and are left out.",
  };
}

/**
 * The candidate's hotspot count against the score threshold, with the
 * reference's hotspot count, the cut-off (with a scheme), the chosen
 * threshold and the thresholds where the classes agree shaded; F1 on a
 * second axis.
 *
 * @param json The comparison.
 * @returns The figure.
 *
 * @example Hotspot count against threshold, with the cut-off
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv } from "hotfield";
 * import { thresholdFigure } from "./compare_plots.ts";
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
 * const fig = thresholdFigure(result.json);
 * const shapes = fig.layout.shapes as unknown[];
 * if (shapes.length < 3) throw new Error(`expected reference, cut-off and threshold lines, got ${shapes.length}`);
 * ```
 */
export function thresholdFigure(json: ComparisonJson): PlotFigure {
  const c = json.curve;
  const data: Record<string, unknown>[] = [{
    type: "scatter",
    mode: c.length > 1 ? "lines" : "markers",
    name: "candidate hotspot count",
    x: c.map((p) => p.threshold),
    y: c.map((p) => p.hotspot_count),
    line: { color: COMPARE_STYLE.candidate.color, width: 2.5, shape: "hv" },
    marker: { size: 9, color: COMPARE_STYLE.candidate.color },
    hovertemplate: "threshold %{x:.2f}: hotspot %{y} figures<extra></extra>",
  }, {
    type: "scatter",
    mode: c.length > 1 ? "lines" : "markers",
    name: "F1 (right axis)",
    x: c.map((p) => p.threshold),
    y: c.map((p) => p.f1),
    yaxis: "y2",
    line: { color: OKABE_ITO.skyBlue, width: 1.5, dash: "dot" },
    hovertemplate: "threshold %{x:.2f}: F1 %{y:.3f}<extra></extra>",
  }];
  const shapes: Record<string, unknown>[] = [];
  const annotations: Record<string, unknown>[] = [];
  const ref = json.hotspot.reference;
  if (ref) {
    shapes.push(hline(ref.count, COMPARE_STYLE.reference.color, "solid"));
    annotations.push(
      label(ref.count, `reference hotspot ${ref.count}`, COMPARE_STYLE.reference.color, 1),
    );
  }
  const g = json.grade;
  if (g && g.min_count_for_window !== undefined) {
    shapes.push(hline(g.min_count_for_window, OKABE_ITO.black, "dash"));
    annotations.push(
      label(
        g.min_count_for_window,
        `cut-off ${g.min_count_for_window} (${plotText(g.scheme)})`,
        OKABE_ITO.black,
        0.02,
      ),
    );
    for (const [lo, hi] of g.agreeing_thresholds) {
      shapes.push({
        type: "rect",
        xref: "x",
        yref: "paper",
        x0: lo - 0.005,
        x1: hi + 0.005,
        y0: 0,
        y1: 1,
        fillcolor: COMPARE_STYLE.agree,
        line: { width: 0 },
        layer: "below",
      });
    }
  }
  shapes.push({
    type: "line",
    xref: "x",
    yref: "paper",
    x0: json.min_score,
    x1: json.min_score,
    y0: 0,
    y1: 1,
    line: { color: OKABE_ITO.vermillion, width: 1.5, dash: "dot" },
  });
  const agreeWords = g
    ? g.agreeing_thresholds.length === 0
      ? `The candidate's class never equals the reference's (${g.reference_class ?? "none"}).`
      : `Shaded: thresholds where the candidate's class equals the reference's (${g.reference_class}): ${
        g.agreeing_thresholds.map(([a, b]) =>
          a === b ? a.toFixed(2) : `${a.toFixed(2)}–${b.toFixed(2)}`
        )
          .join(", ")
      }.`
    : "No scheme was given, so no cut-off or class is shown.";
  return {
    data,
    layout: {
      ...BASE_LAYOUT,
      height: 420,
      margin: { l: 64, r: 64, t: 36, b: 56 },
      xaxis: {
        title: { text: "score threshold (candidates with score ≥ threshold)" },
        range: [-0.01, 1.01],
      },
      yaxis: { title: { text: "figures in the hotspot window" }, rangemode: "tozero" },
      yaxis2: {
        title: { text: "F1" },
        overlaying: "y",
        side: "right",
        range: [0, 1.02],
        dtick: 0.2,
        tickformat: ".1f",
        showgrid: false,
      },
      shapes,
      annotations,
    },
    caption:
      `Exact hotspot count of the candidates at each threshold (same window and grid as the ` +
      `reference). Dotted vertical line: the chosen threshold ${json.min_score}. ${agreeWords}`,
  };
}

function hline(y: number, color: string, dash: string): Record<string, unknown> {
  return {
    type: "line",
    xref: "paper",
    yref: "y",
    x0: 0,
    x1: 1,
    y0: y,
    y1: y,
    line: { color, width: 1.5, dash },
  };
}

function label(y: number, text: string, color: string, x: number): Record<string, unknown> {
  return {
    xref: "paper",
    yref: "y",
    x,
    y,
    text,
    showarrow: false,
    xanchor: x > 0.5 ? "right" : "left",
    yanchor: "bottom",
    font: { color, size: 12 },
    bgcolor: "rgba(255,255,255,0.8)",
  };
}

/**
 * The map around both hotspots (µm, y down): the valid region's outline,
 * the reference's and the candidate's hotspot windows, and every figure in
 * view marked as paired (TP), candidate only (FP) or reference only (FN)
 * at the chosen threshold.
 *
 * @param result The comparison result.
 * @param options `marginUm` around the two windows (default a quarter window).
 * @returns The figure.
 *
 * @example The map holds both hotspot windows
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv } from "hotfield";
 * import { comparisonMapFigure } from "./compare_plots.ts";
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
 * const names = comparisonMapFigure(result).data.map((t) => String(t.name));
 * if (!names.some((n) => n.startsWith("reference hotspot")) || !names.some((n) => n.startsWith("candidate hotspot"))) {
 *   throw new Error(`hotspot windows missing from the legend: ${names.join(", ")}`);
 * }
 * ```
 */
export function comparisonMapFigure(
  result: ComparisonResult,
  options: { marginUm?: number } = {},
): PlotFigure {
  const { window, prepared, matching } = result;
  const mpp = prepared.slide;
  const hs = [result.referenceHotspot, result.candidateHotspot].filter((h) => h !== null);
  const ringsOf = hs.map((h) => windowRingUm(window, h!.centerUm));
  const size = window.shape === "rect"
    ? Math.max(window.widthUm, window.heightUm)
    : window.diameterUm;
  const margin = options.marginUm ?? size / 4;
  let box: [number, number, number, number];
  if (ringsOf.length > 0) {
    const xs = ringsOf.flat().map((p) => p[0]), ys = ringsOf.flat().map((p) => p[1]);
    box = [
      Math.min(...xs) - margin,
      Math.min(...ys) - margin,
      Math.max(...xs) + margin,
      Math.max(...ys) + margin,
    ];
  } else {
    const b = bboxOf(prepared.validPx);
    box = [b[0] * mpp.mppX, b[1] * mpp.mppY, b[2] * mpp.mppX, b[3] * mpp.mppY];
  }
  const inBox = (x: number, y: number) => x >= box[0] && x <= box[2] && y >= box[1] && y <= box[3];
  const data: Record<string, unknown>[] = [];
  // Valid region outline (rings that reach into the view).
  const ox: (number | null)[] = [], oy: (number | null)[] = [];
  for (const poly of prepared.validPx) {
    for (const ring of poly) {
      let near = false;
      for (const [x, y] of ring) if (inBox(x * mpp.mppX, y * mpp.mppY)) near = true;
      if (!near) continue;
      for (const [x, y] of ring) {
        ox.push(r1(x * mpp.mppX));
        oy.push(r1(y * mpp.mppY));
      }
      ox.push(null);
      oy.push(null);
    }
  }
  data.push({
    type: "scatter",
    mode: "lines",
    name: "valid region",
    x: ox,
    y: oy,
    line: { color: "#2b2b2b", width: 1.2 },
    hoverinfo: "skip",
  });
  const marks = { tp: [[], []], fp: [[], []], fn: [[], []] } as Record<
    string,
    [number[], number[]]
  >;
  const cand = result.candidates;
  for (let c = 0; c < cand.xUm.length; c++) {
    if (cand.score[c] < matching.minScore) continue;
    const x = cand.xUm[c], y = cand.yUm[c];
    if (!inBox(x, y)) continue;
    const key = matching.refOfCandidate[c] === -1 ? "fp" : "tp";
    marks[key][0].push(r1(x));
    marks[key][1].push(r1(y));
  }
  for (let r = 0; r < result.reference.xUm.length; r++) {
    if (matching.candidateOfRef[r] !== -1) continue;
    const x = result.reference.xUm[r], y = result.reference.yUm[r];
    if (!inBox(x, y)) continue;
    marks.fn[0].push(r1(x));
    marks.fn[1].push(r1(y));
  }
  for (const key of ["tp", "fp", "fn"] as const) {
    const st = COMPARE_STYLE[key];
    data.push({
      type: "scatter",
      mode: "markers",
      name: `${st.name}: ${marks[key][0].length} in view`,
      x: marks[key][0],
      y: marks[key][1],
      marker: {
        symbol: st.symbol,
        size: key === "fn" ? 8 : 6,
        color: st.color,
        line: { color: st.color, width: 1.5 },
      },
      hovertemplate: `${st.name}<br>x %{x:.0f} µm, y %{y:.0f} µm<extra></extra>`,
    });
  }
  const windowTrace = (
    h: NonNullable<ComparisonResult["referenceHotspot"]>,
    who: "reference" | "candidate",
  ) => {
    const ring = windowRingUm(window, h.centerUm);
    const st = COMPARE_STYLE[who];
    return {
      type: "scatter",
      mode: "lines",
      name: `${who} hotspot: ${h.count} figures`,
      x: ring.map((p) => r1(p[0])),
      y: ring.map((p) => r1(p[1])),
      line: { color: st.color, width: st.width, dash: st.dash },
      hovertemplate: `${who} hotspot: ${h.count} figures<extra></extra>`,
    };
  };
  if (result.referenceHotspot) data.push(windowTrace(result.referenceHotspot, "reference"));
  if (result.candidateHotspot) data.push(windowTrace(result.candidateHotspot, "candidate"));
  const j = result.json.hotspot;
  return {
    data,
    layout: {
      ...BASE_LAYOUT,
      height: 640,
      xaxis: {
        title: { text: "x (µm from the slide origin)" },
        range: [box[0], box[2]],
        zeroline: false,
        constrain: "domain",
      },
      yaxis: {
        title: { text: "y (µm, down)" },
        range: [box[3], box[1]],
        scaleanchor: "x",
        scaleratio: 1,
        zeroline: false,
        constrain: "domain",
      },
    },
    caption:
      "Solid window: the reference's hotspot; dashed: the candidate's at the chosen threshold " +
      `${result.json.min_score}` +
      (j.distance_um !== null ? `, ${j.distance_um.toFixed(0)} µm apart` : "") +
      (j.reference_count_at_candidate !== null
        ? `. The candidate's window holds ${j.reference_count_at_candidate} reference figures ` +
          `(the reference hotspot holds ${j.reference?.count ?? "–"}).`
        : ".") +
      " Marks show figures in view only.",
  };
}

function bboxOf(mp: MultiPolygonPx): [number, number, number, number] {
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  for (const poly of mp) {
    for (const ring of poly) {
      for (const [x, y] of ring) {
        if (x < x0) x0 = x;
        if (y < y0) y0 = y;
        if (x > x1) x1 = x;
        if (y > y1) y1 = y;
      }
    }
  }
  return Number.isFinite(x0) ? [x0, y0, x1, y1] : [0, 0, 1, 1];
}

/**
 * Bland–Altman plot of hotspot counts: difference (candidate − reference)
 * against the mean of the two, with the bias and the 95% limits.
 *
 * @param comparisons The cases.
 * @param summary The cohort summary.
 * @returns The figure.
 *
 * @example One case in a Bland–Altman plot
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv, summarizeComparisons } from "hotfield";
 * import { blandAltmanFigure } from "./compare_plots.ts";
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
 * const fig = blandAltmanFigure([result.json], summarizeComparisons([result.json]));
 * if (fig.data.length !== 1) throw new Error(`expected one trace of cases, got ${fig.data.length}`);
 * ```
 */
export function blandAltmanFigure(
  comparisons: readonly ComparisonJson[],
  summary: ComparisonSummaryJson,
): PlotFigure {
  const rows = comparisons.filter((c) => c.hotspot.reference && c.hotspot.candidate);
  const mean = rows.map((c) => (c.hotspot.reference!.count + c.hotspot.candidate!.count) / 2);
  const diff = rows.map((c) => c.hotspot.candidate!.count - c.hotspot.reference!.count);
  const ba = summary.bland_altman;
  const shapes: Record<string, unknown>[] = [];
  const annotations: Record<string, unknown>[] = [];
  shapes.push(hline(0, "#999999", "solid"));
  for (
    const [v, name, dash] of [[ba.bias, "bias", "solid"], [ba.lower, "lower limit", "dash"], [
      ba.upper,
      "upper limit",
      "dash",
    ]] as const
  ) {
    if (v === null) continue;
    shapes.push(hline(v, OKABE_ITO.vermillion, dash));
    annotations.push(label(v, `${name} ${v.toFixed(2)}`, OKABE_ITO.vermillion, 1));
  }
  return {
    data: [{
      type: "scatter",
      mode: "markers",
      name: "case",
      x: mean,
      y: diff,
      text: rows.map((c) => plotText(c.case)),
      marker: { size: 10, color: OKABE_ITO.blue, line: { color: "#fff", width: 1 } },
      hovertemplate: "%{text}<br>mean %{x:.1f}, difference %{y}<extra></extra>",
    }],
    layout: {
      ...BASE_LAYOUT,
      height: 420,
      showlegend: false,
      xaxis: { title: { text: "mean of the two hotspot counts" }, rangemode: "tozero" },
      yaxis: { title: { text: "candidate − reference hotspot count" } },
      shapes,
      annotations,
    },
    caption: `Bland–Altman plot (Bland & Altman 1986, Lancet) of ${ba.n} case(s): bias ` +
      `${ba.bias === null ? "–" : ba.bias.toFixed(2)} figures, 95% limits of agreement ` +
      `${ba.lower === null ? "–" : ba.lower.toFixed(2)} to ${
        ba.upper === null ? "–" : ba.upper.toFixed(2)
      } ` +
      "(bias ± 1.96 × sample SD). Cases without a hotspot in either are left out.",
  };
}

/**
 * Candidate against reference hotspot count per case, with the line of
 * equality and (when every graded case shares one) the cut-off.
 *
 * @param comparisons The cases.
 * @returns The figure.
 *
 * @example Candidate against reference counts
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv } from "hotfield";
 * import { countAgreementFigure } from "./compare_plots.ts";
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
 * const fig = countAgreementFigure([result.json]);
 * if (fig.data.length !== 2) throw new Error(`expected the equality line and the cases, got ${fig.data.length}`);
 * ```
 */
export function countAgreementFigure(comparisons: readonly ComparisonJson[]): PlotFigure {
  const rows = comparisons.filter((c) => c.hotspot.reference && c.hotspot.candidate);
  const x = rows.map((c) => c.hotspot.reference!.count),
    y = rows.map((c) => c.hotspot.candidate!.count);
  const top = Math.max(1, ...x, ...y) * 1.08;
  const cutoffs = new Set(
    comparisons.map((c) => c.grade?.min_count_for_window).filter((v) => v !== undefined),
  );
  const shapes: Record<string, unknown>[] = [];
  if (cutoffs.size === 1) {
    const v = [...cutoffs][0]!;
    shapes.push(
      {
        type: "line",
        x0: v,
        x1: v,
        y0: 0,
        y1: top,
        line: { color: OKABE_ITO.black, dash: "dash", width: 1 },
      },
      {
        type: "line",
        x0: 0,
        x1: top,
        y0: v,
        y1: v,
        line: { color: OKABE_ITO.black, dash: "dash", width: 1 },
      },
    );
  }
  return {
    data: [{
      type: "scatter",
      mode: "lines",
      name: "equal counts",
      x: [0, top],
      y: [0, top],
      line: { color: "#999999", width: 1 },
      hoverinfo: "skip",
    }, {
      type: "scatter",
      mode: "markers",
      name: "case",
      x,
      y,
      text: rows.map((c) => plotText(c.case)),
      marker: { size: 10, color: OKABE_ITO.reddishPurple, line: { color: "#fff", width: 1 } },
      hovertemplate: "%{text}<br>reference %{x}, candidate %{y}<extra></extra>",
    }],
    layout: {
      ...BASE_LAYOUT,
      height: 420,
      showlegend: false,
      xaxis: { title: { text: "reference hotspot count" }, range: [0, top], constrain: "domain" },
      yaxis: {
        title: { text: "candidate hotspot count" },
        range: [0, top],
        scaleanchor: "x",
        scaleratio: 1,
        constrain: "domain",
      },
      shapes,
    },
    caption: "Each case's hotspot count from the candidate figures against the reference's. " +
      (cutoffs.size === 1
        ? "Dashed lines: the cut-off; a case in the top-left or bottom-right quadrant changes sides."
        : "Points above the grey line: the candidate counts more."),
  };
}
