/**
 * Plot style shared by every figure: the colour-blind safe palette, how each
 * kind of mark is drawn, readers' colours and markers, the font and the
 * plotly.js config.
 *
 * Colours are colour-blind safe: the count map uses the perceptually uniform
 * "cividis" scale (Nuñez, Anderton and Renslow 2018, PLOS ONE 13(7):
 * e0199239) and marks use the eight-colour palette of Okabe and Ito (2008,
 * "Color Universal Design"), each kind also told apart by its line dash and
 * marker shape.
 *
 * @module
 */

/** A plotly.js figure as plain data. */
export interface PlotFigure {
  /** plotly.js traces. */
  data: Record<string, unknown>[];
  /** plotly.js layout. */
  layout: Record<string, unknown>;
  /** Words for a caption under the plot (plain text, not escaped). */
  caption: string;
}

/** The eight colours of Okabe and Ito (2008). */
export const OKABE_ITO = {
  black: "#000000",
  orange: "#E69F00",
  skyBlue: "#56B4E9",
  bluishGreen: "#009E73",
  yellow: "#F0E442",
  blue: "#0072B2",
  vermillion: "#D55E00",
  reddishPurple: "#CC79A7",
} as const;

/** How each kind of mark is drawn: colour, dash and marker shape. */
export const MARK_STYLE = {
  hotspot: { color: OKABE_ITO.vermillion, dash: "solid", width: 3.5, symbol: "star" },
  top: { color: OKABE_ITO.reddishPurple, dash: "dash", width: 2, symbol: "diamond" },
  best: { color: OKABE_ITO.bluishGreen, dash: "dot", width: 2.5, symbol: "square" },
  valid: { color: "#2b2b2b", dash: "solid", width: 1.4, symbol: "circle" },
  exclude: { color: "#4d4d4d", dash: "dot", width: 1, symbol: "x" },
} as const;

/** Colours and marker shapes of readers' fields, in order of first appearance. */
export const READER_STYLES: readonly { color: string; symbol: string }[] = [
  { color: OKABE_ITO.skyBlue, symbol: "circle" },
  { color: OKABE_ITO.orange, symbol: "triangle-up" },
  { color: OKABE_ITO.blue, symbol: "square" },
  { color: OKABE_ITO.yellow, symbol: "diamond" },
  { color: OKABE_ITO.black, symbol: "cross" },
  { color: OKABE_ITO.reddishPurple, symbol: "triangle-down" },
  { color: OKABE_ITO.bluishGreen, symbol: "pentagon" },
];

/** Shared plotly.js config: no logo, no links out, fits its box. */
export const PLOT_CONFIG: Record<string, unknown> = {
  responsive: true,
  displaylogo: false,
  showLink: false,
  showSendToCloud: false,
  toImageButtonOptions: { format: "png", scale: 2 },
};

/** Font of every figure. */
export const PLOT_FONT = {
  family: "system-ui, -apple-system, 'Segoe UI', Roboto, 'Helvetica Neue', Arial, sans-serif",
  size: 13,
  color: "#1a1a1a",
};

/**
 * The readers of a case in order of first appearance, with their colour and marker.
 *
 * @example Two readers, two styles
 * ```ts
 * import { readerStyles } from "./plot_style.ts";
 * const m = readerStyles(["reader-a", "trainee-2", "reader-a"]);
 * if (m.size !== 2) throw new Error(`${m.size} readers, expected 2`);
 * if (m.get("reader-a")!.symbol === m.get("trainee-2")!.symbol) throw new Error("two readers, one marker");
 * ```
 */
export function readerStyles(
  readers: readonly string[],
): Map<string, { color: string; symbol: string }> {
  const styles = new Map<string, { color: string; symbol: string }>();
  for (const r of readers) {
    if (!styles.has(r)) styles.set(r, READER_STYLES[styles.size % READER_STYLES.length]);
  }
  return styles;
}
