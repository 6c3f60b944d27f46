/**
 * The readers page `DIR/readers.html`: for each reader across the cohort,
 * where their chosen fields sit in each case's distribution of window
 * counts, the shares in the upper half and quarter with 95% intervals, the
 * agreement of the field's grade with the hotspot's, the cases where the two
 * grades differ (linked to those case reports), and, for dated fields, the
 * percentile over time.
 *
 * Reader names and case ids from input are escaped; the page loads nothing
 * from the network.
 *
 * @module
 */

import type { ReaderAuditRow, ReaderFieldEntry } from "../cohort/reader_audit.ts";
import { escapeHtml } from "./html_escape.ts";
import { fmt, type PagePlot, plotlyScriptTag, plotScripts } from "./_page.ts";
import { readerName } from "./plot_labels.ts";
import { readerPercentileFigure, readerTimeFigure } from "./reader_plots.ts";
import { REPORT_CAUTIONS, REPORT_CSS } from "./report_html.ts";

/** What the readers page shows besides the audit. */
export interface ReadersHtmlContext {
  /** Relative path of the shared plotly.js, or null when it is inlined. */
  plotlySrc: string | null;
  /** The plotly.js source to inline when `plotlySrc` is null. */
  plotlyInline?: string;
  /** Generation time shown (ISO 8601), or null to leave it out. */
  generatedAt: string | null;
  /** hotfield version. */
  version: string;
  /** Link cases to `<case>/report.html` (else to `<case>/report.json`). @default true */
  linkHtml?: boolean;
  /** Mention `readers.csv` and link back to `index.html`. @default true */
  linkCsv?: boolean;
}

/** The definitions the page and README state, as plain sentences. */
export const READER_DEFINITIONS: readonly string[] = [
  "Only fields of cases with at least one admissible window position count.",
  "A field is compared with its case through its count, scaled to the standard window's " +
  "area when the field has another area or several parts (count × window area / field area).",
  "Upper half: that count is at least the case's median window count; upper quarter: at " +
  "least its upper quartile (Q3, R-7). Shares carry Wilson score 95% intervals (Wilson 1927).",
  "Percentile: the field's mid-rank percentile among all admissible window positions of its " +
  "case. Shortfall: the hotspot count minus the field's count, in figures per standard window.",
  "Class agreement and kappa (Cohen 1960): whether the field's own count and area meet the " +
  "case scheme's cut-off, against whether the hotspot count does; cases without a scheme " +
  "are left out. Kappa is empty when only one class occurs.",
];

function pct(v: number | null): string {
  return v === null ? "–" : `${(v * 100).toFixed(0)}%`;
}

function ci(v: [number, number] | null): string {
  return v === null ? "" : ` (95% CI ${pct(v[0])}–${pct(v[1])})`;
}

function caseLink(caseId: string, linkHtml: boolean): string {
  const href = `${encodeURIComponent(caseId)}/${linkHtml ? "report.html" : "report.json"}`;
  return `<a href="${escapeHtml(href)}">${escapeHtml(caseId)}</a>`;
}

function countWords(e: ReaderFieldEntry): string {
  return e.comparedCount !== e.count
    ? `${fmt(e.count, 0)} (${fmt(e.comparedCount, 1)} per window)`
    : fmt(e.count, 0);
}

