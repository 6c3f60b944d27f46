/**
 * report.json's `provenance`, and the test `batch` uses to skip a case that
 * is done: same input sha256s, same settings_sha256, same hotfield version.
 *
 * @module
 */

import { createHash } from "node:crypto";
import { readInputFile } from "../io/read_input.ts";
import { MAX_TEXT_INPUT_BYTES } from "../defaults.ts";
import { isAbsolute, join } from "node:path";
import type { CaseInput } from "../annotations/read_case.ts";
import type { ReportProvenance } from "../pipeline/report_types.ts";
import type { CaseSource } from "../types.ts";
import { HOTFIELD_VERSION } from "../version.ts";
import { canonicalJson } from "./settings.ts";

/**
 * The provenance of a report from the files read for it.
 *
 * @param sources `CaseData.sources` (paths as given, in reading order).
 * @param settingsSha256 See `settingsSha256` in settings.ts.
 * @returns `{hotfield_version, inputs: [{path, sha256}], settings_sha256}`.
 *
 * @example From the sources of a case
 * ```ts
 * import { caseProvenance } from "./provenance.ts";
 * const p = caseProvenance([{ kind: "annotations", path: "a.geojson", sha256: "ab" }], "cd");
 * if (p.inputs[0].path !== "a.geojson" || p.settings_sha256 !== "cd") throw new Error(`paths and settings sha256 kept: ${JSON.stringify(p)}`);
 * ```
 */
export function caseProvenance(
  sources: readonly CaseSource[],
  settingsSha256: string,
): ReportProvenance {
  return {
    hotfield_version: HOTFIELD_VERSION,
    inputs: sources.map((s) => ({ path: s.path, sha256: s.sha256 })),
    settings_sha256: settingsSha256,
  };
}

/**
 * The files `loadCase` reads for `input`, in its reading order: the case
 * file, the annotations, the figures CSV, the tissue mask.
 *
 * @param input The case input.
 * @returns Paths as written.
 *
 * @example Annotations and a figures CSV
 * ```ts
 * import { caseInputFiles } from "./provenance.ts";
 * const files = caseInputFiles({ annotationsPath: "a.geojson", figuresPath: "f.csv" });
 * if (files.join() !== "a.geojson,f.csv") throw new Error(`annotations, then figures: ${files}`);
 * ```
 */
export function caseInputFiles(input: CaseInput): string[] {
  return [input.caseFilePath, input.annotationsPath, input.figuresPath, input.tissueMaskPath]
    .filter((p): p is string => p !== undefined);
}

/**
 * The provenance a fresh report of `input` would have, from the files as
 * they are now; null when a file cannot be read (the case then has to run,
 * and fails with the reader's message).
 *
 * @param input The case input (paths read against `input.baseDir`).
 * @param settingsSha256 The case's settings sha256.
 * @returns The provenance, or null.
 *
 * @example A missing file means "run it"
 * ```ts
 * import { expectedProvenance } from "./provenance.ts";
 * if (await expectedProvenance({ annotationsPath: "/no/such/file.geojson" }, "0") !== null) {
 *   throw new Error("a missing file must give null (run the case)");
 * }
 * ```
 */
export async function expectedProvenance(
  input: CaseInput,
  settingsSha256: string,
): Promise<ReportProvenance | null> {
  const inputs: { path: string; sha256: string }[] = [];
  for (const path of caseInputFiles(input)) {
    const at = input.baseDir !== undefined && !isAbsolute(path) ? join(input.baseDir, path) : path;
    let bytes: Uint8Array;
    try {
      // regular files only: a named pipe is never opened (loadCase names the problem)
      bytes = await readInputFile(path, {
        what: "input",
        maxBytes: MAX_TEXT_INPUT_BYTES,
        openPath: at,
      });
    } catch {
      return null;
    }
    inputs.push({ path, sha256: createHash("sha256").update(bytes).digest("hex") });
  }
  return { hotfield_version: HOTFIELD_VERSION, inputs, settings_sha256: settingsSha256 };
}

/**
 * A text key of a provenance: equal keys mean the skip test passes.
 *
 * @param p A provenance (possibly from an older report, possibly malformed).
 * @returns The key, or null when `p` is not a provenance.
 *
 * @example Equal provenances, equal keys
 * ```ts
 * import { provenanceKey } from "./provenance.ts";
 * const p = { hotfield_version: "0.1.0", inputs: [{ path: "a", sha256: "b" }], settings_sha256: "c" };
 * if (provenanceKey(p) !== provenanceKey({ ...p }) || provenanceKey(undefined) !== null) throw new Error("equal provenances give equal keys; a non-provenance gives null");
 * ```
 */
export function provenanceKey(p: unknown): string | null {
  if (p === null || typeof p !== "object") return null;
  const v = p as Partial<ReportProvenance>;
  if (
    typeof v.hotfield_version !== "string" || typeof v.settings_sha256 !== "string" ||
    !Array.isArray(v.inputs)
  ) {
    return null;
  }
  return canonicalJson({
    hotfield_version: v.hotfield_version,
    inputs: v.inputs.map((i) => [String(i?.path), String(i?.sha256)]),
    settings_sha256: v.settings_sha256,
  });
}
