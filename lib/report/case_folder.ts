/**
 * One case's output folder `DIR/<case>/`: what goes in it, and writing it so
 * that the folder is either the old one or the complete new one.
 *
 * A folder is staged under the temporary name `DIR/.tmp-<case>-<pid>` and
 * renamed into place; an existing folder is first moved aside to
 * `DIR/.tmp-<case>-<pid>.old` and removed once the new one is in place. A
 * process killed at any moment therefore leaves only complete case folders
 * and `.tmp-` entries, which {@linkcode removeTemporaryEntries} clears
 * (putting a moved-aside folder back when its case folder is missing).
 *
 * @module
 */

import { existsSync, readdirSync, renameSync, rmSync, statSync } from "node:fs";
import { join } from "node:path";
import type { CaseResult } from "../pipeline/case_result.ts";
import {
  describeWriteError,
  OutputTransaction,
  OutputWriteError,
} from "../io/output_transaction.ts";
import { caseIdClash, isReservedCaseId, safeCaseId } from "../annotations/case_id.ts";
import { HOTFIELD_VERSION } from "../version.ts";
import { caseHotspotGeoJson } from "./hotspot_geojson.ts";
import { renderCaseHtml } from "./report_html.ts";

/** Output formats of `hotfield report --format`. */
export type OutputFormat = "json" | "html" | "csv" | "geojson";

/** Every output format, the default of `--format`. */
export const ALL_FORMATS: readonly OutputFormat[] = ["json", "html", "csv", "geojson"];

/** Prefix of every temporary entry hotfield makes in an output folder. */
export const TEMP_PREFIX = ".tmp-";

/**
 * Stable JSON text: two-space indent, trailing newline.
 *
 * @example Two-space indent and a final line break
 * ```ts
 * import { stableJson } from "./case_folder.ts";
 * if (stableJson({ a: 1 }) !== '{\n  "a": 1\n}\n') throw new Error("two-space indent and a final line break");
 * ```
 */
export function stableJson(value: unknown): string {
  return JSON.stringify(value, null, 2) + "\n";
}

/** What {@linkcode renderCaseFiles} needs besides the result. */
export interface CaseFilesContext {
  /** Formats to write. @default all */
  formats?: readonly OutputFormat[];
  /** Inline plotly.js into the page (give `plotlyJs`). @default false */
  standalone?: boolean;
  /** The plotly.js source, needed with `standalone`. */
  plotlyJs?: string;
  /** Generation time shown in the page (ISO 8601), or null for none. */
  generatedAt: string | null;
  /** Options shown in the page. @default the report's settings */
  runOptions?: Record<string, unknown>;
  /** Colour scale of the count map: `sqrt` keeps a weaker second focus visible. @default "linear" */
  mapScale?: "linear" | "sqrt";
}

/**
 * Renders the files of one case folder in memory: `report.json` (format
 * `json`), `hotspot.geojson` (`geojson`) and `report.html` (`html`).
 *
 * @param result The case result.
 * @param context Formats, plotly.js source and generation time.
 * @returns `[file name, text]` pairs in writing order.
 *
 * @example Only the JSON
 * ```ts
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { renderCaseFiles } from "./case_folder.ts";
 * const square = [[[0, 0], [8000, 0], [8000, 6000], [0, 6000], [0, 0]]];
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 0.5 },
 *   features: [{ type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: square } }],
 * }), { fileName: "QVT-24-001.geojson" });
 * const result = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, { bestN: 0, strideUm: 200 });
 * const files = renderCaseFiles(result, { formats: ["json"], generatedAt: null });
 * if (files.length !== 1 || files[0][0] !== "report.json") throw new Error(`only report.json: ${files.map((f) => f[0])}`);
 * ```
 */
