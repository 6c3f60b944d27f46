/**
 * `hotfield inspect FILE`: shows what hotfield read from a case (areas,
 * figure tallies, fields, warnings), as a table or as JSON. Writes no files.
 *
 * @module
 */

import { UsageError } from "../errors.ts";
import { formatInspectTable, inspectCase } from "../pipeline/inspect_case.ts";
import { loadCase } from "../annotations/read_case.ts";
import { parseOptions } from "./_args.ts";
import {
  CASE_OPTIONS,
  CASE_OPTIONS_HELP,
  caseInputFromOptions,
  countOptionsFromValues,
} from "./_case_args.ts";
import type { CommandIo } from "./_io.ts";

const HELP = `Usage: hotfield inspect FILE [options]

Shows what hotfield read from a case: slide, areas (mm²), figure tallies,
reader fields and warnings. FILE is an annotation GeoJSON or a case file
(*.case.json, a JSON object with "hotfield_case": 1).

Options:
  --json                 print JSON instead of a table
${CASE_OPTIONS_HELP}
  -h, --help             show this help

Exit codes: 0 read fine (warnings may be listed), 1 bad input, 2 bad options.
`;

/**
 * Runs `hotfield inspect` with `args` and returns the exit code.
 *
 * @param args The arguments after `inspect`.
 * @param io Where to write text.
 * @returns 0 on success; bad input throws (the dispatcher prints it, exit 1).
 * @throws {UsageError} For bad options (exit 2).
 *
 * @example Asking for help
 * ```ts
 * import { run } from "./inspect_command.ts";
 * const out: string[] = [];
 * const code = await run(["--help"], { stdout: (s) => out.push(s), stderr: () => {} });
 * if (code !== 0 || !out.join("").startsWith("Usage: hotfield inspect")) throw new Error(`exit ${code}: ${out.join("")}`);
 * ```
 */
export async function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, {
    ...CASE_OPTIONS,
    json: { type: "boolean" },
    help: { type: "boolean", short: "h" },
  });
  if (values.help) {
    io.stdout(HELP);
    return 0;
  }
  if (positionals.length !== 1 && !(positionals.length === 0 && values.slide !== undefined)) {
    throw new UsageError(
      positionals.length === 0
        ? "Give one FILE (an annotation GeoJSON or a case file); see hotfield inspect --help"
        : `Give one FILE, not ${positionals.length}: ${positionals.join(" ")}`,
    );
  }
  const counting = countOptionsFromValues(values);
  const input = await caseInputFromOptions(positionals[0], values);
  const caseData = await loadCase(input);
  const result = inspectCase(caseData, counting);
  io.stdout(values.json ? JSON.stringify(result, null, 2) + "\n" : formatInspectTable(result));
  return 0;
}
