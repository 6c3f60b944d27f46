/**
 * Which cases a folder (or a list of files) holds.
 *
 * In a folder, every `*.case.json` is a case, and every `*.geojson` that no
 * case file of the folder names is a case (so a case file and the GeoJSON it
 * names make one case, not two). A case file that cannot be read is still a
 * case, which fails with the reader's message; it claims the GeoJSON of the
 * same stem (`x.case.json` → `x.geojson`), which would otherwise run alone
 * under the case's id. Cases come in file-name order.
 *
 * @module
 */

import { readdirSync, statSync } from "node:fs";
import { isAbsolute, join, resolve } from "node:path";
import { type CaseInput, readCaseFile } from "../annotations/read_case.ts";
import type { ReportOptions } from "../pipeline/case_result.ts";
import type { BatchCase } from "./batch_types.ts";

const CASE_FILE = /\.case\.json$/i;
const GEOJSON = /\.geojson$/i;

/**
 * The cases of a folder (see the module documentation). Paths are the file
 * names, read against the folder (`input.baseDir`).
 *
 * @param dir The folder.
 * @param options Report options of every case.
 * @returns One case per case file or unnamed GeoJSON.
 * @throws {Error} When the folder cannot be listed.
 *
 * @example The committed demo folder holds eight cases
 * ```ts
 * import { folderCases } from "hotfield";
 * import { fileURLToPath } from "node:url";
 * const cases = await folderCases(fileURLToPath(new URL("../../data/demo/", import.meta.url)), {});
 * if (cases.length !== 8 || cases[6].input?.tissueMaskPath !== "QVT-24-007.tissue.png") {
 *   throw new Error(JSON.stringify(cases[6]));
 * }
 * ```
 */
export async function folderCases(dir: string, options: ReportOptions): Promise<BatchCase[]> {
  let names: string[];
  try {
    names = readdirSync(dir).filter((n) => isFile(join(dir, n))).sort();
  } catch (e) {
    throw new Error(`Cannot read the folder "${dir}": ${(e as Error).message}`);
  }
  const baseDir = resolve(dir);
  const found: { name: string; input: CaseInput | null; problem?: string }[] = [];
  const claimed = new Set<string>();
  for (const name of names.filter((n) => CASE_FILE.test(n))) {
    try {
      const input = await readCaseFile(name, { baseDir });
      for (const p of claimedPaths(input)) claimed.add(p);
      found.push({ name, input });
    } catch (e) {
      claimed.add(join(baseDir, name.replace(CASE_FILE, ".geojson")));
      found.push({ name, input: null, problem: (e as Error).message });
    }
  }
  for (const name of names.filter((n) => GEOJSON.test(n))) {
    if (claimed.has(join(baseDir, name))) continue;
    found.push({ name, input: { annotationsPath: name, baseDir } });
  }
  found.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  return found.map(({ name, input, problem }, index) => ({
    index,
    label: join(dir, name),
    input,
    ...(problem !== undefined ? { problem } : {}),
    options: { ...options },
    shardKey: name,
  }));
}

/**
 * Drops, from a list of cases named one by one, those whose file another
 * case of the list reads through its case file (`report in/*` on a folder
 * holding `x.case.json` and the `x.geojson` it names runs one case, not two).
 *
 * @param cases Cases with the file each was named by.
 * @returns The cases to run, in the order given, and the files dropped.
 *
 * @example A case file and the GeoJSON it names make one case
 * ```ts
 * import { dropClaimedFiles } from "./case_sources.ts";
 * const { kept, dropped } = dropClaimedFiles([
 *   { file: "in/x.case.json", input: { caseFilePath: "in/x.case.json", annotationsPath: "in/x.geojson" } },
 *   { file: "in/x.geojson", input: { annotationsPath: "in/x.geojson" } },
 * ]);
 * if (kept.length !== 1 || dropped[0] !== "in/x.geojson") throw new Error(`one case, x.geojson dropped: ${JSON.stringify({ kept, dropped })}`);
 * ```
 */
export function dropClaimedFiles<T extends { file: string; input: CaseInput | null }>(
  cases: readonly T[],
): { kept: T[]; dropped: string[] } {
  const claimed = new Set<string>();
  for (const c of cases) {
    if (c.input?.caseFilePath !== undefined) {
      for (const p of claimedPaths(c.input)) claimed.add(p);
    }
  }
  const kept: T[] = [], dropped: string[] = [];
  for (const c of cases) {
    const isCaseFile = c.input?.caseFilePath !== undefined;
    if (!isCaseFile && claimed.has(resolve(c.file))) dropped.push(c.file);
    else kept.push(c);
  }
  return { kept, dropped };
}

/** Absolute paths of the files a case file names. */
function claimedPaths(input: CaseInput): string[] {
  const at = (p: string) =>
    resolve(isAbsolute(p) ? p : input.baseDir !== undefined ? join(input.baseDir, p) : p);
  return [input.annotationsPath, input.figuresPath, input.tissueMaskPath]
    .filter((p): p is string => p !== undefined)
    .map(at);
}

function isFile(path: string): boolean {
  try {
    return statSync(path).isFile();
  } catch {
    return false;
  }
}
