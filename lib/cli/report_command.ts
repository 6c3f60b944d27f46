/**
 * `hotfield report FILE [FILE...] --out DIR`: count map, exact hotspot,
 * distribution and field check for each case; writes report.json,
 * hotspot.geojson and (when available) HTML and CSV per case.
 *
 * @module
 */

import { statSync } from "node:fs";
import { join } from "node:path";
import { UsageError } from "../errors.ts";
import type { BatchCase } from "../batch/batch_types.ts";
import { dropClaimedFiles, folderCases } from "../batch/case_sources.ts";
import { runBatch } from "../batch/run_batch.ts";
import type { CaseInput } from "../annotations/read_case.ts";
import type { ReportJson } from "../pipeline/report_types.ts";
import { parseOptions } from "./_args.ts";
import {
  CASE_OPTIONS,
  CASE_OPTIONS_HELP,
  caseInputFromOptions,
  countOptionsFromValues,
  FILE_OPTIONS,
} from "./_case_args.ts";
import {
  formatsFromValue,
  mapScaleFromValue,
  REPORT_OPTIONS,
  REPORT_OPTIONS_HELP,
  reportOptionsFromValues,
} from "./_report_args.ts";
import type { CommandIo } from "./_io.ts";

export { reportOptionsFromValues } from "./_report_args.ts";

const HELP = `Usage: hotfield report FILE [FILE...] --out DIR [options]
       hotfield report --slide SLIDE --figures F.csv --out DIR [options]

For each case (an annotation GeoJSON, a case file, or a folder of them): the
count of figures in a standard-area window at every grid position, the exact
hotspot (the best admissible window anywhere), the spread of counts, each
reader's field checked against it, and optionally a grading scheme's
classification. Writes DIR/<case>/report.json, hotspot.geojson and
report.html, then DIR/index.html, cases.csv and fields.csv listing every case
folder in DIR (earlier runs included).
With --slide and no FILE, the case is the slide alone: its mpp, its size and
the tissue found on it (recorded in report.json's tissue_source).
hotfield supports, never replaces, a pathologist's diagnosis.

A folder stands for its cases: every *.case.json, and every *.geojson that no
case file of the folder names. A GeoJSON (or figures CSV, or mask) that a
case file among the FILEs names is not a case of its own. A case that fails
is reported and the others are still written.

Options:
  --out DIR              output folder (required)
${REPORT_OPTIONS_HELP}
  --strict               exit 1 when any case has a warning (for unattended runs); the
                         reports are still written
  --no-cohort            write the case folders only, not index.html, cases.csv, fields.csv
                         (for one job per case under a workflow engine; run hotfield cohort
                         DIR at the end)
${CASE_OPTIONS_HELP}
  -h, --help             show this help

Exit codes: 0 reports written, 1 a case failed (bad input) or bad output
folder (or a warning under --strict), 2 bad options.
`;

/**
 * Runs `hotfield report` with `args` and returns the exit code.
 *
 * Each case is written as soon as it is done (its folder staged, then
 * renamed into place); a case that fails is reported on stderr and the
 * others go on. When no case is written, no output folder is made.
 *
 * @param args The arguments after `report`.
 * @param io Where to write text.
 * @returns 0 when every report was written, 1 when a case failed (2 when
 *   every failure was an option too fine for its case).
 * @throws {UsageError} For bad options (exit 2); other errors mean bad input (exit 1).
 *
 * @example Asking for help
 * ```ts
 * import { run } from "./report_command.ts";
 * const out: string[] = [];
 * const code = await run(["--help"], { stdout: (s) => out.push(s), stderr: () => {} });
 * if (code !== 0 || !out.join("").startsWith("Usage: hotfield report")) throw new Error();
 * ```
 */
