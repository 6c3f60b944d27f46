/**
 * Reader audit across a cohort: where each reader's chosen fields sit in each
 * case's distribution of window counts, and how often the field's grade
 * agrees with the hotspot's.
 *
 * Reads only report.json objects (schema `hotfield.report/1`), so an audit
 * can be rerun from a folder of reports without the slides.
 *
 * @module
 */

import { binaryKappa } from "../stats/kappa.ts";
import { roundTo } from "../numbers.ts";
import { quantileSorted } from "../stats/quantiles.ts";
import { wilsonInterval } from "../stats/wilson.ts";
import { gradeCount } from "../standards/grade_count.ts";
import { getScheme } from "../standards/list_schemes.ts";
import type { GradingScheme } from "../standards/scheme_types.ts";

/** One of a reader's fields, as the audit sees it. */
export interface ReaderFieldEntry {
  /** Case id. */
  case: string;
  /** Feature index of the field in the case's annotation file, when known. */
  featureIndex: number | null;
  /** Figures counted in the field (the sum over its parts). */
  count: number;
  /**
   * The count the field is compared with the distribution by: its count
   * scaled to the standard window when report.json gives one (a field of
   * another area), else the count.
   */
  comparedCount: number;
  /** Field area, mm² (the window's area for a point field). */
  areaMm2: number;
  /** The field's mid-rank percentile among the case's admissible positions. */
  percentile: number | null;
  /** The case's distribution median and upper quartile (window counts). */
  median: number;
  /** The case's upper quartile of window counts. */
  q3: number;
  /** comparedCount ≥ median. */
  upperHalf: boolean;
  /** comparedCount ≥ q3. */
  upperQuarter: boolean;
  /** The case's hotspot count, null when the case has none. */
  hotspotCount: number | null;
  /** hotspotCount − comparedCount (figures per standard window); null without a hotspot. */
  shortfall: number | null;
  /** When the field was read (ISO 8601), null when undated. */
  date: string | null;
  /** The case's scheme, null when the case was not classified. */
  scheme: string | null;
  /** Tier of the field's own count and area under the scheme. */
  fieldTier: string | null;
  /** Tier of the hotspot count under the scheme. */
  hotspotTier: string | null;
  /** Whether the field's count meets the scheme's cut-off. */
  fieldMeetsCutoff: boolean | null;
  /** Whether the hotspot count meets the scheme's cut-off. */
  hotspotMeetsCutoff: boolean | null;
  /** fieldTier ≠ hotspotTier; null without a scheme. */
  gradeDiffers: boolean | null;
}

/** One reader across the cohort (a row of `readers.csv`, plus the fields behind it). */
export interface ReaderAuditRow {
  /** Reader name, as in report.json. */
  reader: string;
  /** Cases with at least one of the reader's fields counted. */
  cases: number;
  /** The reader's fields counted (those of cases with an admissible distribution). */
  fields: number;
  /** Share of the fields in the upper half (comparedCount ≥ median). */
  upperHalfShare: number | null;
  /** Share of the fields in the upper quarter (comparedCount ≥ q3). */
  upperQuarterShare: number | null;
  /** Median of the fields' percentiles (R-7). */
  medianPercentile: number | null;
  /** Mean of hotspot count − comparedCount, figures per standard window. */
  meanShortfall: number | null;
  /** Share of the fields whose cut-off class equals the hotspot's (cases with a scheme). */
  classAgreement: number | null;
  /** Cohen's kappa of those two classes; null when undefined or without a scheme. */
  kappa: number | null;
  /** Fields in the upper half and upper quarter (whole numbers). */
  upperHalfFields: number;
  /** Fields in the upper quarter. */
  upperQuarterFields: number;
  /** Wilson score 95% intervals of the two shares. */
  upperHalfCi95: [number, number] | null;
  /** Wilson score 95% interval of the upper-quarter share; null without fields. */
  upperQuarterCi95: [number, number] | null;
  /** Fields compared for the class (in cases with a scheme). */
  classPairs: number;
  /** Fields whose tier differs from the hotspot's. */
  gradeDiffers: number;
  /** Fields left out: their case has no admissible distribution. */
  fieldsNotCounted: number;
  /** Counted fields with a date, and the first and last date. */
  datedFields: number;
  /** The earliest date of those fields (text order of ISO 8601), null without dates. */
  firstDate: string | null;
  /** The latest date of those fields, null without dates. */
  lastDate: string | null;
  /** The counted fields, in report order then field order. */
  entries: ReaderFieldEntry[];
}

/**
 * What the audit reads of one field of report.json (schema
 * `hotfield.report/1`, `fields[]`); a `ReportField` fits.
 */
