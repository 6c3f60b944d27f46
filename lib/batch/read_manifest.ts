/**
 * Reading a batch manifest: an RFC 4180 CSV file with a header row and one
 * case per row.
 *
 * ## Columns
 *
 * | column          | meaning                                                              |
 * | --------------- | -------------------------------------------------------------------- |
 * | `annotations`   | annotation GeoJSON of the case                                       |
 * | `case_file`     | a `*.case.json` case file (give `annotations` or `case_file`, one)   |
 * | `id`            | case id, the folder name (default: slide id, case-file id, stem)     |
 * | `figures`       | figures CSV, replacing the figure features                          |
 * | `figures_units` | `px` (default) or `um`: unit of the figures CSV's x and y            |
 * | `tissue_mask`   | PNG tissue mask (non-zero = tissue), needs `mask_mpp`                |
 * | `mask_mpp`      | micrometres per mask pixel: `N`, or `"N,M"` for x and y              |
 * | `mpp`           | micrometres per level-0 slide pixel, replacing the slide's: `N`, `"N,M"` |
 * | `slide`         | slide file (or PNG/JPEG thumbnail): mpp, size, and the tissue when no outline is given |
 * | `scheme`        | grading scheme of this case, overriding `--scheme`                   |
 * | `min_score`     | least figure score counted, 0 to 1, overriding `--min-score`         |
 *
 * Only `annotations` or `case_file` is required; other columns are optional
 * and may come in any order. An empty cell means "not given". Paths are
 * relative to the manifest's folder (absolute paths work too); a path that
 * does not exist fails that case only. Cells are trimmed. Rows are numbered
 * as lines of the file (the header is row 1), as a spreadsheet shows them
 * when no cell spans lines.
 *
 * Problems of the manifest itself (CSV syntax, an unknown or repeated
 * column, a row with both or neither of `annotations` and `case_file`, a bad
 * value, two rows with one case id, an id that would leave the output
 * folder) are all reported at once, before anything runs.
 *
 * @module
 */

import { readInputFile } from "../io/read_input.ts";
import { MAX_TEXT_INPUT_BYTES } from "../defaults.ts";
import { dirname, resolve } from "node:path";
import { parse } from "csv-parse/sync";
import { type CaseInput, readCaseFile } from "../annotations/read_case.ts";
import { safeCaseId } from "../annotations/case_id.ts";
import type { ReportOptions } from "../pipeline/case_result.ts";
import { getScheme } from "../standards/list_schemes.ts";
import type { BatchCase } from "./batch_types.ts";

/** The manifest's columns. */
export const MANIFEST_COLUMNS = [
  "annotations",
  "case_file",
  "id",
  "figures",
  "figures_units",
  "tissue_mask",
  "mask_mpp",
  "mpp",
  "scheme",
  "min_score",
  "slide",
] as const;

/** A manifest column name. */
export type ManifestColumn = typeof MANIFEST_COLUMNS[number];

type ErrorClass = typeof SyntaxError | typeof TypeError | typeof RangeError;

/** One row as read, before its files are looked at. */
export interface ManifestRow {
  /** Row number (the header is row 1). */
  row: number;
  /** Given cells by column (trimmed, empty cells left out). */
  cells: Partial<Record<ManifestColumn, string>>;
}

/**
 * Parses and checks the text of a manifest (see the module documentation).
 *
 * @param text The file's text.
 * @param path The manifest's path, for messages.
 * @returns The rows.
 * @throws {SyntaxError | TypeError | RangeError} With every problem, one per
 *   line, each naming the file, the row and the column.
 *
 * @example An unknown column names the closest known one
 * ```ts
 * import { parseManifest } from "./read_manifest.ts";
 * let message = "";
 * try { parseManifest("anotations\na.geojson\n", "m.csv"); } catch (e) { message = (e as Error).message; }
 * if (!message.includes('did you mean "annotations"')) throw new Error(message);
 * ```
 */
