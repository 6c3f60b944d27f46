/**
 * Helpers shared by the HTML pages (not public).
 *
 * @module
 */

import { escapeHtml, jsonForScript } from "./html_escape.ts";
import { PLOT_CONFIG } from "./plot_style.ts";

/** What a report page shows besides the result itself. */
export interface CaseHtmlContext {
  /** Relative path of the shared plotly.js, or null when it is inlined. */
  plotlySrc: string | null;
  /** The plotly.js source to inline when `plotlySrc` is null. */
  plotlyInline?: string;
  /** Generation time shown (ISO 8601), or null to leave it out. */
  generatedAt: string | null;
  /** hotfield version. */
  version: string;
  /** Options of the run, shown as given (keys sorted). */
  options: Record<string, unknown>;
  /** Relative link to the page of all cases of the run, when there is one. */
  cohortHref?: string;
  /** Colour scale of the count map. @default "linear" */
  mapScale?: "linear" | "sqrt";
}

/** Inline a script so no text in it can close the element or open a comment. */
export function inlineScriptSource(source: string): string {
  return source.replace(/<\/(script)/gi, "<\\/$1").replace(/<!--/g, "<\\!--");
}

/** Formats a number for a table: fixed decimals, or a dash when missing. */
export function fmt(value: unknown, digits = 2): string {
  if (typeof value !== "number" || !Number.isFinite(value)) return "–";
  if (Number.isInteger(value) && digits > 0 && Math.abs(value) < 1e15) return String(value);
  return value.toFixed(digits);
}

/** The `<script>` that loads plotly.js: a relative file, or the inlined source. */
export function plotlyScriptTag(
  context: Pick<CaseHtmlContext, "plotlySrc" | "plotlyInline">,
): string {
  if (context.plotlySrc !== null) {
    return `<script src="${escapeHtml(context.plotlySrc)}"></script>`;
  }
  if (context.plotlyInline === undefined) {
    throw new Error("Cannot inline plotly.js: no source was given");
  }
  return `<script>${inlineScriptSource(context.plotlyInline)}</script>`;
}

/**
 * The script that draws the plots whose specs are in the JSON block
 * `#hotfield-plots`, then sets `data-plots-ready` on `<body>` ("true", or
 * "missing" when plotly.js could not be loaded).
 */
const DRAW_PLOTS_SCRIPT = `(function(){
var specs=JSON.parse(document.getElementById("hotfield-plots").textContent);
var body=document.body;
if(typeof Plotly==="undefined"){
  specs.forEach(function(s){var el=document.getElementById(s.id);if(el){el.innerHTML='<p class="noplot">The plots need plotly.js ('+s.asset+'), which was not found next to this report.</p>';}});
  body.setAttribute("data-plots-ready","missing");return;
}
Promise.all(specs.map(function(s){return Plotly.newPlot(s.id,s.figure.data,s.figure.layout,s.config);}))
  .then(function(){body.setAttribute("data-plots-ready","true");},
        function(e){body.setAttribute("data-plots-ready","error");throw e;});
})();`;

/** One plot for the page. */
export interface PagePlot {
  id: string;
  figure: { data: unknown[]; layout: unknown };
  config?: Record<string, unknown>;
}

/** The data block and draw script for a page's plots. */
export function plotScripts(plots: PagePlot[], asset: string): string {
  const specs = plots.map((p) => ({
    id: p.id,
    figure: p.figure,
    config: p.config ?? PLOT_CONFIG,
    asset,
  }));
  return `<script type="application/json" id="hotfield-plots">${jsonForScript(specs)}</script>\n` +
    `<script>${DRAW_PLOTS_SCRIPT}</script>`;
}