export async function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, {
    ...CASE_OPTIONS,
    ...REPORT_OPTIONS,
    out: { type: "string" },
    strict: { type: "boolean" },
    "no-cohort": { type: "boolean" },
    help: { type: "boolean", short: "h" },
  });
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
  const mapScale = mapScaleFromValue(values["map-scale"]);

  // The cases: folders stand for their cases; files a case file names are not cases.
  const named: { file: string; input: CaseInput | null; problem?: string }[] = [];
  const fromFolders: BatchCase[] = [];
  if (positionals.length === 0) {
    // --slide alone: the slide is the case.
    named.push({
      file: String(values.slide),
      input: await caseInputFromOptions(undefined, values),
    });
  }
  for (const file of positionals) {
    if (isFolder(file)) {
      const perFile = Object.keys(FILE_OPTIONS).filter((k) => values[k] !== undefined);
      if (perFile.length > 0) {
        throw new UsageError(
          `Option --${perFile[0]} applies to one FILE, not to the folder "${file}"`,
        );
      }
      fromFolders.push(...await folderCases(file, options));
      continue;
    }
    try {
      named.push({ file, input: await caseInputFromOptions(file, values) });
    } catch (e) {
      if (e instanceof UsageError) throw e;
      named.push({ file, input: null, problem: (e as Error).message });
    }
  }
  const { kept, dropped } = dropClaimedFiles(named);
  for (const file of dropped) {
    io.stderr(`hotfield report: ${file} is read through a case file given too, not as a case\n`);
  }
  const cases: BatchCase[] = [
    ...kept.map((k) => ({
      index: 0,
      label: k.file,
      input: k.input,
      ...(k.problem !== undefined ? { problem: k.problem } : {}),
      options: { ...options },
      shardKey: k.file,
    })),
    ...fromFolders,
  ].map((c, index) => ({ ...c, index }));

  const result = await runBatch(cases, {
    outDir: out,
    formats,
    standalone: values.standalone === true,
    mapScale,
    workers: 1,
    force: true,
    cohort: values["no-cohort"] !== true,
    // Other jobs may be writing other cases into DIR at the same time.
    clearTemporary: false,
  });
  for (const [i, o] of result.outcomes.entries()) {
    if (o.status === "failed") {
      const label = result.cases[i].label;
      const message = o.message ?? "failed";
      io.stderr(
        `hotfield report: ${message.includes(label) ? message : `${label}: ${message}`}\n`,
      );
      continue;
    }
    const s = o.summary!;
    const where = formats.includes("json")
      ? join(out, o.caseId!, "report.json")
      : join(out, o.caseId!);
    io.stdout(
      `${o.caseId}\thotspot ${
        s.hotspotCount !== null ? `${s.hotspotCount} (${s.perMm2} /mm²)` : "none"
      }\t` +
        `positions ${s.positions}\t${where}\n`,
    );
    if (o.report) io.stdout(caseNotes(o.report));
  }
  for (const note of result.notes) io.stderr(`hotfield report: ${note}\n`);
  const warned = result.outcomes.filter((o) => (o.report?.warnings.length ?? 0) > 0);
  if (result.failed === 0) {
    if (values.strict === true && warned.length > 0) {
      io.stderr(
        `report: --strict: ${warned.length} case(s) with warnings: ` +
          `${warned.map((o) => o.caseId).join(", ")}\n`,
      );
      return 1;
    }
    return 0;
  }
  if (cases.length > 1) {
    io.stderr(`hotfield report: ${result.ok} ok, ${result.failed} failed\n`);
  }
  const failures = result.outcomes.filter((o) => o.status === "failed");
  return failures.every((o) => o.usage) ? 2 : 1;
}

/**
 * The verdict and every warning of a case, indented under its summary line.
 *
 * @param report The case's report.json.
 * @returns Lines, each ending in a line break.
 *
 * @example
 * ```ts
 * import { caseNotes } from "./report_command.ts";
 * const text = caseNotes({ verdict: "ok", warnings: ["w"] });
 * if (text !== "  verdict: ok\n  warning: w\n") throw new Error(text);
 * ```
 */
export function caseNotes(report: Pick<ReportJson, "verdict" | "warnings">): string {
  const lines = [`  verdict: ${report.verdict ?? ""}`];
  for (const w of report.warnings) lines.push(`  warning: ${w}`);
  return lines.join("\n") + "\n";
}

function isFolder(path: string): boolean {
  try {
    return statSync(path).isDirectory();
  } catch {
    return false;
  }
}
