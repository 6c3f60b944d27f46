/**
 * Plot specifications as plain data (plotly.js figure JSON: `data` and
 * `layout`), shared by the HTML reports and the notebook display helpers.
 *
 * Conventions: the map is drawn in micrometres from the slide origin, x to
 * the right and y down (the y axis is reversed), with equal scales on both
 * axes so windows keep their shape. Colours are colour-blind safe: the count
 * map uses the perceptually uniform "cividis" scale (Nuñez, Anderton and
 * Renslow 2018, PLOS ONE 13(7): e0199239) and marks use the eight-colour
 * palette of Okabe and Ito (2008, "Color Universal Design"), each kind also
 * told apart by its line dash and marker shape.
 *
 * Everything taken from input (reader names, reasons, case ids) is escaped,
 * because plotly.js reads a few HTML tags and entities inside labels.
 *
 * @module
 */

import type { Placement, WindowShape } from "../count/engine_types.ts";
import type { CaseResult } from "../pipeline/case_result.ts";
import type { ReportClassification } from "../pipeline/report_types.ts";
import type { MultiPolygonPx, PolygonPx } from "../types.ts";
import { windowRingUm } from "./hotspot_geojson.ts";

/** A plotly.js figure as plain data. */
export interface PlotFigure {
  data: Record<string, unknown>[];
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

const FONT = {
  family: "system-ui, -apple-system, 'Segoe UI', Roboto, 'Helvetica Neue', Arial, sans-serif",
  size: 13,
  color: "#1a1a1a",
};

/**
 * Text for a plotly label. plotly.js reads a few tags (`<b>`, `<br>`, `<a>`…)
 * and the entities `&lt;`, `&gt;` and `&amp;` in labels, so those three
 * characters are escaped; quotes are harmless outside a tag and stay as they are.
 *
 * @example
 * ```ts
 * import { plotText } from "./plots.ts";
 * if (plotText('<b>"reader" & co</b>') !== '&lt;b&gt;"reader" &amp; co&lt;/b&gt;') throw new Error();
 * ```
 */
export function plotText(text: unknown): string {
  return String(text).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

/** Options of {@linkcode countMapFigure}. */
export interface CountMapFigureOptions {
  /**
   * Largest number of heatmap cells drawn; bigger maps are reduced by an
   * integer factor, each cell showing the highest admissible count of its block.
   * @default 40000
   */
  maxCells?: number;
  /** Plot height in CSS pixels. @default from the region's aspect, 420 to 980 */
  height?: number;
}

/** The reduction of a count map for drawing. */
export interface HeatmapGrid {
  /** Block size: 1 = every grid position drawn. */
  factor: number;
  /** Block centres in µm. */
  xUm: number[];
  yUm: number[];
  /** Rows (y) of cells (x): highest admissible count in the block, null when none. */
  z: (number | null)[][];
}

/**
 * Reduces a count map to at most `maxCells` cells for drawing.
 *
 * Each cell takes the highest count over the admissible grid positions of
 * its `factor × factor` block (so the hotspot stays visible); a block with no
 * admissible position is blank (null). Block centres are computed as
 * origin + index × stride.
 *
 * @param result The engine result (its `map`).
 * @param maxCells Cell budget. @default 40000
 * @returns The reduced grid.
 *
 * @example A 3 × 2 map at full resolution
 * ```ts
 * import { heatmapGrid } from "./plots.ts";
 * const map = {
 *   grid: { x0Um: 0, y0Um: 0, strideUm: 10, nx: 3, ny: 2 },
 *   counts: new Int32Array([1, 2, 3, 4, 5, 6]),
 *   admissible: new Uint8Array([1, 1, 0, 1, 1, 1]),
 * };
 * const g = heatmapGrid({ map } as never);
 * if (g.factor !== 1 || g.z[0][2] !== null || g.z[1][2] !== 6 || g.xUm[2] !== 20) throw new Error();
 * ```
 */
export function heatmapGrid(
  result: Pick<CaseResult, "map">,
  maxCells = 40000,
): HeatmapGrid {
  const { grid, counts, admissible } = result.map;
  const { nx, ny } = grid;
  const factor = Math.max(1, Math.ceil(Math.sqrt((nx * ny) / Math.max(1, maxCells))));
  const bx = Math.ceil(nx / factor), by = Math.ceil(ny / factor);
  const centre = (start: number, block: number, n: number) => {
    const last = Math.min(n, (block + 1) * factor) - 1;
    return start + ((block * factor + last) / 2) * grid.strideUm;
  };
  const xUm: number[] = [], yUm: number[] = [];
  for (let i = 0; i < bx; i++) xUm.push(round3(centre(grid.x0Um, i, nx)));
  for (let j = 0; j < by; j++) yUm.push(round3(centre(grid.y0Um, j, ny)));
  const z: (number | null)[][] = [];
  for (let bj = 0; bj < by; bj++) {
    const row: (number | null)[] = [];
    for (let bi = 0; bi < bx; bi++) {
      let best = -1;
      for (let j = bj * factor; j < Math.min(ny, (bj + 1) * factor); j++) {
        for (let i = bi * factor; i < Math.min(nx, (bi + 1) * factor); i++) {
          const k = j * nx + i;
          if (admissible[k] && counts[k] > best) best = counts[k];
        }
      }
      row.push(best < 0 ? null : best);
    }
    z.push(row);
  }
  return { factor, xUm, yUm, z };
}

function round3(v: number): number {
  return Math.round(v * 1000) / 1000;
}

/** Rings of a pixel region as one µm line with null breaks (plotly draws them in one trace). */
function regionLineUm(
  region: MultiPolygonPx,
  mpp: { mppX: number; mppY: number },
): { x: (number | null)[]; y: (number | null)[] } {
  const x: (number | null)[] = [], y: (number | null)[] = [];
  for (const polygon of region) {
    for (const ring of polygon) {
      if (x.length > 0) {
        x.push(null);
        y.push(null);
      }
      for (const [px, py] of ring) {
        x.push(round3(px * mpp.mppX));
        y.push(round3(py * mpp.mppY));
      }
    }
  }
  return { x, y };
}

function ringsLineUm(rings: [number, number][][]): { x: (number | null)[]; y: (number | null)[] } {
  const x: (number | null)[] = [], y: (number | null)[] = [];
  for (const ring of rings) {
    if (x.length > 0) {
      x.push(null);
      y.push(null);
    }
    for (const [ux, uy] of ring) {
      x.push(round3(ux));
      y.push(round3(uy));
    }
  }
  return { x, y };
}

/**
 * The readers of a case in order of first appearance, with their colour and marker.
 *
 * @example Two readers, two styles
 * ```ts
 * import { readerStyles } from "./plots.ts";
 * const m = readerStyles(["reader-a", "trainee-2", "reader-a"]);
 * if (m.size !== 2 || m.get("reader-a")!.symbol === m.get("trainee-2")!.symbol) throw new Error();
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

/**
 * Display name of a reader ("" in the file becomes "unnamed reader").
 *
 * @example
 * ```ts
 * import { readerName } from "./plots.ts";
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
 * import { cutoffCount } from "./plots.ts";
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
 * import { cutoffLabel } from "./plots.ts";
 * const c = { scheme: "canine-mct-2tier", cutoff: 7, class: "below", fraction_at_or_above: 0, tier: "low" };
 * if (cutoffLabel(c as never) !== "cut-off: ≥ 7 per window (canine-mct-2tier)") throw new Error();
 * ```
 */
export function cutoffLabel(c: ReportClassification | null | undefined): string {
  const n = cutoffCount(c);
  if (!c || n === null) return "";
  return `cut-off: ≥ ${n} per window (${c.scheme})`;
}

function outlineTraces(
  name: string,
  line: { x: (number | null)[]; y: (number | null)[] },
  style: { color: string; dash: string; width: number },
  hover: string,
  legendgroup: string,
  showlegend = true,
): Record<string, unknown>[] {
  // A white halo under each outline keeps it legible on dark and light cells alike.
  return [
    {
      type: "scatter",
      mode: "lines",
      x: line.x,
      y: line.y,
      line: { color: "#ffffff", width: style.width + 2.5 },
      hoverinfo: "skip",
      showlegend: false,
      legendgroup,
    },
    {
      type: "scatter",
      mode: "lines",
      name,
      x: line.x,
      y: line.y,
      line: { color: style.color, width: style.width, dash: style.dash },
      hovertemplate: hover + "<extra></extra>",
      showlegend,
      legendgroup,
    },
  ];
}

function placementHover(kind: string, p: Placement): string {
  return `${kind}<br>${p.count} figures, coverage ${(p.coverage * 100).toFixed(1)}%<br>${
    p.perMm2.toFixed(2)
  } per mm²<br>centre ${p.centerPx[0].toFixed(0)}, ${p.centerPx[1].toFixed(0)} px`;
}

/**
 * The count map of a case over the slide: window counts at every admissible
 * grid position (cividis; inadmissible positions blank), the valid-region
 * outline, the exclusions (reason on hover), the hotspot, the top-k windows,
 * the best set of separate fields and the readers' fields, labelled.
 *
 * Axes in µm from the slide origin, y down (reversed), equal aspect.
 *
 * @param result The engine result.
 * @param options Cell budget and height.
 * @returns The figure and its caption (states any reduction factor).
 *
 * @example A tiny map draws a heatmap and the valid outline
 * ```ts
 * import { countMapFigure } from "./plots.ts";
 * const result = {
 *   report: { case: "QVT-24-001", fields: [], classification: null, warnings: [] },
 *   prepared: {
 *     slide: { id: "QVT-24-001", mppX: 1, mppY: 1 },
 *     validPx: [[[[0, 0], [30, 0], [30, 20], [0, 20], [0, 0]]]], excludePx: [], fields: [],
 *   },
 *   window: { shape: "rect", areaMm2: 0.0001, widthUm: 10, heightUm: 10, aspect: [1, 1] },
 *   map: {
 *     grid: { x0Um: 5, y0Um: 5, strideUm: 10, nx: 3, ny: 2 },
 *     counts: new Int32Array(6), admissible: new Uint8Array(6).fill(1),
 *   },
 *   hotspot: null, top: [], bestFields: [], bestFieldWindow: null,
 * };
 * const fig = countMapFigure(result as never);
 * if (fig.data[0].type !== "heatmap") throw new Error();
 * if ((fig.layout.yaxis as { autorange: string }).autorange !== "reversed") throw new Error();
 * ```
 */
export function countMapFigure(
  result: CaseResult,
  options: CountMapFigureOptions = {},
): PlotFigure {
  const { prepared, map, report } = result;
  const mpp = { mppX: prepared.slide.mppX, mppY: prepared.slide.mppY };
  const g = heatmapGrid(result, options.maxCells ?? 40000);
  const data: Record<string, unknown>[] = [];
  data.push({
    type: "heatmap",
    name: "window count",
    x: g.xUm,
    y: g.yUm,
    z: g.z,
    colorscale: "Cividis",
    zmin: 0,
    hoverongaps: false,
    colorbar: {
      title: { text: "figures<br>per window", side: "top" },
      thickness: 14,
      outlinewidth: 0,
    },
    hovertemplate: (g.factor > 1 ? "highest in block<br>" : "") +
      "x %{x:.0f} µm, y %{y:.0f} µm<br>%{z} figures<extra></extra>",
  });
  // Valid region V.
  data.push(
    ...outlineTraces(
      "valid region",
      regionLineUm(prepared.validPx, mpp),
      MARK_STYLE.valid,
      "valid region outline",
      "valid",
    ),
  );
  // Exclusions, grouped by reason so the legend stays short.
  const byReason = new Map<string, MultiPolygonPx>();
  for (const e of prepared.excludePx) {
    const key = e.reason ?? "";
    const list = byReason.get(key) ?? [];
    list.push(...e.polygons);
    byReason.set(key, list);
  }
  for (const reason of [...byReason.keys()].sort()) {
    const label = reason === "" ? "excluded" : `excluded: ${plotText(reason)}`;
    const line = regionLineUm(byReason.get(reason)!, mpp);
    data.push({
      type: "scatter",
      mode: "lines",
      name: label,
      x: line.x,
      y: line.y,
      fill: "toself",
      fillcolor: "rgba(60,60,60,0.28)",
      line: { color: MARK_STYLE.exclude.color, width: 1, dash: MARK_STYLE.exclude.dash },
      hoveron: "fills+points",
      text: label,
      hovertemplate: "%{text}<extra></extra>",
      legendgroup: "exclude",
    });
  }
  // Top-k windows (beyond the hotspot itself).
  if (result.top.length > 0) {
    const rings = result.top.map((p) => windowRingUm(result.window, p.centerUm));
    data.push(
      ...outlineTraces(
        `top ${result.top.length} windows`,
        ringsLineUm(rings),
        MARK_STYLE.top,
        "one of the top windows",
        "top",
      ),
    );
    data.push({
      type: "scatter",
      mode: "markers",
      name: "top windows (centres)",
      x: result.top.map((p) => round3(p.centerUm[0])),
      y: result.top.map((p) => round3(p.centerUm[1])),
      marker: {
        symbol: MARK_STYLE.top.symbol,
        size: 8,
        color: MARK_STYLE.top.color,
        line: { color: "#fff", width: 1 },
      },
      text: result.top.map((p, i) => placementHover(`top window ${i + 1}`, p)),
      hovertemplate: "%{text}<extra></extra>",
      showlegend: false,
      legendgroup: "top",
    });
  }
  if (result.bestFieldWindow && result.bestFields.length > 0) {
    const w = result.bestFieldWindow;
    const rings = result.bestFields.map((p) => windowRingUm(w, p.centerUm));
    data.push(
      ...outlineTraces(
        `best ${result.bestFields.length} separate fields`,
        ringsLineUm(rings),
        MARK_STYLE.best,
        "one of the best separate fields",
        "best",
      ),
    );
  }
  if (result.hotspot) {
    const h = result.hotspot;
    data.push(
      ...outlineTraces(
        `hotspot: ${h.count} figures`,
        ringsLineUm([windowRingUm(result.window, h.centerUm)]),
        MARK_STYLE.hotspot,
        placementHover("hotspot", h),
        "hotspot",
      ),
    );
    data.push({
      type: "scatter",
      mode: "markers",
      name: "hotspot centre",
      x: [round3(h.centerUm[0])],
      y: [round3(h.centerUm[1])],
      marker: {
        symbol: "star",
        size: 13,
        color: MARK_STYLE.hotspot.color,
        line: { color: "#fff", width: 1.2 },
      },
      text: [placementHover("hotspot", h)],
      hovertemplate: "%{text}<extra></extra>",
      showlegend: false,
      legendgroup: "hotspot",
    });
  }
  data.push(...fieldTraces(result, mpp));
  const reduced = g.factor > 1
    ? ` Drawn reduced by a factor of ${g.factor} along each axis (${map.grid.nx} × ${map.grid.ny} grid positions): each cell shows the highest count of its ${g.factor} × ${g.factor} block.`
    : "";
  const caption = `Window counts (${windowWords(result.window)}) at every admissible centre of a ` +
    `${map.grid.strideUm} µm grid; blank where less than ${
      (map.minCoverage * 100).toFixed(0)
    }% of the window lies in the valid region.${reduced} Axes in µm from the slide origin, y down.`;
  const layout: Record<string, unknown> = {
    title: { text: `Count map: ${plotText(report.case)}`, x: 0, xanchor: "left" },
    font: FONT,
    height: options.height ?? mapHeight(prepared.validPx, mpp, map),
    margin: { l: 70, r: 20, t: 50, b: 60 },
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ececec",
    xaxis: {
      title: { text: "x (µm)" },
      zeroline: false,
      showgrid: false,
      constrain: "domain",
      ticks: "outside",
    },
    yaxis: {
      title: { text: "y (µm)" },
      autorange: "reversed",
      scaleanchor: "x",
      scaleratio: 1,
      zeroline: false,
      showgrid: false,
      constrain: "domain",
      ticks: "outside",
    },
    legend: {
      orientation: "h",
      x: 0,
      y: -0.12,
      xanchor: "left",
      yanchor: "top",
      bgcolor: "rgba(255,255,255,0.9)",
    },
    hoverlabel: { font: { family: FONT.family } },
  };
  return { data, layout, caption };
}

/** A plot height that suits the region's aspect at a plot area about 880 px wide. */
function mapHeight(
  region: MultiPolygonPx,
  mpp: { mppX: number; mppY: number },
  map: CaseResult["map"],
): number {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const polygon of region) {
    for (const [x, y] of polygon[0] ?? []) {
      minX = Math.min(minX, x * mpp.mppX);
      maxX = Math.max(maxX, x * mpp.mppX);
      minY = Math.min(minY, y * mpp.mppY);
      maxY = Math.max(maxY, y * mpp.mppY);
    }
  }
  if (!(maxX > minX && maxY > minY)) {
    const g = map.grid;
    minX = g.x0Um, maxX = g.x0Um + Math.max(1, g.nx - 1) * g.strideUm;
    minY = g.y0Um, maxY = g.y0Um + Math.max(1, g.ny - 1) * g.strideUm;
  }
  const aspect = (maxY - minY) / (maxX - minX);
  const h = Math.round(880 * (Number.isFinite(aspect) && aspect > 0 ? aspect : 0.75)) + 170;
  return Math.min(980, Math.max(420, h));
}

/**
 * A description of a window in words.
 *
 * @example
 * ```ts
 * import { windowWords } from "./plots.ts";
 * const w = windowWords({ shape: "circle", areaMm2: 2.37, diameterUm: 1737.13 });
 * if (w !== "2.37 mm² circle, 1737.1 µm across") throw new Error(w);
 * ```
 */
export function windowWords(w: WindowShape): string {
  return w.shape === "circle"
    ? `${w.areaMm2} mm² circle, ${w.diameterUm.toFixed(1)} µm across`
    : `${w.areaMm2} mm² rectangle, ${w.widthUm.toFixed(1)} × ${w.heightUm.toFixed(1)} µm`;
}

function fieldTraces(
  result: CaseResult,
  mpp: { mppX: number; mppY: number },
): Record<string, unknown>[] {
  const fields = result.report.fields;
  if (fields.length === 0) return [];
  const styles = readerStyles(fields.map((f) => f.reader));
  const specs = result.prepared.fields ?? [];
  const out: Record<string, unknown>[] = [];
  for (const [reader, style] of styles) {
    const mine = fields.map((f, k) => ({ f, k })).filter(({ f }) => f.reader === reader);
    const rings: [number, number][][] = [];
    for (const { f, k } of mine) {
      const spec = specs[k];
      const polygon: PolygonPx | undefined = spec?.kind === "polygon" ? spec.polygon : undefined;
      if (polygon && polygon.length > 0) {
        rings.push(polygon[0].map(([x, y]) => [x * mpp.mppX, y * mpp.mppY] as [number, number]));
      } else {
        rings.push(
          windowRingUm(result.window, [f.center_px[0] * mpp.mppX, f.center_px[1] * mpp.mppY]),
        );
      }
    }
    const name = plotText(readerName(reader));
    out.push(
      ...outlineTraces(
        `field of ${name}`,
        ringsLineUm(rings),
        { color: style.color, dash: "dashdot", width: 2.5 },
        `field of ${name}`,
        `reader-${name}`,
        false,
      ),
    );
    out.push({
      type: "scatter",
      mode: "markers+text",
      name: `field of ${name}`,
      x: mine.map(({ f }) => round3(f.center_px[0] * mpp.mppX)),
      y: mine.map(({ f }) => round3(f.center_px[1] * mpp.mppY)),
      marker: {
        symbol: style.symbol,
        size: 11,
        color: style.color,
        line: { color: "#1a1a1a", width: 1 },
      },
      text: mine.map(({ f }) => `${name}: ${f.count}`),
      textposition: "top center",
      textfont: { color: "#111111", size: 12 },
      customdata: mine.map(({ f }) =>
        f.percentile === null ? "n/a" : `${f.percentile.toFixed(1)}th percentile`
      ),
      hovertemplate: "%{text} figures<br>%{customdata}<extra></extra>",
      legendgroup: `reader-${name}`,
    });
  }
  return out;
}

/**
 * Histogram of admissible window counts: index = count, value = number of positions.
 *
 * @example
 * ```ts
 * import { admissibleHistogram } from "./plots.ts";
 * const h = admissibleHistogram({
 *   map: { counts: new Int32Array([0, 2, 2, 5]), admissible: new Uint8Array([1, 1, 1, 0]) },
 * } as never);
 * if (h.join() !== "1,0,2") throw new Error(h.join());
 * ```
 */
export function admissibleHistogram(result: Pick<CaseResult, "map">): number[] {
  const { counts, admissible } = result.map;
  const hist: number[] = [];
  for (let k = 0; k < counts.length; k++) {
    if (!admissible[k]) continue;
    const c = counts[k];
    while (hist.length <= c) hist.push(0);
    hist[c]++;
  }
  return hist;
}

/**
 * The distribution of window counts over every admissible position (bars),
 * with the classification's cut-off (dashed line) when there is one, the
 * hotspot (solid line) and each reader's field (marker per reader).
 *
 * @param result The engine result.
 * @returns The figure.
 *
 * @example Bars count positions per count
 * ```ts
 * import { distributionFigure } from "./plots.ts";
 * const fig = distributionFigure({
 *   report: { case: "QVT-24-001", fields: [], classification: null },
 *   map: { counts: new Int32Array([0, 2, 2]), admissible: new Uint8Array([1, 1, 1]) },
 *   hotspot: null,
 * } as never);
 * const y = fig.data[0].y as number[];
 * if (y.join() !== "1,0,2") throw new Error(y.join());
 * ```
 */
export function distributionFigure(result: CaseResult): PlotFigure {
  const hist = admissibleHistogram(result);
  const total = hist.reduce((a, b) => a + b, 0);
  const data: Record<string, unknown>[] = [{
    type: "bar",
    name: "window positions",
    x: hist.map((_, i) => i),
    y: hist,
    marker: { color: "#8da0b6", line: { color: "#4a5a6e", width: 0.6 } },
    hovertemplate: "%{x} figures: %{y} positions<extra></extra>",
  }];
  const peak = Math.max(1, ...hist);
  const shapes: Record<string, unknown>[] = [];
  const annotations: Record<string, unknown>[] = [];
  const cutoff = cutoffCount(result.report.classification);
  if (cutoff !== null) {
    const at = Number.isInteger(cutoff) ? cutoff - 0.5 : cutoff;
    shapes.push({
      type: "line",
      x0: at,
      x1: at,
      y0: 0,
      y1: 1,
      yref: "paper",
      line: { color: OKABE_ITO.black, width: 2, dash: "dash" },
    });
    annotations.push({
      x: at,
      y: 1,
      yref: "paper",
      text: plotText(cutoffLabel(result.report.classification)),
      showarrow: false,
      xanchor: "left",
      yanchor: "bottom",
      font: { size: 12 },
    });
  }
  if (result.hotspot) {
    data.push({
      type: "scatter",
      mode: "lines",
      name: `hotspot: ${result.hotspot.count}`,
      x: [result.hotspot.count, result.hotspot.count],
      y: [0, peak * 1.08],
      line: { color: MARK_STYLE.hotspot.color, width: 3 },
      hovertemplate: `hotspot: ${result.hotspot.count} figures<extra></extra>`,
    });
  }
  const fields = result.report.fields;
  const styles = readerStyles(fields.map((f) => f.reader));
  let n = 0;
  for (const [reader, style] of styles) {
    const mine = fields.filter((f) => f.reader === reader);
    const name = plotText(readerName(reader));
    data.push({
      type: "scatter",
      mode: "markers",
      name: `field of ${name}`,
      x: mine.map((f) => f.count),
      y: mine.map(() => peak * (1.16 + 0.07 * n)),
      marker: {
        symbol: style.symbol,
        size: 12,
        color: style.color,
        line: { color: "#1a1a1a", width: 1 },
      },
      text: mine.map((f) =>
        `${name}: ${f.count} figures` +
        (f.percentile === null ? "" : `, ${f.percentile.toFixed(1)}th percentile`)
      ),
      hovertemplate: "%{text}<extra></extra>",
    });
    n++;
  }
  if (total === 0) {
    annotations.push({
      x: 0.5,
      y: 0.5,
      xref: "paper",
      yref: "paper",
      text: "No admissible window position",
      showarrow: false,
      font: { size: 16, color: "#8a4b00" },
    });
  }
  const layout: Record<string, unknown> = {
    title: { text: `Counts of all admissible windows: ${plotText(result.report.case)}`, x: 0 },
    font: FONT,
    height: 380,
    margin: { l: 70, r: 20, t: 60, b: 55 },
    bargap: 0.08,
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ffffff",
    xaxis: {
      title: { text: "figures in the window" },
      rangemode: "tozero",
      ticks: "outside",
      gridcolor: "#e5e5e5",
    },
    yaxis: {
      title: { text: "grid positions" },
      rangemode: "tozero",
      gridcolor: "#e5e5e5",
    },
    shapes,
    annotations,
    legend: { orientation: "h", x: 0, y: -0.22, xanchor: "left", yanchor: "top" },
  };
  return {
    data,
    layout,
    caption: total === 0
      ? "No admissible window position, so there is no distribution to draw."
      : `How many of the ${total} admissible window positions hold each count.`,
  };
}

/**
 * The cohort at a glance: hotspot count of each case against its cut-off
 * (top) and the hotspot density per mm² (bottom), with exact Poisson 95%
 * limits as error bars when the report has them. Cases without a hotspot
 * are named on the axis with no bar.
 *
 * @param results Engine results, drawn in the order given.
 * @returns The figure.
 *
 * @example Two cases, two bars
 * ```ts
 * import { cohortFigure } from "./plots.ts";
 * const r = (id: string, count: number) => ({
 *   report: { case: id, hotspot: { count, per_mm2: count / 2.37 }, classification: null },
 * });
 * const fig = cohortFigure([r("QVT-24-001", 12), r("QVT-24-002", 3)] as never);
 * if ((fig.data[0].y as number[]).join() !== "12,3") throw new Error();
 * ```
 */
export function cohortFigure(results: readonly Pick<CaseResult, "report">[]): PlotFigure {
  const ids = results.map((r) => plotText(r.report.case));
  const counts = results.map((r) => r.report.hotspot?.count ?? null);
  const dens = results.map((r) => r.report.hotspot ? round3(r.report.hotspot.per_mm2) : null);
  const ci = (
    r: Pick<CaseResult, "report">,
    key: "count_ci95" | "per_mm2_ci95",
    v: number | null,
  ) => {
    const u = r.report.uncertainty;
    if (!u || v === null || !Array.isArray(u[key])) return { plus: null, minus: null };
    return { plus: round3(u[key][1] - v), minus: round3(v - u[key][0]) };
  };
  const countCi = results.map((r, i) => ci(r, "count_ci95", counts[i]));
  const densCi = results.map((r, i) => ci(r, "per_mm2_ci95", dens[i]));
  const hasCi = countCi.some((c) => c.plus !== null);
  const data: Record<string, unknown>[] = [{
    type: "bar",
    name: "hotspot count",
    x: ids,
    y: counts,
    marker: { color: OKABE_ITO.blue },
    error_y: hasCi
      ? {
        type: "data",
        symmetric: false,
        array: countCi.map((c) => c.plus),
        arrayminus: countCi.map((c) => c.minus),
        color: "#333",
        thickness: 1.2,
      }
      : { visible: false },
    hovertemplate: "%{x}: %{y} figures in the hotspot<extra></extra>",
    xaxis: "x",
    yaxis: "y",
  }];
  const cut = results.map((r) => cutoffCount(r.report.classification));
  if (cut.some((c) => c !== null)) {
    data.push({
      type: "scatter",
      mode: "markers",
      name: "cut-off (count per window)",
      x: ids,
      y: cut,
      marker: { symbol: "line-ew-open", size: 34, color: OKABE_ITO.vermillion, line: { width: 3 } },
      text: results.map((r) => plotText(cutoffLabel(r.report.classification))),
      hovertemplate: "%{x}: %{text}<extra></extra>",
      xaxis: "x",
      yaxis: "y",
    });
  }
  data.push({
    type: "bar",
    name: "hotspot per mm²",
    x: ids,
    y: dens,
    marker: { color: OKABE_ITO.skyBlue, pattern: { shape: "/", fgcolor: "#2b6f99", size: 6 } },
    error_y: hasCi
      ? {
        type: "data",
        symmetric: false,
        array: densCi.map((c) => c.plus),
        arrayminus: densCi.map((c) => c.minus),
        color: "#333",
        thickness: 1.2,
      }
      : { visible: false },
    hovertemplate: "%{x}: %{y:.2f} figures per mm²<extra></extra>",
    xaxis: "x2",
    yaxis: "y2",
  });
  const annotations = results.flatMap((r, i) =>
    r.report.hotspot ? [] : [{
      x: ids[i],
      xref: "x",
      y: 0.5,
      yref: "y domain",
      text: "no hotspot",
      showarrow: false,
      bgcolor: "rgba(255,255,255,0.85)",
      font: { size: 12, color: "#8a4b00" },
    }]
  );
  const layout: Record<string, unknown> = {
    title: { text: "Hotspot counts by case", x: 0, y: 0.985, yanchor: "top" },
    font: FONT,
    height: 580,
    margin: { l: 70, r: 20, t: 95, b: 90 },
    grid: { rows: 2, columns: 1, pattern: "independent", roworder: "top to bottom" },
    xaxis: { type: "category", tickangle: -30, automargin: true },
    xaxis2: { type: "category", tickangle: -30, automargin: true, matches: "x" },
    yaxis: { title: { text: "figures in the window" }, rangemode: "tozero", gridcolor: "#e5e5e5" },
    yaxis2: { title: { text: "figures per mm²" }, rangemode: "tozero", gridcolor: "#e5e5e5" },
    annotations,
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ffffff",
    legend: { orientation: "h", x: 0, y: 1.03, xanchor: "left", yanchor: "bottom" },
    bargap: 0.35,
  };
  return {
    data,
    layout,
    caption: "Top: figures in each case's hotspot window" +
      (cut.some((c) => c !== null) ? " with the cut-off of its scheme" : "") +
      (hasCi ? "; error bars are exact Poisson 95% limits" : "") +
      ". Bottom: the same hotspots as figures per mm².",
  };
}