export function renderCaseFiles(
  result: CaseResult,
  context: CaseFilesContext,
): [string, string][] {
  const formats = new Set(context.formats ?? ALL_FORMATS);
  const standalone = context.standalone ?? false;
  const files: [string, string][] = [];
  if (formats.has("json")) files.push(["report.json", stableJson(result.report)]);
  if (formats.has("geojson")) {
    files.push(["hotspot.geojson", stableJson(caseHotspotGeoJson(result))]);
  }
  if (formats.has("html")) {
    files.push([
      "report.html",
      renderCaseHtml(result, {
        plotlySrc: standalone ? null : "../assets/plotly.min.js",
        plotlyInline: standalone ? context.plotlyJs ?? "" : undefined,
        generatedAt: context.generatedAt,
        version: HOTFIELD_VERSION,
        options: context.runOptions ?? { ...result.report.settings },
        cohortHref: "../index.html",
        mapScale: context.mapScale,
      }),
    ]);
  }
  return files;
}

/**
 * Throws unless `id` is usable as a folder name directly inside the output
 * folder (not empty, no separator, not starting with a dot).
 *
 * @param id The case id.
 * @throws {Error} Naming the id.
 *
 * @example A safe id and one that leaves the folder
 * ```ts
 * import { checkCaseFolderName } from "./case_folder.ts";
 * checkCaseFolderName("QVT-24-001");
 * let failed = false;
 * try { checkCaseFolderName("../x"); } catch { failed = true; }
 * if (!failed) throw new Error(`"../x" must be refused`);
 * ```
 */
export function checkCaseFolderName(id: string): void {
  if (id === "" || id === "." || id === ".." || /[\/\\\0]/.test(id) || id.startsWith(".")) {
    throw new Error(
      `Cannot write the report of case "${id}": the case id is not a safe folder name`,
    );
  }
  if (isReservedCaseId(id)) {
    throw new Error(
      `Cannot write the report of case "${id}": hotfield writes a file or folder of that name beside the case folders (safeCaseId gives "${
        safeCaseId(id)
      }")`,
    );
  }
}

/**
 * Writes one case folder `outDir/<id>/` holding exactly `files`, through a
 * staged temporary folder and renames (see the module documentation).
 * Earlier temporary entries of the same case are removed first. `outDir` is
 * created when missing.
 *
 * @param outDir The output folder.
 * @param id The case id (the folder name).
 * @param files `[file name, text or bytes]` pairs.
 * @returns The paths written.
 * @throws {Error} Naming the case when the folder cannot be written; the old
 *   folder, if any, is then left in place.
 *
 * @example Writing a folder twice
 * ```ts
 * import { writeCaseFolder } from "./case_folder.ts";
 * import { readdirSync, readFileSync, rmSync } from "node:fs";
 * const dir = Deno.makeTempDirSync();
 * writeCaseFolder(dir, "QVT-24-001", [["a.txt", "1"], ["b.txt", "2"]]);
 * writeCaseFolder(dir, "QVT-24-001", [["a.txt", "3"]]);
 * if (readdirSync(`${dir}/QVT-24-001`).join() !== "a.txt") throw new Error("old files gone");
 * if (readFileSync(`${dir}/QVT-24-001/a.txt`, "utf8") !== "3") throw new Error("the second write replaces the first");
 * if (readdirSync(dir).join() !== "QVT-24-001") throw new Error("no temporary folder left");
 * rmSync(dir, { recursive: true });
 * ```
 */
export function writeCaseFolder(
  outDir: string,
  id: string,
  files: readonly [string, string | Uint8Array][],
): string[] {
  checkCaseFolderName(id);
  checkCaseIdFree(outDir, id);
  const tx = new OutputTransaction(outDir, `the report of "${id}" in "${outDir}"`);
  try {
    removeTemporaryEntries(outDir, { caseId: id });
  } catch (e) {
    tx.abort();
    throw new OutputWriteError(
      `Cannot write the report of "${id}" in "${outDir}": ${describeWriteError(e)}`,
      { cause: e },
    );
  }
  tx.folder(id, files);
  tx.commit();
  return files.map(([name]) => join(outDir, id, name));
}

