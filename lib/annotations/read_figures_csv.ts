/**
 * Reading figure points from a CSV file (RFC 4180): a header naming the
 * columns `x`, `y` and optionally `label` and `score`, in any order, then one
 * point per line.
 *
 * - Column names are matched without regard to case or surrounding spaces.
 *   Other columns are ignored, with a warning.
 * - A UTF-8 byte order mark is removed.
 * - The separator is found from the header: `,` unless the header only makes
 *   sense split at `;` or a tab. With `;` as separator, numbers with one
 *   decimal comma and no point (`1234,5`) are read as decimals (`1234.5`),
 *   with a warning; other numbers that fail name the line and the value.
 * - Empty lines are skipped. An empty `label` cell gives "mitotic figure";
 *   an empty `score` cell means no score.
 * - Line numbers in messages count the header as line 1.
 *
 * @module
 */

import { parse } from "csv-parse/sync";
import { inputError } from "../errors.ts";
import type { FigureSet } from "../types.ts";
import { umToPx } from "../units.ts";
import { isDecimalText, parseDecimal } from "../numbers.ts";
import { DEFAULT_FIGURE_LABEL, FigureSetBuilder } from "./_figure_builder.ts";
import { checkFigureCount, checkFigureMagnitudes } from "./_plausibility.ts";

/** Options of {@linkcode parseFiguresCsv}. */
export interface ParseFiguresCsvOptions {
  /** The file's path as the user gave it, for messages. */
  fileName: string;
  /**
   * Unit of the x and y columns: level-0 pixels, or micrometres from the
   * slide origin (divided by `mppX` and `mppY`).
   * @default "px"
   */
  units?: "px" | "um";
  /** Micrometres per pixel along x (used for `units: "um"`). */
  mppX: number;
  /** Micrometres per pixel along y (used for `units: "um"`). */
  mppY: number;
}

const WHAT = "figures CSV";
const KNOWN = ["x", "y", "label", "score"] as const;

/**
 * Parses a figures CSV into a FigureSet in level-0 pixels.
 *
 * Each point's `origin` is its line in the file (the header is line 1).
 *
 * @param text The file's text.
 * @param options File name, units and mpp.
 * @returns The points and any warnings.
 * @throws {SyntaxError} For an empty file, broken quoting or a non-numeric value.
 * @throws {TypeError} When the header lacks an `x` or `y` column or repeats one.
 * @throws {RangeError} When a score lies outside [0, 1].
 *
 * @example Reading two points, one with a quoted label holding a comma
 * ```ts
 * import { parseFiguresCsv } from "hotfield";
 * const csv = 'x,y,label\n10,20,mitotic figure\n30,40,"atypical, tripolar"\n';
 * const { figures } = parseFiguresCsv(csv, { fileName: "f.csv", mppX: 0.25, mppY: 0.25 });
 * if (figures.xPx.length !== 2) throw new Error(`${figures.xPx.length} figures, expected 2`);
 * if (figures.labels[1] !== "atypical, tripolar") throw new Error(`quoted label read as ${figures.labels[1]}`);
 * if (figures.origin[1] !== 3) throw new Error("line numbers count the header as line 1");
 * ```
 */
