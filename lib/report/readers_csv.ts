/**
 * `readers.csv`: one row per reader across a cohort (RFC 4180: comma
 * separated, CRLF line ends, fields quoted when they hold a comma, quote or
 * line break). Empty cells mean "none" (no field counted, no scheme, kappa
 * undefined).
 *
 * @module
 */

import { stringify } from "csv-stringify/sync";
import type { ReaderAuditRow } from "../cohort/reader_audit.ts";

/**
 * Columns of `readers.csv`, in order: the contract's nine first, then the
 * counts behind the shares, their Wilson 95% intervals and the dates.
 */
export const READER_COLUMNS = [
  "reader",
  "cases",
  "fields",
  "upper_half_share",
  "upper_quarter_share",
  "median_percentile",
  "mean_shortfall",
  "class_agreement",
  "kappa",
  "upper_half_fields",
  "upper_quarter_fields",
  "upper_half_share_ci95_low",
  "upper_half_share_ci95_high",
  "upper_quarter_share_ci95_low",
  "upper_quarter_share_ci95_high",
  "class_pairs",
  "grade_differs",
  "fields_not_counted",
  "dated_fields",
  "first_date",
  "last_date",
] as const;

type Cell = string | number | null | undefined;

function cell(v: Cell): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? String(v) : "";
  return v;
}

/**
 * The `readers.csv` row of one audited reader, keyed by {@linkcode READER_COLUMNS}.
 *
 * @example A reader without a scheme leaves agreement and kappa empty
 * ```ts
 * import { readerRow } from "./readers_csv.ts";
 * const row = readerRow({
 *   reader: "trainee-1", cases: 2, fields: 2, upperHalfShare: 0.5, upperQuarterShare: 0,
 *   medianPercentile: 48, meanShortfall: 4.5, classAgreement: null, kappa: null,
 *   upperHalfFields: 1, upperQuarterFields: 0, upperHalfCi95: [0.0945, 0.9055],
 *   upperQuarterCi95: [0, 0.6576], classPairs: 0, gradeDiffers: 0, fieldsNotCounted: 0,
 *   datedFields: 0, firstDate: null, lastDate: null, entries: [],
 * });
 * if (row.kappa !== "" || row.upper_half_share !== "0.5" || row.upper_half_share_ci95_low !== "0.0945") {
 *   throw new Error(JSON.stringify(row));
 * }
 * ```
 */
export function readerRow(r: ReaderAuditRow): Record<(typeof READER_COLUMNS)[number], string> {
  return {
    reader: cell(r.reader),
    cases: cell(r.cases),
    fields: cell(r.fields),
    upper_half_share: cell(r.upperHalfShare),
    upper_quarter_share: cell(r.upperQuarterShare),
    median_percentile: cell(r.medianPercentile),
    mean_shortfall: cell(r.meanShortfall),
    class_agreement: cell(r.classAgreement),
    kappa: cell(r.kappa),
    upper_half_fields: cell(r.upperHalfFields),
    upper_quarter_fields: cell(r.upperQuarterFields),
    upper_half_share_ci95_low: cell(r.upperHalfCi95?.[0]),
    upper_half_share_ci95_high: cell(r.upperHalfCi95?.[1]),
    upper_quarter_share_ci95_low: cell(r.upperQuarterCi95?.[0]),
    upper_quarter_share_ci95_high: cell(r.upperQuarterCi95?.[1]),
    class_pairs: cell(r.classPairs),
    grade_differs: cell(r.gradeDiffers),
    fields_not_counted: cell(r.fieldsNotCounted),
    dated_fields: cell(r.datedFields),
    first_date: cell(r.firstDate),
    last_date: cell(r.lastDate),
  };
}

/**
 * `readers.csv`: one row per audited reader, in the order given.
 *
 * @param rows From `readerAudit(reports)`.
 * @returns RFC 4180 text with a header line.
 *
 * @example No readers, just the header
 * ```ts
 * import { readersCsv } from "./readers_csv.ts";
 * const csv = readersCsv([]);
 * if (!csv.startsWith("reader,cases,fields,upper_half_share,upper_quarter_share,median_percentile,mean_shortfall,class_agreement,kappa,")) {
 *   throw new Error(csv);
 * }
 * ```
 */
export function readersCsv(rows: readonly ReaderAuditRow[]): string {
  const records = rows.map((r) => {
    const row = readerRow(r);
    return READER_COLUMNS.map((c) => row[c]);
  });
  return stringify(records, {
    header: true,
    columns: [...READER_COLUMNS],
    record_delimiter: "\r\n",
    eof: true,
  });
}
