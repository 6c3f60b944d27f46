/**
 * Options that name a case's files and what is counted, shared by the
 * commands that read a case (`inspect`, `report`).
 *
 * @module
 */

import { readFile, stat } from "node:fs/promises";
import { UsageError } from "../errors.ts";
import { type CaseInput, parseCaseFile } from "../annotations/read_case.ts";
import { notDecimalWhy, type OptionSpec, parseDecimal } from "./_args.ts";
import {
  DEFAULT_COUNT_LABEL,
  DEFAULT_COUNT_LABELS,
  DEFAULT_MIN_SCORE,
  MAX_CASE_FILE_BYTES,
} from "../defaults.ts";

/** The options naming a case's files and id (node:util parseArgs spec). */
export const FILE_OPTIONS: OptionSpec = {
  figures: { type: "string" },
  units: { type: "string" },
  "tissue-mask": { type: "string" },
  "mask-mpp": { type: "string" },
  mpp: { type: "string" },
  id: { type: "string" },
  slide: { type: "string" },
};

/** The options of what is counted (node:util parseArgs spec). */
export const COUNT_OPTIONS: OptionSpec = {
  "min-score": { type: "string" },
  "count-label": { type: "string", multiple: true },
};

/** The case and counting options (node:util parseArgs spec). */
export const CASE_OPTIONS: OptionSpec = { ...FILE_OPTIONS, ...COUNT_OPTIONS };

/** Help lines for {@linkcode COUNT_OPTIONS}. */
export const COUNT_OPTIONS_HELP = [
  `  --min-score F          figures with a score below F (0..1) are not counted (default ${DEFAULT_MIN_SCORE})`,
  `  --count-label L        label that is counted; repeat for several (default "${DEFAULT_COUNT_LABEL}")`,
].join("\n");

/** Help lines for {@linkcode CASE_OPTIONS}, for a command's `--help`. */
export const CASE_OPTIONS_HELP = [
  "  --figures FILE.csv     figure points from a CSV (x,y[,label][,score]); replaces figure features",
  "  --units px|um          unit of the CSV's x and y (default px: level-0 pixels)",
  "  --tissue-mask M.png    tissue from a PNG mask (non-zero = tissue); united with tissue polygons",
  "  --mask-mpp N | N,M     micrometres per mask pixel (x, or x,y); needed with a mask",
  "  --mpp N | N,M          micrometres per level-0 slide pixel, replacing the slide's (a warning says so)",
  COUNT_OPTIONS_HELP,
  "  --id ID                case id (default: slide id, case-file id, or file stem)",
  "  --slide FILE           the slide file (or PNG/JPEG thumbnail): mpp and size, and the tissue",
  "                         when no outline is given (a slide file needs the OpenSlide library)",
].join("\n");

type Values = Record<string, string | boolean | string[] | undefined>;

/**
 * Builds the {@linkcode CaseInput} for `file` and the options.
 *
 * `file` is a case file when it is a JSON object with a `"hotfield_case"`
 * member, or text naming that member that is not valid JSON (files over
 * 1 MiB are not looked at); otherwise it is the annotation
 * GeoJSON. Options override what a case file says. A file that cannot be
 * read is left for `loadCase` to report.
 *
 * With no `file` (only `--slide`), the case is the slide file alone.
 *
 * @param file The command's FILE argument, if any.
 * @param values Parsed option values.
 * @returns The case input.
 * @throws {UsageError} For a bad `--units`, `--mask-mpp` or `--mpp`, or
 *   `--mask-mpp` or `--units` with nothing to apply to.
 *
 * @example A GeoJSON with a figures CSV in micrometres
 * ```ts
 * import { caseInputFromOptions } from "./_case_args.ts";
 * const input = await caseInputFromOptions("missing.geojson", { figures: "f.csv", units: "um" });
 * if (input.annotationsPath !== "missing.geojson" || input.figureUnits !== "um") {
 *   throw new Error(`input ${JSON.stringify(input)}`);
 * }
 * ```
 */
