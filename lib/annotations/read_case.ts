/**
 * Reading a whole case: an annotation GeoJSON, optionally a figures CSV and a
 * PNG tissue mask, named directly or through a small case file.
 *
 * ## The case file (`*.case.json`, version 1)
 *
 * ```json
 * {
 *   "hotfield_case": 1,
 *   "id": "QVT-24-003",
 *   "annotations": "QVT-24-003.geojson",
 *   "figures": { "path": "QVT-24-003.figures.csv", "units": "px" },
 *   "tissue_mask": { "path": "QVT-24-003.tissue.png", "mpp": 8 },
 *   "slide": { "id": "QVT-24-003", "mpp": 0.25, "width": 80000, "height": 60000 },
 *   "scheme": "canine-mct-2tier",
 *   "min_score": 0.5,
 *   "slide_file": "QVT-24-003.tiff",
 *   "notes": "free text, ignored"
 * }
 * ```
 *
 * - `hotfield_case` (required) is the format version; only `1` exists.
 * - Paths are relative to the case file's folder (absolute paths also work).
 * - `figures` may be a plain path string (then `units` is `"px"`); `units` is
 *   `"px"` (level-0 pixels) or `"um"` (micrometres from the slide origin).
 * - `tissue_mask.mpp` is the mask's own micrometres per mask pixel, one
 *   number or `[x, y]`; it is required.
 * - `slide` has the shape of the GeoJSON `slide` member; its fields replace
 *   the annotation file's field by field (a warning names each change). With
 *   no `annotations`, `slide` must give the mpp, and the tissue comes from the
 *   mask and the figures from the CSV.
 * - Report settings for this case may be named: `scheme` (a scheme id),
 *   `min_score` (0–1), `count_labels` (a list of labels), `area_mm2`,
 *   `shape` (`"rect"` or `"circle"`), `stride_um` and `min_coverage`. They win
 *   over the command line's options for this case (a warning says when they
 *   differ from an option given there).
 * - `slide_file` names the slide itself (any format OpenSlide reads, or a
 *   PNG/JPEG thumbnail), see "The slide file" below.
 * - Unknown members are an error, so that a misspelt name is not ignored.
 *
 * ## How inputs combine
 *
 * - Tissue: the mask's polygons and any `tissue` polygons of the GeoJSON are
 *   united (a warning says so when both are present).
 * - Figures: when a figures CSV is given, its points are used and any
 *   `figure` features of the GeoJSON are ignored, with a warning. Combining
 *   both would count a figure twice whenever both inputs mark it.
 * - Case id: the `--id` override, else the case file's `id`, else `slide.id`,
 *   else the file stem (annotation file, else case file), made safe with
 *   {@linkcode safeCaseId}. A warning names an id that another one replaces.
 * - Figure units: when a figures CSV's coordinates fit the slide's regions
 *   only in the other unit (most points outside as stated, nearly all inside
 *   when read as µm instead of px or the reverse), the case carries a count
 *   problem (left unclassified) unless the unit was stated explicitly; then it
 *   is a warning.
 *
 * ## The slide file
 *
 * A slide file (`--slide`, or `slide_file` in a case file) supplies the
 * level-0 mpp, width and height: missing `slide` values are taken from it,
 * and a value that disagrees with it is an error naming both. With no
 * annotation file at all its stem is the slide id. When no tissue outline
 * or mask is given, the tissue is found on the slide (`detectTissue`) and
 * the case records how (`tissueSource`). A PNG/JPEG thumbnail works too when
 * the `slide` member gives the level-0 size and mpp; its aspect must match.
 *
 * @module
 */

import { createHash } from "node:crypto";
import { basename, dirname, isAbsolute, join } from "node:path";
import { inputError } from "../errors.ts";
import { readInputFile } from "../io/read_input.ts";
import {
  MAX_CASE_FILE_BYTES,
  MAX_IMAGE_PIXELS,
  MAX_JSON_CONTAINERS,
  MAX_MASK_FILE_BYTES,
  MAX_REGION_VERTICES,
  MAX_SLIDE_EXTENT_MM,
  MAX_TEXT_INPUT_BYTES,
} from "../defaults.ts";
import { regionBBox } from "../geometry/region_bbox.ts";
import { pxToUm, umToPx } from "../units.ts";
import type {
  CaseData,
  CaseSettings,
  CaseSource,
  FigureSet,
  RegionPart,
  SlideInfo,
} from "../types.ts";
import {
  checkMaskSize,
  decodeMaskPng,
  MaskOutlineTooLargeError,
  maskToPolygons,
} from "../tissue/read_mask.ts";
import { checkPngBounds } from "../io/png_bounds.ts";
import { describe } from "./_describe.ts";
import { emptyFigureSet } from "./_figure_builder.ts";
import { figurePositionWarnings } from "./_figure_checks.ts";
import { locateJsonProblem } from "./_json_location.ts";
import { containerLimitDetail, duplicateKeyDetail, scanJsonText } from "./_json_keys.ts";
import { isReservedCaseId, safeCaseId } from "./case_id.ts";
import { readAnnotationsBytes } from "./_scan_annotations.ts";
import { decodeText } from "./_decode_text.ts";
import { readFiguresCsvBytes } from "./_scan_figures_csv.ts";
import { parseSlideInfo, type SlideMember } from "./slide_info.ts";
import { sha256File } from "../io/hash_file.ts";
import { withSlideFileFacts } from "./_slide_facts.ts";
import {
  detectSlideTissue,
  readSlideImage,
  type SlideFileFacts,
  slideFileKind,
  type SlideImage,
} from "./read_slide_file.ts";

