/**
 * Plot specifications of the readers page (plotly.js figure JSON as plain
 * data): each reader's field percentiles across cases, and over time for a
 * reader with dated fields. Colours from Okabe and Ito (2008), each class of
 * field also told apart by its marker shape. Text from input is escaped for
 * plotly labels.
 *
 * @module
 */

import type { ReaderAuditRow, ReaderFieldEntry } from "../cohort/reader_audit.ts";
import { OKABE_ITO, PLOT_FONT, type PlotFigure } from "./plot_style.ts";
import { plotText } from "./plot_labels.ts";
import { roundTo } from "../numbers.ts";

/** How a field is drawn by where it sits in its case's distribution. */
const FIELD_CLASSES = [
  {
    key: "quarter",
    name: "upper quarter (≥ Q3)",
    test: (e: ReaderFieldEntry) => e.upperQuarter,
    marker: { color: OKABE_ITO.bluishGreen, symbol: "circle" },
  },
  {
    key: "half",
    name: "upper half, below Q3",
    test: (e: ReaderFieldEntry) => e.upperHalf && !e.upperQuarter,
    marker: { color: OKABE_ITO.skyBlue, symbol: "diamond" },
  },
  {
    key: "lower",
    name: "lower half (< median)",
    test: (e: ReaderFieldEntry) => !e.upperHalf,
    marker: { color: OKABE_ITO.vermillion, symbol: "x" },
  },
] as const;

function hoverText(e: ReaderFieldEntry): string {
  const scaled = e.comparedCount !== e.count ? ` (${roundTo(e.comparedCount, 3)} per window)` : "";
  const grade = e.fieldTier !== null
    ? `<br>grade ${plotText(e.fieldTier)}; hotspot ${plotText(e.hotspotTier ?? "–")}`
    : "";
  return `${plotText(e.case)}: ${e.count} figures${scaled}<br>` +
    `${e.percentile === null ? "no" : e.percentile.toFixed(1)} percentile; median ${
      roundTo(e.median, 3)
    }, Q3 ${roundTo(e.q3, 3)}${grade}` + (e.date ? `<br>${plotText(e.date)}` : "");
}

function guideShapes(): Record<string, unknown>[] {
  return [50, 75].map((y) => ({
    type: "line",
    xref: "paper",
    x0: 0,
    x1: 1,
    y0: y,
    y1: y,
    line: { color: "#7a7a7a", width: 1.2, dash: "dash" },
  }));
}

function guideLabels(): Record<string, unknown>[] {
  return [[50, "50th"], [75, "75th"]].map(([y, text]) => ({
    xref: "paper",
    x: 1,
    y,
    text,
    showarrow: false,
    xanchor: "right",
    yanchor: "bottom",
    font: { size: 11, color: "#5b6570" },
  }));
}

/**
 * One reader's fields across cases: one mark per field, cases along x in
 * cohort order (several fields of one case side by side), the field's
 * percentile among the case's admissible positions on y, marked by whether
 * it is in the upper quarter, the upper half or the lower half of the case's
 * window counts. Dashed guides at the 50th and 75th percentiles.
 *
 * @param row One audited reader.
 * @returns The figure.
 *
 * @example Two fields in two cases
 * ```ts
 * import { readerAudit } from "hotfield";
 * import type { AuditReport } from "../cohort/reader_audit.ts";
 * import { readerPercentileFigure } from "./reader_plots.ts";
 * const report = (id: string, count: number, date?: string): AuditReport => ({
 *   case: id, window: { area_mm2: 2.37 }, hotspot: { count: 9 },
 *   distribution: { positions: 100, median: 2, q3: 4 },
 *   fields: [{ reader: "trainee-1", count, percentile: count * 10, ...(date ? { date } : {}) }],
 *   classification: null,
 * });
 * const [row] = readerAudit([report("QVT-24-001", 6), report("QVT-24-002", 2)]);
 * const fig = readerPercentileFigure(row);
 * const ticks = (fig.layout.xaxis as { ticktext: string[] }).ticktext;
 * if (ticks.join() !== "QVT-24-001,QVT-24-002") throw new Error(`cases on the axis: ${ticks.join()}`);
 * ```
 */
export function readerPercentileFigure(row: Pick<ReaderAuditRow, "entries">): PlotFigure {
  const cases: string[] = [];
  for (const e of row.entries) if (!cases.includes(e.case)) cases.push(e.case);
  // Several fields of one case sit side by side around the case's tick.
  const xOf = new Map<ReaderFieldEntry, number>();
  for (let i = 0; i < cases.length; i++) {
    const mine = row.entries.filter((e) => e.case === cases[i]);
    mine.forEach((e, k) => xOf.set(e, roundTo(i + (k - (mine.length - 1) / 2) * 0.14, 3)));
  }
  const data = FIELD_CLASSES.map((c) => {
    const mine = row.entries.filter((e) => c.test(e) && e.percentile !== null);
    return {
      type: "scatter",
      mode: "markers",
      name: c.name,
      x: mine.map((e) => xOf.get(e)),
      y: mine.map((e) => roundTo(e.percentile as number, 3)),
      text: mine.map(hoverText),
      hovertemplate: "%{text}<extra></extra>",
      marker: { ...c.marker, size: 13, line: { color: "#1a1a1a", width: 1 } },
    };
  }).filter((t) => t.x.length > 0);
  const layout: Record<string, unknown> = {
    font: PLOT_FONT,
    height: 340,
    margin: { l: 64, r: 20, t: 20, b: 90 },
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ffffff",
    xaxis: {
      tickvals: cases.map((_, i) => i),
      ticktext: cases.map(plotText),
      range: [-0.6, Math.max(cases.length, 1) - 0.4],
      tickangle: cases.length > 6 ? -30 : 0,
      zeroline: false,
      showgrid: false,
      title: { text: "case" },
    },
    yaxis: {
      title: { text: "percentile of the field" },
      range: [-4, 104],
      tickvals: [0, 25, 50, 75, 100],
      gridcolor: "#e5e5e5",
      zeroline: false,
    },
    shapes: guideShapes(),
    annotations: guideLabels(),
    legend: { orientation: "h", x: 0, y: -0.3, xanchor: "left", yanchor: "top" },
    showlegend: true,
  };
  return {
    data,
    layout,
    caption: "One mark per field: its percentile among every admissible window position of " +
      "the case (a field of another area through its count scaled to the window). Colour and " +
      "shape say whether the field's count reaches the case's upper quartile, its median, or " +
      "neither; dashed lines mark the 50th and 75th percentiles as a guide.",
  };
}

