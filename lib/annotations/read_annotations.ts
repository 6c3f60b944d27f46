/**
 * Reading a case's annotation file: a GeoJSON FeatureCollection (RFC 7946) in
 * level-0 slide pixels (x right, y down) with a `slide` foreign member and a
 * `properties.role` on every feature.
 *
 * | role      | geometry                | properties                                             |
 * | --------- | ----------------------- | ------------------------------------------------------ |
 * | `tissue`  | Polygon, MultiPolygon   |                                                        |
 * | `tumour`  | Polygon, MultiPolygon   |                                                        |
 * | `exclude` | Polygon, MultiPolygon   | `reason` (e.g. `"necrosis"`)                           |
 * | `figure`  | Point, MultiPoint       | `label` (default `"mitotic figure"`), `score` in [0, 1] |
 * | `field`   | Point, Polygon, MultiPolygon, MultiPoint | `reader` (required), `date`, `field_diameter_mm` |
 *
 * Feature numbers in messages are 0-based indices into `features`.
 *
 * @module
 */

import { inputError } from "../errors.ts";
import type {
  FieldSpec,
  FigureSet,
  MultiPolygonPx,
  PolygonPx,
  RegionPart,
  Ring,
  SlideInfo,
  Vec2,
} from "../types.ts";
import { describe } from "./_describe.ts";
import { DEFAULT_FIGURE_LABEL, figureLabelText, FigureSetBuilder } from "./_figure_builder.ts";
import { figurePositionWarnings } from "./_figure_checks.ts";
import { locateJsonProblem } from "./_json_location.ts";
import { checkFeatureOutline } from "./_outline_check.ts";
import { checkFigureCount, checkFigureMagnitudes, checkOutlinePositions } from "./_plausibility.ts";
import { containerLimitDetail, duplicateKeyDetail, scanJsonText } from "./_json_keys.ts";
import { MAX_JSON_CONTAINERS } from "../defaults.ts";
import { polygonAreaPx2, polygonCentroidPx } from "../geometry/planar_area.ts";
import { mergeSlideMembers, parseSlideInfo, type SlideMember } from "./slide_info.ts";
import { withSlideFileFacts } from "./_slide_facts.ts";
import type { SlideFileFacts } from "./read_slide_file.ts";

/** The roles a feature may have, in the order of the table above. */
export const ANNOTATION_ROLES = ["tissue", "tumour", "exclude", "figure", "field"] as const;

/** One of {@linkcode ANNOTATION_ROLES}. */
export type AnnotationRole = typeof ANNOTATION_ROLES[number];

/** What {@linkcode parseAnnotations} read. */
export interface ParsedAnnotations {
  /** The `slide` member (merged with `options.slide`). */
  slide: SlideInfo;
  /** One part per `tissue` feature. */
  tissue: RegionPart[];
  /** One part per `tumour` feature. */
  tumour: RegionPart[];
  /** One part per `exclude` feature, with its `reason`. */
  exclude: RegionPart[];
  /** Every figure point (a MultiPoint gives one entry per position). */
  figures: FigureSet;
  /** Readers' counting areas. */
  fields: FieldSpec[];
  /** Readable oddities (never printed by the library). */
  warnings: string[];
}

/** Options of {@linkcode parseAnnotations}. */
export interface ParseAnnotationsOptions {
  /** The file's path as the user gave it, for messages. */
  fileName: string;
  /**
   * Slide fields from elsewhere (a case file); they replace the file's own
   * values field by field, with a warning for each value that changes.
   * @default undefined
   */
  slide?: SlideMember;
  /**
   * Who sets each field of `slide`, for the warnings.
   * @default "The case file" for every field
   */
  slideLabels?: Partial<Record<keyof SlideMember, string>>;
  /**
   * A slide file's own facts: they fill the slide member's missing fields,
   * and a value that disagrees with them is an error naming both.
   * @default undefined
   */
  slideFile?: SlideFileFacts;
}

const WHAT = "annotations";

