/**
 * `hotfield grade`: grades a count made at the microscope (N figures in K
 * fields of a known microscope, or in a stated area) against a grading
 * scheme. Writes no files.
 *
 * @module
 */

import { UsageError } from "../errors.ts";
import { fieldOfView, MAX_FIELD_DIAMETER_MM } from "../standards/field_of_view.ts";
import { getScheme } from "../standards/list_schemes.ts";
import { type CountGrade, gradeCount } from "../standards/grade_count.ts";
import { numberOption, parseOptions } from "./_args.ts";
import { roundTo } from "../numbers.ts";
import type { CommandIo } from "./_io.ts";

const HELP =
  `Usage: hotfield grade --count N (--fields K --fn MM --objective X | --area-mm2 A) --scheme ID [--json]

Grades a mitotic count made at the microscope: the rate per mm², the count
converted to the scheme's own area basis, class and tier against the
scheme's cut-off, the exact Poisson 95% interval of the count (Garwood 1936)
and how likely a recount lands on the other side of the cut-off.
hotfield supports, never replaces, a pathologist's grade.

Options:
  --count N           figures counted (a whole number ≥ 0)
  --fields K          number of fields counted (with --fn and --objective)
  --fn MM             eyepiece field number in mm (e.g. 22)
  --objective X       objective magnification (e.g. 40)
  --tube X            intermediate (tube) magnification factor (default 1)
  --area-mm2 A        the area counted in mm², instead of --fields
  --scheme ID         grading scheme (see hotfield schemes)
  --json              print JSON instead of text
  -h, --help          show this help

Exit codes: 0 success, 2 bad options.
`;

const VALUE_OPTIONS = ["count", "fields", "fn", "objective", "tube", "area-mm2", "scheme"];

/**
 * Runs `hotfield grade` with `args` and returns the exit code.
 *
 * @param args The arguments after `grade`.
 * @param io Where to write text.
 * @returns 0 on success.
 * @throws {UsageError} For missing, conflicting or bad options (exit 2), naming the option.
 *
 * @example 8 figures in 10 fields of FN 22 at 40×
 * ```ts
 * import { run } from "./grade_command.ts";
 * const out: string[] = [];
 * await run(
 *   ["--count", "8", "--fields", "10", "--fn", "22", "--objective", "40", "--scheme", "canine-mct-2tier", "--json"],
 *   { stdout: (s) => out.push(s), stderr: () => {} },
 * );
 * const j = JSON.parse(out.join(""));
 * if (j.class !== "above" || Math.abs(j.area_mm2 - 2.3758) > 1e-4) throw new Error(out.join(""));
 * ```
 */
