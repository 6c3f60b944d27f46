/**
 * Writing the outputs of one report run: per case `DIR/<case>/report.json`,
 * `DIR/<case>/hotspot.geojson` (and HTML/CSV once those renderers exist).
 *
 * Each case folder is staged under a temporary name and renamed into place,
 * so a failed run never leaves a half-written case behind.
 *
 * @module
 */

import { existsSync, mkdirSync, renameSync, rmSync, statSync } from "node:fs";
import { join } from "node:path";
import type { CaseResult } from "../count/engine_types.ts";
import { writeFileAtomic } from "../io/write_atomic.ts";
import { caseHotspotGeoJson } from "./hotspot_geojson.ts";

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
}

/** Stable JSON text: two-space indent, trailing newline. */
export function stableJson(value: unknown): string {
  return JSON.stringify(value, null, 2) + "\n";
}

/**
 * Writes the outputs of `results` under `outDir` and returns the paths written.
 *
 * @throws Error when `outDir` exists and is not a folder, or is not writable.
 *
 * @example Refusing a file as output folder
 * ```ts
 * import { writeOutputs } from "./write_outputs.ts";
 * const f = Deno.makeTempFileSync();
 * let failed = false;
 * try { writeOutputs([], f); } catch { failed = true; }
 * if (!failed) throw new Error("expected a clear error");
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
  try {
    mkdirSync(outDir, { recursive: true });
  } catch (e) {
    throw new Error(`Cannot create the output folder "${outDir}": ${(e as Error).message}`);
  }
  const written: string[] = [];
  for (const result of results) {
    const id = result.prepared.caseId;
    const finalDir = join(outDir, id);
    const stage = join(outDir, `.${id}.staging-${Deno.pid}`);
    rmSync(stage, { recursive: true, force: true });
    try {
      mkdirSync(stage, { recursive: true });
      if (formats.has("json")) {
        writeFileAtomic(join(stage, "report.json"), stableJson(result.report));
      }
      if (formats.has("geojson")) {
        writeFileAtomic(join(stage, "hotspot.geojson"), stableJson(caseHotspotGeoJson(result)));
      }
      const old = join(outDir, `.${id}.old-${Deno.pid}`);
      if (existsSync(finalDir)) renameSync(finalDir, old);
      renameSync(stage, finalDir);
      rmSync(old, { recursive: true, force: true });
    } catch (e) {
      rmSync(stage, { recursive: true, force: true });
      throw new Error(`Cannot write the report of "${id}" in "${outDir}": ${(e as Error).message}`);
    }
    for (const f of ["report.json", "hotspot.geojson"]) {
      if (existsSync(join(finalDir, f))) written.push(join(finalDir, f));
    }
  }
  return written;
}