export function parseManifest(text: string, path: string): ManifestRow[] {
  const problems: [ErrorClass, string][] = [];
  const fail = (cls: ErrorClass, detail: string): Error =>
    new cls(`Cannot read manifest "${path}": ${detail}`);
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, {
      bom: true,
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (e) {
    const err = e as Error & { lines?: number };
    const line = typeof err.lines === "number" ? `row ${err.lines}: ` : "";
    throw fail(SyntaxError, `${line}not valid CSV (RFC 4180): ${err.message}`);
  }
  if (records.length === 0) {
    throw fail(
      TypeError,
      'the file is empty: it needs a header row naming "annotations" or "case_file"',
    );
  }
  const header = records[0].record.map((h) => h.trim());
  const columns: (ManifestColumn | null)[] = [];
  const seen = new Map<string, number>();
  header.forEach((name, k) => {
    const where = `row 1, column ${k + 1}`;
    if (name === "") {
      problems.push([
        TypeError,
        `${where}: the header cell is empty; name the column or remove it`,
      ]);
      columns.push(null);
    } else if (!(MANIFEST_COLUMNS as readonly string[]).includes(name)) {
      problems.push([
        TypeError,
        `${where}: unknown column "${name}"; did you mean "${closest(name)}"? Known columns: ${
          MANIFEST_COLUMNS.join(", ")
        }`,
      ]);
      columns.push(null);
    } else if (seen.has(name)) {
      problems.push([
        TypeError,
        `${where}: column "${name}" appears twice (also column ${seen.get(name)! + 1})`,
      ]);
      columns.push(null);
    } else {
      seen.set(name, k);
      columns.push(name as ManifestColumn);
    }
  });
  if (!seen.has("annotations") && !seen.has("case_file")) {
    problems.push([
      TypeError,
      `row 1: the header needs a column "annotations" or "case_file": found ${
        header.map((h) => `"${h}"`).join(", ")
      }`,
    ]);
  }
  const rows: ManifestRow[] = [];
  const ids = new Map<string, number>();
  const sources = new Map<string, number>();
  for (const { record, info } of records.slice(1)) {
    const row = info.lines;
    if (record.length > header.length) {
      problems.push([
        TypeError,
        `row ${row}: ${record.length} cells but the header has ${header.length} columns`,
      ]);
      continue;
    }
    const cells: ManifestRow["cells"] = {};
    record.forEach((v, k) => {
      const col = columns[k];
      if (col && v.trim() !== "") cells[col] = v.trim();
    });
    const at = (col: ManifestColumn) => `row ${row}, column "${col}"`;
    const problem = (cls: ErrorClass, col: ManifestColumn | null, detail: string) =>
      problems.push([cls, `${col ? at(col) : `row ${row}`}: ${detail}`]);
    const hasSourceColumn = seen.has("annotations") || seen.has("case_file");
    if (!hasSourceColumn) {
      // already reported once for the header
    } else if (cells.annotations !== undefined && cells.case_file !== undefined) {
      problem(TypeError, null, 'both "annotations" and "case_file" are given; give one of them');
    } else if (cells.annotations === undefined && cells.case_file === undefined) {
      problem(TypeError, null, 'neither "annotations" nor "case_file" is given; give one of them');
    }
    if (cells.id !== undefined) {
      const id = cells.id;
      if (/[\/\\\0]/.test(id) || /^\.+$/.test(id)) {
        problem(
          RangeError,
          "id",
          `case id "${id}" would lead outside the output folder; use letters, digits, "-", "_" and "."`,
        );
      } else {
        const safe = safeCaseId(id);
        const earlier = ids.get(safe);
        if (earlier !== undefined) {
          problem(TypeError, "id", `case id "${id}" is also the id of row ${earlier}`);
        } else ids.set(safe, row);
      }
    } else {
      const source = cells.annotations ?? cells.case_file;
      if (source !== undefined) {
        const earlier = sources.get(source);
        if (earlier !== undefined) {
          problem(
            TypeError,
            null,
            `"${source}" is also the case of row ${earlier}, so both would get one case id; give each row an "id"`,
          );
        } else sources.set(source, row);
      }
    }
    if (cells.figures_units !== undefined) {
      if (cells.figures_units !== "px" && cells.figures_units !== "um") {
        problem(RangeError, "figures_units", `must be px or um: found "${cells.figures_units}"`);
      } else if (cells.figures === undefined) {
        problem(TypeError, "figures_units", 'applies to a figures CSV: give "figures" too');
      }
    }
    if (cells.tissue_mask !== undefined && cells.mask_mpp === undefined) {
      problem(TypeError, "mask_mpp", `is needed with "tissue_mask" (micrometres per mask pixel)`);
    }
    if (cells.mask_mpp !== undefined) {
      if (cells.tissue_mask === undefined) {
        problem(TypeError, "mask_mpp", 'applies to a tissue mask: give "tissue_mask" too');
      } else if (parseMpp(cells.mask_mpp) === null) {
        problem(
          RangeError,
          "mask_mpp",
          `needs a positive number N, or "N,M" for x and y: found "${cells.mask_mpp}"`,
        );
      }
    }
    if (cells.mpp !== undefined && parseMpp(cells.mpp) === null) {
      problem(
        RangeError,
        "mpp",
        `needs a positive number N, or "N,M" for x and y (micrometres per level-0 pixel): found "${cells.mpp}"`,
      );
    }
    if (cells.scheme !== undefined) {
      try {
        getScheme(cells.scheme);
      } catch (e) {
        problem(RangeError, "scheme", (e as Error).message);
      }
    }
    if (cells.min_score !== undefined) {
      const v = Number(cells.min_score);
      if (!Number.isFinite(v) || v < 0 || v > 1) {
        problem(RangeError, "min_score", `needs a number from 0 to 1: found "${cells.min_score}"`);
      }
    }
    rows.push({ row, cells });
  }
  if (problems.length > 0) {
    const shown = problems.slice(0, 20).map(([, d]) => `Cannot read manifest "${path}": ${d}`);
    if (problems.length > 20) shown.push(`… and ${problems.length - 20} more problems`);
    throw new problems[0][0](shown.join("\n"));
  }
  return rows;
}

/**
 * Reads a manifest and describes each row as a batch case (see the module
 * documentation). Case files are read here (they are small), so a row whose
 * case file is missing or malformed becomes a case that fails with the
 * reader's message; the files they name are read when the case runs.
 *
 * @param path The manifest.
 * @param options The command line's report options; a row's `scheme` and
 *   `min_score` override them.
 * @returns One case per row, in row order.
 * @throws {Error} When the manifest cannot be read, or as {@linkcode parseManifest}.
 *
 * @example A missing manifest
 * ```ts
 * import { readManifest } from "hotfield";
 * let message = "";
 * try { await readManifest("no-such-manifest.csv", {}); } catch (e) { message = (e as Error).message; }
 * if (message !== 'Cannot read manifest "no-such-manifest.csv": file not found') throw new Error(message);
 * ```
 */
export async function readManifest(path: string, options: ReportOptions): Promise<BatchCase[]> {
  // regular files only, within the limit (a named pipe is never opened)
  const bytes = await readInputFile(path, { what: "manifest", maxBytes: MAX_TEXT_INPUT_BYTES });
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new SyntaxError(`Cannot read manifest "${path}": the file is not UTF-8 text`);
  }
  const rows = parseManifest(text, path);
  const baseDir = dirname(resolve(path));
  const cases: BatchCase[] = [];
  for (const [index, { row, cells }] of rows.entries()) {
    const source = (cells.case_file ?? cells.annotations)!;
    const label = `row ${row} (${source})`;
    const caseOptions: ReportOptions = { ...options };
    if (cells.scheme !== undefined) caseOptions.scheme = cells.scheme;
    if (cells.min_score !== undefined) caseOptions.minScore = Number(cells.min_score);
    const shardKey = `${source}\u0000${cells.id ?? ""}`;
    let input: CaseInput;
    if (cells.case_file !== undefined) {
      try {
        input = await readCaseFile(cells.case_file, { baseDir });
      } catch (e) {
        cases.push({
          index,
          label,
          input: null,
          problem: (e as Error).message,
          options: caseOptions,
          shardKey,
        });
        continue;
      }
    } else {
      input = { annotationsPath: cells.annotations, baseDir };
    }
    if (cells.figures !== undefined) {
      input.figuresPath = cells.figures;
      input.figureUnits = (cells.figures_units ?? "px") as "px" | "um";
      if (cells.figures_units !== undefined) input.figureUnitsStated = true;
    }
    if (cells.tissue_mask !== undefined) {
      input.tissueMaskPath = cells.tissue_mask;
      input.maskMpp = parseMpp(cells.mask_mpp!)!;
    }
    if (cells.mpp !== undefined) {
      input.mpp = parseMpp(cells.mpp)!;
    }
    if (cells.slide !== undefined) input.slidePath = cells.slide;
    if (cells.id !== undefined) input.idOverride = cells.id;
    cases.push({ index, label, input, options: caseOptions, shardKey });
  }
  return cases;
}

/** `N` or `N,M`, positive and finite; null otherwise. */
function parseMpp(text: string): number | [number, number] | null {
  const parts = text.split(",").map((s) => s.trim());
  const nums = parts.map((s) => (s === "" ? NaN : Number(s)));
  if (parts.length > 2 || nums.some((v) => !Number.isFinite(v) || v <= 0)) return null;
  return nums.length === 1 ? nums[0] : [nums[0], nums[1]];
}

/** The known column nearest to `name` (Levenshtein distance, ties in column order). */
function closest(name: string): ManifestColumn {
  let best: ManifestColumn = MANIFEST_COLUMNS[0];
  let bestD = Infinity;
  for (const c of MANIFEST_COLUMNS) {
    const d = levenshtein(name.toLowerCase(), c);
    if (d < bestD) [best, bestD] = [c, d];
  }
  return best;
}

function levenshtein(a: string, b: string): number {
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) {
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    prev = cur;
  }
  return prev[b.length];
}
