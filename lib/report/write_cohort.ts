/**
 * The cohort files of an output folder: `DIR/index.html`, `DIR/readers.html`,
 * `DIR/cases.csv`, `DIR/fields.csv` and `DIR/readers.csv` (plus the shared
 * `DIR/assets/plotly.min.js`), built from every case folder in DIR, whichever
 * run wrote it.
 *
 * A case folder is a folder directly inside DIR whose name does not start
 * with a dot, other than `assets`, holding a `report.json` of schema
 * `hotfield.report/1` whose `case` is the folder name. Cases are listed in
 * case-id order (UTF-16 code units, the same on every machine).
 *
 * @module
 */

import { existsSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { REPORT_SCHEMA, type ReportJson } from "../pipeline/report_types.ts";
import { OutputTransaction } from "../io/output_transaction.ts";
import { HOTFIELD_VERSION } from "../version.ts";
import { renderCohortIndex } from "./cohort_index.ts";
import { casesCsv, fieldsCsv } from "./report_csv.ts";
import { readPlotlyBytes, readPlotlyJs } from "./plotly_asset.ts";
import { readerAudit } from "../cohort/reader_audit.ts";
import { readersCsv } from "./readers_csv.ts";
import { renderReadersPage } from "./readers_page.ts";

/** What {@linkcode readCaseReports} found. */
export interface CaseReports {
  /** The reports, in case-id order. */
  reports: ReportJson[];
  /** Folders passed over, each with why (not JSON, another schema, …). */
  skipped: string[];
}

/**
 * Reads `report.json` of every case folder in `outDir` (see the module
 * documentation for what counts as a case folder).
 *
 * @param outDir The output folder; a missing folder has no reports.
 * @returns The reports in case-id order and the folders passed over.
 *
 * @example Two case folders and a hidden one
 * ```ts
 * import { readCaseReports } from "hotfield";
 * import { mkdirSync, rmSync, writeFileSync } from "node:fs";
 * const dir = Deno.makeTempDirSync();
 * for (const id of ["QVT-24-002", "QVT-24-001", ".tmp-QVT-24-003-7"]) {
 *   mkdirSync(`${dir}/${id}`);
 *   writeFileSync(`${dir}/${id}/report.json`, JSON.stringify({ schema: "hotfield.report/1", case: id }));
 * }
 * const { reports } = readCaseReports(dir);
 * if (reports.map((r) => r.case).join() !== "QVT-24-001,QVT-24-002") throw new Error(`two case folders in id order, the hidden one passed over: ${reports.map((r) => r.case)}`);
 * rmSync(dir, { recursive: true });
 * ```
 */
export function readCaseReports(outDir: string): CaseReports {
  const reports: ReportJson[] = [];
  const skipped: string[] = [];
  if (!existsSync(outDir)) return { reports, skipped };
  for (const entry of readdirSync(outDir, { withFileTypes: true })) {
    const name = entry.name;
    if (!entry.isDirectory() || name.startsWith(".") || name === "assets") continue;
    const path = join(outDir, name, "report.json");
    if (!existsSync(path)) continue;
    let report: unknown;
    try {
      report = JSON.parse(readFileSync(path, "utf8"));
    } catch (e) {
      skipped.push(`${path}: not valid JSON (${(e as Error).message})`);
      continue;
    }
    const r = report as Partial<ReportJson> | null;
    if (r === null || typeof r !== "object" || r.schema !== REPORT_SCHEMA) {
      skipped.push(`${path}: not a hotfield report (schema ${REPORT_SCHEMA})`);
    } else if (r.case !== name) {
      skipped.push(`${path}: holds case "${r.case}", not "${name}"`);
    } else {
      reports.push(r as ReportJson);
    }
  }
  reports.sort((a, b) => (a.case < b.case ? -1 : a.case > b.case ? 1 : 0));
  return { reports, skipped };
}

/** Options of {@linkcode writeCohortFiles}. */
export interface CohortFilesOptions {
  /** Write `cases.csv`, `fields.csv` and `readers.csv`. @default true */
  csv?: boolean;
  /** Write `index.html` and `readers.html` (and the shared plotly.js unless `standalone`). @default true */
  html?: boolean;
  /** Inline plotly.js into index.html instead of sharing `assets/plotly.min.js`. @default false */
  standalone?: boolean;
  /** Generation time shown in index.html (ISO 8601), or null for none. */
  generatedAt: string | null;
  /** The plotly.js source, when the caller already has it. @default read from the npm package */
  plotlyJs?: string;
}

/**
 * Writes the cohort files of `outDir` for `reports`, each file through a
 * temporary name. index.html links a case to its `report.html` when that
 * file exists in the case folder, else to its `report.json`.
 *
 * @param outDir The output folder (created when missing).
 * @param reports The reports to list, in order (see {@linkcode readCaseReports}).
 * @param options Which files, plotly.js, generation time.
 * @returns The paths written.
 * @throws {OutputWriteError} Naming the folder and the file at fault; every cohort file
 *   is then as it was (they are staged and renamed into place together).
 *
 * @example The CSV tables of an empty cohort
 * ```ts
 * import { writeCohortFiles } from "hotfield";
 * import { readFileSync, rmSync } from "node:fs";
 * const dir = Deno.makeTempDirSync();
 * const written = writeCohortFiles(dir, [], { html: false, generatedAt: null });
 * if (written.length !== 3 || !readFileSync(`${dir}/cases.csv`, "utf8").startsWith("case,")) {
 *   throw new Error(`three CSV files with headers: ${written}`);
 * }
 * rmSync(dir, { recursive: true });
 * ```
 */
export function writeCohortFiles(
  outDir: string,
  reports: readonly ReportJson[],
  options: CohortFilesOptions,
): string[] {
  const files: [string, string | Uint8Array][] = [];
  const standalone = options.standalone ?? false;
  const html = options.html ?? true, csv = options.csv ?? true;
  if (html && !standalone) {
    files.push([
      join("assets", "plotly.min.js"),
      options.plotlyJs !== undefined ? options.plotlyJs : readPlotlyBytes(),
    ]);
  }
  const readers = csv || html ? readerAudit(reports) : [];
  if (csv) {
    files.push(
      ["cases.csv", casesCsv(reports)],
      ["fields.csv", fieldsCsv(reports)],
      ["readers.csv", readersCsv(readers)],
    );
  }
  if (html) {
    const withHtml = reports
      .filter((r) => existsSync(join(outDir, r.case, "report.html")))
      .map((r) => r.case);
    const plotlyInline = standalone ? (options.plotlyJs ?? readPlotlyJs()) : undefined;
    const page = {
      plotlySrc: standalone ? null : "assets/plotly.min.js",
      plotlyInline,
      generatedAt: options.generatedAt,
      version: HOTFIELD_VERSION,
      linkCsv: csv,
    };
    files.push(
      [
        "index.html",
        renderCohortIndex(reports.map((report) => ({ report })), {
          ...page,
          linkHtml: withHtml,
          linkReaders: true,
        }),
      ],
      // The readers page links every case alike: to its page when most cases have one.
      [
        "readers.html",
        renderReadersPage(readers, { ...page, linkHtml: withHtml.length * 2 >= reports.length }),
      ],
    );
  }
  // all or nothing: a failure (a full disk, a folder in the way) leaves every
  // cohort file as it was
  const tx = new OutputTransaction(outDir, `the cohort files of "${outDir}"`);
  for (const [name, data] of files) tx.file(name, data);
  return tx.commit();
}