/** The files and settings of one case, before reading. */
export interface CaseInput {
  /** Annotation GeoJSON (regions, figures, fields, slide). */
  annotationsPath?: string;
  /** Figures CSV, replacing the GeoJSON's figure features. */
  figuresPath?: string;
  /** Unit of the CSV's x and y. @default "px" */
  figureUnits?: "px" | "um";
  /** True when the user stated the unit (an option or the case file), not a default. */
  figureUnitsStated?: boolean;
  /** PNG tissue mask (non-zero pixels are tissue). */
  tissueMaskPath?: string;
  /** Micrometres per mask pixel, one value or `[x, y]`; required with a mask. */
  maskMpp?: number | [number, number];
  /** The case file these came from, if any (recorded in `sources`). */
  caseFilePath?: string;
  /** Case id chosen by the user; wins over every other id. */
  idOverride?: string;
  /** The case file's `id`, used when the slide has none. */
  caseFileId?: string;
  /** Slide fields replacing those of the annotation file. */
  slide?: SlideMember;
  /** Report settings named by the case file. */
  settings?: CaseSettings;
  /**
   * Micrometres per level-0 pixel given for the case (a command-line option
   * or a manifest cell), one value or `[x, y]`; replaces the slide's mpp from
   * the annotation file and the case file, with a warning when it changes one.
   */
  mpp?: number | [number, number];
  /**
   * Folder that relative paths are read against; the paths are recorded in
   * `sources` and named in messages as given. @default the working directory
   */
  baseDir?: string;
  /** The slide file (or a PNG/JPEG thumbnail): mpp and size, and the tissue when none is given. */
  slidePath?: string;
}

/** The version of the case-file format this code reads. */
export const CASE_FILE_VERSION = 1;

const SETTING_KEYS = [
  "scheme",
  "min_score",
  "count_labels",
  "area_mm2",
  "shape",
  "stride_um",
  "min_coverage",
];

const CASE_KEYS = [
  "hotfield_case",
  "id",
  "annotations",
  "figures",
  "tissue_mask",
  "slide",
  "slide_file",
  "notes",
  ...SETTING_KEYS,
];

/**
 * Reads a case file (see the module documentation for the format) into a
 * {@linkcode CaseInput}, with paths resolved against the case file's folder.
 * The files it names are not read here.
 *
 * @param path The case file.
 * @param options `baseDir`: the folder a relative `path` is read against (kept
 *   in the result, so the files it names are read against it too).
 * @returns The case input.
 * @throws {Error} When the file cannot be read.
 * @throws {SyntaxError} When it is not JSON.
 * @throws {TypeError} When a member is missing, unknown or of the wrong type.
 * @throws {RangeError} When the version is not 1.
 *
 * @example Reading the test fixture's case file
 * ```ts
 * import { readCaseFile } from "hotfield";
 * import { fileURLToPath } from "node:url";
 * const path = fileURLToPath(
 *   new URL("../../test/fixtures/annotations/QVT-24-011.case.json", import.meta.url),
 * );
 * const input = await readCaseFile(path);
 * if (!input.annotationsPath?.endsWith("QVT-24-011.geojson") || input.maskMpp !== 16) {
 *   throw new Error(JSON.stringify(input));
 * }
 * ```
 */
export async function readCaseFile(
  path: string,
  options: { baseDir?: string } = {},
): Promise<CaseInput> {
  const base = options.baseDir;
  const at = base !== undefined && !isAbsolute(path) ? join(base, path) : path;
  const text = decodeText(await readBytes(path, "case file", at), "case file", path);
  const input = parseCaseFile(text, path);
  if (base !== undefined) input.baseDir = base;
  return input;
}

