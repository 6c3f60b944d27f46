/**
 * Rich display of hotfield results in Jupyter notebooks on the Deno kernel.
 *
 * Each helper returns an object with a `Symbol.for("Jupyter.display")`
 * method; the kernel calls it when the object is a cell's last value (or is
 * passed to `Deno.jupyter.display`), and shows the richest format the front
 * end can render from the returned mime bundle:
 *
 * - `application/vnd.plotly.v1+json`: the figure (`data`, `layout`,
 *   `config`), drawn natively where a plotly renderer is installed;
 * - `text/html`: the same figure drawn by plotly.js read from the local npm
 *   package and inlined once per kernel session behind a guard (no network);
 * - `text/plain`: a one-line summary.
 *
 * The plot specs are those of the HTML reports (`lib/report/*_figure.ts`).
 * Nothing here touches `Deno.jupyter`, so the module loads anywhere.
 *
 * @module
 */

import type { CaseResult } from "../pipeline/case_result.ts";
import { cohortFigure } from "../report/cohort_figure.ts";
import { countMapFigure, type CountMapFigureOptions } from "../report/count_map_figure.ts";
import { distributionFigure } from "../report/distribution_figure.ts";
import { PLOT_CONFIG, type PlotFigure } from "../report/plot_style.ts";
import { escapeHtml, jsonForScript } from "../report/html_escape.ts";
import { readPlotlyJs } from "../report/plotly_asset.ts";

/** The symbol the Deno kernel looks for. */
export const JUPYTER_DISPLAY: unique symbol = Symbol.for("Jupyter.display");

/** A Jupyter mime bundle: mime type → data. */
export type MimeBundle = Record<string, unknown>;

/** Something the Deno kernel displays richly. */
export interface Displayable {
  /** The mime bundle to show. */
  [JUPYTER_DISPLAY](): MimeBundle;
}

/** How the HTML fallback gets plotly.js. */
export type PlotlyInlining = "once" | "always" | "never";

/** Options of the plot display helpers. */
export interface ShowPlotOptions {
  /**
   * `once`: inline plotly.js in the first HTML output of the kernel session
   * (later outputs use that copy); `always`: in every output; `never`: rely on
   * a copy already on the page.
   * @default "once"
   */
  inlinePlotly?: PlotlyInlining;
  /** The plotly.js source. @default read from the npm package */
  plotlyJs?: string;
}

// The one piece of state: whether this kernel session has already sent
// plotly.js to the page. Only the HTML fallback uses it.
const session = { plotlyInlined: false, nextId: 1 };

/**
 * Forgets that plotly.js was sent, so the next plot inlines it again (use
 * after clearing all outputs or reloading the page).
 *
 * @example After a reset the next plot carries plotly.js again
 * ```ts
 * import { plotlyMimeBundle, resetPlotlyInlining } from "./show.ts";
 * const figure = { data: [], layout: {}, caption: "" };
 * const options = { inlinePlotly: "once" as const, plotlyJs: "// plotly.js stand-in" };
 * const html = () => String(plotlyMimeBundle(figure, options)["text/html"]);
 * resetPlotlyInlining();
 * if (!html().includes("plotly.js stand-in")) throw new Error("the first plot must inline plotly.js");
 * if (html().includes("plotly.js stand-in")) throw new Error("later plots reuse the first copy");
 * resetPlotlyInlining();
 * if (!html().includes("plotly.js stand-in")) throw new Error("after a reset plotly.js is inlined again");
 * ```
 */
export function resetPlotlyInlining(): void {
  session.plotlyInlined = false;
}

function inlineSafe(source: string): string {
  return source.replace(/<\/(script)/gi, "<\\/$1").replace(/<!--/g, "<\\!--");
}

