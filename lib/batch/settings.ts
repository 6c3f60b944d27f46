/**
 * The effective settings of a case and their sha256, `settings_sha256` in
 * report.json's `provenance`.
 *
 * ## Definition
 *
 * `settings_sha256` is the hex sha256 of the UTF-8 bytes of the canonical
 * JSON of the effective settings: a JSON object with every key of
 * {@linkcode EffectiveSettings}, defaults filled in from lib/defaults.ts,
 * serialized with object keys sorted by UTF-16 code units at every level, no
 * white space, and numbers as JavaScript prints them. Keys:
 *
 * `areaMm2`, `shape`, `aspect` (rectangles only), `strideUm`, `minCoverage`,
 * `minScore`, `countLabels` (in the order given), `top`, `bestN`,
 * `fieldAreaMm2`, `maxGridCells`, `allowEmpty`, `scheme` (null for none),
 * `simulations` and `seed` (with a scheme only), `formats` (sorted),
 * `standalone` and `mapScale` (with the `html` format only). The settings a case file names for its case are laid over
 * the options first (they win, as in the report itself).
 *
 * A setting that cannot change a case's folder is left out (the aspect of a
 * circle, simulations without a scheme), so writing it differently does not
 * make a case look changed. The output formats are in, because they decide
 * which files the folder holds.
 *
 * @module
 */

import { createHash } from "node:crypto";
import type { ReportOptions } from "../pipeline/case_result.ts";
import type { CaseSettings } from "../types.ts";
import type { OutputFormat } from "../report/case_folder.ts";
import {
  DEFAULT_ASPECT,
  DEFAULT_BEST_N,
  DEFAULT_COUNT_LABELS,
  DEFAULT_FIELD_AREA_MM2,
  DEFAULT_MAX_GRID_CELLS,
  DEFAULT_MIN_COVERAGE,
  DEFAULT_MIN_SCORE,
  DEFAULT_SEED,
  DEFAULT_SIMULATIONS,
  DEFAULT_STRIDE_UM,
  DEFAULT_TOP,
  DEFAULT_WINDOW_AREA_MM2,
} from "../defaults.ts";

/** Every setting a case folder depends on, defaults filled in. */
export interface EffectiveSettings {
  /** Window area, mm². */
  areaMm2: number;
  /** Window shape. */
  shape: "rect" | "circle";
  /** Rectangle aspect, width along slide x (rectangles only). */
  aspect?: [number, number];
  /** Grid spacing, µm. */
  strideUm: number;
  /** Least fraction of a window inside the valid region. */
  minCoverage: number;
  /** Least counted figure score. */
  minScore: number;
  /** Counted labels, in the order given. */
  countLabels: string[];
  /** Separate best windows reported. */
  top: number;
  /** Fields in the best field set (0: none). */
  bestN: number;
  /** Single-field area, mm². */
  fieldAreaMm2: number;
  /** Grid size limit, cells. */
  maxGridCells: number;
  /** Classify even when nothing was counted. */
  allowEmpty: boolean;
  /** Grading scheme id, or null. */
  scheme: string | null;
  /** Scan-test simulations (with a scheme only). */
  simulations?: number;
  /** Seed of the simulations (with a scheme only). */
  seed?: number;
  /** Output formats, sorted. */
  formats: OutputFormat[];
  /** plotly.js inlined into every page. */
  standalone: boolean;
  /** Colour scale of the count map in report.html (with the `html` format only). */
  mapScale?: "linear" | "sqrt";
}

/** How the outputs are written: the part of the settings that is not a report option. */
export interface SettingsOutput {
  /** Formats written. */
  formats: readonly OutputFormat[];
  /** plotly.js inlined into every page. */
  standalone: boolean;
  /** Colour scale of the count map. @default "linear" */
  mapScale?: "linear" | "sqrt";
}

