/**
 * The comparison pages: one per case (`DIR/<case>/comparison.html`) and one
 * for a cohort of pairs (`DIR/index.html`). Self-describing, offline, every
 * input text escaped.
 *
 * @module
 */

import type { ComparisonResult } from "../compare/compare_case.ts";
import type { ComparisonJson, ComparisonSummaryJson } from "../compare/comparison_types.ts";
import type { ComparisonFailure } from "../compare/compare_cohort.ts";
import { escapeHtml } from "./html_escape.ts";
import { fmt, plotlyScriptTag, plotScripts } from "./_page.ts";
import { REPORT_CAUTIONS, REPORT_CSS } from "./report_html.ts";
import {
  blandAltmanFigure,
  comparisonMapFigure,
  countAgreementFigure,
  precisionRecallFigure,
  thresholdFigure,
} from "./compare_plots.ts";
import type { PlotFigure } from "./plot_style.ts";

/** Where plotly.js comes from and what the page header says. */
export interface ComparePageContext {
  /** Relative path of the shared plotly.js, or null when it is inlined. */
  plotlySrc: string | null;
  /** The plotly.js source to inline when `plotlySrc` is null. */
  plotlyInline?: string;
  /** Generation time shown (ISO 8601), or null to leave it out. */
  generatedAt: string | null;
  /** hotfield version. */
  version: string;
}

/** The cautions of a comparison page: the report's, and one about validation. */
export const COMPARE_CAUTIONS: readonly string[] = [
  ...REPORT_CAUTIONS,
  "A comparison supports, and does not replace, the validation of a detector under local " +
  "guidelines: one slide or a small cohort cannot show that a detector is fit for grading.",
];

const EXTRA_CSS = `
.agree{color:#00664a;font-weight:600}.disagree{color:#a33b00;font-weight:600}
.cases td:first-child{white-space:nowrap}
.plots2{display:grid;grid-template-columns:1fr 1fr;gap:14px}
@media (max-width:900px){.plots2{grid-template-columns:1fr}}
`;

const pct = (v: number | null | undefined) =>
  typeof v === "number" && Number.isFinite(v) ? `${(v * 100).toFixed(1)}%` : "–";

function card(label: string, value: string, sub: string, cls = ""): string {
  return `<div class="card"><div class="label">${label}</div><div class="value ${cls}">${value}</div>` +
    `<div class="sub">${sub}</div></div>`;
}

function plotBlock(id: string, fig: PlotFigure): string {
  return `<div id="${id}" class="plot" style="min-height:${
    (fig.layout.height as number) + 2
  }px"></div>\n` +
    `<p class="caption">${escapeHtml(fig.caption)}</p>`;
}

function head(title: string, context: ComparePageContext): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="hotfield ${escapeHtml(context.version)}">
<title>${escapeHtml(title)}</title>
<style>${REPORT_CSS}${EXTRA_CSS}</style>
${plotlyScriptTag(context)}
</head>
<body>
<main>`;
}

function cautions(): string {
  return `<aside class="caution" role="note"><strong>Read with care.</strong><ul>${
    COMPARE_CAUTIONS.map((s) => `<li>${escapeHtml(s)}</li>`).join("")
  }</ul></aside>`;
}

function warningsBlock(warnings: readonly string[]): string {
  return warnings.length === 0
    ? `<p class="none">No warnings.</p>`
    : `<ul class="warnings">${warnings.map((w) => `<li>${escapeHtml(w)}</li>`).join("")}</ul>`;
}

/**
 * Renders the comparison page of one case: headline cards (F1, hotspots,
 * classes), the precision–recall curve with the chosen threshold, the
 * hotspot count against threshold with the cut-off and the agreeing band,
 * the map around both hotspots with TP/FP/FN marks, and tables.
 *
 * @param result The comparison.
 * @param context plotly.js source, generation time, version.
 * @returns A complete HTML document.
 *
 * @example A complete page with three plots
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv } from "hotfield";
 * import { renderComparisonHtml } from "./compare_page.ts";
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
 * const html = renderComparisonHtml(result, { plotlySrc: "../assets/plotly.min.js", generatedAt: null, version: "0.1.0" });
 * for (const id of ["plot-pr", "plot-threshold", "plot-map"]) {
 *   if (!html.includes(`id="${id}"`)) throw new Error(`the page lacks the plot ${id}`);
 * }
 * ```
 */
