/**
 * The report options shared by `hotfield report` and `hotfield batch`:
 * window, grid, field set, scheme and outputs (the case's files and the
 * counting options live in `_case_args.ts`).
 *
 * @module
 */

import { UsageError } from "../errors.ts";
import type { ReportOptions } from "../pipeline/case_result.ts";
import { getScheme } from "../standards/list_schemes.ts";
import { ALL_FORMATS, type OutputFormat } from "../report/case_folder.ts";
import { numberOption, type OptionSpec, parseDecimal } from "./_args.ts";
import {
  DEFAULT_ASPECT,
  DEFAULT_BEST_N,
  DEFAULT_FIELD_AREA_MM2,
  DEFAULT_MIN_COVERAGE,
  DEFAULT_SEED,
  DEFAULT_SIMULATIONS,
  DEFAULT_STRIDE_UM,
  DEFAULT_TOP,
  DEFAULT_WINDOW_AREA_MM2,
} from "../defaults.ts";

/** Help lines for {@linkcode REPORT_OPTIONS}. */
export const REPORT_OPTIONS_HELP =
  `  --area MM2             window area in mm² (default ${DEFAULT_WINDOW_AREA_MM2})
  --shape rect|circle    window shape (default rect)
  --aspect W:H           rectangle aspect, width along slide x (default ${DEFAULT_ASPECT.join(":")})
  --stride-um N          distance between grid positions in µm (default ${DEFAULT_STRIDE_UM})
  --min-coverage F       least fraction of a window inside the valid region, in (0, 1] (default ${DEFAULT_MIN_COVERAGE})
  --top K                separate best windows to report (default ${DEFAULT_TOP})
  --best-n N             number of single fields in the best field set, 0 to skip (default ${DEFAULT_BEST_N})
  --field-area MM2       area of one single field in mm² (default ${DEFAULT_FIELD_AREA_MM2}: field number 22 at 40×)
  --scheme ID            classify against a grading scheme (see hotfield schemes)
  --simulations N        scan-test simulations with --scheme (0 skips; default ${DEFAULT_SIMULATIONS})
  --seed N               seed of the simulations (default ${DEFAULT_SEED})
  --format LIST          outputs, comma-separated from json,html,csv,geojson (default all)
  --standalone           put plotting code inside each HTML file
  --map-scale linear|sqrt  colour scale of the count map (default linear; sqrt keeps a
                         weaker second focus visible)
  --allow-empty          classify a case even when nothing was counted (figures present,
                         none counted) or its figures' unit is in doubt; by default it is
                         left unclassified`;

/** The report options shared by `report` and `batch` (node:util parseArgs spec). */
export const REPORT_OPTIONS: OptionSpec = {
  area: { type: "string" },
  shape: { type: "string" },
  aspect: { type: "string" },
  "stride-um": { type: "string" },
  "min-coverage": { type: "string" },
  top: { type: "string" },
  "best-n": { type: "string" },
  "field-area": { type: "string" },
  "allow-empty": { type: "boolean" },
  "map-scale": { type: "string" },
  scheme: { type: "string" },
  simulations: { type: "string" },
  seed: { type: "string" },
  format: { type: "string" },
  standalone: { type: "boolean" },
};

type Values = Record<string, string | boolean | string[] | undefined>;

/**
 * Reads and checks the report options (everything but the case flags).
 *
 * @throws {UsageError} Naming the option, for every bad value.
 *
 * @example An aspect, a top count and a bad area
 * ```ts
 * import { reportOptionsFromValues } from "./_report_args.ts";
 * const o = reportOptionsFromValues({ aspect: "16:9", top: "0" });
 * if (o.aspect?.[0] !== 16 || o.top !== 0) throw new Error(`options ${JSON.stringify(o)}`);
 * let failed = false;
 * try { reportOptionsFromValues({ area: "-1" }); } catch { failed = true; }
 * if (!failed) throw new Error("a negative --area must be refused");
 * ```
 */