/**
 * Parses the text of a case file (see {@linkcode readCaseFile}).
 *
 * @param text The file's text.
 * @param path The case file's path: names it in messages and anchors relative paths.
 * @returns The case input.
 *
 * @example Figures as a plain path
 * ```ts
 * import { parseCaseFile } from "hotfield";
 * const input = parseCaseFile('{"hotfield_case": 1, "annotations": "a.geojson", "figures": "f.csv"}', "cases/x.case.json");
 * if (input.figuresPath !== "cases/f.csv") throw new Error(`paths resolve against the case file: ${input.figuresPath}`);
 * if (input.figureUnits !== "px") throw new Error(`figure units default to px, got ${input.figureUnits}`);
 * ```
 */
export function parseCaseFile(text: string, path: string): CaseInput {
  const what = "case file";
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.trim() === "") throw inputError(SyntaxError, what, path, "the file is empty");
  const scan = scanJsonText(text, MAX_JSON_CONTAINERS);
  if (scan.overLimitAt >= 0) {
    throw inputError(RangeError, what, path, containerLimitDetail(text, scan, MAX_JSON_CONTAINERS));
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    const where = locateJsonProblem(text);
    throw inputError(
      SyntaxError,
      what,
      path,
      where
        ? `not valid JSON: line ${where.line}, column ${where.column}: ${where.problem}`
        : `not valid JSON: ${(e as Error).message}`,
      e,
    );
  }
  if (scan.duplicate) {
    throw inputError(SyntaxError, what, path, duplicateKeyDetail(text, scan.duplicate));
  }
  if (raw === null || typeof raw !== "object" || Array.isArray(raw)) {
    throw inputError(TypeError, what, path, `must hold a JSON object: found ${describe(raw)}`);
  }
  const c = raw as Record<string, unknown>;
  if (c.hotfield_case === undefined) {
    throw inputError(
      TypeError,
      what,
      path,
      `not a hotfield case file: no "hotfield_case": 1 member`,
    );
  }
  if (c.hotfield_case !== CASE_FILE_VERSION) {
    throw inputError(
      RangeError,
      what,
      path,
      `"hotfield_case" ${
        describe(c.hotfield_case)
      } is not a version this hotfield reads (${CASE_FILE_VERSION})`,
    );
  }
  for (const k of Object.keys(c)) {
    if (!CASE_KEYS.includes(k)) {
      throw inputError(
        TypeError,
        what,
        path,
        `unknown member ${JSON.stringify(k)}; known members: ${CASE_KEYS.join(", ")}`,
      );
    }
  }
  const dir = dirname(path);
  const resolve = (p: string) => (isAbsolute(p) ? p : join(dir, p));
  const needPath = (v: unknown, name: string): string => {
    if (typeof v !== "string" || v.trim() === "") {
      throw inputError(
        TypeError,
        what,
        path,
        `"${name}" must be a file path (a non-empty string): found ${describe(v)}`,
      );
    }
    return resolve(v);
  };
  const input: CaseInput = { caseFilePath: path };
  if (c.id !== undefined) {
    if (typeof c.id !== "string") {
      throw inputError(TypeError, what, path, `"id" must be a string: found ${describe(c.id)}`);
    }
    input.caseFileId = c.id;
  }
  if (c.annotations !== undefined) input.annotationsPath = needPath(c.annotations, "annotations");
  if (c.figures !== undefined) {
    if (typeof c.figures === "string") {
      input.figuresPath = needPath(c.figures, "figures");
      input.figureUnits = "px";
    } else if (c.figures !== null && typeof c.figures === "object" && !Array.isArray(c.figures)) {
      const f = c.figures as Record<string, unknown>;
      for (const k of Object.keys(f)) {
        if (k !== "path" && k !== "units") {
          throw inputError(
            TypeError,
            what,
            path,
            `unknown member ${JSON.stringify(`figures.${k}`)}; known: path, units`,
          );
        }
      }
      input.figuresPath = needPath(f.path, "figures.path");
      if (f.units !== undefined) input.figureUnitsStated = true;
      const units = f.units ?? "px";
      if (units !== "px" && units !== "um") {
        throw inputError(
          TypeError,
          what,
          path,
          `"figures.units" must be "px" or "um": found ${describe(units)}`,
        );
      }
      input.figureUnits = units;
    } else {
      throw inputError(
        TypeError,
        what,
        path,
        `"figures" must be a path or {"path": ..., "units": "px" | "um"}: found ${
          describe(c.figures)
        }`,
      );
    }
  }
  if (c.tissue_mask !== undefined) {
    const m = c.tissue_mask;
    if (m === null || typeof m !== "object" || Array.isArray(m)) {
      throw inputError(
        TypeError,
        what,
        path,
        `"tissue_mask" must be {"path": "mask.png", "mpp": micrometres per mask pixel}: found ${
          describe(m)
        }`,
      );
    }
    const mm = m as Record<string, unknown>;
    for (const k of Object.keys(mm)) {
      if (k !== "path" && k !== "mpp") {
        throw inputError(
          TypeError,
          what,
          path,
          `unknown member ${JSON.stringify(`tissue_mask.${k}`)}; known: path, mpp`,
        );
      }
    }
    input.tissueMaskPath = needPath(mm.path, "tissue_mask.path");
    if (mm.mpp === undefined) {
      throw inputError(
        TypeError,
        what,
        path,
        `"tissue_mask.mpp" is missing; give the mask's micrometres per mask pixel, e.g. "tissue_mask": {"path": "mask.png", "mpp": 8}`,
      );
    }
    input.maskMpp = checkMaskMpp(
      mm.mpp,
      (detail) => inputError(TypeError, what, path, `"tissue_mask.mpp" ${detail}`),
    );
  }
  if (c.slide !== undefined) {
    if (c.slide === null || typeof c.slide !== "object" || Array.isArray(c.slide)) {
      throw inputError(
        TypeError,
        what,
        path,
        `"slide" must be an object like the GeoJSON slide member: found ${describe(c.slide)}`,
      );
    }
    input.slide = c.slide as SlideMember;
  }
  if (c.slide_file !== undefined) input.slidePath = needPath(c.slide_file, "slide_file");
  const settings = parseSettings(c, (detail) => inputError(TypeError, what, path, detail));
  if (Object.keys(settings).length > 0) input.settings = settings;
  if (
    input.annotationsPath === undefined && input.slide === undefined &&
    input.slidePath === undefined
  ) {
    throw inputError(
      TypeError,
      what,
      path,
      `names no "annotations" file, no "slide" and no "slide_file"; give at least an annotation GeoJSON, a "slide_file", or a "slide" with its mpp plus a tissue mask`,
    );
  }
  return input;
}

