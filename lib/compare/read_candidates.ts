/**
 * Reading a detector's candidate figures (GeoJSON or figures CSV) for a
 * comparison, checked against the reference's slide.
 *
 * @module
 */

import { createHash } from "node:crypto";
import { readInputFile } from "../io/read_input.ts";
import { MAX_TEXT_INPUT_BYTES } from "../defaults.ts";
import { parseAnnotations } from "../annotations/read_annotations.ts";
import { parseFiguresCsv } from "../annotations/read_figures_csv.ts";
import { inputError } from "../errors.ts";
import type { SlideInfo } from "../types.ts";
import type { CandidateSet } from "./compare_case.ts";

/** Options of {@linkcode readCandidates}. */
export interface ReadCandidatesOptions {
  /** The reference's slide: its mpp converts CSV micrometres, its id and mpp are checked. */
  slide: SlideInfo;
  /** Accept a candidate GeoJSON whose slide id or mpp differ from the reference's. @default false */
  sameSlide?: boolean;
  /** Unit of a CSV's x and y. @default "px" */
  units?: "px" | "um";
}

const WHAT = "candidates";

/**
 * Reads candidate figures from a GeoJSON FeatureCollection (figure features;
 * the `slide` member optional) or a figures CSV (`x,y[,label][,score]`),
 * told apart by the extension (`.csv`, `.tsv`, `.txt` are CSV) or, failing
 * that, by a first character `{`.
 *
 * Positions are level-0 pixels of the reference's slide (a CSV may give µm
 * with `units: "um"`). A GeoJSON `slide` member whose id (when both are
 * given) or mpp differ from the reference's is an error, unless
 * `sameSlide` is set (then a warning, and the reference's mpp is used).
 * Tissue, tumour, exclusion and field features of the candidate file are
 * ignored with a warning: the reference's valid region is used. An empty
 * FeatureCollection or a CSV with a header only is a valid, empty set.
 *
 * @param path The candidate file.
 * @param options The reference slide, `sameSlide`, CSV units.
 * @returns The figures, the file's provenance and warnings.
 * @throws {Error} When the file cannot be read.
 * @throws {SyntaxError | TypeError | RangeError} For bad content, or a different slide.
 *
 * @example A CSV of two scored candidates
 * ```ts
 * import { readCandidates } from "hotfield";
 * const dir = Deno.makeTempDirSync();
 * Deno.writeTextFileSync(`${dir}/det.csv`, "x,y,score\n10,20,0.9\n30,40,0.2\n");
 * const c = await readCandidates(`${dir}/det.csv`, { slide: { id: "QVT-24-001", mppX: 0.25, mppY: 0.25 } });
 * if (c.figures.xPx.length !== 2 || c.figures.score[1] !== 0.2) throw new Error(`read ${c.figures.xPx.length} points`);
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export async function readCandidates(
  path: string,
  options: ReadCandidatesOptions,
): Promise<CandidateSet & { warnings: string[] }> {
  // regular files only, within the limit (a named pipe is never opened)
  const bytes = await readInputFile(path, { what: WHAT, maxBytes: MAX_TEXT_INPUT_BYTES });
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw inputError(
      SyntaxError,
      WHAT,
      path,
      "not UTF-8 text (is it a binary file, such as an image?)",
    );
  }
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const { slide } = options;
  const warnings: string[] = [];
  const isCsv = /\.(csv|tsv|txt)$/i.test(path) ||
    (!/\.(geo)?json$/i.test(path) && !text.trimStart().startsWith("{"));
  if (isCsv) {
    const csv = parseFiguresCsv(text, {
      fileName: path,
      units: options.units ?? "px",
      mppX: slide.mppX,
      mppY: slide.mppY,
    });
    return {
      figures: csv.figures,
      source: { kind: "figures", path, sha256 },
      warnings: [...warnings, ...csv.warnings],
    };
  }
  if (options.units === "um") {
    throw inputError(TypeError, WHAT, path, 'units "um" apply to a figures CSV, not to GeoJSON');
  }
  const emptyCollection = /^\s*\{[\s\S]*"features"\s*:\s*\[\s*\][\s\S]*\}\s*$/.test(text) &&
    text.length < 4096;
  if (emptyCollection) {
    return {
      figures: {
        xPx: new Float64Array(0),
        yPx: new Float64Array(0),
        labelIndex: new Uint32Array(0),
        labels: [],
        score: new Float64Array(0),
        origin: new Int32Array(0),
      },
      source: { kind: "figures", path, sha256 },
      warnings: [`${path}: the FeatureCollection has no features (an empty candidate set)`],
    };
  }
  const hasSlide = /"slide"\s*:/.test(text);
  const parsed = parseAnnotations(text, {
    fileName: path,
    slide: hasSlide ? undefined : { id: slide.id, mpp: [slide.mppX, slide.mppY] },
  });
  if (hasSlide) {
    const s = parsed.slide;
    const problems: string[] = [];
    if (s.id !== "" && slide.id !== "" && s.id !== slide.id) {
      problems.push(`slide id "${s.id}" differs from the reference's "${slide.id}"`);
    }
    const near = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(a, b);
    if (!near(s.mppX, slide.mppX) || !near(s.mppY, slide.mppY)) {
      problems.push(
        `mpp ${fmtMpp(s.mppX, s.mppY)} differs from the reference's ${
          fmtMpp(slide.mppX, slide.mppY)
        } µm/px`,
      );
    }
    if (problems.length > 0) {
      if (!options.sameSlide) {
        throw inputError(
          RangeError,
          WHAT,
          path,
          `${
            problems.join("; ")
          }: the pair must be of the same slide (give --same-slide if it is, ` +
            "and the positions are level-0 pixels of the reference's slide)",
        );
      }
      warnings.push(
        `${path}: ${
          problems.join("; ")
        }; taken as the same slide (same-slide), with the reference's mpp`,
      );
    }
  }
  const regions = parsed.tissue.length + parsed.tumour.length + parsed.exclude.length;
  if (regions > 0 || parsed.fields.length > 0) {
    warnings.push(
      `${path}: its ${regions} region and ${parsed.fields.length} field feature(s) are ignored; ` +
        "the reference's valid region is used",
    );
  }
  warnings.push(...parsed.warnings);
  if (parsed.figures.xPx.length === 0) {
    warnings.push(`${path}: no figure features (an empty candidate set)`);
  }
  return { figures: parsed.figures, source: { kind: "figures", path, sha256 }, warnings };
}

function fmtMpp(x: number, y: number): string {
  return x === y ? String(x) : `${x} × ${y}`;
}