function readerSection(
  row: ReaderAuditRow,
  index: number,
  linkHtml: boolean,
  plots: PagePlot[],
): string {
  const name = escapeHtml(readerName(row.reader));
  const parts: string[] = [];
  parts.push(`<section class="reader" id="reader-${index + 1}">`);
  parts.push(`<h2>Reader: ${name}</h2>`);
  if (row.fields === 0) {
    parts.push(
      `<p class="none">None of this reader's ${row.fieldsNotCounted} field(s) could be ` +
        `compared: their cases have no admissible window position.</p></section>`,
    );
    return parts.join("\n");
  }
  const cards: [string, string, string][] = [
    ["fields", fmt(row.fields, 0), `in ${fmt(row.cases, 0)} case${row.cases === 1 ? "" : "s"}`],
    [
      "upper half",
      pct(row.upperHalfShare),
      `${row.upperHalfFields} of ${row.fields}${ci(row.upperHalfCi95)}`,
    ],
    [
      "upper quarter",
      pct(row.upperQuarterShare),
      `${row.upperQuarterFields} of ${row.fields}${ci(row.upperQuarterCi95)}`,
    ],
    ["median percentile", fmt(row.medianPercentile, 1), "of the fields' percentiles"],
    ["mean shortfall", fmt(row.meanShortfall, 1), "figures per window below the hotspot"],
  ];
  if (row.classPairs > 0) {
    cards.push([
      "class agreement",
      pct(row.classAgreement),
      `${row.classPairs} field${row.classPairs === 1 ? "" : "s"} with a scheme; kappa ${
        row.kappa === null ? "undefined" : fmt(row.kappa, 2)
      }`,
    ]);
  }
  parts.push(
    `<div class="cards">${
      cards.map(([l, v, s]) =>
        `<div class="card"><div class="label">${l}</div><div class="value">${v}</div>` +
        `<div class="sub">${s}</div></div>`
      ).join("")
    }</div>`,
  );
  const fig = readerPercentileFigure(row);
  const id = `plot-reader-${index + 1}`;
  plots.push({ id, figure: { data: fig.data, layout: fig.layout } });
  parts.push(`<h3>Fields across cases</h3>
<div id="${id}" class="plot" style="min-height:${(fig.layout.height as number) + 2}px"></div>
<p class="caption">${
    plots.length === 1 ? escapeHtml(fig.caption) : "Each field's percentile in its case, as above."
  }</p>`);
  const time = readerTimeFigure(row);
  if (time) {
    const tid = `plot-reader-${index + 1}-time`;
    plots.push({ id: tid, figure: { data: time.data, layout: time.layout } });
    parts.push(`<h3>Over time</h3>
<div id="${tid}" class="plot" style="min-height:${(time.layout.height as number) + 2}px"></div>
<p class="caption">${escapeHtml(time.caption)}</p>`);
  }
  const differ = row.entries.filter((e) => e.gradeDiffers === true);
  parts.push(`<h3>Cases where the field's grade differs from the hotspot's</h3>`);
  if (row.classPairs === 0) {
    parts.push(`<p class="none">No case of this reader was graded against a scheme.</p>`);
  } else if (differ.length === 0) {
    parts.push(`<p class="none">None: every field gave the hotspot's grade.</p>`);
  } else {
    const body = differ.map((e) =>
      `<tr><td>${caseLink(e.case, linkHtml)}</td><td>${escapeHtml(e.scheme ?? "–")}</td>` +
      `<td>${countWords(e)}</td><td>${escapeHtml(e.fieldTier ?? "–")}</td>` +
      `<td>${fmt(e.hotspotCount, 0)}</td><td>${escapeHtml(e.hotspotTier ?? "–")}</td>` +
      `<td>${fmt(e.percentile, 1)}</td><td>${e.date ? escapeHtml(e.date) : "–"}</td></tr>`
    );
    parts.push(
      `<div class="table-wrap"><table><thead><tr><th>case</th><th>scheme</th>` +
        `<th>field count</th><th>field grade</th><th>hotspot count</th><th>hotspot grade</th>` +
        `<th>percentile</th><th>date</th></tr></thead><tbody>\n${
          body.join("\n")
        }\n</tbody></table></div>`,
    );
  }
  if (row.fieldsNotCounted > 0) {
    parts.push(
      `<p class="caption">${row.fieldsNotCounted} more field(s) left out: their cases have ` +
        `no admissible window position.</p>`,
    );
  }
  parts.push(`</section>`);
  return parts.join("\n");
}

/**
 * Renders the readers page of a cohort.
 *
 * @param rows From `readerAudit(reports)`.
 * @param context Where plotly.js comes from, generation time and version.
 * @returns A complete HTML document.
 *
 * @example A reader name with markup renders as text
 * ```ts
 * import { renderReadersPage } from "./readers_page.ts";
 * const html = renderReadersPage([{
 *   reader: "<b>x</b>", cases: 0, fields: 0, upperHalfShare: null, upperQuarterShare: null,
 *   medianPercentile: null, meanShortfall: null, classAgreement: null, kappa: null,
 *   upperHalfFields: 0, upperQuarterFields: 0, upperHalfCi95: null, upperQuarterCi95: null,
 *   classPairs: 0, gradeDiffers: 0, fieldsNotCounted: 1, datedFields: 0,
 *   firstDate: null, lastDate: null, entries: [],
 * }], { plotlySrc: "assets/plotly.min.js", generatedAt: null, version: "0.1.0" });
 * if (html.includes("<b>x</b>")) throw new Error("markup from a reader name reached the page");
 * if (!html.includes("&lt;b&gt;x&lt;/b&gt;")) throw new Error("the reader name is missing");
 * ```
 */
