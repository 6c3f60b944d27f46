/**
 * The cohort page `DIR/index.html`: every case of a run with a link to its
 * report, its headline numbers and a chart of hotspot counts by case against
 * the cut-off (and per mm²).
 *
 * @module
 */

import type { CaseResult } from "../pipeline/case_result.ts";
import { escapeHtml } from "./html_escape.ts";
import { cohortFigure } from "./cohort_figure.ts";
import { cutoffCount } from "./plot_labels.ts";
import { type CaseHtmlContext, REPORT_CAUTIONS, REPORT_CSS } from "./report_html.ts";
import { fmt, plotlyScriptTag, plotScripts } from "./_page.ts";

/** Sorts a table by a clicked heading: numbers by `data-v`, text as text. */
const SORT_SCRIPT = `(function () {
  var table = document.getElementById("cases");
  if (!table) return;
  var heads = table.tHead.rows[0].cells;
  Array.prototype.forEach.call(heads, function (th, col) {
    th.style.cursor = "pointer";
    th.title = "sort by this column";
    th.addEventListener("click", function () {
      var down = th.getAttribute("aria-sort") !== "descending";
      Array.prototype.forEach.call(heads, function (h) { h.removeAttribute("aria-sort"); });
      th.setAttribute("aria-sort", down ? "descending" : "ascending");
      var body = table.tBodies[0];
      var rows = Array.prototype.slice.call(body.rows);
      rows.sort(function (a, b) {
        var x = a.cells[col], y = b.cells[col];
        var vx = x.getAttribute("data-v"), vy = y.getAttribute("data-v");
        var c = vx !== null && vy !== null ? Number(vx) - Number(vy)
          : x.textContent.localeCompare(y.textContent);
        return down ? -c : c;
      });
      rows.forEach(function (r) { body.appendChild(r); });
    });
  });
})();`;

/** What the cohort page shows besides the results. */
export interface CohortHtmlContext extends Omit<CaseHtmlContext, "options"> {
  /**
   * Link each case to `<case>/report.html` (else to `<case>/report.json`);
   * a list links those case ids to the page and the others to the JSON.
   * @default true
   */
  linkHtml?: boolean | readonly string[];
  /** Mention `cases.csv` and `fields.csv` beside the table. @default true */
  linkCsv?: boolean;
  /** Link the readers page `readers.html` (and `readers.csv` with `linkCsv`). @default false */
  linkReaders?: boolean;
}

/**
 * Renders the cohort index page.
 *
 * @param results Engine results in the order to list them.
 * @param context Where plotly.js comes from, generation time and version.
 * @returns A complete HTML document.
 *
 * @example Case ids are escaped and linked
 * ```ts
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { renderCohortIndex } from "./cohort_index.ts";
 * // A case whose id holds "&": the link is URL-encoded and the text HTML-escaped.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT&1", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT&1.geojson" });
 * const result = buildCaseResult({ caseId: "QVT&1", ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const html = renderCohortIndex([result], {
 *   plotlySrc: "assets/plotly.min.js", generatedAt: null, version: "0.1.0",
 * });
 * if (!html.includes('href="QVT%261/report.html"')) throw new Error("the case link must be URL-encoded");
 * if (!html.includes(">QVT&amp;1<")) throw new Error("the case id must be HTML-escaped");
 * ```
 */