export function parseFiguresCsv(
  text: string,
  options: ParseFiguresCsvOptions,
): { figures: FigureSet; warnings: string[] } {
  const file = options.fileName;
  const units = options.units ?? "px";
  const fail = (
    Cls: typeof TypeError | typeof RangeError | typeof SyntaxError,
    detail: string,
    cause?: unknown,
  ) => inputError(Cls, WHAT, file, detail, cause);
  if (units !== "px" && units !== "um") {
    throw fail(TypeError, `unknown units "${units}"; use "px" or "um"`);
  }
  if (units === "um" && !(options.mppX > 0 && options.mppY > 0)) {
    throw fail(RangeError, `units "um" need a positive mpp: got ${options.mppX}, ${options.mppY}`);
  }
  const warnings: string[] = [];
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.trim() === "") {
    throw fail(
      SyntaxError,
      text.length === 0 ? "the file is empty (0 bytes)" : "the file holds only white space",
    );
  }
  // lines counted before parsing, which builds an object per row
  let lines = 1;
  for (let i = text.indexOf("\n"); i >= 0 && i < text.length - 1; i = text.indexOf("\n", i + 1)) {
    lines++;
  }
  checkFigureCount(lines, WHAT, file, "lines");
  const firstLine = text.slice(0, 4096).split(/\r?\n/).find((l) => l.trim() !== "") ??
    text.split(/\r?\n/).find((l) => l.trim() !== "") ?? "";
  const delimiter = csvDelimiter(firstLine);

  let rows: { record: string[]; info: { lines: number } }[];
  try {
    rows = parse(text, {
      delimiter,
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
      trim: true,
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (e) {
    const err = e as Error & { lines?: number };
    const line = typeof err.lines === "number" ? `line ${err.lines}: ` : "";
    throw fail(SyntaxError, `${line}not valid CSV (RFC 4180): ${err.message}`, e);
  }
  const { col, warnings: headerWarnings } = csvColumns(rows[0].record, firstLine, delimiter, file);
  warnings.push(...headerWarnings);

  const decimalComma = delimiter === ";";
  let decimalCommaUsed = 0;
  let firstDecimalComma = 0;
  const readNumber = (raw: string, name: string, line: number): number => {
    const v = csvNumber(raw, decimalComma);
    if (v.comma && decimalCommaUsed++ === 0) firstDecimalComma = line;
    if (!Number.isFinite(v.value)) {
      const hint = /,/.test(raw)
        ? "; write numbers with a decimal point and no thousands separator"
        : "";
      throw fail(
        SyntaxError,
        `line ${line}: ${name} ${
          raw === ""
            ? "is empty"
            : isDecimalText(raw.replace(",", "."))
            ? `${JSON.stringify(raw)} is too large`
            : `${JSON.stringify(raw)} is not a number`
        }${hint}`,
      );
    }
    return v.value;
  };

  const figures = new FigureSetBuilder();
  for (let r = 1; r < rows.length; r++) {
    const { record, info } = rows[r];
    const line = info.lines;
    if (record.every((c) => c === "")) continue;
    const cell = (k: number | undefined) => (k === undefined ? "" : record[k] ?? "");
    const x = readNumber(cell(col.x), "x", line);
    const y = readNumber(cell(col.y), "y", line);
    const rawLabel = cell(col.label);
    const label = rawLabel === "" ? DEFAULT_FIGURE_LABEL : rawLabel;
    let score = NaN;
    const rawScore = cell(col.score);
    if (rawScore !== "") {
      score = readNumber(rawScore, "score", line);
      if (!(score >= 0 && score <= 1)) {
        const hint = score > 1 && score <= 100
          ? " (a percentage? give scores as fractions, e.g. 0.87)"
          : "";
        throw fail(RangeError, `line ${line}: score ${rawScore} is outside [0, 1]${hint}`);
      }
    }
    if (units === "um") {
      const [xPx, yPx] = umToPx([x, y], options);
      figures.add(xPx, yPx, label, score, line);
    } else figures.add(x, y, label, score, line);
  }
  warnings.push(...csvEndWarnings(file, decimalCommaUsed, firstDecimalComma, figures.length));
  const built = figures.build();
  checkFigureMagnitudes(built, options, WHAT, file, "line");
  return { figures: built, warnings };
}

/** The warnings a figures CSV gets at its end. */
export function csvEndWarnings(
  file: string,
  decimalCommaUsed: number,
  firstDecimalComma: number,
  rows: number,
): string[] {
  const warnings: string[] = [];
  if (decimalCommaUsed > 0) {
    warnings.push(
      `${file}: read ${decimalCommaUsed} number(s) with a decimal comma as decimals (first on line ${firstDecimalComma})`,
    );
  }
  if (rows === 0) warnings.push(`${file}: the file has a header but no figure rows`);
  return warnings;
}

/**
 * A cell's number as the figures CSV reads it: with `;` as separator, one
 * decimal comma and no point (`1234,5`) is a decimal (`comma` says so);
 * otherwise the cell as a plain decimal; NaN for an empty cell or anything
 * else (hexadecimal, `Infinity`, a value beyond a double's range).
 *
 * @example
 * ```ts
 * import { csvNumber } from "./read_figures_csv.ts";
 * if (csvNumber("12,5", true).value !== 12.5 || !Number.isNaN(csvNumber("12,5", false).value)) {
 *   throw new Error("decimal comma only with ';'");
 * }
 * ```
 */
export function csvNumber(raw: string, decimalComma: boolean): { value: number; comma: boolean } {
  let s = raw, comma = false;
  if (decimalComma && /^[+-]?\d+,\d+$/.test(s)) {
    s = s.replace(",", ".");
    comma = true;
  }
  // decimals only: Number() would also take "0x10", "Infinity" or "1e400"
  return { value: parseDecimal(s) ?? NaN, comma };
}

/**
 * The columns of a figures CSV from its header record (see the module
 * documentation), with the warnings the header gives.
 *
 * @param record The header's cells.
 * @param firstLine The header line as written (for messages).
 * @param delimiter The separator found.
 * @param file The file's path, for messages.
 * @returns Column index of x, y, label and score, and warnings.
 * @throws {TypeError} When x or y is missing or a known column repeats.
 *
 * @example
 * ```ts
 * import { csvColumns } from "./read_figures_csv.ts";
 * const { col, warnings } = csvColumns(["Y", "x", "note"], "Y,x,note", ",", "f.csv");
 * if (col.x !== 1 || col.y !== 0 || warnings.length !== 1) throw new Error("columns");
 * ```
 */
export function csvColumns(
  record: string[],
  firstLine: string,
  delimiter: string,
  file: string,
): { col: Partial<Record<typeof KNOWN[number], number>>; warnings: string[] } {
  const fail = (Cls: typeof TypeError, detail: string) => inputError(Cls, WHAT, file, detail);
  const warnings: string[] = [];
  const header = record.map((h) => h.trim().toLowerCase());
  const col: Partial<Record<typeof KNOWN[number], number>> = {};
  const extra: string[] = [];
  header.forEach((h, k) => {
    if ((KNOWN as readonly string[]).includes(h)) {
      const key = h as typeof KNOWN[number];
      if (col[key] !== undefined) {
        throw fail(
          TypeError,
          `the header names column ${JSON.stringify(h)} twice: ${quoteHeader(firstLine)}`,
        );
      }
      col[key] = k;
    } else extra.push(record[k]);
  });
  for (const need of ["x", "y"] as const) {
    if (col[need] === undefined) {
      throw fail(
        TypeError,
        `no "${need}" column in the header; the first line must name the columns x,y[,label][,score]: found ${
          quoteHeader(firstLine)
        }`,
      );
    }
  }
  if (extra.length > 0) {
    warnings.push(
      `${file}: ignored column(s) ${
        extra.map((c) => JSON.stringify(c)).join(", ")
      }; hotfield reads x, y, label, score`,
    );
  }
  if (delimiter !== ",") {
    warnings.push(
      `${file}: columns are separated by ${delimiter === ";" ? '";"' : "tabs"}, not commas`,
    );
  }

  return { col, warnings };
}

/**
 * The separator of a figures CSV, from its header line: `,` unless the
 * header only names x and y when split at `;` or a tab.
 *
 * @example
 * ```ts
 * import { csvDelimiter } from "./read_figures_csv.ts";
 * if (csvDelimiter("x;y;label") !== ";" || csvDelimiter("x,y") !== ",") throw new Error("separator");
 * ```
 */
export function csvDelimiter(headerLine: string): string {
  const names = (d: string) =>
    headerLine.split(d).map((h) => h.trim().replace(/^"|"$/g, "").toLowerCase());
  const hasXY = (d: string) => {
    const n = names(d);
    return n.includes("x") && n.includes("y");
  };
  if (hasXY(",")) return ",";
  if (hasXY(";")) return ";";
  if (hasXY("\t")) return "\t";
  return ",";
}

function quoteHeader(line: string): string {
  const s = line.length > 80 ? line.slice(0, 77) + "..." : line;
  return JSON.stringify(s);
}
