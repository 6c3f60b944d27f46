/**
 * Writing the outputs of one report run:
 *
 * - per case `DIR/<case>/report.json`, `DIR/<case>/hotspot.geojson` and
 *   `DIR/<case>/report.html`;
 * - for the run `DIR/cases.csv`, `DIR/fields.csv`, `DIR/readers.csv`,
 *   `DIR/index.html`, `DIR/readers.html` and the shared
 *   `DIR/assets/plotly.min.js` (unless plotly.js is inlined).
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

import { existsSync, mkdirSync, renameSync, rmSync, statSync } from "node:fs";
import { join } from "node:path";
import type { CaseResult } from "../pipeline/case_result.ts";
import { writeFileAtomic } from "../io/write_atomic.ts";
import { HOTFIELD_VERSION } from "../version.ts";
import { caseHotspotGeoJson } from "./hotspot_geojson.ts";
import { renderCaseHtml } from "./report_html.ts";
import { renderCohortIndex } from "./cohort_index.ts";
import { casesCsv, fieldsCsv } from "./report_csv.ts";
import { readPlotlyBytes, readPlotlyJs } from "./plotly_asset.ts";
import { readerAudit } from "../cohort/reader_audit.ts";
import { readersCsv } from "./readers_csv.ts";
import { renderReadersPage } from "./readers_page.ts";

/** Output formats of `hotfield report --format`. */
export type OutputFormat = "json" | "html" | "csv" | "geojson";

/** Every output format, the default of `--format`. */
export const ALL_FORMATS: readonly OutputFormat[] = ["json", "html", "csv", "geojson"];

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
 * Stable JSON text: two-space indent, trailing newline.
 *
 * @example
 * ```ts
 * import { stableJson } from "./write_outputs.ts";
 * const text = stableJson({ a: 1 });
 * if (text !== '{\n  "a": 1\n}\n') throw new Error(`two-space indent and a final newline: ${JSON.stringify(text)}`);
 * ```
 */
export function stableJson(value: unknown): string {
  return JSON.stringify(value, null, 2) + "\n";
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

function sourceDateEpochFromEnv(): string | undefined {
  try {
    const state = Deno.permissions.querySync({ name: "env", variable: "SOURCE_DATE_EPOCH" }).state;
    return state === "granted" ? Deno.env.get("SOURCE_DATE_EPOCH") : undefined;
  } catch {
    return undefined;
  }
}

function checkCaseFolderName(id: string): void {
  if (id === "" || id === "." || id === ".." || /[\/\\\0]/.test(id) || id.startsWith(".")) {
    throw new Error(
      `Cannot write the report of case "${id}": the case id is not a safe folder name`,
    );
  }
}

/**
 * Writes the outputs of `results` under `outDir` and returns the paths written.
 *
 * Per case (formats `json`, `geojson`, `html`): `<case>/report.json`,
 * `<case>/hotspot.geojson`, `<case>/report.html`. For the run: `cases.csv`,
 * `fields.csv` and `readers.csv` (format `csv`), `index.html`,
 * `readers.html` (the reader audit across the cases) and
 * `assets/plotly.min.js` (format `html`; the asset is left out with
 * `standalone`, which inlines plotly.js into every page). Any number of
 * cases, including none.
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

  // 1. Render everything in memory.
  const generatedAt = options.generatedAt !== undefined
    ? options.generatedAt
    : generationTime(sourceDateEpochFromEnv(), new Date());
  const wantHtml = formats.has("html");
  const standalone = options.standalone ?? false;
  // Only inlining needs the text; the shared asset is copied as bytes.
  const plotlyJs = wantHtml && standalone ? (options.plotlyJs ?? readPlotlyJs()) : "";
  const perCase: { id: string; files: [string, string][] }[] = results.map((result) => {
    const files: [string, string][] = [];
    if (formats.has("json")) files.push(["report.json", stableJson(result.report)]);
    if (formats.has("geojson")) {
      files.push(["hotspot.geojson", stableJson(caseHotspotGeoJson(result))]);
    }
    if (wantHtml) {
      files.push([
        "report.html",
        renderCaseHtml(result, {
          plotlySrc: standalone ? null : "../assets/plotly.min.js",
          plotlyInline: standalone ? plotlyJs : undefined,
          generatedAt,
          version: HOTFIELD_VERSION,
          options: options.runOptions ?? { ...result.report.settings },
          cohortHref: "../index.html",
          mapScale: options.mapScale,
        }),
      ]);
    }
    return { id: result.prepared.caseId, files };
  });
  const runFiles: [string, string][] = [];
  const reports = results.map((r) => r.report);
  const readers = formats.has("csv") || wantHtml ? readerAudit(reports) : [];
  if (formats.has("csv")) {
    runFiles.push(
      ["cases.csv", casesCsv(reports)],
      ["fields.csv", fieldsCsv(reports)],
      ["readers.csv", readersCsv(readers)],
    );
  }
  if (wantHtml) {
    runFiles.push([
      "index.html",
      renderCohortIndex(results, {
        plotlySrc: standalone ? null : "assets/plotly.min.js",
        plotlyInline: standalone ? plotlyJs : undefined,
        generatedAt,
        version: HOTFIELD_VERSION,
        linkHtml: true,
        linkCsv: formats.has("csv"),
        linkReaders: true,
      }),
    ], [
      "readers.html",
      renderReadersPage(readers, {
        plotlySrc: standalone ? null : "assets/plotly.min.js",
        plotlyInline: standalone ? plotlyJs : undefined,
        generatedAt,
        version: HOTFIELD_VERSION,
        linkHtml: true,
        linkCsv: formats.has("csv"),
      }),
    ]);
  }
  const assetFiles: [string, string | Uint8Array][] = wantHtml && !standalone
    ? [[
      join("assets", "plotly.min.js"),
      options.plotlyJs !== undefined ? options.plotlyJs : readPlotlyBytes(),
    ]]
    : [];

  // 2. Write: the shared asset first (reports reference it), then each case folder
  // staged, then the cohort files that link to the cases.
  try {
    mkdirSync(outDir, { recursive: true });
  } catch (e) {
    throw new Error(`Cannot create the output folder "${outDir}": ${(e as Error).message}`, {
      cause: e,
    });
  }
  const written: string[] = [];
  const writeRunFile = ([name, text]: [string, string | Uint8Array]) => {
    const path = join(outDir, name);
    try {
      writeFileAtomic(path, text);
    } catch (e) {
      throw new Error(`Cannot write "${path}": ${(e as Error).message}`, { cause: e });
    }
    written.push(path);
  };
  assetFiles.forEach(writeRunFile);
  for (const { id, files } of perCase) {
    // A format list with nothing per case (csv only) makes no empty folder.
    if (files.length === 0) continue;
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
        `Cannot write the report of "${id}" in "${outDir}": ${(e as Error).message}`,
        { cause: e },
      );
    }
    for (const [name] of files) written.push(join(finalDir, name));
  }
  runFiles.forEach(writeRunFile);
  return written;
}