/**
 * The mime bundle of a plotly figure: plotly JSON, an HTML fallback and a
 * plain-text line.
 *
 * @param figure Figure as plain data.
 * @param options How plotly.js reaches the HTML fallback.
 * @returns The bundle.
 *
 * @example A bundle with all three formats
 * ```ts
 * import { plotlyMimeBundle } from "./show.ts";
 * const b = plotlyMimeBundle(
 *   { data: [{ type: "bar", x: [1], y: [2] }], layout: {}, caption: "one bar" },
 *   { inlinePlotly: "never" },
 * );
 * const json = b["application/vnd.plotly.v1+json"] as { data: unknown[] };
 * if (json.data.length !== 1) throw new Error(`${json.data.length} traces in the plotly bundle`);
 * if (typeof b["text/html"] !== "string") throw new Error("no HTML fallback");
 * if (b["text/plain"] !== "one bar") throw new Error(`plain text: ${b["text/plain"]}`);
 * ```
 */
export function plotlyMimeBundle(figure: PlotFigure, options: ShowPlotOptions = {}): MimeBundle {
  const mode = options.inlinePlotly ?? "once";
  const id = `hotfield-plot-${session.nextId++}`;
  let loader = "";
  if (mode === "always" || (mode === "once" && !session.plotlyInlined)) {
    const js = options.plotlyJs ?? readPlotlyJs();
    loader = `<script>if(typeof window.Plotly==="undefined"){${inlineSafe(js)}\n}</script>`;
    session.plotlyInlined = true;
  }
  const height = typeof figure.layout.height === "number" ? figure.layout.height : 450;
  const spec = { data: figure.data, layout: figure.layout, config: PLOT_CONFIG };
  const html = `${loader}<div id="${id}" style="width:100%;min-height:${height}px"></div>
<script>(function(){var spec=${jsonForScript(spec)};var tries=0;
function draw(){if(typeof window.Plotly==="undefined"){if(tries++<200){setTimeout(draw,50);}
else{document.getElementById("${id}").textContent="plotly.js is not loaded on this page: run the cell again after resetPlotlyInlining()";}return;}
window.Plotly.newPlot("${id}",spec.data,spec.layout,spec.config);}draw();})();</script>
${figure.caption ? `<p style="font-size:12px;color:#555">${escapeHtml(figure.caption)}</p>` : ""}`;
  return {
    "application/vnd.plotly.v1+json": spec,
    "text/html": html,
    "text/plain": figure.caption,
  };
}

function displayable(bundle: () => MimeBundle): Displayable {
  return { [JUPYTER_DISPLAY]: bundle } as Displayable;
}

/**
 * Shows the count map of a case (heatmap, valid region, exclusions, hotspot,
 * top-k windows, best separate fields, readers' fields).
 *
 * @param result The engine result.
 * @param options Map size and plotly.js inlining.
 * @returns A displayable object.
 *
 * @example The bundle holds the heatmap
 * ```ts
 * import { buildCaseResult, JUPYTER_DISPLAY, parseAnnotations, showCountMap } from "hotfield";
 * // A 4 × 3 mm tissue piece at 1 µm/px with three figures.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const result = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const shown = showCountMap(result, { inlinePlotly: "never" });
 * const json = shown[JUPYTER_DISPLAY]()["application/vnd.plotly.v1+json"] as {
 *   data: { type: string }[];
 * };
 * if (json.data[0].type !== "heatmap") throw new Error(`first trace ${json.data[0].type}, expected heatmap`);
 * ```
 */
export function showCountMap(
  result: CaseResult,
  options: ShowPlotOptions & CountMapFigureOptions = {},
): Displayable {
  return displayable(() => plotlyMimeBundle(countMapFigure(result, options), options));
}

/**
 * Shows the distribution of admissible window counts with the cut-off, the
 * hotspot and the readers' fields.
 *
 * @example
 * ```ts
 * import { buildCaseResult, JUPYTER_DISPLAY, parseAnnotations, showDistribution } from "hotfield";
 * // A 4 × 3 mm tissue piece at 1 µm/px with three figures.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const result = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const bundle = showDistribution(result, { inlinePlotly: "never" })[JUPYTER_DISPLAY]();
 * const json = bundle["application/vnd.plotly.v1+json"] as { data: { type: string }[] };
 * if (json.data[0].type !== "bar") throw new Error(`first trace ${json.data[0].type}, expected bar`);
 * ```
 */