export function renderReadersPage(
  rows: readonly ReaderAuditRow[],
  context: ReadersHtmlContext,
): string {
  const linkHtml = context.linkHtml ?? true;
  const plots: PagePlot[] = [];
  const overview = rows.map((r, i) =>
    `<tr><td class="name"><a href="#reader-${i + 1}">${escapeHtml(readerName(r.reader))}</a></td>` +
    `<td>${fmt(r.cases, 0)}</td><td>${fmt(r.fields, 0)}</td>` +
    `<td>${pct(r.upperHalfShare)}${
      r.upperHalfCi95
        ? ` <span class="ci">${pct(r.upperHalfCi95[0])}–${pct(r.upperHalfCi95[1])}</span>`
        : ""
    }</td>` +
    `<td>${pct(r.upperQuarterShare)}${
      r.upperQuarterCi95
        ? ` <span class="ci">${pct(r.upperQuarterCi95[0])}–${pct(r.upperQuarterCi95[1])}</span>`
        : ""
    }</td>` +
    `<td>${fmt(r.medianPercentile, 1)}</td><td>${fmt(r.meanShortfall, 1)}</td>` +
    `<td>${pct(r.classAgreement)}${
      r.classPairs > 0 ? ` <span class="ci">of ${r.classPairs}</span>` : ""
    }</td><td>${fmt(r.kappa, 2)}</td>` +
    `<td>${r.classPairs > 0 ? fmt(r.gradeDiffers, 0) : "–"}</td></tr>`
  );
  const sections = rows.map((r, i) => readerSection(r, i, linkHtml, plots));
  const links = (context.linkCsv ?? true)
    ? `<p class="caption">The same numbers as a table: <a href="readers.csv">readers.csv</a>. ` +
      `Back to the <a href="index.html">cohort page</a>.</p>`
    : "";
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="hotfield ${escapeHtml(context.version)}">
<title>Readers' fields: ${rows.length} reader${rows.length === 1 ? "" : "s"}</title>
<style>${REPORT_CSS}
.ci{color:var(--muted);font-size:12.5px;white-space:nowrap}
td.name{white-space:nowrap}
section.reader{margin-top:26px}
section.reader h2{margin-top:10px}
</style>
${plotlyScriptTag(context)}
</head>
<body>
<main>
<header class="top">
<div class="kicker">hotfield · readers' choice of field</div>
<h1>Readers across the cohort</h1>
<div class="meta">hotfield ${escapeHtml(context.version)}${
    context.generatedAt ? ` · generated ${escapeHtml(context.generatedAt)}` : ""
  }</div>
</header>
<aside class="caution" role="note"><strong>Read with care.</strong><ul>${
    REPORT_CAUTIONS.map((s) => `<li>${escapeHtml(s)}</li>`).join("")
  }<li>These figures describe where fields were placed on these slides; they are a training ` +
    `and quality-assurance aid, not a judgement of a reader's diagnoses.</li></ul></aside>
<section><h2>Overview</h2>
${
      rows.length === 0
        ? `<p class="none">No reader marked a field in these cases.</p>`
        : `<div class="table-wrap"><table><thead><tr><th>reader</th><th>cases</th><th>fields</th>` +
          `<th>upper half (95% CI)</th><th>upper quarter (95% CI)</th><th>median percentile</th>` +
          `<th>mean shortfall</th><th>class agreement</th><th>kappa</th>` +
          `<th>grade differs</th></tr></thead><tbody>\n${
            overview.join("\n")
          }\n</tbody></table></div>`
    }
${links}
<ul class="caption">${READER_DEFINITIONS.map((d) => `<li>${escapeHtml(d)}</li>`).join("")}</ul>
</section>
${sections.join("\n")}
<footer>hotfield ${escapeHtml(context.version)}.</footer>
</main>
${plotScripts(plots, context.plotlySrc ?? "inline")}
</body>
</html>
`;
}
