/**
 * Writing the outputs of one report run:
 *
 * - per case `DIR/<case>/report.json`, `DIR/<case>/hotspot.geojson` and
 *   `DIR/<case>/report.html` (see `case_folder.ts`);
 * - for the cohort `DIR/cases.csv`, `DIR/fields.csv`, `DIR/readers.csv`,
 *   `DIR/index.html`, `DIR/readers.html` and the shared
 *   `DIR/assets/plotly.min.js` (unless plotly.js is inlined), rebuilt from
 *   every case folder in DIR, earlier runs included (see `write_cohort.ts`).
 *
 * Everything is rendered in memory first, so a rendering problem writes
 * nothing. Each case folder is then staged under a temporary name and renamed
 * into place, and every single file is written through a temporary name, so
 * a failed run never leaves a half-written file behind.
 *
 * Reports of the same inputs are byte-identical across runs: the only time
 * shown honours `SOURCE_DATE_EPOCH` (reproducible-builds.org convention).
 *
 * @module
 */

import { existsSync, statSync } from "node:fs";
import type { CaseResult } from "../pipeline/case_result.ts";
import {
  ALL_FORMATS,
  checkCaseFolderName,
  type OutputFormat,
  renderCaseFiles,
  writeCaseFolder,
} from "./case_folder.ts";
import { readCaseReports, writeCohortFiles } from "./write_cohort.ts";
import { readPlotlyJs } from "./plotly_asset.ts";
import { caseIdClash } from "../annotations/case_id.ts";

export { ALL_FORMATS, type OutputFormat, stableJson } from "./case_folder.ts";

/** Options of {@linkcode writeOutputs}. */
export interface WriteOutputsOptions {
  /** Formats to write. @default all */
  formats?: readonly OutputFormat[];
  /** Inline plotly.js into each HTML file instead of one shared copy. @default false */
  standalone?: boolean;
  /**
   * Generation time shown in the HTML pages (ISO 8601), or null for none.
   * @default from `SOURCE_DATE_EPOCH`, else the current time
   */
  generatedAt?: string | null;
  /** Options of the run, shown in each report. @default each report's settings */
  runOptions?: Record<string, unknown>;
  /** The plotly.js source, when the caller already has it. @default read from the npm package */
  plotlyJs?: string;
  /** Colour scale of the count maps: `sqrt` keeps a weaker second focus visible. @default "linear" */
  mapScale?: "linear" | "sqrt";
}

/**
 * The generation time to show: `SOURCE_DATE_EPOCH` (whole seconds since
 * 1970-01-01 UTC) as ISO 8601 UTC without fractions, else `now`.
 *
 * @param sourceDateEpoch The variable's value, or undefined when unset.
 * @param now The current time, used when the variable is unset or empty.
 * @returns ISO 8601 UTC, e.g. `2023-11-14T22:13:20Z`.
 * @throws RangeError when the variable is set but not a whole number of seconds.
 *
 * @example A fixed epoch gives a fixed time
 * ```ts
 * import { generationTime } from "./write_outputs.ts";
 * const fixed = generationTime("1700000000", new Date(0));
 * if (fixed !== "2023-11-14T22:13:20Z") throw new Error(`SOURCE_DATE_EPOCH 1700000000 gave ${fixed}`);
 * const now = generationTime(undefined, new Date(0));
 * if (now !== "1970-01-01T00:00:00Z") throw new Error(`without an epoch the clock is used: ${now}`);
 * ```
 */
export function generationTime(sourceDateEpoch: string | undefined, now: Date): string {
  let date = now;
  if (sourceDateEpoch !== undefined && sourceDateEpoch.trim() !== "") {
    const s = sourceDateEpoch.trim();
    if (!/^\d+$/.test(s) || !Number.isSafeInteger(Number(s)) || Number(s) > 8.64e12) {
      throw new RangeError(
        `SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01 UTC: got "${sourceDateEpoch}"`,
      );
    }
    date = new Date(Number(s) * 1000);
  }
  return date.toISOString().replace(/\.\d{3}Z$/, "Z");
}

/**
 * The generation time reports show: {@linkcode generationTime} of
 * `SOURCE_DATE_EPOCH` when it is set (and readable), else of `now`.
 *
 * @param now The current time.
 * @returns ISO 8601 UTC.
 * @throws RangeError when `SOURCE_DATE_EPOCH` is malformed.
 *
 * @example
 * ```ts
 * import { reportGenerationTime } from "./write_outputs.ts";
 * if (!/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ$/.test(reportGenerationTime())) throw new Error();
 * ```
 */