export interface AuditField {
  /** Reader name. */
  reader: string;
  /** Figures counted in the field. */
  count: number;
  /** Mid-rank percentile among the case's admissible positions. */
  percentile: number | null;
  /** Field area, mm² (the window's area when absent). */
  area_mm2?: number;
  /** The count scaled to the standard window, when the field's area differs. */
  count_scaled_to_window?: number | null;
  /** Feature index in the annotation file. */
  feature_index?: number;
  /** When the field was read (ISO 8601). */
  date?: string;
}

/**
 * What the audit reads of a report (report.json, schema `hotfield.report/1`);
 * a `ReportJson` fits. Declared here, not imported, because the cohort layer
 * sits beside the pipeline that defines report.json.
 */
export interface AuditReport {
  /** Case id. */
  case: string;
  /** The standard window (its area, mm²). */
  window: { area_mm2: number };
  /** The hotspot (its count), null when no window is admissible. */
  hotspot: { count: number } | null;
  /** Admissible positions, median and upper quartile of window counts. */
  distribution: { positions: number; median: number | null; q3: number | null };
  /** The readers' fields. */
  fields: readonly AuditField[];
  /** The case's classification (its scheme id), null without a scheme. */
  classification: { scheme: string } | null;
}

/**
 * Audits every reader's fields across a cohort of reports.
 *
 * Only fields of cases with an admissible distribution count (at least one
 * admissible position, so a median and an upper quartile). A field's
 * comparison count is its count scaled to the standard window when
 * report.json gives one (`count_scaled_to_window`: a field of another area,
 * or of several parts), else its count. It is in the upper half when that
 * count is ≥ the case's distribution median, in the upper quarter when ≥ q3.
 *
 * - `medianPercentile`: the median (R-7) of the fields' percentiles.
 * - `meanShortfall`: the mean of hotspot count − comparison count, in figures
 *   per standard window (negative when a field beats the hotspot, which only
 *   a field of another area can).
 * - `classAgreement` and `kappa` (Cohen 1960), over the fields of cases with
 *   a scheme: two classes, whether a count meets the scheme's primary cut-off,
 *   for the field (its own count and area, as `gradeCount`) against the
 *   hotspot (its count in the window). Null when none of the reader's cases
 *   has a scheme; kappa is also null when chance agreement is 1 (both used one
 *   class only).
 * - Shares carry Wilson score 95% intervals (Wilson 1927).
 *
 * Readers are listed by name (code-unit order); shares, percentiles, means
 * and kappa are rounded to 4 decimals.
 *
 * @param reports The cohort's reports, in cohort order.
 * @returns One row per reader.
 * @throws {RangeError} When a report names a scheme this version does not know.
 * @see Cohen J. A coefficient of agreement for nominal scales. Educ Psychol Meas 1960;20(1):37-46
 *
 * @example Two fields of one reader, one in the upper quarter
 * ```ts
 * import { readerAudit } from "hotfield";
 * import type { AuditReport } from "./reader_audit.ts";
 * const report = (id: string, count: number, date?: string): AuditReport => ({
 *   case: id, window: { area_mm2: 2.37 }, hotspot: { count: 9 },
 *   distribution: { positions: 100, median: 2, q3: 4 },
 *   fields: [{ reader: "trainee-1", count, percentile: count * 10, ...(date ? { date } : {}) }],
 *   classification: null,
 * });
 * // Median 2 and upper quartile 4 in both cases: 5 is in the upper quarter, 1 in neither half.
 * const [row] = readerAudit([report("QVT-24-001", 5), report("QVT-24-002", 1)]);
 * if (row.upperQuarterShare !== 0.5 || row.upperHalfShare !== 0.5 || row.meanShortfall !== 6) {
 *   throw new Error(`upper quarter ${row.upperQuarterShare}, upper half ${row.upperHalfShare}, shortfall ${row.meanShortfall}`);
 * }
 * ```
 */