/** Reads the report settings members of a case file; `fail(detail)` builds the error. */
function parseSettings(c: Record<string, unknown>, fail: (detail: string) => Error): CaseSettings {
  const out: CaseSettings = {};
  const num = (key: string, ok: (v: number) => boolean, range: string): number | undefined => {
    const v = c[key];
    if (v === undefined) return undefined;
    if (typeof v !== "number" || !Number.isFinite(v) || !ok(v)) {
      throw fail(`"${key}" must be a number ${range}: found ${describe(v)}`);
    }
    return v;
  };
  if (c.scheme !== undefined) {
    if (typeof c.scheme !== "string" || c.scheme.trim() === "") {
      throw fail(
        `"scheme" must be a scheme id (see hotfield schemes): found ${describe(c.scheme)}`,
      );
    }
    out.scheme = c.scheme.trim();
  }
  const minScore = num("min_score", (v) => v >= 0 && v <= 1, "in [0, 1]");
  if (minScore !== undefined) out.minScore = minScore;
  if (c.count_labels !== undefined) {
    const v = c.count_labels;
    if (
      !Array.isArray(v) || v.length === 0 ||
      v.some((l) => typeof l !== "string" || l.trim() === "")
    ) {
      throw fail(`"count_labels" must be a list of non-empty labels: found ${describe(v)}`);
    }
    out.countLabels = [...new Set(v.map((l: string) => l.trim()))];
  }
  const area = num("area_mm2", (v) => v > 0, "> 0 (mm²)");
  if (area !== undefined) out.areaMm2 = area;
  if (c.shape !== undefined) {
    if (c.shape !== "rect" && c.shape !== "circle") {
      throw fail(`"shape" must be "rect" or "circle": found ${describe(c.shape)}`);
    }
    out.shape = c.shape;
  }
  const stride = num("stride_um", (v) => v > 0, "> 0 (µm)");
  if (stride !== undefined) out.strideUm = stride;
  const cover = num("min_coverage", (v) => v > 0 && v <= 1, "in (0, 1]");
  if (cover !== undefined) out.minCoverage = cover;
  return out;
}

/**
 * Checks a mask mpp (one number or `[x, y]`, each positive and finite).
 * `fail(detail)` builds the error to throw.
 */