/**
 * Parses and checks an annotation FeatureCollection.
 *
 * Checks follow RFC 7946: the root is a FeatureCollection (§3.3) of Features
 * (§3.2); a position is an array of at least two finite numbers (§3.1.1, any
 * further elements such as altitude are ignored); a polygon ring has at least
 * four positions and its first and last positions are equal (§3.1.6). Either
 * ring winding is accepted; rings are kept as given (normalizing them is the
 * valid region's job). A UTF-8 byte order mark is ignored. The JSON must name
 * each member of an object once (RFC 8259 §4 recommends it; a repeated name
 * would silently replace a value).
 *
 * @param text The file's text.
 * @param options The file name for messages, and optional slide fields.
 * @returns Slide, region parts, figures, fields and warnings.
 * @throws {SyntaxError} When the text is empty or not JSON, or an object
 *   names a member twice (with line and column).
 * @throws {TypeError} When the shape is wrong (not a FeatureCollection, no
 *   features, unknown role, wrong geometry for a role, bad positions or rings).
 * @throws {RangeError} When mpp, a size or a score is out of range, or the
 *   text holds more JSON objects and arrays than `MAX_JSON_CONTAINERS`.
 *
 * @example Reading a tissue square and two figures
 * ```ts
 * import { parseAnnotations } from "hotfield";
 * const text = JSON.stringify({
 *   type: "FeatureCollection",
 *   slide: { id: "QVT-24-001", mpp: 0.25 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon",
 *       coordinates: [[[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure", score: 0.9 }, geometry: { type: "MultiPoint",
 *       coordinates: [[10, 10], [20, 20]] } },
 *   ],
 * });
 * const a = parseAnnotations(text, { fileName: "QVT-24-001.geojson" });
 * if (a.tissue.length !== 1 || a.figures.xPx.length !== 2) {
 *   throw new Error(`${a.tissue.length} tissue parts, ${a.figures.xPx.length} figures; expected 1 and 2`);
 * }
 * const label = a.figures.labels[0];
 * if (label !== "mitotic figure") throw new Error(`a figure without a label is "${label}"`);
 * ```
 */
export function parseAnnotations(
  text: string,
  options: ParseAnnotationsOptions,
): ParsedAnnotations {
  const file = options.fileName;
  const fail = (
    Cls: typeof TypeError | typeof RangeError | typeof SyntaxError,
    detail: string,
    cause?: unknown,
  ) => inputError(Cls, WHAT, file, detail, cause);
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.trim() === "") {
    throw fail(
      SyntaxError,
      text.length === 0 ? "the file is empty (0 bytes)" : "the file holds only white space",
    );
  }
  // One pass before parsing: too many objects and arrays, and repeated names.
  const scan = scanJsonText(text, MAX_JSON_CONTAINERS);
  if (scan.overLimitAt >= 0) {
    throw fail(RangeError, containerLimitDetail(text, scan, MAX_JSON_CONTAINERS));
  }
  let root: unknown;
  try {
    root = JSON.parse(text);
  } catch (e) {
    const where = locateJsonProblem(text);
    throw fail(
      SyntaxError,
      where
        ? `not valid JSON: line ${where.line}, column ${where.column}: ${where.problem}${
          csvHint(file, text)
        }`
        : `not valid JSON: ${(e as Error).message}`,
      e,
    );
  }
  if (scan.duplicate) throw fail(SyntaxError, duplicateKeyDetail(text, scan.duplicate));
  const reader = new AnnotationCollector(root, options);
  const features = (root as { features: unknown[] }).features;
  for (let i = 0; i < features.length; i++) reader.feature(features[i], i);
  return reader.finish();
}

/**
 * The checks and the collecting of {@linkcode parseAnnotations}, one feature
 * at a time, so that the byte scanner (`_scan_annotations.ts`) can hand it
 * the features it does not read itself.
 *
 * Order of checks, as the messages depend on it: the root (a
 * FeatureCollection with a non-empty `features` array; only `Array.isArray`
 * and `length` are asked of it here), the slide, then each feature in
 * order. `finish()` adds the warnings about the whole file.
 *
 * @example Two features, fed one at a time
 * ```ts
 * import { AnnotationCollector } from "./read_annotations.ts";
 * const root = { type: "FeatureCollection", slide: { mpp: 0.5 }, features: new Array(2) };
 * const c = new AnnotationCollector(root, { fileName: "a.geojson" });
 * c.feature({ type: "Feature", properties: { role: "tissue" }, geometry: {
 *   type: "Polygon", coordinates: [[[0, 0], [9, 0], [9, 9], [0, 0]]] } }, 0);
 * c.feature({ type: "Feature", properties: { role: "figure" }, geometry: {
 *   type: "Point", coordinates: [1, 2] } }, 1);
 * const a = c.finish();
 * if (a.tissue.length !== 1 || a.figures.xPx[0] !== 1) throw new Error("collected");
 * ```
 */