export async function caseInputFromOptions(
  file: string | undefined,
  values: Values,
): Promise<CaseInput> {
  let input: CaseInput = file === undefined ? {} : { annotationsPath: file };
  const text = file === undefined ? undefined : await smallText(file);
  if (file !== undefined && text !== undefined && looksLikeCaseFile(text)) {
    input = parseCaseFile(text, file);
  }

  const str = (name: string): string | undefined => {
    const v = values[name];
    if (v === undefined) return undefined;
    if (typeof v !== "string" || v.trim() === "") {
      throw new UsageError(`Option --${name} needs a value`);
    }
    return v;
  };
  const figures = str("figures");
  if (figures !== undefined) input.figuresPath = figures;
  const units = str("units");
  if (units !== undefined) {
    if (units !== "px" && units !== "um") {
      throw new UsageError(`Option --units must be px or um: got "${units}"`);
    }
    if (input.figuresPath === undefined) {
      throw new UsageError("Option --units applies to a figures CSV: give --figures FILE.csv");
    }
    input.figureUnits = units;
    input.figureUnitsStated = true;
  } else if (figures !== undefined) {
    input.figureUnits = "px";
  }
  const mask = str("tissue-mask");
  const maskMpp = str("mask-mpp");
  if (mask !== undefined) {
    input.tissueMaskPath = mask;
    if (maskMpp === undefined) {
      throw new UsageError(
        "Option --tissue-mask needs --mask-mpp N (micrometres per mask pixel, or N,M for x,y)",
      );
    }
  }
  if (maskMpp !== undefined) {
    if (input.tissueMaskPath === undefined) {
      throw new UsageError("Option --mask-mpp applies to a tissue mask: give --tissue-mask M.png");
    }
    input.maskMpp = parseMaskMpp(maskMpp);
  }
  const mpp = str("mpp");
  if (mpp !== undefined) input.mpp = parseMpp(mpp);
  const id = str("id");
  if (id !== undefined) input.idOverride = id;
  const slide = str("slide");
  if (slide !== undefined) input.slidePath = slide;
  if (input.annotationsPath === undefined && input.slidePath === undefined && !input.slide) {
    throw new UsageError("Give a FILE (an annotation GeoJSON or a case file) or --slide FILE");
  }
  return input;
}

/**
 * Reads `--min-score` and `--count-label`.
 *
 * @param values Parsed option values.
 * @returns The minimum score (default 0) and counted labels (default ["mitotic figure"]).
 * @throws {UsageError} When the score is not a number in [0, 1] or a label is empty.
 *
 * @example Defaults and a choice
 * ```ts
 * import { countOptionsFromValues } from "./_case_args.ts";
 * const d = countOptionsFromValues({});
 * if (d.minScore !== 0 || d.countLabels[0] !== "mitotic figure") throw new Error(`defaults ${JSON.stringify(d)}`);
 * const c = countOptionsFromValues({ "min-score": "0.5", "count-label": ["a", "b"] });
 * if (c.minScore !== 0.5 || c.countLabels.length !== 2) throw new Error(`options ${JSON.stringify(c)}`);
 * ```
 */
export function countOptionsFromValues(
  values: Values,
): { minScore: number; countLabels: string[] } {
  let minScore = DEFAULT_MIN_SCORE;
  const raw = values["min-score"];
  if (raw !== undefined) {
    const v = parseDecimal(String(raw));
    if (v === undefined) {
      throw new UsageError(
        `Option --min-score needs a number in [0, 1]: ${notDecimalWhy(raw)}`,
      );
    }
    if (v < 0 || v > 1) {
      throw new UsageError(`Option --min-score must lie in [0, 1]: got ${raw}`);
    }
    minScore = v;
  }
  let countLabels = [...DEFAULT_COUNT_LABELS];
  const labels = values["count-label"];
  if (labels !== undefined) {
    const list = (Array.isArray(labels) ? labels : [String(labels)]).map((l) => l.trim());
    if (list.some((l) => l === "")) {
      throw new UsageError("Option --count-label needs a non-empty label");
    }
    countLabels = [...new Set(list)];
  }
  return { minScore, countLabels };
}

function parseMpp(text: string): number | [number, number] {
  const nums = text.split(",").map((s) => parseDecimal(s) ?? NaN);
  if (nums.length > 2 || nums.some((v) => !Number.isFinite(v) || v <= 0)) {
    throw new UsageError(
      `Option --mpp needs a positive number N or a pair N,M (micrometres per level-0 pixel): got "${text}"`,
    );
  }
  return nums.length === 1 ? nums[0] : [nums[0], nums[1]];
}

function parseMaskMpp(text: string): number | [number, number] {
  const parts = text.split(",").map((s) => s.trim());
  const nums = parts.map((s) => parseDecimal(s) ?? NaN);
  if ((parts.length !== 1 && parts.length !== 2) || nums.some((v) => !Number.isFinite(v))) {
    throw new UsageError(`Option --mask-mpp needs a number N or a pair N,M: got "${text}"`);
  }
  if (nums.some((v) => v <= 0)) {
    throw new UsageError(
      `Option --mask-mpp must be positive (micrometres per mask pixel): got ${text}`,
    );
  }
  return nums.length === 1 ? nums[0] : [nums[0], nums[1]];
}

async function smallText(file: string): Promise<string | undefined> {
  try {
    const s = await stat(file);
    if (!s.isFile() || s.size > MAX_CASE_FILE_BYTES) return undefined;
    return new TextDecoder().decode(await readFile(file));
  } catch {
    return undefined;
  }
}

function looksLikeCaseFile(text: string): boolean {
  if (!text.includes('"hotfield_case"')) return false;
  try {
    const v = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
    return v !== null && typeof v === "object" && !Array.isArray(v) && "hotfield_case" in v;
  } catch {
    // broken JSON that names the member: let the case-file reader report it
    return true;
  }
}