function checkMaskMpp(
  v: unknown,
  fail: (detail: string) => Error,
): number | [number, number] {
  const ok = (x: unknown) => typeof x === "number" && Number.isFinite(x) && x > 0;
  if (ok(v)) return v as number;
  if (Array.isArray(v) && v.length === 2 && v.every(ok)) return [v[0], v[1]];
  throw fail(
    `must be a positive number of micrometres per mask pixel, or a pair [x, y]: found ${
      describe(v)
    }`,
  );
}

/**
 * Reads every file of a case, checks it, and gathers it into
 * {@linkcode CaseData} with the sha256 of each file in `sources`.
 *
 * See the module documentation for how the inputs combine. Mask polygons are
 * scaled into level-0 pixels by mask mpp ÷ slide mpp along each axis.
 *
 * @param input The files and settings.
 * @returns The case, all checks done, with its warnings.
 * @throws {Error} When a file is missing or unreadable (message names it).
 * @throws {SyntaxError | TypeError | RangeError} For bad content (see the readers).
 *
 * @example Loading the test fixture's case (GeoJSON, figures CSV and mask)
 * ```ts
 * import { loadCase, readCaseFile } from "hotfield";
 * import { fileURLToPath } from "node:url";
 * const path = fileURLToPath(
 *   new URL("../../test/fixtures/annotations/QVT-24-011.case.json", import.meta.url),
 * );
 * const c = await loadCase(await readCaseFile(path));
 * if (c.caseId !== "QVT-24-011" || c.figures.xPx.length !== 4 || c.sources.length !== 4) {
 *   throw new Error(`case ${c.caseId}: ${c.figures.xPx.length} figures from ${c.sources.length} files`);
 * }
 * if (c.sources.some((s) => s.sha256.length !== 64)) throw new Error("hex sha256 of each file");
 * ```
 */