export class AnnotationCollector {
  /** The slide, read and checked. */
  readonly slide: SlideInfo;
  readonly #file: string;
  readonly #fail: Fail;
  readonly #warnings: string[] = [];
  readonly #tissue: RegionPart[] = [];
  readonly #tumour: RegionPart[] = [];
  readonly #exclude: RegionPart[] = [];
  readonly #fields: FieldSpec[] = [];
  readonly #figures = new FigureSetBuilder();
  readonly #emptyGeometries: number[] = [];
  readonly #beyondSlide: number[] = [];
  /** Per figure feature read here: feature index and its points' range in the builder. */
  readonly #figureFeatures: [number, number, number][] = [];
  /** Positions of all outlines so far, against MAX_REGION_VERTICES. */
  readonly #budget = { vertices: 0 };

  /**
   * Checks the root and reads the slide.
   *
   * @param root The parsed root value.
   * @param options File name and slide fields, as {@linkcode parseAnnotations} takes.
   * @throws {TypeError | RangeError} As {@linkcode parseAnnotations}.
   */
  constructor(root: unknown, options: ParseAnnotationsOptions) {
    const file = options.fileName;
    this.#file = file;
    const fail = (
      Cls: typeof TypeError | typeof RangeError | typeof SyntaxError,
      detail: string,
      cause?: unknown,
    ) => inputError(Cls, WHAT, file, detail, cause);
    this.#fail = fail;
    if (root === null || typeof root !== "object" || Array.isArray(root)) {
      throw fail(
        TypeError,
        `not a GeoJSON FeatureCollection (RFC 7946 §3.3): the file holds ${describe(root)}`,
      );
    }
    const fc = root as Record<string, unknown>;
    if (fc.type !== "FeatureCollection") {
      throw fail(
        TypeError,
        `not a GeoJSON FeatureCollection (RFC 7946 §3.3): found "type" ${describe(fc.type)}${
          fc.type === "Feature" || typeof fc.coordinates === "object"
            ? '; wrap the feature(s) in {"type": "FeatureCollection", "features": [...]}'
            : ""
        }`,
      );
    }
    if (!Array.isArray(fc.features)) {
      throw fail(
        TypeError,
        `the FeatureCollection has no "features" array (RFC 7946 §3.3): found ${
          describe(fc.features)
        }`,
      );
    }
    const features = fc.features as unknown[];
    if (features.length === 0) {
      throw fail(
        TypeError,
        "the FeatureCollection is empty: it has no features (need tissue or tumour polygons at least)",
      );
    }
    const warnings = this.#warnings;
    const nested = (fc.properties as Record<string, unknown> | null | undefined)?.slide;
    if (fc.slide === undefined && nested !== undefined && options.slide?.mpp === undefined) {
      throw fail(
        TypeError,
        'the "slide" member is inside the collection\'s "properties"; hotfield reads it at the top level, beside "type" and "features"',
      );
    }
    const merged = mergeSlideMembers(fc.slide, options.slide, options.slideLabels);
    warnings.push(...merged.warnings);
    const member = options.slideFile === undefined
      ? merged.member
      : withSlideFileFacts(merged.member, options.slideFile, WHAT, file);
    this.slide = parseSlideInfo(member, { what: WHAT, fileName: file });
  }

