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
 * import { buildCaseResult, caseRow, parseAnnotations } from "hotfield";
 * // A 1 × 0.8 mm biopsy at 1 µm/px with two figures: too small for a 2.37 mm² window.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-005", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [1000, 0], [1000, 800], [0, 800], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[100, 100], [200, 200]] } },
 *   ],
 * }), { fileName: "QVT-24-005.geojson" });
 * const { report } = buildCaseResult({ caseId: "QVT-24-005", ...parsed, sources: [] }, { bestN: 0 });
 * const row = caseRow(report);
 * if (row.hotspot_count !== "" || row.figures_counted !== "2") {
 *   throw new Error(`hotspot "${row.hotspot_count}", counted "${row.figures_counted}"`);
 * }
 * if (row.warnings !== String(report.warnings.length)) throw new Error(`warnings "${row.warnings}"`);
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
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { fieldRows } from "./report_csv.ts";
 * // trainee-2 counted a quiet corner; the hotspot holds one figure more.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-006", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500]] } },
 *     { type: "Feature", properties: { role: "field", reader: "trainee-2" }, geometry: { type: "Point", coordinates: [3000, 2000] } },
 *   ],
 * }), { fileName: "QVT-24-006.geojson" });
 * const { report } = buildCaseResult({ caseId: "QVT-24-006", ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const [row] = fieldRows(report);
 * if (row.reader !== "trainee-2" || row.count !== "0" || row.shortfall !== "1") {
 *   throw new Error(`row ${JSON.stringify(row)}`);
 * }
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
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { casesCsv } from "./report_csv.ts";
 * // A case id with a comma and quotes is quoted as RFC 4180 says.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const { report } = buildCaseResult({ caseId: 'QVT, "odd"', ...parsed, sources: [] }, { strideUm: 100, bestN: 0 });
 * const csv = casesCsv([report]);
 * if (!csv.startsWith("case,window_shape,")) throw new Error(`header: ${csv.split("\r\n")[0]}`);
 * if (!csv.includes('\r\n"QVT, ""odd""",')) throw new Error(`row: ${csv.split("\r\n")[1]}`);
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
 * const csv = fieldsCsv([]);
 * const lines = csv.split("\r\n");
 * if (!lines[0].startsWith("case,reader,kind,x_px,y_px,count,coverage,percentile,shortfall,") || lines.length !== 2) {
 *   throw new Error(`no reports should give the header line alone: ${JSON.stringify(csv)}`);
 * }
 * ```
 */
export function fieldsCsv(reports: readonly ReportJson[]): string {
  return toCsv(FIELD_COLUMNS, reports.flatMap(fieldRows));
}
