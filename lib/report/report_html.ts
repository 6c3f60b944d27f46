/**
 * The per-case HTML report (`DIR/<case>/report.html`): one self-describing
 * page that opens offline, with the cautions, the count map, the
 * distribution of window counts and tables of every number.
 *
 * Everything taken from input is escaped (text with {@linkcode escapeHtml},
 * plot data with {@linkcode jsonForScript}); the page loads nothing from the
 * network.
 *
 * @module
 */

import type { CaseResult } from "../pipeline/case_result.ts";
import type { ReportPlacement } from "../pipeline/report_types.ts";
import { escapeHtml } from "./html_escape.ts";
import { type CaseHtmlContext, fmt, plotlyScriptTag, plotScripts } from "./_page.ts";
import { countMapFigure } from "./count_map_figure.ts";
import { distributionFigure } from "./distribution_figure.ts";
import { cutoffCount, readerName, windowWords } from "./plot_labels.ts";

export type { CaseHtmlContext };

/** The cautions every report carries, as plain sentences. */
export const REPORT_CAUTIONS: readonly string[] = [
  "hotfield is a research and quality-assurance aid, not a diagnosis.",
  "A pathologist reviews the slide and confirms every count and grade.",
  "Follow local grading guidelines and licensed practice; the numbers here " +
  "depend on the annotations, the figure labels and the options shown below.",
];

function pct(value: unknown, digits = 1): string {
  return typeof value === "number" && Number.isFinite(value)
    ? `${(value * 100).toFixed(digits)}%`
    : "–";
}

function px(c: [number, number] | undefined): string {
  return c ? `${c[0].toFixed(0)}, ${c[1].toFixed(0)}` : "–";
}

function table(head: string[], rows: string[][], cls = ""): string {
  const th = head.map((h) => `<th scope="col">${h}</th>`).join("");
  const body = rows.map((r) => `<tr>${r.map((c) => `<td>${c}</td>`).join("")}</tr>`).join("\n");
  return `<div class="table-wrap"><table class="${cls}"><thead><tr>${th}</tr></thead>` +
    `<tbody>\n${body}\n</tbody></table></div>`;
}

function keyValues(rows: [string, string][]): string {
  return `<dl class="kv">${
    rows.map(([k, v]) => `<div><dt>${k}</dt><dd>${v}</dd></div>`).join("")
  }</dl>`;
}

/** An option's value as plain text: lists joined, objects as key: value pairs. */
function plainValue(value: unknown): string {
  if (value === undefined || value === null) return "–";
  if (Array.isArray(value)) return value.map((v) => plainValue(v)).join(", ");
  if (typeof value === "object") {
    return Object.keys(value as Record<string, unknown>).sort().map((k) =>
      `${escapeHtml(k)}: ${plainValue((value as Record<string, unknown>)[k])}`
    ).join("; ");
  }
  return escapeHtml(String(value));
}