export function reportGenerationTime(now: Date = new Date()): string {
  return generationTime(sourceDateEpochFromEnv(), now);
}

function sourceDateEpochFromEnv(): string | undefined {
  try {
    const state = Deno.permissions.querySync({ name: "env", variable: "SOURCE_DATE_EPOCH" }).state;
    return state === "granted" ? Deno.env.get("SOURCE_DATE_EPOCH") : undefined;
  } catch {
    return undefined;
  }
}

/**
 * Writes the outputs of `results` under `outDir` and returns the paths written.
 *
 * Per case (formats `json`, `geojson`, `html`): `<case>/report.json`,
 * `<case>/hotspot.geojson`, `<case>/report.html`. For the cohort: `cases.csv`,
 * `fields.csv` and `readers.csv` (format `csv`), `index.html`, `readers.html`
 * and `assets/plotly.min.js` (format `html`; the asset is left out with
 * `standalone`, which inlines plotly.js into every page), listing every case
 * folder in `outDir`, those of earlier runs included. Any number of cases,
 * including none.
 *
 * @param results Engine results; case ids must be distinct.
 * @param outDir Output folder, created when missing (it may lie inside the input folder).
 * @param options Formats, standalone HTML, generation time.
 * @returns Paths of the files written, in writing order.
 * @throws Error when `outDir` is a file, not writable, or two results share a case id.
 *
 * @example Refusing a file as output folder
 * ```ts
 * import { writeOutputs } from "hotfield";
 * let message = "";
 * try { writeOutputs([], Deno.execPath()); } catch (e) { message = (e as Error).message; }
 * if (!message.includes("it is a file, not a folder")) throw new Error(message);
 * ```
 */
export function writeOutputs(
  results: CaseResult[],
  outDir: string,
  options: WriteOutputsOptions = {},
): string[] {
  const formats = new Set(options.formats ?? ALL_FORMATS);
  if (existsSync(outDir) && !statSync(outDir).isDirectory()) {
    throw new Error(`Cannot write reports to "${outDir}": it is a file, not a folder`);
  }
  const seen = new Set<string>();
  for (const r of results) {
    const id = r.prepared.caseId;
    checkCaseFolderName(id);
    if (seen.has(id)) {
      throw new Error(`Cannot write reports to "${outDir}": case "${id}" appears twice`);
    }
    seen.add(id);
  }
  const clash = caseIdClash([...seen]);
  if (clash !== undefined) {
    throw new Error(
      `Cannot write reports to "${outDir}": cases "${clash[0]}" and "${
        clash[1]
      }" differ only by case, and would share one folder on a case-insensitive file system; give one of them another id`,
    );
  }

  // 1. Render everything in memory.
  const generatedAt = options.generatedAt !== undefined
    ? options.generatedAt
    : reportGenerationTime();
  const standalone = options.standalone ?? false;
  // Only inlining needs the text; the shared asset is copied as bytes.
  const plotlyJs = formats.has("html") && standalone
    ? (options.plotlyJs ?? readPlotlyJs())
    : options.plotlyJs;
  const perCase = results.map((result) => ({
    id: result.prepared.caseId,
    files: renderCaseFiles(result, {
      formats: [...formats],
      standalone,
      plotlyJs,
      generatedAt,
      runOptions: options.runOptions,
      mapScale: options.mapScale,
    }),
  }));

  // 2. Write each case folder staged, then the cohort files from every case folder.
  // (each write creates the folder when missing, and removes it again when it fails)
  const written: string[] = [];
  for (const { id, files } of perCase) {
    // A format list with nothing per case (csv only) makes no empty folder.
    if (files.length > 0) written.push(...writeCaseFolder(outDir, id, files));
  }
  const reports = new Map(readCaseReports(outDir).reports.map((r) => [r.case, r]));
  for (const r of results) reports.set(r.report.case, r.report);
  const cohort = [...reports.values()].sort((a, b) =>
    a.case < b.case ? -1 : a.case > b.case ? 1 : 0
  );
  written.push(
    ...writeCohortFiles(outDir, cohort, {
      csv: formats.has("csv"),
      html: formats.has("html"),
      standalone,
      generatedAt,
      plotlyJs,
    }),
  );
  return written;
}