/**
 * Fills in the defaults of `options` (see the module documentation).
 *
 * @param options Report options as given.
 * @param output Formats and standalone HTML of the run.
 * @param caseSettings Settings the case file names (they win).
 * @returns The effective settings.
 *
 * @example Defaults
 * ```ts
 * import { effectiveSettings } from "./settings.ts";
 * const s = effectiveSettings({ shape: "circle" }, { formats: ["json"], standalone: false });
 * if (s.areaMm2 !== 2.37 || s.aspect !== undefined || s.scheme !== null) throw new Error(`defaults filled in, no aspect for a circle: ${JSON.stringify(s)}`);
 * ```
 */
export function effectiveSettings(
  options: ReportOptions,
  output: SettingsOutput,
  caseSettings?: CaseSettings,
): EffectiveSettings {
  if (caseSettings !== undefined) options = { ...options, ...caseSettings };
  const shape = options.shape ?? "rect";
  const scheme = options.scheme ?? null;
  const s: EffectiveSettings = {
    areaMm2: options.areaMm2 ?? DEFAULT_WINDOW_AREA_MM2,
    shape,
    strideUm: options.strideUm ?? DEFAULT_STRIDE_UM,
    minCoverage: options.minCoverage ?? DEFAULT_MIN_COVERAGE,
    minScore: options.minScore ?? DEFAULT_MIN_SCORE,
    countLabels: [...(options.countLabels ?? DEFAULT_COUNT_LABELS)],
    top: options.top ?? DEFAULT_TOP,
    bestN: options.bestN ?? DEFAULT_BEST_N,
    fieldAreaMm2: options.fieldAreaMm2 ?? DEFAULT_FIELD_AREA_MM2,
    maxGridCells: options.maxGridCells ?? DEFAULT_MAX_GRID_CELLS,
    allowEmpty: options.allowEmpty ?? false,
    scheme,
    formats: [...new Set(output.formats)].sort(),
    standalone: output.standalone,
  };
  if (shape === "rect") s.aspect = [...(options.aspect ?? DEFAULT_ASPECT)] as [number, number];
  if (output.formats.includes("html")) s.mapScale = output.mapScale ?? "linear";
  if (scheme !== null) {
    s.simulations = options.simulations ?? DEFAULT_SIMULATIONS;
    s.seed = options.seed ?? DEFAULT_SEED;
  }
  return s;
}

/**
 * Canonical JSON: object keys sorted at every level, no white space.
 *
 * @param value Plain data (objects, arrays, strings, finite numbers, booleans, null).
 * @returns The text.
 *
 * @example Key order does not matter
 * ```ts
 * import { canonicalJson } from "./settings.ts";
 * if (canonicalJson({ b: 1, a: [{ d: 2, c: 3 }] }) !== '{"a":[{"c":3,"d":2}],"b":1}') throw new Error("keys sorted at every level");
 * ```
 */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value !== null && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(value).sort()) {
      const v = (value as Record<string, unknown>)[k];
      if (v !== undefined) out[k] = sortKeys(v);
    }
    return out;
  }
  return value;
}

/**
 * `settings_sha256` of a case: the hex sha256 of the canonical JSON of its
 * effective settings.
 *
 * @param options Report options as given.
 * @param output Formats and standalone HTML of the run.
 * @param caseSettings Settings the case file names (they win).
 * @returns 64 hex digits.
 *
 * @example Giving a default explicitly changes nothing
 * ```ts
 * import { settingsSha256 } from "./settings.ts";
 * const out = { formats: ["json", "html"] as const, standalone: false };
 * const a = settingsSha256({}, { ...out, formats: [...out.formats] });
 * const b = settingsSha256({ strideUm: 25 }, { ...out, formats: ["html", "json"] });
 * if (a !== b || a.length !== 64) throw new Error("same effective settings, same sha256");
 * ```
 */
export function settingsSha256(
  options: ReportOptions,
  output: SettingsOutput,
  caseSettings?: CaseSettings,
): string {
  const text = canonicalJson(effectiveSettings(options, output, caseSettings));
  return createHash("sha256").update(text).digest("hex");
}