/** Shared page style: our own quiet, print-friendly look. */
export const REPORT_CSS = `
:root{--ink:#1b1f24;--muted:#5b6570;--line:#d5dae0;--panel:#f6f7f9;--accent:#0072B2;--warn:#8a4b00;--warnbg:#fff6e6}
*{box-sizing:border-box}
body{margin:0;font:15px/1.5 system-ui,-apple-system,"Segoe UI",Roboto,"Helvetica Neue",Arial,sans-serif;color:var(--ink);background:#fff}
main{max-width:1180px;margin:0 auto;padding:24px 28px 48px}
header.top{border-bottom:3px solid var(--ink);padding-bottom:12px;margin-bottom:18px}
header.top .kicker{font-size:12px;letter-spacing:.08em;text-transform:uppercase;color:var(--muted)}
h1{font-size:28px;margin:2px 0 4px;font-weight:700}
h2{font-size:19px;margin:34px 0 10px;padding-bottom:4px;border-bottom:1px solid var(--line)}
h3{font-size:15px;margin:18px 0 6px}
.meta{color:var(--muted);font-size:13px}
.caution{border-left:5px solid var(--warn);background:var(--warnbg);padding:10px 14px;margin:14px 0;border-radius:2px}
.caution strong{color:var(--warn)}
.caution ul{margin:4px 0 0 18px;padding:0}
.cards{display:grid;grid-template-columns:repeat(auto-fit,minmax(170px,1fr));gap:10px;margin:14px 0}
.card{background:var(--panel);border:1px solid var(--line);border-radius:4px;padding:10px 12px}
.card .label{font-size:12px;color:var(--muted);text-transform:uppercase;letter-spacing:.05em}
.card .value{font-size:24px;font-weight:700;font-variant-numeric:tabular-nums}
.card .sub{font-size:12px;color:var(--muted)}
.plot{width:100%;min-height:360px;border:1px solid var(--line);border-radius:4px}
.caption{font-size:13px;color:var(--muted);margin:6px 0 0}
.table-wrap{overflow-x:auto}
td.id{white-space:nowrap}
.table-wrap.scroll{max-height:560px;overflow-y:auto;border:1px solid var(--line)}
.table-wrap.scroll thead th{position:sticky;top:0;z-index:1}
table{border-collapse:collapse;width:100%;font-size:14px;font-variant-numeric:tabular-nums;margin:4px 0 8px}
th,td{text-align:left;padding:5px 10px;border-bottom:1px solid var(--line);vertical-align:top}
th{background:var(--panel);font-weight:600}
td.hash,code{font-family:ui-monospace,SFMono-Regular,Menlo,Consolas,monospace;font-size:12.5px;word-break:break-all}
dl.kv{display:grid;grid-template-columns:repeat(auto-fit,minmax(260px,1fr));gap:2px 18px;margin:4px 0}
dl.kv div{display:flex;gap:8px;border-bottom:1px dotted var(--line);padding:3px 0}
dl.kv dt{color:var(--muted);min-width:150px}
dl.kv dd{margin:0;font-variant-numeric:tabular-nums}
.warnings li{margin:2px 0}
.verdict{font-size:17px;line-height:1.45;border-left:5px solid var(--accent);background:#eef5fb;padding:10px 14px;margin:14px 0;border-radius:2px}
.verdict .label{display:block;font-size:12px;letter-spacing:.06em;text-transform:uppercase;color:var(--muted)}
.problem{border-left:5px solid #b00020;background:#fdecee;padding:10px 14px;margin:14px 0;border-radius:2px}
.problem strong{color:#b00020}
.problem ul,.warnbox ul{margin:4px 0 0 18px;padding:0}
.warnbox{border-left:5px solid var(--warn);background:var(--warnbg);padding:10px 14px;margin:14px 0;border-radius:2px}
.warnbox strong{color:var(--warn)}
.explain{font-size:13px;color:var(--muted);margin:2px 0 10px}
.back{font-size:13px}
dl.kv dd.text{word-break:normal;overflow-wrap:break-word}
.none{color:var(--muted);font-style:italic}
.noplot{padding:24px;color:var(--warn)}
footer{margin-top:40px;font-size:12px;color:var(--muted);border-top:1px solid var(--line);padding-top:10px}
@media print{.plot{break-inside:avoid}}
`;

/** Plain words for the classes. */
const CLASS_WORDS: Record<string, string> = {
  below: "hotspot below the cut-off",
  above: "most placements reach the cut-off",
  "field-dependent": "the field chosen decides",
};

/** "1 figure", "3 figures". */
function countWords(n: number): string {
  return `${n} figure${n === 1 ? "" : "s"}`;
}