export function readerAudit(reports: readonly AuditReport[]): ReaderAuditRow[] {
  const byReader = new Map<string, { entries: ReaderFieldEntry[]; notCounted: number }>();
  const slot = (reader: string) => {
    let s = byReader.get(reader);
    if (!s) byReader.set(reader, s = { entries: [], notCounted: 0 });
    return s;
  };
  for (const report of reports) {
    const d = report.distribution;
    const admissible = d.positions > 0 && d.median !== null && d.q3 !== null;
    const scheme = report.classification && report.hotspot
      ? schemeOf(report.classification.scheme, report.case)
      : null;
    const hotspotGrade = scheme && report.hotspot
      ? gradeCount(report.hotspot.count, { areaMm2: report.window.area_mm2, scheme })
      : null;
    for (const f of report.fields) {
      const s = slot(f.reader);
      if (!admissible) {
        s.notCounted++;
        continue;
      }
      s.entries.push(entryOf(report, f, scheme, hotspotGrade));
    }
  }
  const names = [...byReader.keys()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  return names.map((reader) => summarize(reader, byReader.get(reader)!));
}

function schemeOf(id: string, caseId: string): GradingScheme {
  try {
    return getScheme(id);
  } catch (e) {
    throw new RangeError(
      `Cannot audit the readers of case "${caseId}": ${(e as Error).message}`,
    );
  }
}

function entryOf(
  report: AuditReport,
  f: AuditField,
  scheme: GradingScheme | null,
  hotspotGrade: ReturnType<typeof gradeCount> | null,
): ReaderFieldEntry {
  const median = report.distribution.median as number;
  const q3 = report.distribution.q3 as number;
  const compared = typeof f.count_scaled_to_window === "number"
    ? f.count_scaled_to_window
    : f.count;
  const areaMm2 = typeof f.area_mm2 === "number" && f.area_mm2 > 0
    ? f.area_mm2
    : report.window.area_mm2;
  const hotspotCount = report.hotspot?.count ?? null;
  const fieldGrade = scheme ? gradeCount(f.count, { areaMm2, scheme }) : null;
  return {
    case: report.case,
    featureIndex: typeof f.feature_index === "number" ? f.feature_index : null,
    count: f.count,
    comparedCount: compared,
    areaMm2,
    percentile: f.percentile,
    median,
    q3,
    upperHalf: compared >= median,
    upperQuarter: compared >= q3,
    hotspotCount,
    shortfall: hotspotCount === null ? null : r4(hotspotCount - compared),
    date: typeof f.date === "string" ? f.date : null,
    scheme: scheme?.id ?? null,
    fieldTier: fieldGrade?.tier ?? null,
    hotspotTier: hotspotGrade?.tier ?? null,
    fieldMeetsCutoff: fieldGrade ? fieldGrade.class === "above" : null,
    hotspotMeetsCutoff: hotspotGrade ? hotspotGrade.class === "above" : null,
    gradeDiffers: fieldGrade && hotspotGrade ? fieldGrade.tier !== hotspotGrade.tier : null,
  };
}

function summarize(
  reader: string,
  { entries, notCounted }: { entries: ReaderFieldEntry[]; notCounted: number },
): ReaderAuditRow {
  const n = entries.length;
  const half = entries.filter((e) => e.upperHalf).length;
  const quarter = entries.filter((e) => e.upperQuarter).length;
  const percentiles = entries.map((e) => e.percentile).filter((p): p is number => p !== null)
    .sort((a, b) => a - b);
  const shortfalls = entries.map((e) => e.shortfall).filter((v): v is number => v !== null);
  const paired = entries.filter((e) =>
    e.fieldMeetsCutoff !== null && e.hotspotMeetsCutoff !== null
  );
  const agree = paired.filter((e) => e.fieldMeetsCutoff === e.hotspotMeetsCutoff).length;
  const kappa = paired.length > 0
    ? binaryKappa(
      paired.map((e) => e.fieldMeetsCutoff as boolean),
      paired.map((e) => e.hotspotMeetsCutoff as boolean),
    ).kappa
    : null;
  const dates = entries.map((e) => e.date).filter((v): v is string => v !== null).sort();
  return {
    reader,
    cases: new Set(entries.map((e) => e.case)).size,
    fields: n,
    upperHalfShare: n > 0 ? r4(half / n) : null,
    upperQuarterShare: n > 0 ? r4(quarter / n) : null,
    medianPercentile: percentiles.length > 0 ? r4(quantileSorted(percentiles, 0.5)!) : null,
    meanShortfall: shortfalls.length > 0
      ? r4(shortfalls.reduce((a, b) => a + b, 0) / shortfalls.length)
      : null,
    classAgreement: paired.length > 0 ? r4(agree / paired.length) : null,
    kappa: kappa === null ? null : r4(kappa),
    upperHalfFields: half,
    upperQuarterFields: quarter,
    upperHalfCi95: roundPair(wilsonInterval(half, n)),
    upperQuarterCi95: roundPair(wilsonInterval(quarter, n)),
    classPairs: paired.length,
    gradeDiffers: entries.filter((e) => e.gradeDiffers === true).length,
    fieldsNotCounted: notCounted,
    datedFields: dates.length,
    firstDate: dates[0] ?? null,
    lastDate: dates.at(-1) ?? null,
    entries,
  };
}

/** Four decimals, as the audit gives every share, mean and kappa. */
function r4(v: number): number {
  return roundTo(v, 4);
}

function roundPair(p: [number, number] | null): [number, number] | null {
  return p === null ? null : [r4(p[0]), r4(p[1])];
}