export function showDistribution(result: CaseResult, options: ShowPlotOptions = {}): Displayable {
  return displayable(() => plotlyMimeBundle(distributionFigure(result), options));
}

/**
 * Shows hotspot counts (and per mm²) by case against each case's cut-off.
 *
 * @example
 * ```ts
 * import { buildCaseResult, JUPYTER_DISPLAY, parseAnnotations, showCohort } from "hotfield";
 * // A 4 × 3 mm tissue piece at 1 µm/px with three figures.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const result = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const bundle = showCohort([result], { inlinePlotly: "never" })[JUPYTER_DISPLAY]();
 * // One horizontal bar per case: the case on y, its hotspot count on x.
 * const json = bundle["application/vnd.plotly.v1+json"] as { data: { x: number[]; y: string[] }[] };
 * const [bar] = json.data;
 * if (bar.y[0] !== "QVT-24-001" || bar.x[0] !== 3) throw new Error(`bar ${bar.y[0]}: ${bar.x[0]}, expected 3`);
 * ```
 */
export function showCohort(
  results: readonly Pick<CaseResult, "report">[],
  options: ShowPlotOptions = {},
): Displayable {
  return displayable(() => plotlyMimeBundle(cohortFigure(results), options));
}

/** Options of {@linkcode showTable}. */
export interface ShowTableOptions {
  /** Columns in order. @default the keys of all rows, in order of first appearance */
  columns?: string[];
  /** A caption above the table. */
  caption?: string;
  /** Decimals for non-integer numbers. @default 3 */
  digits?: number;
}

function cellText(v: unknown, digits: number): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") {
    return Number.isInteger(v) || !Number.isFinite(v) ? String(v) : v.toFixed(digits);
  }
  if (typeof v === "object") return JSON.stringify(v);
  return String(v);
}

/**
 * Shows rows of plain data as an HTML table (text is escaped), with a
 * tab-separated plain-text fallback.
 *
 * @param rows One object per row.
 * @param options Columns, caption and decimals.
 * @returns A displayable object.
 *
 * @example Escaped cells
 * ```ts
 * import { JUPYTER_DISPLAY, showTable } from "hotfield";
 * const b = showTable([{ reader: "<b>a</b>", count: 3 }])[JUPYTER_DISPLAY]() as Record<string, string>;
 * if (!b["text/html"].includes("&lt;b&gt;a&lt;/b&gt;")) throw new Error("cells must be HTML-escaped");
 * if (!b["text/plain"].startsWith("reader\tcount")) throw new Error(`plain text: ${b["text/plain"]}`);
 * ```
 */
export function showTable(
  rows: readonly Record<string, unknown>[],
  options: ShowTableOptions = {},
): Displayable {
  const digits = options.digits ?? 3;
  const columns = options.columns ?? [...new Set(rows.flatMap((r) => Object.keys(r)))];
  return displayable(() => {
    const head = columns.map((c) => `<th style="text-align:left">${escapeHtml(c)}</th>`).join("");
    const body = rows.map((r) =>
      `<tr>${
        columns.map((c) => `<td style="text-align:left">${escapeHtml(cellText(r[c], digits))}</td>`)
          .join("")
      }</tr>`
    ).join("\n");
    const caption = options.caption ? `<caption>${escapeHtml(options.caption)}</caption>` : "";
    const text = [
      columns.join("\t"),
      ...rows.map((r) => columns.map((c) => cellText(r[c], digits)).join("\t")),
    ].join("\n");
    return {
      "text/html":
        `<table>${caption}<thead><tr>${head}</tr></thead><tbody>\n${body}\n</tbody></table>`,
      "text/plain": (options.caption ? options.caption + "\n" : "") + text,
    };
  });
}
