/**
 * `hotfield cohort DIR`: rebuilds DIR/index.html, cases.csv and fields.csv
 * from every case folder in DIR (after sharded runs, or to refresh them).
 *
 * @module
 */

import { existsSync, statSync } from "node:fs";
import { UsageError } from "../errors.ts";
import { removeTemporaryEntries } from "../report/case_folder.ts";
import { readCaseReports, writeCohortFiles } from "../report/write_cohort.ts";
import { reportGenerationTime } from "../report/write_outputs.ts";
import { parseOptions } from "./_args.ts";
import { formatsFromValue } from "./_report_args.ts";
import type { CommandIo } from "./_io.ts";

const HELP = `Usage: hotfield cohort DIR [options]

Rebuilds the cohort files of an output folder from every case folder in it
(every DIR/<case>/report.json, whichever run wrote it): DIR/index.html,
DIR/cases.csv and DIR/fields.csv. Run it after the shards of a sharded
batch have all finished; it also removes the temporary entries (.tmp-…) a
killed run left, so run it when no batch is writing into DIR.

Options:
  --format LIST          cohort files, comma-separated from csv,html (default both)
  --standalone           put plotting code inside index.html
  -h, --help             show this help

Exit codes: 0 written, 1 DIR missing or not a folder, 2 bad options.
`;

/**
 * Runs `hotfield cohort` with `args` and returns the exit code.
 *
 * @param args The arguments after `cohort`.
 * @param io Where to write text.
 * @returns 0 when the files were written.
 * @throws {UsageError} For bad options (exit 2); a missing folder is exit 1.
 *
 * @example Asking for help
 * ```ts
 * import { run } from "./cohort_command.ts";
 * const out: string[] = [];
 * const code = await run(["--help"], { stdout: (s) => out.push(s), stderr: () => {} });
 * if (code !== 0 || !out.join("").startsWith("Usage: hotfield cohort")) throw new Error(`exit ${code}: ${out.join("")}`);
 * ```
 */
export function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, {
    format: { type: "string" },
    standalone: { type: "boolean" },
    help: { type: "boolean", short: "h" },
  });
  if (values.help) {
    io.stdout(HELP);
    return Promise.resolve(0);
  }
  if (positionals.length !== 1) {
    throw new UsageError(
      positionals.length === 0
        ? "Give the output folder DIR; see hotfield cohort --help"
        : `Give one DIR, not ${positionals.length}: ${positionals.join(" ")}`,
    );
  }
  const formats = values.format === undefined ? ["csv", "html"] : formatsFromValue(values.format);
  const csv = formats.includes("csv"), html = formats.includes("html");
  if (!csv && !html) {
    throw new UsageError(
      `Option --format of cohort takes csv, html or both: got "${values.format}"`,
    );
  }
  const dir = positionals[0];
  if (!existsSync(dir)) throw new Error(`Cannot read the output folder "${dir}": not found`);
  if (!statSync(dir).isDirectory()) {
    throw new Error(`Cannot read the output folder "${dir}": it is a file, not a folder`);
  }
  removeTemporaryEntries(dir);
  const { reports, skipped } = readCaseReports(dir);
  for (const s of skipped) io.stderr(`hotfield cohort: passed over ${s}\n`);
  const written = writeCohortFiles(dir, reports, {
    csv,
    html,
    standalone: values.standalone === true,
    generatedAt: reportGenerationTime(),
  });
  for (const path of written) io.stdout(`${path}\n`);
  io.stdout(`cohort: ${reports.length} case${reports.length === 1 ? "" : "s"}\n`);
  return Promise.resolve(0);
}
