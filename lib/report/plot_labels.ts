/**
 * Words on the plots: escaped label text, reader names, the cut-off of a
 * classification and a window described in words.
 *
 * Everything taken from input (reader names, reasons, case ids) is escaped,
 * because plotly.js reads a few HTML tags and entities inside labels.
 *
 * @module
 */

import type { WindowShape } from "../count/engine_types.ts";
import type { ReportClassification } from "../pipeline/report_types.ts";

/**
 * Text for a plotly label. plotly.js reads a few tags (`<b>`, `<br>`, `<a>`…)
 * and the entities `&lt;`, `&gt;` and `&amp;` in labels, so those three
 * characters are escaped; quotes are harmless outside a tag and stay as they are.
 *
 * @example
 * ```ts
 * import { plotText } from "./plot_labels.ts";
 * const text = plotText('<b>"reader" & co</b>');
 * if (text !== '&lt;b&gt;"reader" &amp; co&lt;/b&gt;') throw new Error(`escaped as ${text}`);
 * ```
 */
export function plotText(text: unknown): string {
  return String(text).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

/**
 * Display name of a reader ("" in the file becomes "unnamed reader").
 *
 * @example
 * ```ts
 * import { readerName } from "./plot_labels.ts";
 * if (readerName("") !== "unnamed reader") throw new Error(`"" is shown as ${readerName("")}`);
 * if (readerName("reader-a") !== "reader-a") throw new Error("a name is shown as given");
 * ```
 */
export function readerName(reader: string): string {
  return reader === "" ? "unnamed reader" : reader;
}

/**
 * Count threshold of the classification for a window of the map (a count at
 * or above it meets the cut-off): `min_count_for_window`, else
 * `cutoff_for_window`, else `cutoff`; null without a classification.
 *
 * @example
 * ```ts
 * import { classifyCounts, getScheme } from "hotfield";
 * import { cutoffCount } from "./plot_labels.ts";
 * const { classification } = classifyCounts({
 *   hotspotCount: 3, q1: 0, windowAreaMm2: 2.37, counts: [0, 3], admissible: [1, 1],
 * }, getScheme("canine-mct-2tier"));
 * const n = cutoffCount(classification);
 * if (n !== 7) throw new Error(`≥ 7 per 2.37 mm² in a 2.37 mm² window gives ${n}`);
 * if (cutoffCount(null) !== null) throw new Error("no classification, no cut-off");
 * ```
 */
export function cutoffCount(c: ReportClassification | null | undefined): number | null {
  if (!c) return null;
  const min = c.min_count_for_window;
  if (typeof min === "number" && Number.isFinite(min)) return min;
  const forWindow = c.cutoff_for_window;
  if (typeof forWindow === "number" && Number.isFinite(forWindow)) return forWindow;
  return Number.isFinite(c.cutoff) ? c.cutoff : null;
}

/**
 * Words for the cut-off, e.g. "cut-off: ≥ 7 per window (canine-mct-2tier)"; "" without one.
 *
 * @example
 * ```ts
 * import { classifyCounts, getScheme } from "hotfield";
 * import { cutoffLabel } from "./plot_labels.ts";
 * const { classification } = classifyCounts({
 *   hotspotCount: 3, q1: 0, windowAreaMm2: 2.37, counts: [0, 3], admissible: [1, 1],
 * }, getScheme("canine-mct-2tier"));
 * const label = cutoffLabel(classification);
 * if (label !== "cut-off: ≥ 7 per window (canine-mct-2tier)") throw new Error(`label: ${label}`);
 * ```
 */
export function cutoffLabel(c: ReportClassification | null | undefined): string {
  const n = cutoffCount(c);
  if (!c || n === null) return "";
  return `cut-off: ≥ ${n} per window (${c.scheme})`;
}

/**
 * A description of a window in words.
 *
 * @example
 * ```ts
 * import { windowWords } from "./plot_labels.ts";
 * const w = windowWords({ shape: "circle", areaMm2: 2.37, diameterUm: 1737.13 });
 * if (w !== "2.37 mm² circle, 1737.1 µm across") throw new Error(w);
 * ```
 */
export function windowWords(w: WindowShape): string {
  return w.shape === "circle"
    ? `${w.areaMm2} mm² circle, ${w.diameterUm.toFixed(1)} µm across`
    : `${w.areaMm2} mm² rectangle, ${w.widthUm.toFixed(1)} × ${w.heightUm.toFixed(1)} µm`;
}

/**
 * A count of figures in words: "1 figure", "3 figures".
 *
 * @example
 * ```ts
 * import { figureWords } from "./plot_labels.ts";
 * if (figureWords(1) !== "1 figure") throw new Error(figureWords(1));
 * ```
 */
export function figureWords(n: number): string {
  return `${n} figure${n === 1 ? "" : "s"}`;
}
