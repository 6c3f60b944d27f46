/**
 * A cohort of comparisons: the manifest of pairs, a loop that records a
 * failing pair and goes on, and the cohort summary.
 *
 * @module
 */

import { readFile, stat } from "node:fs/promises";
import { dirname, isAbsolute, join } from "node:path";
import { parse } from "csv-parse/sync";
import { inputError } from "../errors.ts";
import { loadCase, parseCaseFile } from "../annotations/read_case.ts";
import type { CaseInput } from "../annotations/read_case.ts";
import { safeCaseId } from "../annotations/case_id.ts";
import { cohenKappa } from "../stats/kappa.ts";
import { blandAltman } from "../stats/bland_altman.ts";
import { HOTFIELD_VERSION } from "../version.ts";
import { compareCase, type CompareOptions, type ComparisonResult } from "./compare_case.ts";
import { readCandidates } from "./read_candidates.ts";
import { detectionScores } from "./detection_scores.ts";
import {
  COMPARISON_SUMMARY_SCHEMA,
  type ComparisonJson,
  type ComparisonSummaryJson,
} from "./comparison_types.ts";

/** One row of a comparison manifest. */
export interface ManifestRow {
  /** Data line in the file (the header is line 1). */
  line: number;
  /** Reference path (annotation GeoJSON or case file), resolved against the manifest's folder. */
  reference: string;
  /** Candidate path (GeoJSON or figures CSV), resolved likewise. */
  candidate: string;
  /** Case id of the comparison, when given. */
  id?: string;
  /** Grading scheme id, when given. */
  scheme?: string;
}

const MANIFEST_COLUMNS = ["reference", "candidate", "id", "scheme"];

/**
 * Parses a comparison manifest: an RFC 4180 CSV with a header naming the
 * columns `reference`, `candidate` (required) and `id`, `scheme`
 * (optional), one pair a row. Paths are relative to the manifest's folder
 * (absolute paths also work). Empty lines are skipped; an unknown column is
 * an error, so a misspelt name is not ignored.
 *
 * @param text The manifest's text.
 * @param path The manifest's path (names it in messages, anchors relative paths).
 * @returns The rows.
 * @throws {SyntaxError} When the CSV cannot be parsed or the file is empty.
 * @throws {TypeError} When a required column or cell is missing or a column is unknown.
 *
 * @example Two pairs, one with an id and a scheme
 * ```ts
 * import { parseComparisonManifest } from "hotfield";
 * const rows = parseComparisonManifest(
 *   "reference,candidate,id,scheme\nref/a.geojson,det/a.csv,A,canine-mct-2tier\nref/b.geojson,det/b.csv,,\n",
 *   "pairs/manifest.csv",
 * );
 * if (rows.length !== 2 || rows[0].reference !== "pairs/ref/a.geojson" || rows[1].id !== undefined) {
 *   throw new Error(JSON.stringify(rows));
 * }
 * ```
 */