  /**
   * Checks and collects feature i.
   *
   * @throws {TypeError | RangeError} As {@linkcode parseAnnotations}.
   */
  feature(f: unknown, i: number): void {
    const file = this.#file, fail = this.#fail, slide = this.slide, warnings = this.#warnings;
    const tissue = this.#tissue, tumour = this.#tumour, exclude = this.#exclude;
    const fields = this.#fields, figures = this.#figures;
    const emptyGeometries = this.#emptyGeometries, beyondSlide = this.#beyondSlide;
    const budget = this.#budget;
    const at = `feature ${i}`;
    if (f === null || typeof f !== "object" || Array.isArray(f)) {
      throw fail(
        TypeError,
        `${at} is not a GeoJSON Feature object (RFC 7946 §3.2): found ${describe(f)}`,
      );
    }
    const feat = f as Record<string, unknown>;
    if (feat.type !== "Feature") {
      throw fail(
        TypeError,
        `${at} is not a GeoJSON Feature (RFC 7946 §3.2): found "type" ${describe(feat.type)}`,
      );
    }
    const props = feat.properties;
    if (
      props !== undefined && props !== null && (typeof props !== "object" || Array.isArray(props))
    ) {
      throw fail(
        TypeError,
        `${at} has "properties" that are not an object: found ${describe(props)}`,
      );
    }
    const p = (props ?? {}) as Record<string, unknown>;
    const role = checkRole(p.role, at, fail);
    const geom = feat.geometry;
    if (geom === null || geom === undefined) {
      throw fail(TypeError, `${at} (role "${role}") has no geometry`);
    }
    if (typeof geom !== "object" || Array.isArray(geom)) {
      throw fail(
        TypeError,
        `${at} (role "${role}") has a "geometry" that is not an object: found ${describe(geom)}`,
      );
    }
    const g = geom as Record<string, unknown>;
    const type = g.type;
    if (typeof type !== "string" || !ALLOWED_GEOMETRIES[role].includes(type)) {
      throw fail(
        TypeError,
        `${at} has role "${role}" but geometry ${describe(type)}; role "${role}" takes ${
          ALLOWED_GEOMETRIES[role].join(" or ")
        }`,
      );
    }
    const c = g.coordinates;
    // Fast path for the common case, a figure Point of two finite numbers;
    // anything else goes through the reader, which names the problem.
    if (role === "figure" && type === "Point" && Array.isArray(c) && c.length >= 2) {
      const x = c[0], y = c[1];
      if (typeof x === "number" && typeof y === "number" && Number.isFinite(x + y)) {
        const label = figureLabel(p.label, at, fail), score = figureScore(p.score, at, fail);
        this.#figureFeatures.push([i, figures.length, figures.length + 1]);
        figures.add(x, y, label, score, i);
        return;
      }
    }
    const reader = new GeometryReader(at, fail);
    switch (role) {
      case "tissue":
      case "tumour":
      case "exclude": {
        const read = type === "Polygon" ? [reader.polygon(c, "")] : reader.multiPolygon(c);
        if (read.length === 0) {
          emptyGeometries.push(i);
          break;
        }
        const checked = checkFeatureOutline(read, {
          file,
          at,
          multi: type === "MultiPolygon",
          slide,
          budget,
        });
        if (checked.warning !== undefined) warnings.push(checked.warning);
        const polygons = checked.polygons;
        if (slide.widthPx !== undefined || slide.heightPx !== undefined) {
          if (polygons.some((poly) => poly[0].some((q) => isBeyond(q, slide)))) beyondSlide.push(i);
        }
        const part: RegionPart = { polygons, source: `${file} feature ${i}` };
        if (role === "exclude" && p.reason !== undefined && p.reason !== null) {
          if (typeof p.reason === "string") part.reason = p.reason;
          else {
            part.reason = JSON.stringify(p.reason);
            warnings.push(`${file} ${at}: "reason" is not a string; kept as ${part.reason}`);
          }
        }
        (role === "tissue" ? tissue : role === "tumour" ? tumour : exclude).push(part);
        break;
      }
      case "figure": {
        const label = figureLabel(p.label, at, fail);
        const score = figureScore(p.score, at, fail);
        const points = type === "Point" ? [reader.position(c, "")] : reader.positions(c);
        if (points.length === 0) emptyGeometries.push(i);
        this.#figureFeatures.push([i, figures.length, figures.length + points.length]);
        for (const [x, y] of points) figures.add(x, y, label, score, i);
        break;
      }
      case "field": {
        const spec = readField(p, type, c, reader, i, fail, { file, slide, warnings, budget });
        // points of a field: magnitude only (like figures, they may lie a little off the slide)
        checkOutlinePositions([[spec.pointsPx ?? [spec.centerPx]]], slide, file, at, false);
        fields.push(spec);
        break;
      }
    }
  }

