/**
 * Cohort tables as RFC 4180 CSV (comma separated, CRLF line ends, fields
 * quoted when they hold a comma, quote or line break): `cases.csv` with one
 * row per case and `fields.csv` with one row per reader's field (with the
 * field's own grade under the scheme, when there is one).
 *
 * Empty cells mean "none" (no hotspot, no scheme, no percentile). Numbers are
 * written as JavaScript prints them (shortest round-trip form), so the
 * values read back are exactly those of report.json.
 *
 * @module
 */

import { stringify } from "csv-stringify/sync";
import type { ReportJson } from "../pipeline/report_types.ts";

/** Columns of `cases.csv`, in order. */
export const CASE_COLUMNS = [
  "case",
  "window_shape",
  "window_area_mm2",
  "valid_area_mm2",
  "figures_counted",
  "hotspot_count",
  "hotspot_per_mm2",
  "hotspot_coverage",
  "hotspot_x_px",
  "hotspot_y_px",
  "positions",
  "min",
  "q1",
  "median",
  "q3",
  "max",
  "mean",
  "scheme",
  "cutoff",
  "class",
  "tier",
  "count_ci95_low",
  "count_ci95_high",
  "scan_p",
  "warnings",
] as const;

/** Columns of `fields.csv`, in order. */
export const FIELD_COLUMNS = [
  "case",
  "reader",
  "kind",
  "x_px",
  "y_px",
  "count",
  "coverage",
  "percentile",
  "shortfall",
  "area_mm2",
  "parts",
  "count_scaled_to_window",
  "date",
  "scheme",
  "count_per_scheme_basis",
  "class",
  "tier",
] as const;

type Cell = string | number | null | undefined;

function cell(v: Cell): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? String(v) : "";
  return v;
}

/**
 * The `cases.csv` row of one report, keyed by {@linkcode CASE_COLUMNS}.
 *
 * @example A case without a hotspot leaves the hotspot cells empty
 * ```ts
 * import { caseRow } from "./report_csv.ts";
 * const row = caseRow({
 *   case: "QVT-24-005", window: { shape: "circle", area_mm2: 2.37, diameter_um: 1737.1 },
 *   valid_area_mm2: 1.2, figures: { total: 3, counted: 2, outside_valid: 1, below_score: 0 },
 *   hotspot: null,
 *   distribution: { positions: 0, min: null, q1: null, median: null, q3: null, max: null, mean: null },
 *   fields: [], classification: null, warnings: ["No admissible window position"],
 * } as never);
 * if (row.hotspot_count !== "" || row.warnings !== "1" || row.figures_counted !== "2") throw new Error();
 * ```
 */
export function caseRow(report: ReportJson): Record<(typeof CASE_COLUMNS)[number], string> {
  const h = report.hotspot, d = report.distribution, c = report.classification;
  const u = report.uncertainty ?? null;
  const cutoffForWindow = c && typeof c.cutoff_for_window === "number"
    ? c.cutoff_for_window
    : c?.cutoff;
  return {
    case: cell(report.case),
    window_shape: cell(report.window.shape),
    window_area_mm2: cell(report.window.area_mm2),
    valid_area_mm2: cell(report.valid_area_mm2),
    figures_counted: cell(report.figures.counted),
    hotspot_count: cell(h?.count),
    hotspot_per_mm2: cell(h?.per_mm2),
    hotspot_coverage: cell(h?.coverage),
    hotspot_x_px: cell(h?.center_px[0]),
    hotspot_y_px: cell(h?.center_px[1]),
    positions: cell(d.positions),
    min: cell(d.min),
    q1: cell(d.q1),
    median: cell(d.median),
    q3: cell(d.q3),
    max: cell(d.max),
    mean: cell(d.mean),
    scheme: cell(c?.scheme),
    cutoff: cell(cutoffForWindow),
    class: cell(c?.class),
    tier: cell(c?.tier),
    count_ci95_low: cell(u?.count_ci95?.[0]),
    count_ci95_high: cell(u?.count_ci95?.[1]),
    scan_p: cell(u?.scan_p),
    warnings: cell(report.warnings.length),
  };
}

/**
 * The `fields.csv` rows of one report, keyed by {@linkcode FIELD_COLUMNS}.
 *
 * @example One reader's field
 * ```ts
 * import { fieldRows } from "./report_csv.ts";
 * const rows = fieldRows({
 *   case: "QVT-24-006",
 *   fields: [{ reader: "trainee-2", center_px: [100, 200], count: 4, coverage: 1, percentile: 35.5, kind: "point", shortfall: 9 }],
 * } as never);
 * if (rows[0].reader !== "trainee-2" || rows[0].shortfall !== "9") throw new Error();
 * ```
 */
export function fieldRows(report: ReportJson): Record<(typeof FIELD_COLUMNS)[number], string>[] {
  return report.fields.map((f) => ({
    case: cell(report.case),
    reader: cell(f.reader),
    kind: cell(f.kind ?? "point"),
    x_px: cell(f.center_px[0]),
    y_px: cell(f.center_px[1]),
    count: cell(f.count),
    coverage: cell(f.coverage),
    percentile: cell(f.percentile),
    shortfall: cell(f.shortfall ?? null),
    area_mm2: cell(f.area_mm2),
    parts: cell(f.parts ?? 1),
    count_scaled_to_window: cell(f.count_scaled_to_window),
    date: cell(f.date),
    scheme: cell(f.grade?.scheme),
    count_per_scheme_basis: cell(f.grade?.count_per_scheme_basis),
    class: cell(f.grade?.class),
    tier: cell(f.grade?.tier),
  }));
}

function toCsv(columns: readonly string[], rows: Record<string, string>[]): string {
  return stringify(rows.map((r) => columns.map((c) => r[c])), {
    header: true,
    columns: [...columns],
    record_delimiter: "\r\n",
    eof: true,
  });
}

/**
 * `cases.csv`: one row per report, in the order given.
 *
 * @example Header and a quoted case id
 * ```ts
 * import { casesCsv } from "./report_csv.ts";
 * const csv = casesCsv([{
 *   case: 'QVT, "odd"', window: { shape: "circle", area_mm2: 2.37, diameter_um: 1737.1 },
 *   valid_area_mm2: 1, figures: { total: 0, counted: 0, outside_valid: 0, below_score: 0 },
 *   hotspot: null,
 *   distribution: { positions: 0, min: null, q1: null, median: null, q3: null, max: null, mean: null },
 *   fields: [], classification: null, warnings: [],
 * } as never]);
 * if (!csv.startsWith("case,window_shape,") || !csv.includes('"QVT, ""odd"""')) throw new Error(csv);
 * ```
 */
export function casesCsv(reports: readonly ReportJson[]): string {
  return toCsv(CASE_COLUMNS, reports.map(caseRow));
}

/**
 * `fields.csv`: one row per reader's field over all reports.
 *
 * @example No fields, just the header
 * ```ts
 * import { fieldsCsv } from "./report_csv.ts";
 * if (!fieldsCsv([]).startsWith("case,reader,kind,x_px,y_px,count,coverage,percentile,shortfall,")) {
 *   throw new Error();
 * }
 * ```
 */
export function fieldsCsv(reports: readonly ReportJson[]): string {
  return toCsv(FIELD_COLUMNS, reports.flatMap(fieldRows));
}
