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
import type { WindowShape } from "../count/engine_types.ts";
import type { MultiPolygonPx, PolygonPx } from "../types.ts";
import { windowRingUm } from "./hotspot_geojson.ts";
import { outlineTraces, placementHover, regionLineUm, ringsLineUm } from "./_plot_helpers.ts";
import { figureWords, plotText, readerName, windowWords } from "./plot_labels.ts";
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
  /**
   * Colour scale of window counts: `linear`, or `sqrt` (square root) so that
   * a second, weaker focus stays visible beside a strong one.
   * @default "linear"
   */
  colorScale?: "linear" | "sqrt";
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
 * const g = heatmapGrid({ map });
 * if (g.factor !== 1) throw new Error(`a 3 × 2 map is drawn whole, not reduced by ${g.factor}`);
 * if (g.z[0][2] !== null || g.z[1][2] !== 6) throw new Error(`column 3: ${g.z[0][2]}, ${g.z[1][2]}`);
 * if (g.xUm[2] !== 20) throw new Error(`third centre at ${g.xUm[2]} µm, expected 20`);
 * ```
 */
export function heatmapGrid(
  result: { map: Pick<CaseResult["map"], "grid" | "counts" | "admissible"> },
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

/** A µm line as a mm line (plotly draws the map in mm). */
function lineMm(line: { x: (number | null)[]; y: (number | null)[] }): {
  x: (number | null)[];
  y: (number | null)[];
} {
  const mm = (v: number | null) => (v === null ? null : roundTo(v / 1000, 6));
  return { x: line.x.map(mm), y: line.y.map(mm) };
}

/** Keeps at most about `budget` vertices over all rings, every k-th (drawing only). */
function thinRegion(region: MultiPolygonPx, budget: number): { region: MultiPolygonPx; k: number } {
  let n = 0;
  for (const polygon of region) for (const ring of polygon) n += ring.length;
  const k = Math.max(1, Math.ceil(n / budget));
  if (k === 1) return { region, k };
  const thin = region.map((polygon) =>
    polygon.map((ring) => {
      const kept = ring.filter((_, i) => i % k === 0);
      kept.push(ring[ring.length - 1]);
      return kept;
    })
  );
  return { region: thin, k };
}

/** The most figures drawn as points; more are thinned to every k-th. */
export const MAX_FIGURES_DRAWN = 5000;

/** Outline styles of the slide's regions, one per kind. */
const REGION_STYLE = {
  tissue: { color: "#6b6b6b", dash: "solid", width: 1.2 },
  tumour: { color: "#1a1a1a", dash: "longdash", width: 1.6 },
  exclude: { color: "#3d3d3d", dash: "dot", width: 1 },
} as const;

/** The plot's background: where no admissible window centre lies. */
const NOT_ADMISSIBLE = "#f2eee4";

/**
 * The count map of a case over the slide: window counts at every admissible
 * grid position (cividis; positions that are not admissible show the pale
 * background, with its own legend entry), the tissue, tumour and exclusion
 * outlines (one style per kind; exclusions hatched, reason on hover), every
 * counted figure (thinned to every k-th above {@linkcode MAX_FIGURES_DRAWN},
 * said in the caption), the best set of separate fields, the further top
 * windows, the readers' fields (named in the legend, never in text over the
 * map) and the hotspot on top.
 *
 * Axes in mm from the slide origin, y down (reversed), equal aspect.
 *
 * @param result The engine result.
 * @param options Cell budget, height and colour scale.
 * @returns The figure and its caption (states any reduction factor and thinning).
 *
 * @example A tiny map draws a heatmap in mm, y down
 * ```ts
 * import { buildCaseResult, countMapFigure, parseAnnotations } from "hotfield";
 * // A 4 × 3 mm tissue piece at 1 µm/px with three figures.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const result = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const fig = countMapFigure(result);
 * if (fig.data[0].type !== "heatmap") throw new Error(`first trace ${fig.data[0].type}, expected heatmap`);
 * const yAxis = fig.layout.yaxis as { autorange: string };
 * if (yAxis.autorange !== "reversed") throw new Error("y must point down, as on the slide");
 * if (!fig.data.some((t) => t.name === "counted figures (3)")) throw new Error("the three figures are not drawn");
 * ```
 */
export function countMapFigure(
  result: CaseResult,
  options: CountMapFigureOptions = {},
): PlotFigure {
  const { prepared, map, report } = result;
  const mpp = { mppX: prepared.slide.mppX, mppY: prepared.slide.mppY };
  const g = heatmapGrid(result, options.maxCells ?? 40000);
  const sqrt = options.colorScale === "sqrt";
  let zmax = 0;
  for (const row of g.z) for (const v of row) if (v !== null && v > zmax) zmax = v;
  const data: Record<string, unknown>[] = [];
  const ticks = sqrt ? sqrtTicks(zmax) : null;
  data.push({
    type: "heatmap",
    name: "window count",
    x: g.xUm.map((v) => roundTo(v / 1000, 6)),
    y: g.yUm.map((v) => roundTo(v / 1000, 6)),
    z: sqrt
      ? g.z.map((row) => row.map((v) => (v === null ? null : roundTo(Math.sqrt(v), 6))))
      : g.z,
    text: sqrt ? g.z : undefined,
    colorscale: "Cividis",
    zmin: 0,
    hoverongaps: false,
    colorbar: {
      title: { text: `figures<br>per window${sqrt ? "<br>(√ scale)" : ""}`, side: "top" },
      thickness: 14,
      outlinewidth: 0,
      ...(ticks ? { tickvals: ticks.map(Math.sqrt), ticktext: ticks.map(String) } : {}),
    },
    hovertemplate: (g.factor > 1 ? "highest in block<br>" : "") +
      `x %{x:.2f} mm, y %{y:.2f} mm<br>%{${sqrt ? "text" : "z"}} figures<extra></extra>`,
  });
  // Where no window is admissible: the background, named in the legend.
  data.push({
    type: "scatter",
    mode: "markers",
    name: `not admissible (under ${
      (map.minCoverage * 100).toFixed(0)
    }% of a window in the valid region)`,
    x: [null],
    y: [null],
    marker: {
      symbol: "square",
      size: 14,
      color: NOT_ADMISSIBLE,
      line: { color: "#b9b2a3", width: 1 },
    },
    hoverinfo: "skip",
  });
  // The slide's regions, one style per kind.
  let thinned = 1;
  const caseData = result.caseData;
  for (const kind of ["tissue", "tumour"] as const) {
    const parts = caseData?.[kind] ?? [];
    if (parts.length === 0) continue;
    const t = thinRegion(parts.flatMap((p) => p.polygons), 20000);
    thinned = Math.max(thinned, t.k);
    const line = lineMm(regionLineUm(t.region, mpp));
    data.push({
      type: "scatter",
      mode: "lines",
      name: `${kind} outline`,
      x: line.x,
      y: line.y,
      line: REGION_STYLE[kind],
      hoverinfo: "skip",
    });
  }
  if (!(caseData?.tissue?.length || caseData?.tumour?.length) && prepared.validPx.length > 0) {
    // No outlines came with the result: draw the valid region instead.
    const t = thinRegion(prepared.validPx, 20000);
    thinned = Math.max(thinned, t.k);
    const line = lineMm(regionLineUm(t.region, mpp));
    data.push({
      type: "scatter",
      mode: "lines",
      name: "valid region outline",
      x: line.x,
      y: line.y,
      line: REGION_STYLE.tissue,
      hoverinfo: "skip",
    });
  }
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
    const line = lineMm(regionLineUm(byReason.get(reason)!, mpp));
    data.push({
      type: "scatter",
      mode: "lines",
      name: label,
      x: line.x,
      y: line.y,
      fill: "toself",
      fillcolor: "rgba(40,40,40,0.45)",
      fillpattern: {
        shape: "/",
        bgcolor: "rgba(70,70,70,0.55)",
        fgcolor: "#ffffff",
        size: 7,
        solidity: 0.3,
      },
      line: REGION_STYLE.exclude,
      hoveron: "fills+points",
      text: label,
      hovertemplate: "%{text}<extra></extra>",
      legendgroup: "exclude",
    });
  }
  // Counted figures, thinned deterministically when there are many.
  const n = prepared.xUm?.length ?? 0;
  const every = Math.max(1, Math.ceil(n / MAX_FIGURES_DRAWN));
  if (n > 0) {
    const fx: number[] = [], fy: number[] = [];
    for (let k = 0; k < n; k += every) {
      fx.push(roundTo(prepared.xUm[k] / 1000, 6));
      fy.push(roundTo(prepared.yUm[k] / 1000, 6));
    }
    data.push({
      type: "scatter",
      mode: "markers",
      name: every > 1
        ? `counted figures (every ${every}th of ${n})`
        : `counted figure${n === 1 ? "" : "s"} (${n})`,
      x: fx,
      y: fy,
      marker: {
        symbol: "circle",
        size: 5,
        color: "#111111",
        line: { color: "#ffffff", width: 1 },
      },
      hovertemplate: "figure at x %{x:.3f} mm, y %{y:.3f} mm<extra></extra>",
    });
  }
  if (result.bestFieldWindow && result.bestFields.length > 0) {
    const w = result.bestFieldWindow;
    const rings = result.bestFields.map((p) => windowRingUm(w, p.centerUm));
    data.push(
      ...outlineTraces(
        result.bestFields.length === 1
          ? "best single field"
          : `best ${result.bestFields.length} separate single fields`,
        lineMm(ringsLineUm(rings)),
        MARK_STYLE.best,
        "one of the best separate single fields",
        "best",
      ),
    );
  }
  // Top windows beyond the hotspot (top 1 is the hotspot, drawn last).
  const further = result.top.filter((p) => p !== result.hotspot);
  if (further.length > 0) {
    const rings = further.map((p) => windowRingUm(result.window, p.centerUm));
    const first = result.top.length - further.length + 1;
    data.push(
      ...outlineTraces(
        further.length === 1 ? `top window ${first}` : `top windows ${first}–${result.top.length}`,
        lineMm(ringsLineUm(rings)),
        MARK_STYLE.top,
        "one of the top windows",
        "top",
      ),
    );
  }
  data.push(...fieldTraces(result, mpp));
  if (result.hotspot) {
    const h = result.hotspot;
    data.push(
      ...outlineTraces(
        `hotspot: ${figureWords(h.count)}`,
        lineMm(ringsLineUm([windowRingUm(result.window, h.centerUm)])),
        MARK_STYLE.hotspot,
        placementHover("hotspot", h),
        "hotspot",
      ),
    );
  }
  const reduced = g.factor > 1
    ? ` Drawn reduced by a factor of ${g.factor} along each axis (${map.grid.nx} × ${map.grid.ny} grid positions): each cell shows the highest count of its ${g.factor} × ${g.factor} block.`
    : "";
  const thin = every > 1 ? ` Every ${every}th of the ${n} counted figures is drawn.` : "";
  const outlines = thinned > 1 ? ` Outlines are drawn with every ${thinned}th vertex.` : "";
  const caption = `Window counts (${windowWords(result.window)}) at every admissible centre of a ` +
    `${map.grid.strideUm} µm grid${sqrt ? ", colours on a square-root scale" : ""}; the pale ` +
    `background is where less than ${(map.minCoverage * 100).toFixed(0)}% of the window would ` +
    `lie in the valid region.${reduced}${thin}${outlines} Axes in mm from the slide origin, y down.`;
  const layout: Record<string, unknown> = {
    title: { text: `Count map: ${plotText(report.case)}`, x: 0, xanchor: "left" },
    font: PLOT_FONT,
    height: options.height ?? mapHeight(prepared.validPx, mpp, map),
    margin: { l: 70, r: 20, t: 50, b: 60 },
    paper_bgcolor: "#ffffff",
    plot_bgcolor: NOT_ADMISSIBLE,
    xaxis: {
      title: { text: "x (mm)" },
      zeroline: false,
      showgrid: false,
      constrain: "domain",
      ticks: "outside",
    },
    yaxis: {
      title: { text: "y (mm)" },
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

/** Whole-number ticks for a square-root colour scale up to `max`. */
function sqrtTicks(max: number): number[] {
  const out = [0];
  for (const t of [1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000, 5000]) {
    if (t <= max) out.push(t);
  }
  if (max > out[out.length - 1]) out.push(max);
  return out;
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
      const polygons: PolygonPx[] = spec?.kind === "polygon" && spec.polygon
        ? [spec.polygon]
        : spec?.kind === "polygons" && spec.parts
        ? spec.parts
        : [];
      if (spec?.kind === "circles" && spec.pointsPx && spec.diameterMm) {
        // Each circular microscope field drawn as its own circle.
        const circle: WindowShape = {
          shape: "circle",
          areaMm2: Math.PI * (spec.diameterMm / 2) ** 2,
          diameterUm: spec.diameterMm * 1000,
        };
        for (const [x, y] of spec.pointsPx) {
          rings.push(windowRingUm(circle, pxToUm([x, y], mpp)));
        }
      } else if (polygons.length > 0) {
        for (const polygon of polygons) {
          rings.push(ringPxToUm(polygon[0], mpp));
        }
      } else {
        rings.push(
          windowRingUm(result.window, pxToUm(f.center_px, mpp)),
        );
      }
    }
    const name = plotText(readerName(reader));
    const words = (f: (typeof fields)[number]) =>
      figureWords(f.count) +
      (f.percentile === null ? "" : `, percentile ${roundTo(f.percentile, 1)}`);
    // The count and percentile go in the legend, never as text over the map.
    const label = mine.length === 1
      ? `${name}'s field: ${words(mine[0].f)}`
      : `${name}'s ${mine.length} fields`;
    out.push(
      ...outlineTraces(
        label,
        lineMm(ringsLineUm(rings)),
        { color: style.color, dash: "dashdot", width: 2.5 },
        `field of ${name}`,
        `reader-${name}`,
        false,
      ),
    );
    out.push({
      type: "scatter",
      mode: "markers",
      name: label,
      x: mine.map(({ f }) => roundTo(pxToUm(f.center_px, mpp)[0] / 1000, 6)),
      y: mine.map(({ f }) => roundTo(pxToUm(f.center_px, mpp)[1] / 1000, 6)),
      marker: {
        symbol: style.symbol,
        size: 11,
        color: style.color,
        line: { color: "#1a1a1a", width: 1 },
      },
      text: mine.map(({ f }) => `${name}: ${words(f)}`),
      hovertemplate: "%{text}<extra></extra>",
      legendgroup: `reader-${name}`,
    });
  }
  return out;
}