export async function loadCase(input: CaseInput): Promise<CaseData> {
  const warnings: string[] = [];
  const countProblems: string[] = [];
  const sources: CaseSource[] = [];
  const record = (kind: CaseSource["kind"], path: string, bytes: Uint8Array) =>
    sources.push({ kind, path, sha256: createHash("sha256").update(bytes).digest("hex") });
  const base = input.baseDir;
  const at = (path: string) => base !== undefined && !isAbsolute(path) ? join(base, path) : path;
  const read = (path: string, what: string) => readBytes(path, what, at(path));

  if (input.caseFilePath !== undefined) {
    record("case", input.caseFilePath, await read(input.caseFilePath, "case file"));
  }
  let slideOverride = input.slide;
  let slideLabels: Partial<Record<keyof SlideMember, string>> | undefined;
  if (input.mpp !== undefined) {
    // One wording whoever gave it, so a manifest row and the option give the same report.
    const from = "The mpp given for the case";
    const old = input.slide?.mpp;
    if (old !== undefined && JSON.stringify(old) !== JSON.stringify(input.mpp)) {
      warnings.push(
        `${from} sets slide mpp ${JSON.stringify(input.mpp)}, replacing ${
          JSON.stringify(old)
        } from the case file`,
      );
    }
    slideOverride = { ...input.slide, mpp: input.mpp };
    slideLabels = { mpp: from };
  }

  let slide: SlideInfo;
  let tissue: RegionPart[] = [];
  let tumour: RegionPart[] = [];
  let exclude: RegionPart[] = [];
  let figures = emptyFigureSet();
  let fields: CaseData["fields"] = [];
  let tissueSource: CaseData["tissueSource"];
  const mainFile = input.annotationsPath ?? input.caseFilePath ?? input.slidePath;

  // a slide file says its own mpp and size, which the annotations must agree with
  let slideImage: SlideImage | undefined;
  let slideFacts: SlideFileFacts | undefined;
  if (input.slidePath !== undefined && slideFileKind(at(input.slidePath)) === "slide") {
    const path = at(input.slidePath);
    slideImage = await readSlideImage(path);
    const s = slideImage.slide;
    slideFacts = {
      member: { id: s.id, mpp: [s.mppX, s.mppY], width: s.widthPx, height: s.heightPx },
      path,
      mppFrom: slideImage.mppFrom,
    };
    sources.push({ kind: "slide", path, sha256: sha256File(path) });
    warnings.push(...slideImage.warnings);
  }

  if (input.annotationsPath !== undefined) {
    const path = input.annotationsPath;
    const bytes = await read(path, "annotations");
    record("annotations", path, bytes);
    // The byte scanner reads the usual files; anything it is unsure of goes
    // through the ordinary reader, which gives the same result and messages.
    const parsed = readAnnotationsBytes(bytes, {
      fileName: path,
      slide: slideOverride,
      slideLabels,
      slideFile: slideFacts,
    });
    ({ slide, tissue, tumour, exclude, figures, fields } = parsed);
    warnings.push(...parsed.warnings);
  } else if (slideOverride !== undefined) {
    const fileName = input.caseFilePath ?? "(options)";
    slide = parseSlideInfo(
      slideFacts === undefined
        ? slideOverride
        : withSlideFileFacts(slideOverride, slideFacts, "case file", fileName),
      { what: "case file", fileName },
    );
  } else if (slideFacts !== undefined) {
    slide = parseSlideInfo(slideFacts.member, { what: "slide", fileName: slideFacts.path });
  } else {
    throw new TypeError("Cannot read case: no annotation file and no slide information given");
  }

  if (input.slidePath !== undefined && slideImage === undefined) {
    // a thumbnail: placed by the slide's level-0 size and mpp from the annotations
    const path = at(input.slidePath);
    if (slide.widthPx === undefined || slide.heightPx === undefined) {
      throw inputError(
        TypeError,
        "slide",
        path,
        `it is a thumbnail image, and the slide's level-0 width and height are not known to place it; give them in the "slide" member, or make a tissue outline first with hotfield tissue ${path} --mpp N --slide-mpp N`,
      );
    }
    slideImage = await readSlideImage(path, { slide });
    sources.push({ kind: "slide", path, sha256: sha256File(path) });
    warnings.push(...slideImage.warnings);
  }

  // found on the slide when no outline or mask gives the tissue; before the
  // figures, so their unit check sees the tissue too
  if (slideImage !== undefined && tissue.length === 0 && input.tissueMaskPath === undefined) {
    const detection = detectSlideTissue(slideImage);
    warnings.push(...detection.warnings);
    if (detection.polygons.length === 0) {
      throw inputError(
        TypeError,
        "slide",
        slideImage.path,
        "no tissue was found on it and no tissue outline was given, so there is nothing to count; give a tissue outline or mask",
      );
    }
    tissue = [{ polygons: detection.polygons, source: `${slideImage.path} (detected tissue)` }];
    tissueSource = { slide: slideImage.path, method: detection.method };
  }

  if (input.figuresPath !== undefined) {
    const path = input.figuresPath;
    const bytes = await read(path, "figures CSV");
    record("figures", path, bytes);
    const csv = readFiguresCsvBytes(bytes, {
      fileName: path,
      units: input.figureUnits ?? "px",
      mppX: slide.mppX,
      mppY: slide.mppY,
    });
    warnings.push(...csv.warnings);
    if (figures.xPx.length > 0) {
      warnings.push(
        `Figures are read from ${path} (${csv.figures.xPx.length} points); the ${figures.xPx.length} figure points in ${input.annotationsPath} are ignored`,
      );
    }
    figures = csv.figures;
    warnings.push(...figurePositionWarnings(figures, slide, path, "line"));
    const unitDoubt = figureUnitDoubt(figures, slide, [...tissue, ...tumour], {
      path,
      units: input.figureUnits ?? "px",
      stated: input.figureUnitsStated === true,
    });
    if (unitDoubt !== null) {
      warnings.push(unitDoubt.message);
      if (unitDoubt.blocking) countProblems.push(unitDoubt.message);
    }
  }

  if (input.tissueMaskPath !== undefined) {
    const path = input.tissueMaskPath;
    if (input.maskMpp === undefined) {
      throw inputError(
        TypeError,
        "tissue mask",
        path,
        'its micrometres per mask pixel are not given (--mask-mpp, or "mpp" in the case file\'s tissue_mask)',
      );
    }
    const maskMpp = checkMaskMpp(
      input.maskMpp,
      (detail) => inputError(RangeError, "tissue mask", path, `mask mpp ${detail}`),
    );
    const [maskMppX, maskMppY] = typeof maskMpp === "number" ? [maskMpp, maskMpp] : maskMpp;
    const bytes = await read(path, "tissue mask");
    record("tissue-mask", path, bytes);
    // sized from its header before it is decoded (see "Input limits" in the README)
    const header = await checkPngBounds(bytes, {
      what: "tissue mask",
      fileName: path,
      maxPixels: MAX_IMAGE_PIXELS,
    });
    if (header !== null) checkMaskExtent(header, [maskMppX, maskMppY], path);
    // throws when the size disagrees; returns warnings for unknown sizes or small mismatches
    const sizeWarnings = header !== null
      ? checkMaskSize(header, [maskMppX, maskMppY], slide, path)
      : undefined;
    const mask = decodeMaskPng(bytes, { fileName: path });
    warnings.push(...(sizeWarnings ?? checkMaskSize(mask, [maskMppX, maskMppY], slide, path)));
    if (maskMppX < slide.mppX || maskMppY < slide.mppY) {
      warnings.push(
        `${path}: mask mpp ${maskMppX}, ${maskMppY} is finer than the slide's ${slide.mppX}, ${slide.mppY} µm/px; masks are usually coarser`,
      );
    }
    // One mask pixel, in µm, as slide pixels along x and y.
    const [scaleX, scaleY] = umToPx([maskMppX, maskMppY], slide);
    let polygons;
    try {
      // the mask's share of the limit: what the annotation outlines left of it
      let used = 0;
      for (const part of [...tissue, ...tumour, ...exclude]) {
        for (const p of part.polygons) for (const r of p) used += r.length;
      }
      polygons = maskToPolygons(mask, {
        scaleX,
        scaleY,
        maxVertices: Math.max(0, MAX_REGION_VERTICES - used),
      });
    } catch (e) {
      if (!(e instanceof MaskOutlineTooLargeError)) throw e;
      throw inputError(
        RangeError,
        "tissue mask",
        path,
        `its outline traces into more vertices than the limit of ${
          MAX_REGION_VERTICES.toLocaleString("en-US")
        } outline positions per case allows (a noisy mask? smooth it, or give a coarser one; see "Input limits" in the README)`,
        e,
      );
    }
    if (polygons.length === 0) {
      warnings.push(`${path}: the mask has no tissue pixels (all zero)`);
    } else {
      if (tissue.length > 0) {
        warnings.push(
          `Tissue is the union of ${path} and the ${tissue.length} tissue polygon feature(s) of ${input.annotationsPath}`,
        );
      }
      tissue = [...tissue, { polygons, source: path }];
    }
  }

  if (tissue.length === 0 && tumour.length === 0) {
    const what = input.annotationsPath !== undefined ? "annotations" : "case file";
    throw inputError(
      TypeError,
      what,
      mainFile ?? "(options)",
      `no tissue or tumour polygons: at least one feature with role "tissue" or "tumour" (or a tissue mask) is needed to define where figures are counted`,
    );
  }

  const slideId = slide.id !== "" ? slide.id : undefined;
  const named: [string, string | undefined][] = [
    ["--id", input.idOverride],
    ["the case file's id", input.caseFileId],
    ["the slide id", slideId],
  ];
  const chosen = named.find(([, v]) => v !== undefined && v.trim() !== "");
  const rawId = chosen?.[1] ?? fileStem(mainFile ?? "case");
  for (const [source, value] of named) {
    if (chosen && source !== chosen[0] && value !== undefined && value !== rawId) {
      warnings.push(`Case id "${rawId}" (from ${chosen[0]}) replaces "${value}" (${source})`);
    }
  }
  const caseId = safeCaseId(rawId);
  if (caseId !== rawId.trim() && rawId.trim() !== "") {
    warnings.push(
      isReservedCaseId(rawId.trim())
        ? `Case id "${rawId}" is written "${caseId}": hotfield writes a file or folder named "${rawId.trim()}" of its own beside the case folders`
        : `Case id "${rawId}" is written "${caseId}" so that it is safe as a folder name`,
    );
  }
  if (figures.xPx.length === 0) {
    warnings.push(
      "The case has no figure points: a count of 0 is only as good as the annotations' completeness",
    );
  }
  const out: CaseData = {
    caseId,
    slide,
    tissue,
    tumour,
    exclude,
    figures,
    fields,
    sources,
    warnings,
  };
  if (countProblems.length > 0) out.countProblems = countProblems;
  if (input.settings !== undefined) out.settings = { ...input.settings };
  if (tissueSource !== undefined) out.tissueSource = tissueSource;
  return out;
}