export function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(joinNegativeValues(args), {
    count: { type: "string" },
    fields: { type: "string" },
    fn: { type: "string" },
    objective: { type: "string" },
    tube: { type: "string" },
    "area-mm2": { type: "string" },
    scheme: { type: "string" },
    json: { type: "boolean" },
    help: { type: "boolean", short: "h" },
  });
  if (values.help) {
    io.stdout(HELP);
    return Promise.resolve(0);
  }
  if (positionals.length > 0) {
    throw new UsageError(`hotfield grade takes no file arguments: got ${positionals.join(" ")}`);
  }
  const wholeAtLeast = (min: number) => (v: number) =>
    Number.isInteger(v) && v >= min ? undefined : `must be a whole number ≥ ${min}`;
  const positive = (v: number) => (v > 0 ? undefined : "must be > 0");
  const count = numberOption(values, "count", wholeAtLeast(0));
  if (count === undefined) {
    throw new UsageError("Option --count is required (the figures counted, a whole number ≥ 0)");
  }
  const schemeId = values.scheme;
  if (typeof schemeId !== "string" || schemeId === "") {
    throw new UsageError("Option --scheme is required (see hotfield schemes)");
  }
  let scheme;
  try {
    scheme = getScheme(schemeId);
  } catch (e) {
    throw new UsageError(`Option --scheme: ${(e as Error).message}`);
  }
  const hasFields = values.fields !== undefined;
  const hasArea = values["area-mm2"] !== undefined;
  if (hasFields && hasArea) {
    throw new UsageError(
      "Options --fields and --area-mm2 exclude each other: give the area counted one way",
    );
  }
  if (!hasFields && !hasArea) {
    throw new UsageError(
      "Give the area counted: --fields K with --fn and --objective, or --area-mm2 A",
    );
  }
  let areaMm2: number;
  let optics: Record<string, number> | null = null;
  if (hasFields) {
    const fields = numberOption(values, "fields", wholeAtLeast(1))!;
    const fn = numberOption(values, "fn", positive);
    const objective = numberOption(values, "objective", positive);
    const tube = numberOption(values, "tube", positive) ?? 1;
    if (fn === undefined) {
      throw new UsageError("Option --fn is required with --fields (eyepiece field number, mm)");
    }
    if (objective === undefined) {
      throw new UsageError(
        "Option --objective is required with --fields (objective magnification)",
      );
    }
    const diameterMm = fn / (objective * tube);
    if (diameterMm > MAX_FIELD_DIAMETER_MM) {
      throw new UsageError(
        `Options --fn, --objective and --tube give a field diameter of ${
          roundTo(diameterMm, 4)
        } mm, over ${MAX_FIELD_DIAMETER_MM} mm, which is no high-power field: check them`,
      );
    }
    const fov = fieldOfView({ fieldNumberMm: fn, objective, tube });
    areaMm2 = fields * fov.areaMm2;
    optics = {
      fields,
      field_number_mm: fn,
      objective,
      tube,
      field_diameter_mm: fov.diameterMm,
      field_area_mm2: fov.areaMm2,
    };
  } else {
    for (const name of ["fn", "objective", "tube"]) {
      if (values[name] !== undefined) {
        throw new UsageError(`Option --${name} goes with --fields, not with --area-mm2`);
      }
    }
    areaMm2 = numberOption(values, "area-mm2", positive)!;
  }
  const grade = gradeCount(count, { areaMm2, scheme });
  if (values.json) {
    const out = {
      ...grade,
      ...(optics ? { fields: optics } : {}),
      method: {
        area_mm2: optics
          ? "fields × π(d/2)², d = FN / (objective × tube)"
          : "as given with --area-mm2",
        count_per_scheme_basis: "count × basis area / area (areas within 0.5% count as equal)",
        interval_95: "exact two-sided Poisson interval (Garwood 1936)",
        p_other_side: "Y ~ Poisson(mean = count): P(Y < k) when the count meets the cut-off, " +
          "else P(Y ≥ k), k = min_count_for_area",
      },
    };
    io.stdout(JSON.stringify(out, null, 2) + "\n");
    return Promise.resolve(0);
  }
  io.stdout(textLines(grade, optics).join("\n") + "\n");
  return Promise.resolve(0);
}

/** `--count -1` would read "-1" as an option; join such values as `--count=-1`. */
function joinNegativeValues(args: string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i], next = args[i + 1];
    if (
      a.startsWith("--") && VALUE_OPTIONS.includes(a.slice(2)) && next !== undefined &&
      /^-[\d.]/.test(next)
    ) {
      out.push(`${a}=${next}`);
      i++;
    } else out.push(a);
  }
  return out;
}

function textLines(g: CountGrade, optics: Record<string, number> | null): string[] {
  const area = optics
    ? `${optics.fields} field${optics.fields === 1 ? "" : "s"} of ${
      fmt(optics.field_diameter_mm, 3)
    } mm (field number ${optics.field_number_mm} mm, objective ${optics.objective}×${
      optics.tube === 1 ? "" : `, tube ${optics.tube}×`
    }) = ${fmt(g.area_mm2, 4)} mm²`
    : `${fmt(g.area_mm2, 4)} mm²`;
  return [
    `Count ${g.count} in ${area}`,
    `  per mm²              ${fmt(g.per_mm2, 3)}`,
    `  per scheme basis     ${fmt(g.count_per_scheme_basis, 2)} (${g.cutoff_basis})`,
    `  scheme               ${g.scheme}: cut-off ${g.cutoff_rule} ${g.cutoff} ${g.cutoff_basis}`,
    `  class                ${g.class} the cut-off (needs ${g.min_count_for_area} in this area)`,
    `  tier                 ${g.tier}`,
    `  95% interval         ${fmt(g.interval_95[0], 2)}–${
      fmt(g.interval_95[1], 2)
    } figures (exact Poisson)`,
    `  recount other side   ${fmt(g.p_other_side * 100, 1)}% chance`,
    ...g.notes.map((n) => `  note: ${n}`),
    "",
    g.caution,
  ];
}

function fmt(x: number, digits: number): string {
  return x.toFixed(digits);
}
