/**
 * `hotfield report FILE [FILE...] --out DIR`: count map, exact hotspot,
 * distribution and field check for each case; writes report.json,
 * hotspot.geojson and (when available) HTML and CSV per case.
 *
 * @module
 */

import { join } from "node:path";
import { GridSizeError, UsageError } from "../errors.ts";
import { loadCase } from "../annotations/read_case.ts";
import { buildCaseResult } from "../pipeline/build_case_result.ts";
import type { CaseResult, ReportOptions } from "../pipeline/case_result.ts";
import { getScheme } from "../standards/list_schemes.ts";
import { ALL_FORMATS, type OutputFormat, writeOutputs } from "../report/write_outputs.ts";
import { numberOption, parseOptions } from "./_args.ts";
import {
  CASE_OPTIONS,
  CASE_OPTIONS_HELP,
  caseInputFromOptions,
  countOptionsFromValues,
} from "./_case_args.ts";
import type { CommandIo } from "./_io.ts";
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

const HELP = `Usage: hotfield report FILE [FILE...] --out DIR [options]
       hotfield report --slide SLIDE --figures F.csv --out DIR [options]

For each case (an annotation GeoJSON or a case file): the count of figures in
a standard-area window at every grid position, the exact hotspot (the best
admissible window anywhere), the spread of counts, each reader's field
checked against it, and optionally a grading scheme's classification.
Writes DIR/<case>/report.json, hotspot.geojson, and HTML and CSV outputs.
With --slide and no FILE, the case is the slide alone: its mpp, its size and
the tissue found on it (recorded in report.json's tissue_source).
hotfield supports, never replaces, a pathologist's diagnosis.

Options:
  --out DIR              output folder (required)
  --area MM2             window area in mm² (default ${DEFAULT_WINDOW_AREA_MM2})
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
                         left unclassified
  --strict               exit 1 when any case has a warning (for unattended runs); the
                         reports are still written
${CASE_OPTIONS_HELP}
  -h, --help             show this help

Exit codes: 0 reports written, 1 bad input or output folder (or a warning under
--strict), 2 bad options.
`;

const REPORT_OPTIONS = {
  out: { type: "string" },
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
  strict: { type: "boolean" },
  scheme: { type: "string" },
  simulations: { type: "string" },
  seed: { type: "string" },
  format: { type: "string" },
  standalone: { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const;

type Values = Record<string, string | boolean | string[] | undefined>;

/**
 * Reads and checks the report options (everything but the case flags).
 *
 * @throws {UsageError} Naming the option, for every bad value.
 *
 * @example
 * ```ts
 * import { reportOptionsFromValues } from "./report_command.ts";
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
    const m = /^\s*([0-9.eE+]+)\s*:\s*([0-9.eE+]+)\s*$/.exec(String(aspect));
    const w = m ? Number(m[1]) : NaN, h = m ? Number(m[2]) : NaN;
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

/** Parses `--format`. */
function formatsFromValue(raw: unknown): OutputFormat[] {
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

/**
 * Runs `hotfield report` with `args` and returns the exit code.
 *
 * Every case is computed before anything is written, so a bad input leaves
 * no output folder behind.
 *
 * @param args The arguments after `report`.
 * @param io Where to write text.
 * @returns 0 when every report was written.
 * @throws {UsageError} For bad options (exit 2); other errors mean bad input (exit 1).
 *
 * @example Asking for help
 * ```ts
 * import { run } from "./report_command.ts";
 * const out: string[] = [];
 * const code = await run(["--help"], { stdout: (s) => out.push(s), stderr: () => {} });
 * if (code !== 0 || !out.join("").startsWith("Usage: hotfield report")) throw new Error(`exit ${code}: ${out.join("")}`);
 * ```
 */
export async function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, { ...CASE_OPTIONS, ...REPORT_OPTIONS });
  if (values.help) {
    io.stdout(HELP);
    return 0;
  }
  if (positionals.length === 0 && values.slide === undefined) {
    throw new UsageError(
      "Give at least one FILE (an annotation GeoJSON or a case file), or --slide FILE; see hotfield report --help",
    );
  }
  if (positionals.length > 1 && values.slide !== undefined) {
    throw new UsageError(
      `Option --slide names the slide of one case: give one FILE with it, not ${positionals.length}`,
    );
  }
  const out = values.out;
  if (typeof out !== "string" || out.trim() === "") {
    throw new UsageError("Option --out DIR is required: the folder to write reports into");
  }
  const options = { ...reportOptionsFromValues(values), ...countOptionsFromValues(values) };
  const formats = formatsFromValue(values.format);
  const results: CaseResult[] = [];
  const seen = new Map<string, string>();
  for (const file of positionals.length === 0 ? [undefined] : positionals) {
    const input = await caseInputFromOptions(file, values);
    const caseData = await loadCase(input);
    const earlier = seen.get(caseData.caseId);
    if (earlier !== undefined) {
      throw new Error(
        `Cases "${earlier}" and "${
          file ?? values.slide
        }" have the same case id "${caseData.caseId}": ` +
          "give each a distinct id (--id works for a single file)",
      );
    }
    seen.set(caseData.caseId, file ?? String(values.slide));
    try {
      results.push(buildCaseResult(caseData, options));
    } catch (e) {
      if (e instanceof GridSizeError) {
        throw new UsageError(
          `Option --stride-um is too small for case "${caseData.caseId}": ${e.message}`,
          { cause: e },
        );
      }
      throw e;
    }
  }
  const mapScale = values["map-scale"];
  if (mapScale !== undefined && mapScale !== "linear" && mapScale !== "sqrt") {
    throw new UsageError(`Option --map-scale must be linear or sqrt: got "${mapScale}"`);
  }
  writeOutputs(results, out, {
    formats,
    standalone: values.standalone === true,
    ...(mapScale ? { mapScale } : {}),
  });
  for (const r of results) {
    const h = r.report.hotspot;
    const where = formats.includes("json")
      ? join(out, r.prepared.caseId, "report.json")
      : join(out, r.prepared.caseId);
    io.stdout(
      `${r.prepared.caseId}\thotspot ${h ? `${h.count} (${h.per_mm2} /mm²)` : "none"}\t` +
        `positions ${r.report.distribution.positions}\t${where}\n`,
    );
    io.stdout(caseNotes(r));
  }
  const warned = results.filter((r) => r.report.warnings.length > 0);
  if (values.strict === true && warned.length > 0) {
    io.stderr(
      `report: --strict: ${warned.length} case(s) with warnings: ` +
        `${warned.map((r) => r.prepared.caseId).join(", ")}\n`,
    );
    return 1;
  }
  return 0;
}

/** The verdict and every warning of a case, indented under its summary line. */
export function caseNotes(r: Pick<CaseResult, "report">): string {
  const lines = [`  verdict: ${r.report.verdict ?? ""}`];
  for (const w of r.report.warnings) lines.push(`  warning: ${w}`);
  return lines.join("\n") + "\n";
}