export function reportOptionsFromValues(values: Values): ReportOptions {
  const positive = (v: number) => (v > 0 ? undefined : "must be greater than 0");
  const whole = (min: number) => (v: number) =>
    Number.isInteger(v) && v >= min ? undefined : `must be a whole number ≥ ${min}`;
  const options: ReportOptions = {};
  options.areaMm2 = numberOption(values, "area", positive);
  const shape = values.shape;
  if (shape !== undefined) {
    if (shape !== "rect" && shape !== "circle") {
      throw new UsageError(`Option --shape must be rect or circle: got "${shape}"`);
    }
    options.shape = shape;
  }
  const aspect = values.aspect;
  if (aspect !== undefined) {
    const m = /^([^:]*):([^:]*)$/.exec(String(aspect));
    const w = m ? parseDecimal(m[1]) ?? NaN : NaN, h = m ? parseDecimal(m[2]) ?? NaN : NaN;
    if (!(Number.isFinite(w) && Number.isFinite(h) && w > 0 && h > 0)) {
      throw new UsageError(
        `Option --aspect needs W:H with two positive numbers, e.g. 4:3: got "${aspect}"`,
      );
    }
    options.aspect = [w, h];
  }
  options.strideUm = numberOption(values, "stride-um", positive);
  options.minCoverage = numberOption(
    values,
    "min-coverage",
    (v) => (v > 0 && v <= 1 ? undefined : "must lie in (0, 1]"),
  );
  options.top = numberOption(values, "top", whole(0));
  options.bestN = numberOption(values, "best-n", whole(0));
  options.fieldAreaMm2 = numberOption(values, "field-area", positive);
  const scheme = values.scheme;
  if (scheme !== undefined) {
    try {
      getScheme(String(scheme));
    } catch (e) {
      throw new UsageError(`Option --scheme: ${(e as Error).message}`, { cause: e });
    }
    options.scheme = String(scheme);
  }
  options.simulations = numberOption(
    values,
    "simulations",
    (v) =>
      Number.isInteger(v) && (v === 0 || (v >= 19 && v <= 100_000))
        ? undefined
        : "must be 0 or a whole number from 19 to 100000",
  );
  options.seed = numberOption(
    values,
    "seed",
    (v) => (Number.isInteger(v) ? undefined : "must be a whole number"),
  );
  if (values["allow-empty"] === true) options.allowEmpty = true;
  for (const k of Object.keys(options) as (keyof ReportOptions)[]) {
    if (options[k] === undefined) delete options[k];
  }
  return options;
}

/**
 * Reads `--map-scale`.
 *
 * @param raw The option's value.
 * @returns `"linear"` or `"sqrt"`, or undefined when not given.
 * @throws {UsageError} For another value.
 *
 * @example Linear, square root, or not given
 * ```ts
 * import { mapScaleFromValue } from "./_report_args.ts";
 * if (mapScaleFromValue("sqrt") !== "sqrt" || mapScaleFromValue(undefined) !== undefined) {
 *   throw new Error("sqrt is kept; no value gives undefined");
 * }
 * ```
 */
export function mapScaleFromValue(raw: unknown): "linear" | "sqrt" | undefined {
  if (raw === undefined) return undefined;
  if (raw !== "linear" && raw !== "sqrt") {
    throw new UsageError(`Option --map-scale must be linear or sqrt: got "${raw}"`);
  }
  return raw;
}

/**
 * Parses `--format`.
 *
 * @param raw The option's value (undefined: every format).
 * @returns The formats, without repeats.
 * @throws {UsageError} For an unknown or empty list.
 *
 * @example A list with spaces
 * ```ts
 * import { formatsFromValue } from "./_report_args.ts";
 * if (formatsFromValue("json, html").join() !== "json,html") throw new Error("spaces around the commas are dropped");
 * ```
 */
export function formatsFromValue(raw: unknown): OutputFormat[] {
  if (raw === undefined) return [...ALL_FORMATS];
  const list = String(raw).split(",").map((s) => s.trim()).filter((s) => s !== "");
  const bad = list.filter((f) => !(ALL_FORMATS as readonly string[]).includes(f));
  if (list.length === 0 || bad.length > 0) {
    throw new UsageError(
      `Option --format takes a comma-separated list of ${ALL_FORMATS.join(", ")}: got "${raw}"`,
    );
  }
  return [...new Set(list)] as OutputFormat[];
}
