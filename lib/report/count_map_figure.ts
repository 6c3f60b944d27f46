/**
 * The count map of a case as a plotly.js figure (plain data).
 *
 * Conventions: the map is drawn in micrometres from the slide origin, x to
 * the right and y down (the y axis is reversed), with equal scales on both
 * axes so windows keep their shape. Window counts use the "cividis" scale;
 * marks follow {@linkcode MARK_STYLE}.
 *
 * @module
 */

import type { CaseResult } from "../pipeline/case_result.ts";
import type { MultiPolygonPx, PolygonPx } from "../types.ts";
import { windowRingUm } from "./hotspot_geojson.ts";
import { outlineTraces, placementHover, regionLineUm, ringsLineUm } from "./_plot_helpers.ts";
import { plotText, readerName, windowWords } from "./plot_labels.ts";
import { MARK_STYLE, PLOT_FONT, type PlotFigure, readerStyles } from "./plot_style.ts";
import { roundTo } from "../numbers.ts";
import { type Mpp, pxToUm, regionPxToUm, ringPxToUm } from "../units.ts";
import { regionBBox } from "../geometry/region_bbox.ts";

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
 * import { heatmapGrid } from "./count_map_figure.ts";
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
  for (let i = 0; i < bx; i++) xUm.push(roundTo(centre(grid.x0Um, i, nx), 3));
  for (let j = 0; j < by; j++) yUm.push(roundTo(centre(grid.y0Um, j, ny), 3));
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
 * import { countMapFigure } from "./count_map_figure.ts";
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
      x: result.top.map((p) => roundTo(p.centerUm[0], 3)),
      y: result.top.map((p) => roundTo(p.centerUm[1], 3)),
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
      x: [roundTo(h.centerUm[0], 3)],
      y: [roundTo(h.centerUm[1], 3)],
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
    font: PLOT_FONT,
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
    hoverlabel: { font: { family: PLOT_FONT.family } },
  };
  return { data, layout, caption };
}

/** A plot height that suits the region's aspect at a plot area about 880 px wide. */
function mapHeight(
  region: MultiPolygonPx,
  mpp: Mpp,
  map: CaseResult["map"],
): number {
  const box = regionBBox(regionPxToUm(region, mpp));
  let minX: number, minY: number, maxX: number, maxY: number;
  if (box && box[2] > box[0] && box[3] > box[1]) {
    [minX, minY, maxX, maxY] = box;
  } else {
    const g = map.grid;
    minX = g.x0Um, maxX = g.x0Um + Math.max(1, g.nx - 1) * g.strideUm;
    minY = g.y0Um, maxY = g.y0Um + Math.max(1, g.ny - 1) * g.strideUm;
  }
  const aspect = (maxY - minY) / (maxX - minX);
  const h = Math.round(880 * (Number.isFinite(aspect) && aspect > 0 ? aspect : 0.75)) + 170;
  return Math.min(980, Math.max(420, h));
}

function fieldTraces(
  result: CaseResult,
  mpp: Mpp,
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
        rings.push(ringPxToUm(polygon[0], mpp));
      } else {
        rings.push(
          windowRingUm(result.window, pxToUm(f.center_px, mpp)),
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
      x: mine.map(({ f }) => roundTo(pxToUm(f.center_px, mpp)[0], 3)),
      y: mine.map(({ f }) => roundTo(pxToUm(f.center_px, mpp)[1], 3)),
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
