/**
 * `hotfield batch SOURCE --out DIR`: every case of a manifest or a folder,
 * unattended: skip what is done, isolate failures, run in parallel, keep a
 * run history, rebuild the cohort files.
 *
 * @module
 */

import { existsSync, statSync } from "node:fs";
import { UsageError } from "../errors.ts";
import type { BatchCase } from "../batch/batch_types.ts";
import { folderCases } from "../batch/case_sources.ts";
import { barProgress, lineProgress, type ProgressReporter } from "../batch/progress.ts";
import { MANIFEST_COLUMNS, readManifest } from "../batch/read_manifest.ts";
import { runBatch } from "../batch/run_batch.ts";
import { parseShard, type Shard } from "../batch/shard.ts";
import { parseOptions } from "./_args.ts";
import { COUNT_OPTIONS, COUNT_OPTIONS_HELP, countOptionsFromValues } from "./_case_args.ts";
import {
  formatsFromValue,
  mapScaleFromValue,
  REPORT_OPTIONS,
  REPORT_OPTIONS_HELP,
  reportOptionsFromValues,
} from "./_report_args.ts";
import type { CommandIo } from "./_io.ts";

const HELP = `Usage: hotfield batch SOURCE --out DIR [options]

Reports every case of SOURCE into DIR, as hotfield report does, for runs
nobody watches (a nightly job, a cluster array):
- SOURCE is a manifest (a CSV file, one case per row) or a folder (every
  *.case.json, and every *.geojson that no case file of the folder names).
- A case whose DIR/<case>/report.json has the same input files (sha256), the
  same settings and the same hotfield version is skipped (--force runs it).
- A case that fails is recorded with its message; the others go on.
- Each run is recorded in DIR/runs.sqlite (tables runs and case_runs).
- At the end DIR/index.html, cases.csv and fields.csv are rebuilt from every
  case folder in DIR (not by a sharded run: run hotfield cohort DIR after).
- Killed at any moment, the same command completes the work.
hotfield supports, never replaces, a pathologist's diagnosis.

Manifest columns (header row; annotations or case_file on each row, the rest
optional; paths relative to the manifest's folder; empty cell = not given):
  ${MANIFEST_COLUMNS.join(", ")}
A row's scheme and min_score override --scheme and --min-score.

Options:
  --out DIR              output folder (required)
  --workers N            cases computed at once, in one process (default: the machine's cores)
  --shard K/N            take the K-th of N shares of the cases (1 ≤ K ≤ N); writes case folders only
  --force                run every case, skipping none
  --quiet                no progress; failures and the closing line only
${REPORT_OPTIONS_HELP}
${COUNT_OPTIONS_HELP}
  -h, --help             show this help

Progress: a live bar on a terminal, else one timestamped line per case.
The last line on stdout is always: batch: N ok, M skipped, K failed

Exit codes: 0 every case ok or skipped; 1 a case failed (each listed on
stderr with its message), or the manifest or DIR is unusable (nothing
written then); 2 bad options.
`;

/**
 * Runs `hotfield batch` with `args` and returns the exit code.
 *
 * @param args The arguments after `batch`.
 * @param io Where to write text.
 * @returns 0 when every case is ok or skipped, 1 when a case failed.
 * @throws {UsageError} For bad options (exit 2); other errors mean the
 *   source or output folder is unusable (exit 1, nothing written).
 *
 * @example Asking for help
 * ```ts
 * import { run } from "./batch_command.ts";
 * const out: string[] = [];
 * const code = await run(["--help"], { stdout: (s) => out.push(s), stderr: () => {} });
 * if (code !== 0 || !out.join("").startsWith("Usage: hotfield batch")) throw new Error(`exit ${code}: ${out.join("")}`);
 * ```
 */
export async function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, {
    ...REPORT_OPTIONS,
    ...COUNT_OPTIONS,
    out: { type: "string" },
    workers: { type: "string" },
    shard: { type: "string" },
    force: { type: "boolean" },
    quiet: { type: "boolean" },
    help: { type: "boolean", short: "h" },
  });
  if (values.help) {
    io.stdout(HELP);
    return 0;
  }
  if (positionals.length !== 1) {
    throw new UsageError(
      positionals.length === 0
        ? "Give one SOURCE (a manifest CSV or a folder of cases); see hotfield batch --help"
        : `Give one SOURCE, not ${positionals.length}: ${positionals.join(" ")}`,
    );
  }
  const source = positionals[0];
  const out = values.out;
  if (typeof out !== "string" || out.trim() === "") {
    throw new UsageError("Option --out DIR is required: the folder to write reports into");
  }
  const options = { ...reportOptionsFromValues(values), ...countOptionsFromValues(values) };
  const formats = formatsFromValue(values.format);
  const mapScale = mapScaleFromValue(values["map-scale"]);
  const workers = workersFromValue(values.workers);
  const shard: Shard | undefined = values.shard !== undefined
    ? parseShard(String(values.shard))
    : undefined;

  // Nothing is written before the source has been read in full.
  if (existsSync(out) && !statSync(out).isDirectory()) {
    throw new Error(`Cannot write reports to "${out}": it is a file, not a folder`);
  }
  let cases: BatchCase[];
  if (existsSync(source) && statSync(source).isDirectory()) {
    cases = await folderCases(source, options);
  } else {
    cases = await readManifest(source, options);
  }
  if (cases.length === 0) io.stderr(`hotfield batch: "${source}" holds no cases\n`);

  const quiet = values.quiet === true;
  const progress: ProgressReporter | null = quiet
    ? null
    : io.isTerminal?.()
    ? barProgress(io.stdout)
    : lineProgress(io.stdout);
  let result;
  try {
    result = await runBatch(cases, {
      outDir: out,
      formats,
      standalone: values.standalone === true,
      mapScale,
      workers,
      force: values.force === true,
      shard,
      history: {
        source,
        shard: shard ? `${shard.k}/${shard.n}` : null,
        workers,
        forced: values.force === true,
      },
      onPlan: (p) => progress?.plan(p),
      onOutcome: (o, c) => progress?.outcome(o, c),
    });
  } finally {
    progress?.finish();
  }
  const failures = result.outcomes
    .map((o, i) => ({ o, c: result.cases[i] }))
    .filter(({ o }) => o.status === "failed");
  if (failures.length > 0) {
    io.stderr(
      `hotfield batch: ${failures.length} case${failures.length === 1 ? "" : "s"} failed:\n`,
    );
    for (const { o, c } of failures) {
      io.stderr(`  ${c.label}: ${(o.message ?? "failed").replace(/\n/g, "\n    ")}\n`);
    }
  }
  for (const note of result.notes) io.stderr(`hotfield batch: ${note}\n`);
  io.stdout(`batch: ${result.ok} ok, ${result.skipped} skipped, ${result.failed} failed\n`);
  return result.failed > 0 ? 1 : 0;
}

/** Reads `--workers`: a whole number ≥ 1; default the machine's cores. */
function workersFromValue(raw: unknown): number {
  if (raw === undefined) return Math.max(1, navigator.hardwareConcurrency ?? 1);
  const text = String(raw).trim();
  const v = /^\d+$/.test(text) ? Number(text) : NaN;
  if (!Number.isSafeInteger(v) || v < 1) {
    throw new UsageError(`Option --workers needs a whole number ≥ 1: got "${raw}"`);
  }
  return v;
}