export function renderCohortIndex(
  results: readonly (Pick<CaseResult, "report"> & { prepared?: { caseId: string } })[],
  context: CohortHtmlContext,
): string {
  const fig = cohortFigure(results);
  const link = context.linkHtml ?? true;
  const linkHtml = (id: string) => typeof link === "boolean" ? link : link.includes(id);
  // Numeric cells carry their value for sorting (data-v); "none" sorts lowest.
  const num = (v: number | null | undefined, digits: number, none = "–") =>
    `<td data-v="${typeof v === "number" && Number.isFinite(v) ? v : -1}">${
      typeof v === "number" ? fmt(v, digits) : none
    }</td>`;
  const rows = results.map((res) => {
    const r = res.report, h = r.hotspot, c = r.classification;
    const id = res.prepared?.caseId ?? r.case; // the folder name
    const href = `${encodeURIComponent(id)}/${linkHtml(id) ? "report.html" : "report.json"}`;
    const problems = ((r.count_problems as string[] | undefined) ?? []).length;
    const cls = c ? escapeHtml(c.class) : problems > 0 ? "<b>not graded</b>" : "–";
    return `<tr><td class="id"><a href="${escapeHtml(href)}">${escapeHtml(r.case)}</a></td>` +
      num(h?.count, 0, "none") + num(h?.per_mm2, 2) +
      num(r.valid_area_mm2, 2) + num(r.distribution.positions, 0) +
      `<td>${c ? escapeHtml(c.scheme) : "–"}</td>` + num(c ? cutoffCount(c) : null, 0) +
      `<td>${cls}</td><td>${c?.tier ? escapeHtml(c.tier) : "–"}</td>` +
      num(r.fields.length, 0) + num(r.warnings.length, 0) + `</tr>`;
  });
  const csvNote = (context.linkCsv ?? true)
    ? `<p class="caption">The same numbers as tables: <a href="cases.csv">cases.csv</a> ` +
      `(one row per case) and <a href="fields.csv">fields.csv</a> (one row per reader's field).</p>`
    : "";
  const readersNote = context.linkReaders
    ? `<p class="caption"><a href="readers.html">Readers' fields across the cohort</a>: where ` +
      `each reader's chosen fields sit in each case's distribution, and how often the field's ` +
      `grade differs from the hotspot's${
        (context.linkCsv ?? true) ? ` (as a table: <a href="readers.csv">readers.csv</a>)` : ""
      }.</p>`
    : "";
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="hotfield ${escapeHtml(context.version)}">
<title>Mitotic count reports: ${results.length} cases</title>
<style>${REPORT_CSS}</style>
${plotlyScriptTag(context)}
</head>
<body>
<main>
<header class="top">
<div class="kicker">hotfield · standardized-area mitotic count</div>
<h1>Cohort of ${results.length} case${results.length === 1 ? "" : "s"}</h1>
<div class="meta">hotfield ${escapeHtml(context.version)}${
    context.generatedAt ? ` · generated ${escapeHtml(context.generatedAt)}` : ""
  }</div>
</header>
<aside class="caution" role="note"><strong>Read with care.</strong><ul>${
    REPORT_CAUTIONS.map((s) => `<li>${escapeHtml(s)}</li>`).join("")
  }</ul></aside>
<section><h2>Cases</h2>
<p class="caption">Click a column's heading to sort by it; click again to reverse.</p>
<div class="table-wrap${
    results.length > 25 ? " scroll" : ""
  }"><table id="cases" class="sortable"><thead><tr><th>case</th><th>hotspot count</th><th>per mm²</th>` +
    `<th>valid mm²</th><th>positions</th><th>scheme</th><th>cut-off (count)</th><th>class</th>` +
    `<th>tier</th><th>fields</th><th>warnings</th></tr></thead>
<tbody>
${rows.join("\n")}
</tbody></table></div>
${csvNote}
${readersNote}
<script>${SORT_SCRIPT}</script>
</section>
<section><h2>Hotspots by case</h2>
<div id="plot-cohort" class="plot" style="min-height:${(fig.layout.height as number) + 2}px"></div>
<p class="caption">${escapeHtml(fig.caption)}</p>
</section>
<footer>hotfield ${escapeHtml(context.version)}.</footer>
</main>
${
      plotScripts(
        [{ id: "plot-cohort", figure: { data: fig.data, layout: fig.layout } }],
        context.plotlySrc ?? "inline",
      )
    }
</body>
</html>
`;
}