/** Share of points inside a box grown by 5% on each side, and the points' extent. */
function fitToBox(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  box: [number, number, number, number],
  scaleX: number,
  scaleY: number,
): { share: number; width: number; height: number } {
  const gx = (box[2] - box[0]) * 0.05, gy = (box[3] - box[1]) * 0.05;
  let n = 0, x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  for (let k = 0; k < xs.length; k++) {
    const x = xs[k] * scaleX, y = ys[k] * scaleY;
    if (x >= box[0] - gx && x <= box[2] + gx && y >= box[1] - gy && y <= box[3] + gy) n++;
    x0 = Math.min(x0, x), x1 = Math.max(x1, x), y0 = Math.min(y0, y), y1 = Math.max(y1, y);
  }
  return { share: xs.length === 0 ? 1 : n / xs.length, width: x1 - x0, height: y1 - y0 };
}

/**
 * A figures CSV whose points fit the slide's regions (or its size) only when
 * read in the other unit: the message, and whether it voids the count (the
 * unit was a default, not stated).
 *
 * Read the other way, the points fit the regions' bounding box (90% inside)
 * while as read either most fall outside it, or (µm taken as px, at fine
 * mpp) they huddle in a corner: less than 70% of the box's width and height,
 * where the other reading spreads them over at least half of it.
 */