  /**
   * The result, with the warnings about the whole file. With `scanned`, the
   * figure points a byte scanner read itself are merged in feature order
   * with those read here, and its empty geometries listed with these.
   */
  finish(scanned?: ScannedFigures): ParsedAnnotations {
    const file = this.#file, slide = this.slide, warnings = this.#warnings;
    const emptyGeometries = scanned
      ? [...this.#emptyGeometries, ...scanned.emptyGeometries].sort((a, b) => a - b)
      : this.#emptyGeometries;
    const beyondSlide = this.#beyondSlide;
    if (emptyGeometries.length > 0) {
      warnings.push(
        `${file}: ${emptyGeometries.length} feature(s) have an empty geometry and were ignored (features ${
          listSome(emptyGeometries)
        })`,
      );
    }
    if (beyondSlide.length > 0) {
      warnings.push(
        `${file}: ${beyondSlide.length} region feature(s) reach beyond the slide's ${
          slide.widthPx ?? "?"
        } × ${slide.heightPx ?? "?"} px (features ${listSome(beyondSlide)})`,
      );
    }
    const figureSet = scanned
      ? mergeFigures(scanned, this.#figures.build(), this.#figureFeatures)
      : this.#figures.build();
    checkFigureCount(figureSet.xPx.length, WHAT, file);
    checkFigureMagnitudes(figureSet, slide, WHAT, file, "feature");
    warnings.push(...figurePositionWarnings(figureSet, slide, file, "feature"));
    return {
      slide,
      tissue: this.#tissue,
      tumour: this.#tumour,
      exclude: this.#exclude,
      figures: figureSet,
      fields: this.#fields,
      warnings,
    };
  }
}

/** Figure points a byte scanner read itself (see {@linkcode AnnotationCollector.finish}). */
export interface ScannedFigures {
  /** The points, in feature order (`origin` is the feature index). */
  figures: FigureSet;
  /** Scanned figure features with an empty geometry. */
  emptyGeometries: number[];
}

/**
 * Merges scanned points with points read one feature at a time, in feature
 * order, and numbers the labels by first appearance (as one pass would).
 */
function mergeFigures(
  scanned: ScannedFigures,
  read: FigureSet,
  readFeatures: [number, number, number][],
): FigureSet {
  const a = scanned.figures;
  if (read.xPx.length === 0) return a;
  const out = new FigureSetBuilder();
  const from = (f: FigureSet, k: number) =>
    out.add(f.xPx[k], f.yPx[k], f.labels[f.labelIndex[k]], f.score[k], f.origin[k]);
  let k = 0;
  for (const [i, lo, hi] of readFeatures) {
    while (k < a.xPx.length && a.origin[k] < i) from(a, k++);
    for (let t = lo; t < hi; t++) from(read, t);
  }
  while (k < a.xPx.length) from(a, k++);
  return out.build();
}

type Fail = (
  Cls: typeof TypeError | typeof RangeError | typeof SyntaxError,
  detail: string,
) => Error;

function csvHint(file: string, text: string): string {
  const first = text.trimStart()[0];
  if (
    /\.(csv|tsv|txt)$/i.test(file) || (first !== "{" && first !== "[" && /^[^\n]*[,;\t]/.test(text))
  ) {
    return " (this looks like a CSV: figure points in a CSV go with --figures FILE.csv beside the annotation GeoJSON)";
  }
  return "";
}

function listSome(xs: number[]): string {
  return xs.slice(0, 5).join(", ") + (xs.length > 5 ? ", ..." : "");
}

function isBeyond([x, y]: Vec2, slide: SlideInfo): boolean {
  return x < 0 || y < 0 || (slide.widthPx !== undefined && x > slide.widthPx) ||
    (slide.heightPx !== undefined && y > slide.heightPx);
}

/** Geometry types each role takes. */
const ALLOWED_GEOMETRIES: Record<AnnotationRole, readonly string[]> = {
  tissue: ["Polygon", "MultiPolygon"],
  tumour: ["Polygon", "MultiPolygon"],
  exclude: ["Polygon", "MultiPolygon"],
  figure: ["Point", "MultiPoint"],
  field: ["Point", "Polygon", "MultiPolygon", "MultiPoint"],
};

/** Largest `field_diameter_mm` accepted: wider circles are no microscope fields. */
const MAX_FIELD_DIAMETER_MM = 2;

/** ISO 8601 calendar date, optionally with a time and zone. */
const ISO_DATE =
  /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?$/;

/**
 * Reads one `field` feature: a Point (a standard window centred there, or
 * with `field_diameter_mm` one circular microscope field), a Polygon, a
 * MultiPolygon (separate areas counted together) or a MultiPoint with
 * `field_diameter_mm` (one circular field at each point, counted together).
 */
function readField(
  p: Record<string, unknown>,
  type: string,
  c: unknown,
  reader: GeometryReader,
  i: number,
  fail: Fail,
  ctx: { file: string; slide: SlideInfo; warnings: string[]; budget: { vertices: number } },
): FieldSpec {
  const at = `feature ${i}`;
  if (p.reader === undefined || p.reader === null) {
    throw fail(
      TypeError,
      `${at} (role "field") has no "reader": every field needs the name of who chose it, e.g. "reader": "reader-a"`,
    );
  }
  if (typeof p.reader !== "string") {
    throw fail(
      TypeError,
      `${at} (role "field") has a "reader" that is not a string: found ${describe(p.reader)}`,
    );
  }
  if (p.reader.trim() === "") {
    throw fail(
      TypeError,
      `${at} (role "field") has an empty "reader": give the name of who chose the field`,
    );
  }
  const readerName = p.reader;
  const who = `${at} (role "field", reader ${JSON.stringify(readerName)})`;
  let date: string | undefined;
  if (p.date !== undefined && p.date !== null) {
    date = fieldDate(p.date, who, fail);
  }
  let diameterMm: number | undefined;
  if (p.field_diameter_mm !== undefined && p.field_diameter_mm !== null) {
    diameterMm = fieldDiameter(p.field_diameter_mm, who, fail);
    if (type === "Polygon" || type === "MultiPolygon") {
      throw fail(
        TypeError,
        `${who} is a ${type} with "field_diameter_mm": a diameter goes with Point or MultiPoint fields (circular microscope fields), a polygon gives its own area`,
      );
    }
  }
  let spec: FieldSpec;
  if (type === "Point" && diameterMm === undefined) {
    spec = { reader: readerName, kind: "point", centerPx: reader.position(c, ""), featureIndex: i };
  } else if (type === "Point" || type === "MultiPoint") {
    if (diameterMm === undefined) {
      throw fail(
        TypeError,
        `${who} is a MultiPoint without "field_diameter_mm": give the diameter of each circular microscope field in mm (e.g. 0.55 for field number 22 at 40×)`,
      );
    }
    const pointsPx = type === "Point" ? [reader.position(c, "")] : reader.positions(c);
    if (pointsPx.length === 0) {
      throw fail(TypeError, `${who} is an empty MultiPoint: it marks no field`);
    }
    let sx = 0, sy = 0;
    for (const [x, y] of pointsPx) sx += x, sy += y;
    spec = {
      reader: readerName,
      kind: "circles",
      centerPx: [sx / pointsPx.length, sy / pointsPx.length],
      pointsPx,
      diameterMm,
      featureIndex: i,
    };
  } else {
    const read = type === "Polygon" ? [reader.polygon(c, "")] : reader.multiPolygon(c);
    if (read.length === 0) {
      throw fail(TypeError, `${who} is an empty MultiPolygon: it marks no field`);
    }
    const checked = checkFeatureOutline(read, {
      file: ctx.file,
      at: who,
      multi: type === "MultiPolygon",
      slide: ctx.slide,
      budget: ctx.budget,
    });
    if (checked.warning !== undefined) ctx.warnings.push(checked.warning);
    if (checked.polygons.length === 0) {
      throw fail(TypeError, `${who} has an outline without area: it marks no field`);
    }
    const parts = checked.polygons;
    spec = type === "Polygon" && parts.length === 1
      ? {
        reader: readerName,
        kind: "polygon",
        centerPx: polygonCentroidPx(parts[0]),
        polygon: parts[0],
        featureIndex: i,
      }
      : {
        reader: readerName,
        kind: "polygons",
        centerPx: weightedCentroid(parts),
        parts,
        featureIndex: i,
      };
  }
  if (date !== undefined) spec.date = date;
  const rest: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(p)) {
    if (k !== "role" && k !== "reader" && k !== "date" && k !== "field_diameter_mm") rest[k] = v;
  }
  if (Object.keys(rest).length > 0) spec.properties = rest;
  return spec;
}

/** Area-weighted centroid of separate polygons (pixels). */
function weightedCentroid(parts: PolygonPx[]): Vec2 {
  let a = 0, sx = 0, sy = 0;
  for (const poly of parts) {
    const w = Math.abs(polygonAreaPx2(poly));
    const [cx, cy] = polygonCentroidPx(poly);
    a += w, sx += w * cx, sy += w * cy;
  }
  if (a > 0) return [sx / a, sy / a];
  const cs = parts.map(polygonCentroidPx);
  return [
    cs.reduce((s, q) => s + q[0], 0) / cs.length,
    cs.reduce((s, q) => s + q[1], 0) / cs.length,
  ];
}

function fieldDate(raw: unknown, who: string, fail: Fail): string {
  const m = typeof raw === "string" ? ISO_DATE.exec(raw.trim()) : null;
  if (m) {
    const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
    const t = new Date(Date.UTC(y, mo - 1, d));
    const timeOk = m[4] === undefined ||
      (Number(m[4]) < 24 && Number(m[5]) < 60 && (m[6] === undefined || Number(m[6]) < 60));
    if (t.getUTCFullYear() === y && t.getUTCMonth() === mo - 1 && t.getUTCDate() === d && timeOk) {
      return (raw as string).trim();
    }
  }
  throw fail(
    TypeError,
    `${who} has a "date" that is not an ISO 8601 date (YYYY-MM-DD, optionally with a time): found ${
      describe(raw)
    }`,
  );
}

function fieldDiameter(raw: unknown, who: string, fail: Fail): number {
  if (typeof raw !== "number" || !Number.isFinite(raw)) {
    throw fail(
      TypeError,
      `${who} has a "field_diameter_mm" that is not a number: found ${describe(raw)}`,
    );
  }
  if (!(raw > 0 && raw <= MAX_FIELD_DIAMETER_MM)) {
    const hint = raw > 100 ? " (micrometres? give millimetres, e.g. 0.55)" : "";
    throw fail(
      RangeError,
      `${who} has "field_diameter_mm" ${raw}; a microscope field's diameter must be > 0 and at most ${MAX_FIELD_DIAMETER_MM} mm${hint}`,
    );
  }
  return raw;
}

function checkRole(raw: unknown, at: string, fail: Fail): AnnotationRole {
  if (raw === "figure") return "figure";
  const known = ANNOTATION_ROLES.join(", ");
  if (raw === undefined || raw === null) {
    throw fail(TypeError, `${at} has no "role" in its properties; known roles: ${known}`);
  }
  if (typeof raw === "string" && (ANNOTATION_ROLES as readonly string[]).includes(raw)) {
    return raw as AnnotationRole;
  }
  let hint = "";
  if (typeof raw === "string") {
    const t = raw.trim().toLowerCase();
    const guess = t === "tumor"
      ? "tumour"
      : (ANNOTATION_ROLES as readonly string[]).includes(t)
      ? t
      : "";
    if (guess) hint = ` (did you mean "${guess}"?)`;
  }
  throw fail(TypeError, `${at} has unknown role ${describe(raw)}${hint}; known roles: ${known}`);
}

function figureLabel(raw: unknown, at: string, fail: Fail): string {
  if (raw === undefined || raw === null || raw === DEFAULT_FIGURE_LABEL) {
    return DEFAULT_FIGURE_LABEL;
  }
  if (typeof raw !== "string") {
    throw fail(
      TypeError,
      `${at} (role "figure") has a "label" that is not a string: found ${describe(raw)}`,
    );
  }
  return figureLabelText(raw);
}

function figureScore(raw: unknown, at: string, fail: Fail): number {
  if (raw === undefined || raw === null) return NaN;
  if (typeof raw !== "number") {
    throw fail(
      TypeError,
      `${at} (role "figure") has a "score" that is not a number in [0, 1]: found ${describe(raw)}`,
    );
  }
  if (!(raw >= 0 && raw <= 1)) {
    const hint = raw > 1 && raw <= 100
      ? " (a percentage? give scores as fractions, e.g. 0.87)"
      : "";
    throw fail(RangeError, `${at} (role "figure") has score ${raw} outside [0, 1]${hint}`);
  }
  return raw;
}

/** Reads RFC 7946 coordinate arrays, naming the place of any problem. */
class GeometryReader {
  constructor(private at: string, private fail: Fail) {}

