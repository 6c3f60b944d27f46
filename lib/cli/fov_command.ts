/**
 * `hotfield fov`: microscope field of view (diameter, area) and how many
 * fields make a target area. Writes no files.
 *
 * @module
 */

import { UsageError } from "../errors.ts";
import { fieldOfView, fieldsForArea, MAX_FIELD_DIAMETER_MM } from "../standards/field_of_view.ts";
import { numberOption, parseOptions } from "./_args.ts";
import type { CommandIo } from "./_io.ts";
import { DEFAULT_WINDOW_AREA_MM2 } from "../defaults.ts";
import { roundTo } from "../numbers.ts";

/** Target areas always listed, mm²: 1 (melanoma), 2 (NEN rate), 2.37 (veterinary MC), 5 (GIST), 10 (NEN count). */
export const COMMON_TARGETS_MM2 = [1, 2, DEFAULT_WINDOW_AREA_MM2, 5, 10];

const HELP = `Usage: hotfield fov --fn MM --objective X [options]

Field of view of a microscope: diameter d = FN / (objective × tube) and area
π(d/2)², and the number of such fields that make a target area.

Options:
  --fn MM             eyepiece field number in mm (e.g. 22)
  --objective X       objective magnification (e.g. 40)
  --tube X            intermediate (tube) magnification factor (default 1)
  --target-mm2 A      target area in mm² (default ${DEFAULT_WINDOW_AREA_MM2}, the veterinary standard)
  --json              print JSON instead of text
  -h, --help          show this help

Measure your field with a stage micrometer when in doubt: field numbers
printed on eyepieces are nominal.

Exit codes: 0 success, 2 bad options.
`;

/**
 * Runs `hotfield fov` with `args` and returns the exit code.
 *
 * @param args The arguments after `fov`.
 * @param io Where to write text.
 * @returns 0 on success.
 * @throws {UsageError} For missing or bad options (exit 2), naming the option.
 *
 * @example JSON for FN 22 at 40×
 * ```ts
 * import { run } from "./fov_command.ts";
 * const out: string[] = [];
 * await run(["--fn", "22", "--objective", "40", "--json"], { stdout: (s) => out.push(s), stderr: () => {} });
 * const j = JSON.parse(out.join(""));
 * if (Math.abs(j.diameter_mm - 0.55) > 1e-12 || j.fields_for_target_rounded !== 10) {
 *   throw new Error(`FN 22 at 40×: ${j.diameter_mm} mm, ${j.fields_for_target_rounded} fields for 2.37 mm²`);
 * }
 * ```
 */
export function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, {
    fn: { type: "string" },
    objective: { type: "string" },
    tube: { type: "string" },
    "target-mm2": { type: "string" },
    json: { type: "boolean" },
    help: { type: "boolean", short: "h" },
  });
  if (values.help) {
    io.stdout(HELP);
    return Promise.resolve(0);
  }
  if (positionals.length > 0) {
    throw new UsageError(`hotfield fov takes no file arguments: got ${positionals.join(" ")}`);
  }
  const mustBePositive = (v: number) => (v > 0 ? undefined : "must be > 0");
  const fn = numberOption(values, "fn", mustBePositive);
  const objective = numberOption(values, "objective", mustBePositive);
  const tube = numberOption(values, "tube", mustBePositive) ?? 1;
  const target = numberOption(values, "target-mm2", mustBePositive) ?? DEFAULT_WINDOW_AREA_MM2;
  if (fn === undefined) throw new UsageError("Option --fn is required (eyepiece field number, mm)");
  if (objective === undefined) {
    throw new UsageError("Option --objective is required (objective magnification)");
  }
  const diameter = fn / (objective * tube);
  if (diameter > MAX_FIELD_DIAMETER_MM) {
    throw new UsageError(
      `Options --fn, --objective and --tube give a field diameter of ${roundTo(diameter, 4)} mm, ` +
        `over ${MAX_FIELD_DIAMETER_MM} mm, which is no high-power field: check them`,
    );
  }
  const fov = fieldOfView({ fieldNumberMm: fn, objective, tube });
  const forTarget = fieldsForArea(fov.areaMm2, target);
  const common = COMMON_TARGETS_MM2.map((t) => {
    const f = fieldsForArea(fov.areaMm2, t);
    return { target_mm2: t, fields: f.exact, fields_rounded: f.rounded };
  });
  const result = {
    field_number_mm: fn,
    objective,
    tube,
    diameter_mm: fov.diameterMm,
    area_mm2: fov.areaMm2,
    target_mm2: target,
    fields_for_target: forTarget.exact,
    fields_for_target_rounded: forTarget.rounded,
    area_of_rounded_fields_mm2: forTarget.rounded * fov.areaMm2,
    fields_for_common_targets: common,
    method: "d = FN / (objective × tube); area = π(d/2)²; fields = target / area, rounded up",
  };
  if (values.json) {
    io.stdout(JSON.stringify(result, null, 2) + "\n");
    return Promise.resolve(0);
  }
  const lines = [
    `Field of view: field number ${fn} mm, objective ${objective}×, tube ${tube}×`,
    `  diameter   ${fmt(fov.diameterMm, 4)} mm`,
    `  area       ${fmt(fov.areaMm2, 4)} mm²`,
    "",
    `Fields for ${target} mm²: ${fmt(forTarget.exact, 2)} (count ${forTarget.rounded} fields = ` +
    `${fmt(forTarget.rounded * fov.areaMm2, 3)} mm²)`,
    "",
    "Fields for common areas:",
    ...common.map((c) =>
      `  ${(c.target_mm2 + " mm²").padEnd(10)} ${
        fmt(c.fields, 2).padStart(7)
      }  (${c.fields_rounded})`
    ),
  ];
  io.stdout(lines.join("\n") + "\n");
  return Promise.resolve(0);
}

function fmt(x: number, digits: number): string {
  return x.toFixed(digits);
}
