/**
 * `hotfield compare REFERENCE CANDIDATE --out DIR` and
 * `hotfield compare MANIFEST.csv --out DIR`: a detector's figures against a
 * reference, from pairs of figures up to the grade.
 *
 * @module
 */

import { readInputFile } from "../io/read_input.ts";
import { MAX_TEXT_INPUT_BYTES } from "../defaults.ts";
import { UsageError } from "../errors.ts";
import { loadCase } from "../annotations/read_case.ts";
import { compareCase, type CompareOptions } from "../compare/compare_case.ts";
import { readCandidates } from "../compare/read_candidates.ts";
import {
  compareCohort,
  parseComparisonManifest,
  summarizeComparisons,
} from "../compare/compare_cohort.ts";
import { MAX_MATCH_RADIUS_UM } from "../compare/match_figures.ts";
import { writeComparisonCase, writeComparisonCohort } from "../report/write_comparison.ts";
import { generationTime } from "../report/write_outputs.ts";
import { numberOption, parseOptions } from "./_args.ts";
import {
  CASE_OPTIONS,
  CASE_OPTIONS_HELP,
  caseInputFromOptions,
  countOptionsFromValues,
} from "./_case_args.ts";
import { reportOptionsFromValues } from "./report_command.ts";
import type { CommandIo } from "./_io.ts";

const HELP = `Usage: hotfield compare REFERENCE CANDIDATE --out DIR [options]
       hotfield compare MANIFEST.csv --out DIR [options]

Compares a detector's figures (CANDIDATE: GeoJSON or figures CSV with
scores, on the same slide) with a reference case (REFERENCE: annotation
GeoJSON or case file with regions and reference figures): one-to-one pairs
within a radius, precision, recall and F1, the curve over score thresholds
0.00 to 1.00 with the exact hotspot at each, average precision, both
hotspots, and with a scheme both classes and the thresholds where they agree.
Only figures with a counted label inside the reference's valid region take part.

A manifest is a CSV with the columns reference, candidate[, id][, scheme]
(paths relative to the manifest's folder), one pair a row; a failing pair is
recorded and the others go on.

Writes DIR/<case>/comparison.json and comparison.html; for a manifest also
DIR/comparison.csv, DIR/comparison-summary.json and DIR/index.html.
A comparison supports, and does not replace, validating a detector under
local guidelines; hotfield never replaces a pathologist's diagnosis.

Options:
  --out DIR              output folder (required)
  --radius-um R          largest centre distance of a pair, in (0, ${MAX_MATCH_RADIUS_UM}] µm (default 7.5)
  --match optimal|greedy optimal: most pairs, then least total distance (default);
                         greedy: by descending score, each takes the nearest free reference
  --min-score S          the chosen threshold: candidates with score ≥ S count (default 0)
  --scheme ID            grade both hotspots against a scheme (see hotfield schemes)
  --same-slide           accept a candidate GeoJSON whose slide id or mpp differ
  --candidate-units px|um  unit of a candidate CSV's x and y (default px)
  --area MM2             window area in mm² (default 2.37)
  --shape rect|circle    window shape (default rect)
  --aspect W:H           rectangle aspect, width along slide x (default 4:3)
  --stride-um N          grid stride in µm (default 25)
  --min-coverage F       least fraction of a window inside the valid region (default 0.95)
  --standalone           put plotting code inside each HTML file
${CASE_OPTIONS_HELP.split("\n").filter((l) => !l.includes("--min-score")).join("\n")}
  -h, --help             show this help

The case options (--figures, --tissue-mask, …, --id) apply to the reference.
Exit codes: 0 written, 1 bad input (for a manifest: any pair failed, the
others written), 2 bad options.
`;