  position(raw: unknown, where: string): Vec2 {
    if (!Array.isArray(raw) || raw.length < 2) {
      throw this.fail(
        TypeError,
        `${this.at}${where}: a position must be an array of at least two numbers [x, y] (RFC 7946 §3.1.1): found ${
          describe(raw)
        }`,
      );
    }
    const [x, y] = raw;
    for (const v of [x, y]) {
      if (typeof v !== "number") {
        throw this.fail(
          TypeError,
          `${this.at}${where}: position ${describe(raw)} has a non-numeric coordinate ${
            describe(v)
          } (RFC 7946 §3.1.1 positions are numbers)`,
        );
      }
      if (!Number.isFinite(v)) {
        throw this.fail(TypeError, `${this.at}${where}: position has a non-finite coordinate ${v}`);
      }
    }
    return [x, y];
  }

  positions(raw: unknown): Vec2[] {
    if (!Array.isArray(raw)) {
      throw this.fail(
        TypeError,
        `${this.at}: MultiPoint "coordinates" must be an array of positions: found ${
          describe(raw)
        }`,
      );
    }
    return raw.map((q, k) => this.position(q, ` position ${k}`));
  }

  ring(raw: unknown, where: string): Ring {
    if (!Array.isArray(raw)) {
      throw this.fail(
        TypeError,
        `${this.at}${where}: a ring must be an array of positions: found ${describe(raw)}`,
      );
    }
    const ring = raw.map((q, k) => this.position(q, `${where} position ${k}`));
    if (ring.length < 4) {
      throw this.fail(
        TypeError,
        `${this.at}${where} has ${ring.length} position(s); a polygon ring needs at least 4 (RFC 7946 §3.1.6: a closed LinearRing with four or more positions)`,
      );
    }
    const a = ring[0];
    const b = ring[ring.length - 1];
    if (a[0] !== b[0] || a[1] !== b[1]) {
      throw this.fail(
        TypeError,
        `${this.at}${where} is not closed: first position [${a}] differs from last [${b}] (RFC 7946 §3.1.6: first and last positions must be identical)`,
      );
    }
    return ring;
  }

