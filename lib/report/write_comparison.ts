/**
 * Writing comparison outputs: per case `DIR/<case>/comparison.json` and
 * `comparison.html`; for a cohort `DIR/comparison.csv`,
 * `DIR/comparison-summary.json` and `DIR/index.html`; the shared
 * `DIR/assets/plotly.min.js` unless plotly.js is inlined.
 *
 * Each case folder is staged under a temporary name and renamed into place;
 * every single file is written through a temporary name.
 *
 * @module
 */

import { existsSync, mkdirSync, renameSync, rmSync, statSync } from "node:fs";
import { join } from "node:path";
import { stringify } from "csv-stringify/sync";
import type { ComparisonResult } from "../compare/compare_case.ts";
import type { ComparisonJson, ComparisonSummaryJson } from "../compare/comparison_types.ts";
import type { ComparisonFailure } from "../compare/compare_cohort.ts";
import { writeFileAtomic } from "../io/write_atomic.ts";
import { HOTFIELD_VERSION } from "../version.ts";
import { renderComparisonCohortHtml, renderComparisonHtml } from "./compare_page.ts";
import { readPlotlyBytes, readPlotlyJs } from "./plotly_asset.ts";
import { stableJson } from "./write_outputs.ts";

/** Options of the comparison writers. */
export interface WriteComparisonOptions {
  /** Inline plotly.js into each page instead of one shared copy. @default false */
  standalone?: boolean;
  /** Generation time shown in the pages (ISO 8601), or null for none. @default null */
  generatedAt?: string | null;
  /** The plotly.js source, when the caller already has it. @default read from the npm package */
  plotlyJs?: string;
}

/** Columns of `comparison.csv`, in order. */
export const COMPARISON_COLUMNS = [
  "case",
  "matching",
  "radius_um",
  "min_score",
  "reference",
  "candidate",
  "tp",
  "fp",
  "fn",
  "precision",
  "recall",
  "f1",
  "average_precision",
  "best_f1",
  "best_f1_threshold",
  "reference_hotspot",
  "candidate_hotspot",
  "hotspot_distance_um",
  "reference_count_at_candidate",
  "scheme",
  "reference_class",
  "candidate_class",
  "same_class",
  "agreeing_thresholds",
  "warnings",
] as const;

const cell = (v: unknown): string =>
  v === null || v === undefined ? "" : typeof v === "boolean" ? (v ? "yes" : "no") : String(v);

/**
 * `comparison.csv`: one row a case, RFC 4180 (CRLF line ends, quoted where
 * needed); empty cells mean "none"; `agreeing_thresholds` as `lo–hi`
 * intervals joined by `;`.
 *
 * @param comparisons The cases.
 * @returns The CSV text.
 *
 * @example
 * ```ts
 * import { comparisonCsv } from "./write_comparison.ts";
 * const csv = comparisonCsv([]);
 * if (!csv.startsWith("case,matching,radius_um,")) throw new Error(csv);
 * ```
 */
export function comparisonCsv(comparisons: readonly ComparisonJson[]): string {
  const rows = comparisons.map((c) => {
    const g = c.grade;
    const row: Record<string, unknown> = {
      case: c.case,
      matching: c.matching,
      radius_um: c.radius_um,
      min_score: c.min_score,
      reference: c.detection.reference,
      candidate: c.detection.candidate,
      tp: c.detection.tp,
      fp: c.detection.fp,
      fn: c.detection.fn,
      precision: c.detection.precision,
      recall: c.detection.recall,
      f1: c.detection.f1,
      average_precision: c.average_precision,
      best_f1: c.best_f1.f1,
      best_f1_threshold: c.best_f1.threshold,
      reference_hotspot: c.hotspot.reference?.count,
      candidate_hotspot: c.hotspot.candidate?.count,
      hotspot_distance_um: c.hotspot.distance_um,
      reference_count_at_candidate: c.hotspot.reference_count_at_candidate,
      scheme: g?.scheme,
      reference_class: g?.reference_class,
      candidate_class: g?.candidate_class,
      same_class: g ? g.reference_class !== null && g.reference_class === g.candidate_class : null,
      agreeing_thresholds: g ? g.agreeing_thresholds.map(([a, b]) => `${a}–${b}`).join(";") : null,
      warnings: c.warnings.length,
    };
    return COMPARISON_COLUMNS.map((k) => cell(row[k]));
  });
  return stringify(rows, {
    header: true,
    columns: [...COMPARISON_COLUMNS],
    record_delimiter: "\r\n",
    eof: true,
  });
}

function checkOutDir(outDir: string): void {
  if (existsSync(outDir) && !statSync(outDir).isDirectory()) {
    throw new Error(`Cannot write comparisons to "${outDir}": it is a file, not a folder`);
  }
  try {
    mkdirSync(outDir, { recursive: true });
  } catch (e) {
    throw new Error(`Cannot create the output folder "${outDir}": ${(e as Error).message}`);
  }
}

function safeFolder(id: string): void {
  if (id === "" || id === "." || id === ".." || /[\/\\\0]/.test(id) || id.startsWith(".")) {
    throw new Error(
      `Cannot write the comparison of case "${id}": the case id is not a safe folder name`,
    );
  }
}