/**
 * Refuses a case id that differs only by case from a folder or file already
 * in `outDir`: on a case-insensitive file system they are one entry, and the
 * new report would replace another case's.
 *
 * @param outDir The output folder (missing is fine).
 * @param id The case id.
 * @throws {Error} Naming both names and the folder.
 *
 * @example
 * ```ts
 * import { checkCaseIdFree } from "./case_folder.ts";
 * import { mkdirSync } from "node:fs";
 * const dir = Deno.makeTempDirSync();
 * mkdirSync(`${dir}/QVT-24-001`);
 * checkCaseIdFree(dir, "QVT-24-001"); // the same case again: fine
 * let refused = false;
 * try { checkCaseIdFree(dir, "qvt-24-001"); } catch { refused = true; }
 * if (!refused) throw new Error("an id differing only by case must be refused");
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export function checkCaseIdFree(outDir: string, id: string): void {
  let names: string[];
  try {
    names = readdirSync(outDir);
  } catch {
    return;
  }
  const clash = caseIdClash([id, ...names.filter((n) => !n.startsWith("."))]);
  if (clash !== undefined && clash[0] === id) {
    throw new Error(
      `Cannot write the report of case "${id}" in "${outDir}": "${
        clash[1]
      }" is already there and differs only by case (one folder on a case-insensitive file system); give the case another id`,
    );
  }
}

const TEMP_FOLDER = /^\.tmp-(.+)-(\d+)(\.old)?$/;
const TEMP_FILE = /\.tmp-\d+-\d+$/;

/**
 * Removes the temporary entries a killed run left in `outDir`: staged case
 * folders (`.tmp-<case>-<pid>`), moved-aside folders (`.tmp-<case>-<pid>.old`,
 * put back as `<case>` when that folder is missing) and half-written files
 * (`<name>.tmp-<pid>-<n>`, in `outDir` and `outDir/assets`).
 *
 * Only call it when no other process is writing into `outDir` (or, with
 * `caseId`, into that case's folder): their temporary entries look the same.
 *
 * @param outDir The output folder (missing is fine).
 * @param options `caseId`: only that case's folders.
 * @returns The names removed or put back, sorted.
 *
 * @example A leftover staged folder goes
 * ```ts
 * import { removeTemporaryEntries } from "./case_folder.ts";
 * import { mkdirSync, readdirSync, rmSync } from "node:fs";
 * const dir = Deno.makeTempDirSync();
 * mkdirSync(`${dir}/.tmp-QVT-24-001-4242`);
 * mkdirSync(`${dir}/QVT-24-002`);
 * const gone = removeTemporaryEntries(dir);
 * if (gone.join() !== ".tmp-QVT-24-001-4242" || readdirSync(dir).join() !== "QVT-24-002") {
 *   throw new Error(`only the staged folder goes: removed ${gone}`);
 * }
 * rmSync(dir, { recursive: true });
 * ```
 */
export function removeTemporaryEntries(
  outDir: string,
  options: { caseId?: string } = {},
): string[] {
  let names: string[];
  try {
    names = readdirSync(outDir).sort();
  } catch {
    return [];
  }
  const done: string[] = [];
  for (const name of names) {
    const path = join(outDir, name);
    const m = TEMP_FOLDER.exec(name);
    if (m && (options.caseId === undefined || m[1] === options.caseId)) {
      const finalDir = join(outDir, m[1]);
      if (m[3] && !existsSync(finalDir) && isFolder(path)) renameSync(path, finalDir);
      else rmSync(path, { recursive: true, force: true });
      done.push(name);
    } else if (options.caseId === undefined && TEMP_FILE.test(name)) {
      rmSync(path, { recursive: true, force: true });
      done.push(name);
    }
  }
  if (options.caseId === undefined && isFolder(join(outDir, "assets"))) {
    for (const name of readdirSync(join(outDir, "assets"))) {
      if (TEMP_FILE.test(name)) {
        rmSync(join(outDir, "assets", name), { force: true });
        done.push(join("assets", name));
      }
    }
  }
  return done.sort();
}

function isFolder(path: string): boolean {
  try {
    return statSync(path).isDirectory();
  } catch {
    return false;
  }
}