function figureUnitDoubt(
  figures: FigureSet,
  slide: SlideInfo,
  regions: RegionPart[],
  csv: { path: string; units: "px" | "um"; stated: boolean },
): { message: string; blocking: boolean } | null {
  if (figures.xPx.length < 5) return null;
  let box = regionBBox(regions.flatMap((part) => part.polygons));
  if (box === null && slide.widthPx !== undefined && slide.heightPx !== undefined) {
    box = [0, 0, slide.widthPx, slide.heightPx];
  }
  if (box === null) return null;
  // As read, points are level-0 px. Read the other way: values in µm that were
  // taken as px are px·mpp too small; values in px taken as µm are too large.
  // The scale of one unit read the other way: 1 µm in px, or 1 px in µm.
  const [sx, sy] = csv.units === "px" ? umToPx([1, 1], slide) : pxToUm([1, 1], slide);
  const asRead = fitToBox(figures.xPx, figures.yPx, box, 1, 1);
  const other = fitToBox(figures.xPx, figures.yPx, box, sx, sy);
  const bw = box[2] - box[0], bh = box[3] - box[1];
  const huddled = csv.units === "px" && slide.mppX <= 0.7 && slide.mppY <= 0.7 &&
    asRead.width < 0.7 * bw && asRead.height < 0.7 * bh &&
    (other.width >= 0.5 * bw || other.height >= 0.5 * bh);
  if (!(other.share >= 0.9 && (asRead.share < 0.5 || huddled))) return null;
  const pct = (v: number) => `${Math.round(v * 100)}%`;
  const [stated, alt, option] = csv.units === "px"
    ? ["pixels", "micrometres", '--units um, or "units": "um" in the case file']
    : ["micrometres", "pixels", '--units px, or "units": "px" in the case file'];
  const how = asRead.share < 0.5
    ? `only ${pct(asRead.share)} of its ${figures.xPx.length} points fall within the slide's ` +
      `regions when x and y are read as ${stated}, but ${pct(other.share)} do when read as ${alt}`
    : `read as ${stated}, its ${figures.xPx.length} points crowd into a corner of the slide's ` +
      `regions (${pct(Math.max(asRead.width / bw, asRead.height / bh))} of their extent); read ` +
      `as ${alt} they spread over them`;
  const message =
    `Figures CSV "${csv.path}": ${how}: the coordinates look like ${alt} (${option})` +
    (csv.stated ? "; the unit was stated, so the points are counted as given" : "");
  return { message, blocking: !csv.stated };
}

/** The file name without folders and without `.case.json`, `.geojson` or `.json` (or another extension). */
function fileStem(path: string): string {
  const base = basename(path);
  const m = /^(.*?)(\.case\.json|\.geojson|\.json|\.[^.]*)$/i.exec(base);
  return m && m[1] !== "" ? m[1] : base;
}

/** The size limit of each kind of input file, bytes. */
const INPUT_LIMITS: Record<string, number> = {
  "case file": MAX_CASE_FILE_BYTES,
  annotations: MAX_TEXT_INPUT_BYTES,
  "figures CSV": MAX_TEXT_INPUT_BYTES,
  "tissue mask": MAX_MASK_FILE_BYTES,
};

/**
 * Reads an input file named `path` in messages, found at `at`: regular files
 * only, within the size limit of its kind.
 */
function readBytes(path: string, what: string, at = path): Promise<Uint8Array> {
  return readInputFile(path, {
    what,
    maxBytes: INPUT_LIMITS[what] ?? MAX_TEXT_INPUT_BYTES,
    openPath: at,
  });
}
/** Refuses a mask whose extent in micrometres no slide could have. */
function checkMaskExtent(
  size: { width: number; height: number },
  [mppX, mppY]: [number, number],
  path: string,
): void {
  const wMm = size.width * mppX / 1000, hMm = size.height * mppY / 1000;
  if (wMm > MAX_SLIDE_EXTENT_MM || hMm > MAX_SLIDE_EXTENT_MM) {
    throw inputError(
      RangeError,
      "tissue mask",
      path,
      `the mask covers ${Math.round(wMm)} × ${
        Math.round(hMm)
      } mm at ${mppX} × ${mppY} µm per mask pixel, more than any slide (${MAX_SLIDE_EXTENT_MM} mm); check the mask mpp`,
    );
  }
}