function placementRow(label: string, p: ReportPlacement, areaMm2: number): string[] {
  return [
    label,
    fmt(p.count, 0),
    fmt(areaMm2, 4),
    fmt(p.per_mm2, 2),
    pct(p.coverage),
    px(p.center_px),
    p.center_um ? `${p.center_um[0].toFixed(0)}, ${p.center_um[1].toFixed(0)}` : "–",
  ];
}

/**
 * Renders the HTML report of one case.
 *
 * @param result The engine result of the case.
 * @param context Where plotly.js comes from, the generation time, version and options.
 * @returns A complete HTML document.
 *
 * @example Names from input are escaped
 * ```ts
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { renderCaseHtml } from "./report_html.ts";
 * // A case id holding markup is shown as text.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const result = buildCaseResult({ caseId: "<b>QVT</b>", ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const html = renderCaseHtml(result, {
 *   plotlySrc: "../assets/plotly.min.js", generatedAt: null, version: "0.1.0", options: {},
 * });
 * if (html.includes("<b>QVT</b>")) throw new Error("markup from the input reached the page");
 * if (!html.includes("&lt;b&gt;QVT&lt;/b&gt;")) throw new Error("the case id is missing");
 * ```
 */
export function renderCaseHtml(result: CaseResult, context: CaseHtmlContext): string {
  const r = result.report;
  const id = escapeHtml(r.case);
  const mapFig = countMapFigure(result, { colorScale: context.mapScale });
  const distFig = distributionFigure(result);
  const c = r.classification;
  const u = r.uncertainty ?? null;
  const h = r.hotspot;
  const parts: string[] = [];
  parts.push(`<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="hotfield ${escapeHtml(context.version)}">
<title>Mitotic count report: ${id}</title>
<style>${REPORT_CSS}</style>
${plotlyScriptTag(context)}
</head>
<body>
<main>
<header class="top">
${
    context.cohortHref
      ? `<div class="back"><a href="${
        escapeHtml(context.cohortHref)
      }">← all cases of this run</a></div>`
      : ""
  }
<div class="kicker">hotfield · standardized-area mitotic count</div>
<h1>Case ${id}</h1>
<div class="meta">hotfield ${escapeHtml(context.version)}${
    context.generatedAt ? ` · generated ${escapeHtml(context.generatedAt)}` : ""
  } · window ${escapeHtml(windowWords(result.window))}</div>