export function parseComparisonManifest(text: string, path: string): ManifestRow[] {
  const what = "comparison manifest";
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.trim() === "") throw inputError(SyntaxError, what, path, "the file is empty");
  let rows: { record: string[]; info: { lines: number } }[];
  try {
    rows = parse(text, {
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
      trim: true,
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (e) {
    throw inputError(SyntaxError, what, path, `not valid CSV (RFC 4180): ${(e as Error).message}`);
  }
  const header = rows[0].record.map((h) => h.trim().toLowerCase());
  for (const h of header) {
    if (!MANIFEST_COLUMNS.includes(h)) {
      throw inputError(
        TypeError,
        what,
        path,
        `unknown column "${h}" in the header; columns: reference, candidate[, id][, scheme]`,
      );
    }
  }
  for (const need of ["reference", "candidate"]) {
    if (!header.includes(need)) {
      throw inputError(
        TypeError,
        what,
        path,
        `no "${need}" column in the header; the first line must name reference,candidate[,id][,scheme]`,
      );
    }
  }
  const col = (name: string) => header.indexOf(name);
  const dir = dirname(path);
  const resolve = (p: string) => (isAbsolute(p) ? p : join(dir, p));
  const out: ManifestRow[] = [];
  for (let r = 1; r < rows.length; r++) {
    const { record, info } = rows[r];
    if (record.every((c) => c === "")) continue;
    const cell = (name: string) => (col(name) < 0 ? "" : record[col(name)] ?? "");
    const row: ManifestRow = { line: info.lines, reference: "", candidate: "" };
    for (const need of ["reference", "candidate"] as const) {
      const v = cell(need);
      if (v === "") {
        throw inputError(TypeError, what, path, `line ${info.lines}: the ${need} cell is empty`);
      }
      row[need] = resolve(v);
    }
    if (cell("id") !== "") row.id = cell("id");
    if (cell("scheme") !== "") row.scheme = cell("scheme");
    out.push(row);
  }
  if (out.length === 0) throw inputError(TypeError, what, path, "the manifest lists no pairs");
  return out;
}

/**
 * The case input for a reference path: a case file when it is a small JSON
 * object naming `"hotfield_case"`, else an annotation GeoJSON.
 *
 * @example
 * ```ts
 * import { referenceInput } from "./compare_cohort.ts";
 * const input = await referenceInput("missing.geojson");
 * if (input.annotationsPath !== "missing.geojson") throw new Error(`not read as annotations: ${JSON.stringify(input)}`);
 * ```
 */
export async function referenceInput(path: string): Promise<CaseInput> {
  try {
    const s = await stat(path);
    if (s.isFile() && s.size < 1 << 20) {
      const text = new TextDecoder().decode(await readFile(path));
      if (text.includes('"hotfield_case"')) return parseCaseFile(text, path);
    }
  } catch {
    // missing or unreadable: loadCase names the file and the problem
  }
  return { annotationsPath: path };
}

/** One failed pair of a cohort. */
export interface ComparisonFailure {
  /** Case id of the pair (or its manifest line). */
  id: string;
  /** Data line in the manifest. */
  line: number;
  /** Reference path. */
  reference: string;
  /** Candidate path. */
  candidate: string;
  /** The error message. */
  error: string;
}

/** Options of {@linkcode compareCohort}. */
export interface CompareCohortOptions extends Omit<CompareOptions, "caseId" | "scheme"> {
  /** Scheme for rows whose `scheme` cell is empty. */
  scheme?: string;
  /** Accept pairs with differing slide ids or mpp. @default false */
  sameSlide?: boolean;
}

/**
 * Compares every pair of a manifest in order. A pair that fails (unreadable
 * file, different slide, unknown scheme, a case id used before, or an
 * error thrown by `onResult`) is recorded with its message and the others
 * go on. Each result is handed to `onResult` (to write it) and then only its
 * `comparison.json` is kept, so memory stays small for long cohorts.
 *
 * The case id of a pair is its `id` cell, else the reference's case id,
 * made safe as a folder name.
 *
 * @param rows The manifest rows.
 * @param options Comparison options for every pair (a row's scheme wins).
 * @param onResult Called with each successful result, in order.
 * @returns The comparisons that succeeded and the failures.
 *
 * @example An empty list
 * ```ts
 * import { compareCohort } from "hotfield";
 * const r = await compareCohort([], {}, () => {});
 * if (r.comparisons.length !== 0 || r.failed.length !== 0) throw new Error("an empty manifest compares nothing");
 * ```
 */
export async function compareCohort(
  rows: readonly ManifestRow[],
  options: CompareCohortOptions,
  onResult: (result: ComparisonResult) => void | Promise<void>,
): Promise<{ comparisons: ComparisonJson[]; failed: ComparisonFailure[] }> {
  const comparisons: ComparisonJson[] = [];
  const failed: ComparisonFailure[] = [];
  const seen = new Set<string>();
  for (const row of rows) {
    let id = row.id !== undefined ? safeCaseId(row.id) : `line ${row.line}`;
    try {
      const reference = await loadCase(await referenceInput(row.reference));
      id = row.id !== undefined ? safeCaseId(row.id) : reference.caseId;
      if (seen.has(id)) {
        throw new Error(
          `Case id "${id}" is used by an earlier pair of the manifest: give each pair its own id`,
        );
      }
      seen.add(id);
      const candidates = await readCandidates(row.candidate, {
        slide: reference.slide,
        sameSlide: options.sameSlide,
      });
      const result = compareCase(reference, candidates, {
        ...options,
        caseId: id,
        scheme: row.scheme ?? options.scheme,
      });
      await onResult(result);
      comparisons.push(result.json);
    } catch (e) {
      failed.push({
        id,
        line: row.line,
        reference: row.reference,
        candidate: row.candidate,
        error: (e as Error).message,
      });
    }
  }
  return { comparisons, failed };
}

/** The class order used in tables and kappa (others follow, sorted). */
export const CLASS_ORDER: readonly string[] = ["below", "field-dependent", "above"];

/**
 * The cohort summary of comparisons (`comparison-summary.json`).
 *
 * - `pooled`: tp, fp and fn summed over cases, with precision, recall and
 *   F1 of the sums (micro-average).
 * - `mean_case_f1`: mean of the cases' F1 (macro-average), over cases with an F1.
 * - `bland_altman`: hotspot counts, candidate − reference, over cases where
 *   both have a hotspot: bias and bias ± 1.96 × sample SD (Bland & Altman
 *   1986, Lancet); see `blandAltman`.
 * - `class_agreement`: share of graded cases (both classes known) whose
 *   classes are equal; `kappa`: Cohen's kappa (1960) of the same table.
 *
 * @param comparisons The cases' `comparison.json`.
 * @param failed Failed pairs, listed in the summary.
 * @returns The summary.
 *
 * @example Pooled counts of one case
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv, summarizeComparisons } from "hotfield";
 * const geojson = JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-900", mpp: 0.5 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon",
 *       coordinates: [[[0, 0], [8000, 0], [8000, 8000], [0, 8000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint",
 *       coordinates: [[4000, 4000], [4100, 4000], [4200, 4000]] } },
 *   ],
 * });
 * const parsed = parseAnnotations(geojson, { fileName: "QVT-24-900.geojson" });
 * const csv = "x,y,score\n4002,4000,0.9\n4100,4004,0.8\n6000,6000,0.3\n";
 * const { figures } = parseFiguresCsv(csv, { fileName: "detector.csv", mppX: 0.5, mppY: 0.5 });
 * const result = compareCase({ caseId: "QVT-24-900", ...parsed, sources: [] }, { figures }, {
 *   strideUm: 100, scheme: "canine-mct-2tier",
 * });
 * const s = summarizeComparisons([result.json, result.json]);
 * // tp 2, fp 1, fn 1 per case: pooled 4, 2, 2 and F1 = 8 / 12
 * if (s.pooled.tp !== 4 || Math.abs(s.pooled.f1! - 8 / 12) > 1e-6) throw new Error(`pooled ${JSON.stringify(s.pooled)}`);
 * if (s.bland_altman.bias !== 0) throw new Error(`equal counts give bias 0, got ${s.bland_altman.bias}`);
 * ```
 */
export function summarizeComparisons(
  comparisons: readonly ComparisonJson[],
  failed: readonly ComparisonFailure[] = [],
): ComparisonSummaryJson {
  let tp = 0, fp = 0, fn = 0;
  const f1s: number[] = [];
  const refCounts: number[] = [], candCounts: number[] = [];
  const pairs: [string, string][] = [];
  for (const c of comparisons) {
    tp += c.detection.tp;
    fp += c.detection.fp;
    fn += c.detection.fn;
    if (c.detection.f1 !== null) f1s.push(c.detection.f1);
    const r = c.hotspot.reference, k = c.hotspot.candidate;
    if (r && k) {
      refCounts.push(r.count);
      candCounts.push(k.count);
    }
    const g = c.grade;
    if (g && g.reference_class !== null && g.candidate_class !== null) {
      pairs.push([g.reference_class, g.candidate_class]);
    }
  }
  const pooled = detectionScores(tp, fp, fn);
  const ba = blandAltman(refCounts, candCounts);
  const seenClasses = new Set(pairs.flat());
  const classes = [
    ...CLASS_ORDER.filter((c) => seenClasses.has(c)),
    ...[...seenClasses].filter((c) => !CLASS_ORDER.includes(c)).sort(),
  ];
  const table = classes.map(() => classes.map(() => 0));
  for (const [a, b] of pairs) table[classes.indexOf(a)][classes.indexOf(b)]++;
  const agreement = pairs.length === 0 ? null : cohenKappa(table);
  return {
    schema: COMPARISON_SUMMARY_SCHEMA,
    pooled: {
      tp,
      fp,
      fn,
      precision: round(pooled.precision, 6),
      recall: round(pooled.recall, 6),
      f1: round(pooled.f1, 6),
    },
    mean_case_f1: f1s.length === 0 ? null : round(f1s.reduce((s, v) => s + v, 0) / f1s.length, 6),
    bland_altman: {
      n: ba.n,
      bias: round(ba.bias, 4),
      lower: round(ba.lower, 4),
      upper: round(ba.upper, 4),
      sd: round(ba.sd, 4),
    },
    class_agreement: agreement === null ? null : round(agreement.observed, 6),
    kappa: agreement === null ? null : round(agreement.kappa, 6),
    cases: comparisons.length,
    failed: failed.map((f) => ({
      id: f.id,
      reference: f.reference,
      candidate: f.candidate,
      error: f.error,
    })),
    graded_cases: pairs.length,
    class_table: { classes, counts: table },
    methods: {
      pooled: "tp, fp and fn summed over the cases; precision, recall and F1 of the sums",
      mean_case_f1: "Mean of the cases' F1 at each case's operating threshold",
      bland_altman:
        "Hotspot counts, candidate − reference, over cases where both have a hotspot: " +
        "bias = mean difference, limits = bias ± 1.96 × sample SD (n − 1) (Bland & Altman 1986, Lancet)",
      class_agreement: "Share of graded cases whose candidate class equals the reference class",
      kappa:
        "Cohen's kappa (1960) of the reference × candidate class table; rows are the reference",
    },
    hotfield_version: HOTFIELD_VERSION,
  };
}

function round(v: number | null, d: number): number | null {
  if (v === null) return null;
  const f = 10 ** d;
  const r = Math.round(v * f) / f;
  return Object.is(r, -0) ? 0 : r;
}
