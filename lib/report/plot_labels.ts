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
 * if (plotText('<b>"reader" & co</b>') !== '&lt;b&gt;"reader" &amp; co&lt;/b&gt;') throw new Error();
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
 * if (readerName("") !== "unnamed reader" || readerName("reader-a") !== "reader-a") throw new Error();
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
 * import { cutoffCount } from "./plot_labels.ts";
 * const c = { scheme: "canine-mct-2tier", cutoff: 7, class: "below", fraction_at_or_above: 0, tier: "low", min_count_for_window: 7 };
 * if (cutoffCount(c as never) !== 7 || cutoffCount(null) !== null) throw new Error();
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
 * import { cutoffLabel } from "./plot_labels.ts";
 * const c = { scheme: "canine-mct-2tier", cutoff: 7, class: "below", fraction_at_or_above: 0, tier: "low" };
 * if (cutoffLabel(c as never) !== "cut-off: ≥ 7 per window (canine-mct-2tier)") throw new Error();
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