</header>
<aside class="caution" role="note"><strong>Read with care.</strong><ul>${
    REPORT_CAUTIONS.map((s) => `<li>${escapeHtml(s)}</li>`).join("")
  }</ul></aside>`);

  // The verdict, then anything that makes the numbers doubtful, before any number.
  if (typeof r.verdict === "string") {
    parts.push(
      `<p class="verdict" id="verdict"><span class="label">In one sentence</span>${
        escapeHtml(r.verdict)
      }</p>`,
    );
  }
  const problems = (r.count_problems as string[] | undefined) ?? [];
  if (problems.length > 0) {
    parts.push(
      `<aside class="problem" role="alert"><strong>${
        c ? "The count is in doubt." : "Not graded: the count is not meaningful."
      }</strong><ul>${problems.map((w) => `<li>${escapeHtml(w)}</li>`).join("")}</ul></aside>`,
    );
  }
  const others = r.warnings.filter((w) => !problems.includes(w));
  if (others.length > 0) {
    parts.push(
      `<aside class="warnbox" role="note" id="warnings"><strong>${others.length} warning${
        others.length === 1 ? "" : "s"
      }</strong><ul class="warnings">${
        others.map((w) => `<li>${escapeHtml(w)}</li>`).join("")
      }</ul></aside>`,
    );
  }

  // Headline figures.
  const cards: [string, string, string][] = [
    [
      "hotspot count",
      h ? fmt(h.count, 0) : "none",
      h ? `figures in ${escapeHtml(result.window.areaMm2)} mm²` : "no admissible position",
    ],
    ["per mm²", h ? fmt(h.per_mm2, 2) : "–", "hotspot density"],
    ["valid area", `${fmt(r.valid_area_mm2, 2)}`, "mm² of tissue counted over"],
    ["positions", fmt(r.distribution.positions, 0), "admissible window centres"],
  ];
  if (c) {
    cards.push([
      "grade",
      escapeHtml(c.tier ?? "–"),
      `${escapeHtml(c.scheme)} · ${escapeHtml(CLASS_WORDS[c.class] ?? c.class)}`,
    ]);
  }
  if (u && Array.isArray(u.count_ci95)) {
    cards.push([
      "95% limits",
      `${fmt(u.count_ci95[0], 1)}–${fmt(u.count_ci95[1], 1)}`,
      "exact Poisson, hotspot count",
    ]);
  }
  parts.push(
    `<section class="cards" aria-label="key figures">${
      cards.map(([l, v, s]) =>
        `<div class="card"><div class="label">${l}</div><div class="value">${v}</div>` +
        `<div class="sub">${s}</div></div>`
      ).join("")
    }</section>`,
  );

  const whole = r.whole_area ?? null;
  if (!h) {
    parts.push(
      `<aside class="problem" role="alert"><strong>No window of the standard area could be placed.</strong> ` +
        (whole
          ? `The whole valid area (${fmt(whole.area_mm2, 3)} mm²) holds ${
            countWords(whole.count)
          }: ${fmt(whole.per_mm2, 2)} per mm², about ${fmt(whole.count_per_window_area, 1)} per ` +
            `${
              escapeHtml(result.window.areaMm2)
            } mm². This is not a hotspot count and is not graded.`
          : "The case has no admissible position.") +
        `</aside>`,
    );
  }

  parts.push(`<section id="map-section"><h2>Count map</h2>
<div id="plot-map" class="plot" style="min-height:${(mapFig.layout.height as number) + 2}px"></div>
<p class="caption">${escapeHtml(mapFig.caption)}</p></section>`);
  parts.push(`<section id="distribution-section"><h2>Distribution of window counts</h2>
<div id="plot-distribution" class="plot" style="min-height:${
    (distFig.layout.height as number) + 2
  }px"></div>