const COMPARE_OPTIONS = {
  out: { type: "string" },
  "radius-um": { type: "string" },
  match: { type: "string" },
  scheme: { type: "string" },
  "same-slide": { type: "boolean" },
  "candidate-units": { type: "string" },
  area: { type: "string" },
  shape: { type: "string" },
  aspect: { type: "string" },
  "stride-um": { type: "string" },
  "min-coverage": { type: "string" },
  standalone: { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const;

type Values = Record<string, string | boolean | string[] | undefined>;

/**
 * Reads and checks the comparison options (everything but the reference's case flags).
 *
 * @throws {UsageError} Naming the option, for every bad value.
 *
 * @example
 * ```ts
 * import { compareOptionsFromValues } from "./compare_command.ts";
 * const o = compareOptionsFromValues({ "radius-um": "5", match: "greedy" });
 * if (o.radiusUm !== 5 || o.matching !== "greedy" || o.minScore !== 0) throw new Error(JSON.stringify(o));
 * let failed = false;
 * try { compareOptionsFromValues({ "radius-um": "0" }); } catch { failed = true; }
 * if (!failed) throw new Error("a radius of 0 µm must be refused");
 * ```
 */
export function compareOptionsFromValues(values: Values): CompareOptions {
  const report = reportOptionsFromValues({
    area: values.area,
    shape: values.shape,
    aspect: values.aspect,
    "stride-um": values["stride-um"],
    "min-coverage": values["min-coverage"],
    scheme: values.scheme,
  });
  const { minScore, countLabels } = countOptionsFromValues(values);
  const radiusUm = numberOption(
    values,
    "radius-um",
    (
      v,
    ) => (v > 0 && v <= MAX_MATCH_RADIUS_UM
      ? undefined
      : `must lie in (0, ${MAX_MATCH_RADIUS_UM}] µm`),
  );
  const match = values.match;
  if (match !== undefined && match !== "optimal" && match !== "greedy") {
    throw new UsageError(`Option --match must be optimal or greedy: got "${match}"`);
  }
  const options: CompareOptions = {
    radiusUm: radiusUm ?? 7.5,
    matching: (match as "optimal" | "greedy" | undefined) ?? "optimal",
    minScore,
    countLabels,
    sameSlide: values["same-slide"] === true,
  };
  if (report.scheme !== undefined) options.scheme = report.scheme;
  if (report.areaMm2 !== undefined) options.areaMm2 = report.areaMm2;
  if (report.shape !== undefined) options.shape = report.shape;
  if (report.aspect !== undefined) options.aspect = report.aspect;
  if (report.strideUm !== undefined) options.strideUm = report.strideUm;
  if (report.minCoverage !== undefined) options.minCoverage = report.minCoverage;
  return options;
}

function candidateUnits(values: Values): "px" | "um" | undefined {
  const u = values["candidate-units"];
  if (u === undefined) return undefined;
  if (u !== "px" && u !== "um") {
    throw new UsageError(`Option --candidate-units must be px or um: got "${u}"`);
  }
  return u;
}

/** The generation time for the pages (SOURCE_DATE_EPOCH when set). */
function pageTime(): string {
  let epoch: string | undefined;
  try {
    const ok = Deno.permissions.querySync({ name: "env", variable: "SOURCE_DATE_EPOCH" }).state ===
      "granted";
    epoch = ok ? Deno.env.get("SOURCE_DATE_EPOCH") : undefined;
  } catch {
    epoch = undefined;
  }
  return generationTime(epoch, new Date());
}

/**
 * Runs `hotfield compare` with `args` and returns the exit code.
 *
 * @param args The arguments after `compare`.
 * @param io Where to write text.
 * @returns 0 when every comparison was written; 1 when a manifest pair failed.
 * @throws {UsageError} For bad options (exit 2); other errors mean bad input (exit 1).
 *
 * @example Asking for help
 * ```ts
 * import { run } from "./compare_command.ts";
 * const out: string[] = [];
 * const code = await run(["--help"], { stdout: (s) => out.push(s), stderr: () => {} });
 * if (code !== 0 || !out.join("").startsWith("Usage: hotfield compare")) throw new Error(`exit ${code}`);
 * ```
 */
export async function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, { ...CASE_OPTIONS, ...COMPARE_OPTIONS });
  if (values.help) {
    io.stdout(HELP);
    return 0;
  }
  if (positionals.length !== 1 && positionals.length !== 2) {
    throw new UsageError(
      `Give REFERENCE CANDIDATE, or one MANIFEST.csv: got ${positionals.length} file(s); see hotfield compare --help`,
    );
  }
  const out = values.out;
  if (typeof out !== "string" || out.trim() === "") {
    throw new UsageError("Option --out DIR is required: the folder to write comparisons into");
  }
  const options = compareOptionsFromValues(values);
  const units = candidateUnits(values);
  const write = { standalone: values.standalone === true, generatedAt: pageTime() };

  if (positionals.length === 2) {
    const [refPath, candPath] = positionals;
    const reference = await loadCase(await caseInputFromOptions(refPath, values));
    const candidates = await readCandidates(candPath, {
      slide: reference.slide,
      sameSlide: options.sameSlide,
      units,
    });
    const result = compareCase(reference, candidates, options);
    const paths = writeComparisonCase(result, out, write);
    io.stdout(summaryLine(result.json) + `\t${paths.find((p) => p.endsWith("comparison.json"))}\n`);
    return 0;
  }

  const manifestPath = positionals[0];
  for (const name of ["figures", "units", "tissue-mask", "mask-mpp", "id"]) {
    if (values[name] !== undefined) {
      throw new UsageError(`Option --${name} applies to a single pair, not to a manifest`);
    }
  }
  // regular files only, within the limit (a named pipe is never opened)
  const text = new TextDecoder().decode(
    await readInputFile(manifestPath, {
      what: "comparison manifest",
      maxBytes: MAX_TEXT_INPUT_BYTES,
    }),
  );
  if (/\.(geo)?json$/i.test(manifestPath) || text.trimStart().startsWith("{")) {
    throw new UsageError(
      `"${manifestPath}" looks like annotations, not a manifest: give REFERENCE CANDIDATE (two files), or a manifest CSV`,
    );
  }
  const rows = parseComparisonManifest(text, manifestPath);
  const { scheme, ...rest } = options;
  const cohort = await compareCohort(rows, { ...rest, scheme }, (result) => {
    writeComparisonCase(result, out, write);
    io.stdout(summaryLine(result.json) + "\n");
  });
  const summary = summarizeComparisons(cohort.comparisons, cohort.failed);
  writeComparisonCohort(cohort.comparisons, summary, cohort.failed, out, write);
  const p = summary.pooled;
  io.stdout(
    `cohort\t${cohort.comparisons.length} compared, ${cohort.failed.length} failed\t` +
      `pooled F1 ${p.f1 ?? "–"}\tkappa ${summary.kappa ?? "–"}\n`,
  );
  if (cohort.failed.length > 0) {
    for (const f of cohort.failed) {
      io.stderr(`hotfield compare: pair "${f.id}" (manifest line ${f.line}) failed: ${f.error}\n`);
    }
    return 1;
  }
  return 0;
}

function summaryLine(j: import("../compare/comparison_types.ts").ComparisonJson): string {
  const d = j.detection, h = j.hotspot, g = j.grade;
  return `${j.case}\tF1 ${d.f1 ?? "–"} (tp ${d.tp}, fp ${d.fp}, fn ${d.fn})\t` +
    `hotspot ${h.reference?.count ?? "none"} → ${h.candidate?.count ?? "none"}` +
    (g ? `\tclass ${g.reference_class ?? "none"} → ${g.candidate_class ?? "none"}` : "");
}
