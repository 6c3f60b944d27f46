/**
 * Plain-data types shared by every concern of hotfield.
 *
 * Conventions, everywhere in the library:
 * - Slide coordinates are level-0 pixels, x to the right, y down.
 * - Pixels are the unit inside the library; micrometres and mm² appear only at
 *   the edges, converted in `units.ts` with the slide's micrometres per pixel
 *   (x and y may differ).
 * - Rings are closed (first position equals last), as in RFC 7946 §3.1.6.
 *   Either winding is accepted on input; normalized rings have the outer
 *   boundary with positive shoelace area in (x right, y down) coordinates and
 *   holes negative.
 *
 * Everything here is plain data (arrays, typed arrays, objects) so that a
 * case can be posted to a worker with `structuredClone` semantics.
 *
 * @module
 */

/** A position `[x, y]` in level-0 slide pixels. */
export type Vec2 = [number, number];

/** A closed ring of positions in pixels (first equals last). */
export type Ring = Vec2[];

/** A polygon: the outer ring first, then any holes. */
export type PolygonPx = Ring[];

/** A set of polygons (a region); polygons may touch but not overlap once normalized. */
export type MultiPolygonPx = PolygonPx[];

/** Axis-aligned bounding box in pixels: `[minX, minY, maxX, maxY]`. */
export type BBoxPx = [number, number, number, number];

/** Slide metadata, from the `slide` foreign member of the annotation file. */
export interface SlideInfo {
  /** Slide identifier as given in the file. */
  id: string;
  /** Micrometres per pixel along x. */
  mppX: number;
  /** Micrometres per pixel along y. */
  mppY: number;
  /** Level-0 width in pixels, when known. */
  widthPx?: number;
  /** Level-0 height in pixels, when known. */
  heightPx?: number;
}

/**
 * Figure points, one entry per point (a MultiPoint feature contributes one
 * entry per position). Columnar so 250,000 points stay compact.
 */
export interface FigureSet {
  /** x of each point, pixels. */
  xPx: Float64Array;
  /** y of each point, pixels. */
  yPx: Float64Array;
  /** Index into `labels` for each point. */
  labelIndex: Uint32Array;
  /** Distinct labels, in order of first appearance. */
  labels: string[];
  /** Detector or annotator score in [0, 1]; NaN where the input gave none. */
  score: Float64Array;
  /**
   * Where each point came from, for messages: the feature index in the
   * GeoJSON (0-based) or the CSV data line (1-based, header is line 1).
   */
  origin: Int32Array;
}

/** One region polygon as read, with where it came from. */
export interface RegionPart {
  /** The polygon(s) of this feature or mask, pixels. */
  polygons: MultiPolygonPx;
  /** Human-readable origin, e.g. `case01.geojson feature 3` or `mask.png`. */
  source: string;
  /** For `exclude` parts: the reason given (e.g. "necrosis"), if any. */
  reason?: string;
}

/**
 * What a reader's field is: `point`, a standard window centred at the point;
 * `polygon`, that area; `polygons`, several separate areas counted together
 * (a MultiPolygon); `circles`, one circular microscope field of a stated
 * diameter at each point (a Point or MultiPoint with `field_diameter_mm`),
 * counted together.
 */
export type FieldKind = "point" | "polygon" | "polygons" | "circles";

/** A reader's chosen counting area (`role: "field"`). */
export interface FieldSpec {
  /** Reader name (required on input; never empty). */
  reader: string;
  /** What the field is (see {@linkcode FieldKind}). */
  kind: FieldKind;
  /**
   * Centre in pixels: for a polygon its area centroid, for `polygons` the
   * area-weighted centroid of the parts, for `circles` the mean of the centres.
   */
  centerPx: Vec2;
  /** The polygon, for `kind: "polygon"`. */
  polygon?: PolygonPx;
  /** The separate polygons, for `kind: "polygons"`. */
  parts?: PolygonPx[];
  /** The centre of each circular field, for `kind: "circles"`. */
  pointsPx?: Vec2[];
  /** Diameter of each circular field in the specimen, mm, for `kind: "circles"`. */
  diameterMm?: number;
  /** When the field was read (ISO 8601 date or date-time), from `properties.date`. */
  date?: string;
  /** Feature index in the source file (0-based). */
  featureIndex: number;
  /** Any other properties of the feature, kept for reports (e.g. `label`). */
  properties?: Record<string, unknown>;
}

/** An input file of a case, for provenance in reports. */
export interface CaseSource {
  /** What the file provided. */
  kind: "annotations" | "figures" | "tissue-mask" | "case" | "slide";
  /** Path as given (relative paths resolved against the working directory or case file). */
  path: string;
  /** Hex sha256 of the file bytes. */
  sha256: string;
}

/**
 * Report settings a case file names for its own case (they win over the
 * command line's options for that case). Plain data; the pipeline checks the
 * scheme id.
 */
export interface CaseSettings {
  /** Grading scheme id. */
  scheme?: string;
  /** Least figure score that is counted, in [0, 1]. */
  minScore?: number;
  /** Figure labels that are counted. */
  countLabels?: string[];
  /** Window area, mm². */
  areaMm2?: number;
  /** Window shape. */
  shape?: "rect" | "circle";
  /** Spacing of window centres, µm. */
  strideUm?: number;
  /** Least fraction of a window inside the valid region, in (0, 1]. */
  minCoverage?: number;
}

/** Everything hotfield read for one case, before any computation. */
export interface CaseData {
  /** Case id: `slide.id`, else the file stem, made safe for a folder name. */
  caseId: string;
  /** The slide: id, micrometres per pixel and size when known. */
  slide: SlideInfo;
  /** Tissue outlines (their union bounds the valid region); may be empty when a tumour is given. */
  tissue: RegionPart[];
  /** Tumour outlines (their union bounds the valid region); may be empty when tissue is given. */
  tumour: RegionPart[];
  /** Outlines taken out of the valid region (necrosis, artefact…), with reasons. */
  exclude: RegionPart[];
  /** Every figure point, counted or not. */
  figures: FigureSet;
  /** Readers' fields, in file order. */
  fields: FieldSpec[];
  /** The files read, with their hashes. */
  sources: CaseSource[];
  /** Recoverable problems found while reading (never printed by the library). */
  warnings: string[];
  /**
   * Problems found while reading that make any count meaningless, such as
   * figure coordinates that fit the slide only in another unit. Each is also
   * in `warnings`; the pipeline leaves such a case unclassified.
   */
  countProblems?: string[];
  /** Report settings named by the case file, if any. */
  settings?: CaseSettings;
  /** Where the tissue came from when it was detected in a slide file (absent otherwise). */
  tissueSource?: TissueSource;
}

/** Tissue detected in a slide file, for the report's record of where it came from. */
export interface TissueSource {
  /** The slide file (or thumbnail) as given. */
  slide: string;
  /** Each step of the detection with its parameters, as `detectTissue` records it. */
  method: Record<string, unknown>;
}

/**
 * An 8-bit RGB image, row-major, 3 bytes per pixel: `data[3·(y·width + x) + c]`
 * for channel c = 0 (red), 1 (green), 2 (blue). Transparent pixels are
 * composited over white when an image is read.
 */
export interface RgbImage {
  /** Width in pixels. */
  width: number;
  /** Height in pixels. */
  height: number;
  /** 3·width·height bytes: R, G, B of each pixel, rows top to bottom. */
  data: Uint8Array;
}