<p class="caption">${escapeHtml(distFig.caption)}</p></section>`);

  // Numbers.
  parts.push(`<section id="numbers"><h2>Numbers</h2><h3>Hotspot and top windows</h3>`);
  const placements: string[][] = [];
  const area = r.window.area_mm2;
  if (h) placements.push(placementRow("hotspot (top 1)", h, area));
  (r.top ?? []).forEach((p, i) => {
    const rank = p.rank ?? i + 1;
    if (rank !== 1 || !h) placements.push(placementRow(`top ${rank}`, p, area));
  });
  parts.push(
    placements.length > 0
      ? table(
        ["window", "count", "area (mm²)", "per mm²", "coverage", "centre (px)", "centre (µm)"],
        placements,
      )
      : `<p class="none">No window placed.</p>`,
  );
  if (h && typeof h.margin_um === "number") {
    parts.push(
      `<p class="explain">The hotspot's centre can move ${
        fmt(h.margin_um, 1)
      } µm in any direction before its count changes; a recount at the printed centre gives ` +
        `${countWords(h.count)}. Top windows do not overlap each other.</p>`,
    );
  }
  if (r.best_fields) {
    const bf = r.best_fields;
    parts.push(
      `<h3>Best set of ${bf.n === 1 ? "one single field" : `${bf.n} separate single fields`}</h3>`,
    );
    parts.push(
      `<p class="explain">Single microscope fields of ${fmt(bf.field_area_mm2, 4)} mm² each, ` +
        `placed apart; their total (${countWords(bf.total)} in ${
          fmt(bf.field_area_mm2 * bf.fields.length, 2)
        } mm²) is what a reader choosing the best separate fields could count. Per-mm² rates ` +
        `of single fields are not comparable with the hotspot's (different areas).</p>`,
    );
    parts.push(
      bf.fields.length > 0
        ? table(
          ["field", "count", "area (mm²)", "per mm²", "coverage", "centre (px)", "centre (µm)"],
          bf.fields.map((p, i) => placementRow(`field ${p.rank ?? i + 1}`, p, bf.field_area_mm2)),
        )
        : `<p class="none">No single field fits.</p>`,
    );
    parts.push(`<p class="caption">${escapeHtml(bf.guarantee)}</p>`);
  }

  const d = r.distribution;
  parts.push(`<h3>Distribution over admissible positions</h3>`);
  parts.push(
    table(["positions", "min", "Q1", "median", "Q3", "max", "mean"], [[
      fmt(d.positions, 0),
      fmt(d.min),
      fmt(d.q1),
      fmt(d.median),
      fmt(d.q3),
      fmt(d.max),
      fmt(d.mean, 2),
    ]]),
  );
  if (d.quantile_method) {
    parts.push(`<p class="caption">Quartiles: ${escapeHtml(d.quantile_method)}.</p>`);
  }

  parts.push(`<h3>Readers' fields</h3>`);
  parts.push(
    r.fields.length > 0
      ? table(
        [
          "reader",
          "kind",
          "centre (px)",
          "count",
          "coverage",
          "percentile",
          "short of hotspot",
          "scaled to window",
        ],
        r.fields.map((f) => [
          escapeHtml(readerName(f.reader)),
          escapeHtml(f.kind ?? "point"),
          px(f.center_px),
          fmt(f.count, 0),
          pct(f.coverage),
          fmt(f.percentile, 1),
          fmt(f.shortfall ?? null, 0),
          fmt(f.count_scaled_to_window ?? null, 1),
        ]),
      )
      : `<p class="none">No reader marked a field in this case.</p>`,
  );
  if (r.fields.length > 0) {
    parts.push(
      `<p class="explain">Percentile: the share of all admissible window positions holding fewer ` +
        `figures than the reader's field (ties count half); 100 would be the hotspot itself. ` +
        `Short of hotspot: hotspot count minus the field's count. Scaled to window: a drawn ` +
        `field's count times the window area over the field's area, when they differ by more ` +
        `than 5%.</p>`,
    );
  }

  parts.push(`<h3>Classification</h3>`);
  if (c) {
    const kv: [string, string][] = [
      ["scheme", escapeHtml(c.scheme)],
      ["cut-off", `${escapeHtml(c.cutoff_rule ?? "≥")} ${fmt(c.cutoff)}`],
      ["cut-off basis", escapeHtml(c.cutoff_basis ?? "–")],
      ["count needed in this window", fmt(cutoffCount(c), 0)],
      ["class", escapeHtml(c.class)],
      ["tier", escapeHtml(c.tier ?? "–")],
      ["positions at or above", pct(c.fraction_at_or_above)],
    ];
    parts.push(keyValues(kv));
    parts.push(
      `<p class="explain">Class: <b>below</b> when even the hotspot misses the cut-off; ` +
        `<b>above</b> when at least three quarters of window positions meet it; otherwise ` +
        `<b>field-dependent</b>: the grade depends on where the count is made. ` +
        `Positions at or above: the share of all admissible window positions whose count ` +
        `meets the cut-off.</p>`,
    );
    for (const key of ["definition", "note"]) {
      if (typeof c[key] === "string") {
        parts.push(`<p class="caption">${escapeHtml(c[key])}</p>`);
      }
    }
  } else {
    parts.push(`<p class="none">No grading scheme was chosen, so the case was not classified.</p>`);
  }
  if (u) {
    parts.push(`<h3>Uncertainty</h3>`);
    parts.push(keyValues([
      ["hotspot count, 95% limits", `${fmt(u.count_ci95?.[0], 2)} – ${fmt(u.count_ci95?.[1], 2)}`],
      ["per mm², 95% limits", `${fmt(u.per_mm2_ci95?.[0], 2)} – ${fmt(u.per_mm2_ci95?.[1], 2)}`],
      ["chance of the other side", fmt(u.p_other_side, 3)],
      ["scan test p", fmt(u.scan_p, 3)],
      ["simulations", fmt(u.simulations, 0)],
    ]));
    parts.push(
      `<p class="explain">95% limits: the exact Poisson interval of the hotspot count ` +
        `(Garwood 1936). Chance of the other side: how likely a recount of the same window ` +
        `would fall on the other side of the cut-off if counts vary as Poisson counts do. Scan ` +
        `test p: how often a hotspot at least this high arises when the same number of ` +
        `figures is spread evenly over the valid region (small p: a real focus).</p>`,
    );
  }

  parts.push(`<h3>Warnings</h3>`);
  parts.push(
    r.warnings.length > 0
      ? `<p class="explain">${r.warnings.length} warning${
        r.warnings.length === 1 ? " is" : "s are"
      } listed at the top of this page.</p>`
      : `<p class="none">None.</p>`,
  );
  parts.push(`</section>`);

  // Inputs and settings.
  const inputs = r.inputs ?? result.caseData?.sources ?? [];
  const f = r.figures;
  parts.push(`<section id="inputs"><h2>Inputs and settings</h2>`);
  parts.push(
    inputs.length > 0
      ? table(
        ["kind", "file", "sha256"],
        inputs.map((s) => [escapeHtml(s.kind), escapeHtml(s.path), escapeHtml(s.sha256)]),
      ).replace(/<td>([0-9a-f]{64})<\/td>/g, '<td class="hash">$1</td>')
      : `<p class="none">No input files recorded.</p>`,
  );
  const mpp = r.mpp ?? [result.prepared.slide.mppX, result.prepared.slide.mppY];
  parts.push(keyValues([
    ["slide", escapeHtml(result.prepared.slide.id)],
    ["µm per pixel (x, y)", `${fmt(mpp[0], 4)}, ${fmt(mpp[1], 4)}`],
    ["figures read", fmt(f.total, 0)],
    ["figures counted", fmt(f.counted, 0)],
    ["outside the valid region", fmt(f.outside_valid, 0)],
    ["below the score threshold", fmt(f.below_score, 0)],
    ["stride", `${fmt(r.settings.stride_um)} µm`],
    ["minimum coverage", pct(r.settings.min_coverage, 0)],
    ["minimum score", fmt(r.settings.min_score)],
    ["counted labels", escapeHtml(r.settings.count_labels.join(", "))],
  ]));
  if (f.by_label) {
    parts.push(
      table(
        ["label", "points"],
        Object.keys(f.by_label).sort().map((k) => [escapeHtml(k), fmt(f.by_label![k], 0)]),
      ),
    );
  }
  const optionKeys = Object.keys(context.options).sort();
  if (optionKeys.length > 0) {
    parts.push(`<h3>Options of this run</h3>`);
    parts.push(keyValues(
      optionKeys.map((
        k,
      ) => [escapeHtml(k), plainValue(context.options[k])]),
    ));
  }
  if (r.map?.discretization) {
    parts.push(`<p class="caption">${escapeHtml(r.map.discretization)}</p>`);
  }
  parts.push(`</section>`);
  parts.push(
    `<footer>Report schema ${escapeHtml(r.schema)} · hotfield ${
      escapeHtml(context.version)
    }. Counts are exact for the annotations given; they are only as good as those annotations.</footer>
</main>
${
      plotScripts([
        { id: "plot-map", figure: { data: mapFig.data, layout: mapFig.layout } },
        { id: "plot-distribution", figure: { data: distFig.data, layout: distFig.layout } },
      ], context.plotlySrc ?? "inline")
    }
</body>
</html>
`,
  );
  return parts.join("\n");
}