export function renderComparisonHtml(
  result: ComparisonResult,
  context: ComparePageContext,
): string {
  const j = result.json;
  const d = j.detection, h = j.hotspot, g = j.grade;
  const pr = precisionRecallFigure(j), th = thresholdFigure(j), map = comparisonMapFigure(result);
  const same = g && g.reference_class !== null && g.reference_class === g.candidate_class;
  const cards = [
    card(
      "F1 at the chosen threshold",
      fmt(d.f1, 3),
      `precision ${pct(d.precision)}, recall ${pct(d.recall)}`,
    ),
    card(
      "reference hotspot",
      h.reference ? fmt(h.reference.count, 0) : "none",
      "figures in the standard window",
    ),
    card(
      "candidate hotspot",
      h.candidate ? fmt(h.candidate.count, 0) : "none",
      h.reference_count_at_candidate === null
        ? "–"
        : `its window holds ${h.reference_count_at_candidate} reference figures`,
    ),
    card(
      "hotspots apart",
      h.distance_um === null ? "–" : `${fmt(h.distance_um, 0)} µm`,
      "distance between the window centres",
    ),
    g
      ? card(
        "class",
        same ? "same" : "differs",
        `reference ${escapeHtml(g.reference_class ?? "none")}, candidate ${
          escapeHtml(g.candidate_class ?? "none")
        }`,
        same ? "agree" : "disagree",
      )
      : card("class", "–", "no scheme given"),
  ];
  const agreeText = g
    ? g.agreeing_thresholds.length === 0 ? "at no threshold" : g.agreeing_thresholds.map((
      [a, b],
    ) => (a === b ? a.toFixed(2) : `${a.toFixed(2)}–${b.toFixed(2)}`))
      .join(", ")
    : "–";
  const kv = (rows: [string, string][]) =>
    `<dl class="kv">${rows.map(([k, v]) => `<div><dt>${k}</dt><dd>${v}</dd></div>`).join("")}</dl>`;
  const detail = kv([
    ["matching", `${escapeHtml(j.matching)}, radius ${fmt(j.radius_um, 2)} µm`],
    ["chosen threshold", fmt(j.min_score, 2)],
    ["reference figures", fmt(d.reference, 0)],
    ["candidates at the threshold", fmt(d.candidate, 0)],
    ["TP / FP / FN", `${d.tp} / ${d.fp} / ${d.fn}`],
    [
      "average precision",
      j.average_precision === null ? "not defined" : fmt(j.average_precision, 3),
    ],
    [
      "best F1",
      j.best_f1.f1 === null ? "–" : `${fmt(j.best_f1.f1, 3)} at ${fmt(j.best_f1.threshold, 2)}`,
    ],
    [
      "candidate figures in the reference hotspot",
      h.candidate_count_at_reference === null || h.candidate_count_at_reference === undefined
        ? "–"
        : fmt(h.candidate_count_at_reference, 0),
    ],
    ["scheme", g ? escapeHtml(g.scheme) : "none"],
    [
      "cut-off",
      g
        ? `${escapeHtml(g.cutoff_rule ?? "")} ${fmt(g.cutoff, 2)} (window count ${
          fmt(g.min_count_for_window, 0)
        })`
        : "–",
    ],
    ["thresholds with the same class", escapeHtml(agreeText)],
  ]);
  const sampled = j.curve.filter((_p, i) => i % 10 === 0 || j.curve.length <= 11);
  const curveRows = sampled.map((p) =>
    `<tr><td>${p.threshold.toFixed(2)}</td><td>${p.tp}</td><td>${p.fp}</td><td>${p.fn}</td>` +
    `<td>${fmt(p.precision, 3)}</td><td>${fmt(p.recall, 3)}</td><td>${fmt(p.f1, 3)}</td>` +
    `<td>${fmt(p.hotspot_count, 0)}</td><td>${
      p.class === undefined ? "–" : escapeHtml(p.class ?? "none")
    }</td></tr>`
  ).join("\n");
  return `${head(`Comparison: ${j.case}`, context)}
<header class="top">
<div class="kicker">hotfield · detector against reference</div>
<h1>Comparison: ${escapeHtml(j.case)}</h1>
<div class="meta">hotfield ${escapeHtml(context.version)}${
    context.generatedAt ? ` · generated ${escapeHtml(context.generatedAt)}` : ""
  }</div>
</header>
${cautions()}
<section class="cards">${cards.join("")}</section>
<p class="caption">${escapeHtml(j.scope ?? "")}</p>
<section><h2>Detection: precision and recall</h2>
${plotBlock("plot-pr", pr)}
</section>
<section><h2>Hotspot count against the threshold</h2>
${plotBlock("plot-threshold", th)}
</section>
<section><h2>Where the hotspots are</h2>
${plotBlock("plot-map", map)}
</section>
<section><h2>Numbers</h2>
${detail}
<h3>The curve, every 0.10 (all 101 thresholds are in comparison.json)</h3>
<div class="table-wrap"><table><thead><tr><th>threshold</th><th>TP</th><th>FP</th><th>FN</th>` +
    `<th>precision</th><th>recall</th><th>F1</th><th>hotspot</th><th>class</th></tr></thead>
<tbody>
${curveRows}
</tbody></table></div>
</section>
<section><h2>Warnings</h2>
${warningsBlock(j.warnings)}
</section>
<footer>hotfield ${
      escapeHtml(context.version)
    } · comparison.json holds every number of this page.</footer>
</main>
${
      plotScripts(
        [
          { id: "plot-pr", figure: { data: pr.data, layout: pr.layout } },
          { id: "plot-threshold", figure: { data: th.data, layout: th.layout } },
          { id: "plot-map", figure: { data: map.data, layout: map.layout } },
        ],
        context.plotlySrc ?? "inline",
      )
    }
</body>
</html>
`;
}