/**
 * Writes one case's `comparison.json` and `comparison.html` into
 * `outDir/<case>/` (staged, then renamed into place, replacing an older
 * folder of that case), and the shared plotly.js asset unless `standalone`.
 *
 * @param result The comparison.
 * @param outDir The output folder (created when missing).
 * @param options Standalone pages, generation time.
 * @returns The paths written.
 * @throws {Error} When the folder cannot be created or written.
 *
 * @example Refusing a file as output folder
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv, writeComparisonCase } from "hotfield";
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
 * let message = "";
 * try { writeComparisonCase(result, Deno.execPath()); } catch (e) { message = (e as Error).message; }
 * if (!message.includes("it is a file, not a folder")) throw new Error(`unexpected message: ${message}`);
 * ```
 */
export function writeComparisonCase(
  result: ComparisonResult,
  outDir: string,
  options: WriteComparisonOptions = {},
): string[] {
  checkOutDir(outDir);
  const id = result.json.case;
  safeFolder(id);
  const standalone = options.standalone ?? false;
  const plotlyJs = standalone ? (options.plotlyJs ?? readPlotlyJs()) : "";
  const files: [string, string][] = [
    ["comparison.json", stableJson(result.json)],
    [
      "comparison.html",
      renderComparisonHtml(result, {
        plotlySrc: standalone ? null : "../assets/plotly.min.js",
        plotlyInline: standalone ? plotlyJs : undefined,
        generatedAt: options.generatedAt ?? null,
        version: HOTFIELD_VERSION,
      }),
    ],
  ];
  const written: string[] = [];
  if (!standalone) written.push(writeAsset(outDir, options));
  const finalDir = join(outDir, id);
  const stage = join(outDir, `.${id}.staging-${Deno.pid}`);
  const old = join(outDir, `.${id}.old-${Deno.pid}`);
  rmSync(stage, { recursive: true, force: true });
  try {
    mkdirSync(stage, { recursive: true });
    for (const [name, text] of files) writeFileAtomic(join(stage, name), text);
    if (existsSync(finalDir)) renameSync(finalDir, old);
    renameSync(stage, finalDir);
    rmSync(old, { recursive: true, force: true });
  } catch (e) {
    rmSync(stage, { recursive: true, force: true });
    if (!existsSync(finalDir) && existsSync(old)) renameSync(old, finalDir);
    throw new Error(
      `Cannot write the comparison of "${id}" in "${outDir}": ${(e as Error).message}`,
    );
  }
  for (const [name] of files) written.push(join(finalDir, name));
  return written;
}

function writeAsset(outDir: string, options: WriteComparisonOptions): string {
  const path = join(outDir, "assets", "plotly.min.js");
  writeFileAtomic(path, options.plotlyJs !== undefined ? options.plotlyJs : readPlotlyBytes());
  return path;
}

/**
 * Writes the cohort files: `comparison.csv`, `comparison-summary.json` and
 * `index.html` (and the shared plotly.js asset unless `standalone`).
 *
 * @param comparisons The cases, in manifest order.
 * @param summary The cohort summary.
 * @param failed The failed pairs.
 * @param outDir The output folder.
 * @param options Standalone page, generation time.
 * @returns The paths written.
 *
 * @example Writing a cohort of one (standalone pages need no asset)
 * ```ts
 * import { compareCase, parseAnnotations, parseFiguresCsv, summarizeComparisons, writeComparisonCohort } from "hotfield";
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
 * if ((await Deno.permissions.query({ name: "write" })).state === "granted") {
 *   const dir = Deno.makeTempDirSync();
 *   const written = writeComparisonCohort([result.json], summarizeComparisons([result.json]), [], dir, {
 *     plotlyJs: "void 0;", standalone: true,
 *   });
 *   if (written.length !== 3) throw new Error(`expected csv, summary and page, got ${written.join(", ")}`);
 *   Deno.removeSync(dir, { recursive: true });
 * }
 * ```
 */
export function writeComparisonCohort(
  comparisons: readonly ComparisonJson[],
  summary: ComparisonSummaryJson,
  failed: readonly ComparisonFailure[],
  outDir: string,
  options: WriteComparisonOptions = {},
): string[] {
  checkOutDir(outDir);
  const standalone = options.standalone ?? false;
  const written: string[] = [];
  if (!standalone) written.push(writeAsset(outDir, options));
  const files: [string, string][] = [
    ["comparison.csv", comparisonCsv(comparisons)],
    ["comparison-summary.json", stableJson(summary)],
    [
      "index.html",
      renderComparisonCohortHtml(comparisons, summary, failed, {
        plotlySrc: standalone ? null : "assets/plotly.min.js",
        plotlyInline: standalone ? (options.plotlyJs ?? readPlotlyJs()) : undefined,
        generatedAt: options.generatedAt ?? null,
        version: HOTFIELD_VERSION,
      }),
    ],
  ];
  for (const [name, text] of files) {
    const path = join(outDir, name);
    writeFileAtomic(path, text);
    written.push(path);
  }
  return written;
}