  polygon(raw: unknown, where: string): PolygonPx {
    if (!Array.isArray(raw) || raw.length === 0) {
      throw this.fail(
        TypeError,
        `${this.at}${where}: Polygon "coordinates" must be a non-empty array of rings (RFC 7946 §3.1.6): found ${
          describe(raw)
        }`,
      );
    }
    if (Array.isArray(raw[0]) && typeof raw[0][0] === "number") {
      throw this.fail(
        TypeError,
        `${this.at}${where}: Polygon "coordinates" must be an array of rings, each an array of positions (RFC 7946 §3.1.6): found an array of positions (one level of brackets missing?)`,
      );
    }
    return raw.map((r, k) => this.ring(r, `${where} ring ${k}`));
  }

  multiPolygon(raw: unknown): MultiPolygonPx {
    if (!Array.isArray(raw)) {
      throw this.fail(
        TypeError,
        `${this.at}: MultiPolygon "coordinates" must be an array of polygons (RFC 7946 §3.1.7): found ${
          describe(raw)
        }`,
      );
    }
    if (Array.isArray(raw[0]) && Array.isArray(raw[0][0]) && typeof raw[0][0][0] === "number") {
      throw this.fail(
        TypeError,
        `${this.at}: MultiPolygon "coordinates" must be an array of polygons, each an array of rings (RFC 7946 §3.1.7): found the coordinates of a single Polygon (use "type": "Polygon", or add one level of brackets)`,
      );
    }
    return raw.map((poly, k) => this.polygon(poly, ` polygon ${k}`));
  }
}