/**
 * Renders the cohort comparison page: summary cards, the Bland–Altman plot
 * of hotspot counts, the count agreement scatter, the class table, one row
 * per case (linked to its page) and the failed pairs.
 *
 * @param comparisons The cases.
 * @param summary The cohort summary.
 * @param failed The pairs that failed.
 * @param context plotly.js source, generation time, version.
 * @returns A complete HTML document.
 *
 * @example Case ids are escaped
 * ```ts
 * import { renderComparisonCohortHtml } from "./compare_page.ts";
 * const html = renderComparisonCohortHtml([], {
 *   pooled: { tp: 0, fp: 0, fn: 0, precision: null, recall: null, f1: null }, mean_case_f1: null,
 *   bland_altman: { n: 0, bias: null, lower: null, upper: null }, class_agreement: null, kappa: null,
 * }, [{ id: "<b>", line: 2, reference: "r", candidate: "c", error: "x" }], {
 *   plotlySrc: "assets/plotly.min.js", generatedAt: null, version: "0",
 * });
 * if (html.includes("<b>") || !html.includes("&lt;b&gt;")) throw new Error("a pair name must show as text");
 * ```
 */
export function renderComparisonCohortHtml(
  comparisons: readonly ComparisonJson[],
  summary: ComparisonSummaryJson,
  failed: readonly ComparisonFailure[],
  context: ComparePageContext,
): string {
  const ba = blandAltmanFigure(comparisons, summary), ag = countAgreementFigure(comparisons);
  const p = summary.pooled;
  const cards = [
    card(
      "cases",
      fmt(comparisons.length, 0),
      failed.length > 0 ? `${failed.length} failed` : "all compared",
    ),
    card("pooled F1", fmt(p.f1, 3), `precision ${pct(p.precision)}, recall ${pct(p.recall)}`),
    card("mean case F1", fmt(summary.mean_case_f1, 3), "each case at its threshold"),
    card(
      "hotspot bias",
      fmt(summary.bland_altman.bias, 2),
      `limits ${fmt(summary.bland_altman.lower, 2)} to ${fmt(summary.bland_altman.upper, 2)}`,
    ),
    card(
      "same class",
      pct(summary.class_agreement),
      `Cohen's kappa ${fmt(summary.kappa, 2)}`,
    ),
  ];
  const t = summary.class_table;
  const classTable = t && t.classes.length > 0
    ? `<div class="table-wrap"><table><thead><tr><th>reference ↓ / candidate →</th>${
      t.classes.map((c) => `<th>${escapeHtml(c)}</th>`).join("")
    }</tr></thead><tbody>${
      t.classes.map((c, i) =>
        `<tr><th scope="row">${escapeHtml(c)}</th>${
          t.counts[i].map((v, k) => `<td${i === k ? ' class="agree"' : ""}>${v}</td>`).join("")
        }</tr>`
      ).join("")
    }</tbody></table></div>`
    : `<p class="none">No case was graded (give --scheme or a scheme column).</p>`;
  const rows = comparisons.map((c) => {
    const href = `${encodeURIComponent(c.case)}/comparison.html`;
    const g = c.grade;
    const same = g && g.reference_class !== null && g.reference_class === g.candidate_class;
    return `<tr><td><a href="${escapeHtml(href)}">${escapeHtml(c.case)}</a></td>` +
      `<td>${c.detection.tp}</td><td>${c.detection.fp}</td><td>${c.detection.fn}</td>` +
      `<td>${fmt(c.detection.f1, 3)}</td><td>${fmt(c.average_precision, 3)}</td>` +
      `<td>${c.hotspot.reference ? c.hotspot.reference.count : "none"}</td>` +
      `<td>${c.hotspot.candidate ? c.hotspot.candidate.count : "none"}</td>` +
      `<td>${fmt(c.hotspot.reference_count_at_candidate, 0)}</td>` +
      `<td>${g ? escapeHtml(g.reference_class ?? "none") : "–"}</td>` +
      `<td${g ? (same ? ' class="agree"' : ' class="disagree"') : ""}>${
        g ? escapeHtml(g.candidate_class ?? "none") : "–"
      }</td></tr>`;
  }).join("\n");
  const failedBlock = failed.length === 0 ? "" : `<section><h2>Pairs that failed</h2>
<div class="table-wrap"><table><thead><tr><th>pair</th><th>manifest line</th><th>error</th></tr></thead><tbody>
${
    failed.map((f) =>
      `<tr><td>${escapeHtml(f.id)}</td><td>${f.line}</td><td>${escapeHtml(f.error)}</td></tr>`
    ).join("\n")
  }
</tbody></table></div></section>`;
  return `${head(`Detector comparison: ${comparisons.length} cases`, context)}
<header class="top">
<div class="kicker">hotfield · detector against reference, cohort</div>
<h1>Comparison of ${comparisons.length} case${comparisons.length === 1 ? "" : "s"}</h1>
<div class="meta">hotfield ${escapeHtml(context.version)}${
    context.generatedAt ? ` · generated ${escapeHtml(context.generatedAt)}` : ""
  }</div>
</header>
${cautions()}
<section class="cards">${cards.join("")}</section>
<section><h2>Hotspot counts: candidate against reference</h2>
<div class="plots2"><div>${plotBlock("plot-ba", ba)}</div><div>${
    plotBlock("plot-agree", ag)
  }</div></div>
</section>
<section><h2>Classes</h2>
${classTable}
<p class="caption">Rows: the reference's class; columns: the candidate's at each case's threshold. ` +
    `Cohen's kappa ${fmt(summary.kappa, 3)} over ${summary.graded_cases ?? 0} graded case(s) ` +
    `(undefined, shown –, when both sides use a single class).</p>
</section>
<section><h2>Cases</h2>
<div class="table-wrap"><table class="cases"><thead><tr><th>case</th><th>TP</th><th>FP</th><th>FN</th><th>F1</th>` +
    `<th>AP</th><th>reference hotspot</th><th>candidate hotspot</th><th>reference figures in candidate's window</th>` +
    `<th>reference class</th><th>candidate class</th></tr></thead>
<tbody>
${rows}
</tbody></table></div>
<p class="caption">The same numbers: <a href="comparison.csv">comparison.csv</a> (one row a case) and ` +
    `<a href="comparison-summary.json">comparison-summary.json</a>.</p>
</section>
${failedBlock}
<footer>hotfield ${escapeHtml(context.version)}.</footer>
</main>
${
      plotScripts(
        [
          { id: "plot-ba", figure: { data: ba.data, layout: ba.layout } },
          { id: "plot-agree", figure: { data: ag.data, layout: ag.layout } },
        ],
        context.plotlySrc ?? "inline",
      )
    }
</body>
</html>
`;
}