/** A date as plotly's date axis reads it: UTC for a zoned time, as given otherwise. */
function plotDate(date: string): string {
  if (/^\d{4}-\d{2}-\d{2}$/.test(date)) return date;
  if (/(Z|[+-]\d{2}:?\d{2})$/.test(date)) {
    const t = Date.parse(date);
    if (Number.isFinite(t)) return new Date(t).toISOString().slice(0, 19).replace("T", " ");
  }
  return date.replace("T", " ").replace(/\.\d+$/, "");
}

/** Milliseconds of a plot date read as UTC (zone-less times are taken as written). */
function dateMs(d: string): number {
  return Date.parse(d.length === 10 ? `${d}T00:00:00Z` : `${d.replace(" ", "T")}Z`);
}

/**
 * An x range around the dates, padded by 5% of their span and at least three
 * days, so one date or a few close ones do not zoom in to milliseconds.
 */
function dateRange(xs: string[]): [string, string] {
  const ms = xs.map(dateMs).filter(Number.isFinite);
  const lo = Math.min(...ms), hi = Math.max(...ms);
  const pad = Math.max(3 * 86_400_000, 0.05 * (hi - lo));
  const text = (t: number) => new Date(t).toISOString().slice(0, 19).replace("T", " ");
  return [text(lo - pad), text(hi + pad)];
}

/**
 * A reader's dated fields over time: percentile against the date the field
 * was read, joined in date order, marked as in {@linkcode readerPercentileFigure};
 * null when the reader has no dated field.
 *
 * @param row One audited reader.
 * @returns The figure, or null.
 *
 * @example Two dated fields
 * ```ts
 * import { readerAudit } from "hotfield";
 * import type { AuditReport } from "../cohort/reader_audit.ts";
 * import { readerTimeFigure } from "./reader_plots.ts";
 * const report = (id: string, count: number, date?: string): AuditReport => ({
 *   case: id, window: { area_mm2: 2.37 }, hotspot: { count: 9 },
 *   distribution: { positions: 100, median: 2, q3: 4 },
 *   fields: [{ reader: "trainee-1", count, percentile: count * 10, ...(date ? { date } : {}) }],
 *   classification: null,
 * });
 * const [row] = readerAudit([
 *   report("QVT-24-001", 6, "2024-05-01"),
 *   report("QVT-24-002", 2, "2024-02-01T10:00:00Z"),
 * ]);
 * const x = (readerTimeFigure(row)?.data[0].x as string[]).join();
 * if (x !== "2024-02-01 10:00:00,2024-05-01") throw new Error(`dates in time order: ${x}`);
 * ```
 */
export function readerTimeFigure(row: Pick<ReaderAuditRow, "entries">): PlotFigure | null {
  const dated = row.entries
    .filter((e) => e.date !== null && e.percentile !== null)
    .map((e) => ({ e, x: plotDate(e.date as string) }))
    .sort((a, b) => (a.x < b.x ? -1 : a.x > b.x ? 1 : 0));
  if (dated.length === 0) return null;
  const data: Record<string, unknown>[] = [{
    type: "scatter",
    mode: "lines",
    name: "in date order",
    x: dated.map((d) => d.x),
    y: dated.map((d) => roundTo(d.e.percentile as number, 3)),
    line: { color: "#8a8a8a", width: 1.5 },
    hoverinfo: "skip",
  }];
  for (const c of FIELD_CLASSES) {
    const mine = dated.filter((d) => c.test(d.e));
    if (mine.length === 0) continue;
    data.push({
      type: "scatter",
      mode: "markers",
      name: c.name,
      x: mine.map((d) => d.x),
      y: mine.map((d) => roundTo(d.e.percentile as number, 3)),
      text: mine.map((d) => hoverText(d.e)),
      hovertemplate: "%{text}<extra></extra>",
      marker: { ...c.marker, size: 12, line: { color: "#1a1a1a", width: 1 } },
    });
  }
  return {
    data,
    layout: {
      font: PLOT_FONT,
      height: 320,
      margin: { l: 64, r: 20, t: 20, b: 80 },
      paper_bgcolor: "#ffffff",
      plot_bgcolor: "#ffffff",
      xaxis: {
        type: "date",
        title: { text: "date read" },
        gridcolor: "#eeeeee",
        range: dateRange(dated.map((d) => d.x)),
        tickformat: "%Y-%m-%d",
      },
      yaxis: {
        title: { text: "percentile of the field" },
        range: [-4, 104],
        tickvals: [0, 25, 50, 75, 100],
        gridcolor: "#e5e5e5",
        zeroline: false,
      },
      shapes: guideShapes(),
      annotations: guideLabels(),
      legend: { orientation: "h", x: 0, y: -0.28, xanchor: "left", yanchor: "top" },
    },
    caption: "The same fields by the date they were read (properties.date): a rising line " +
      "means the fields chosen later sit higher in their cases' distributions.",
  };
}
