/**
 * Reading a slide file, or a PNG/JPEG thumbnail of one, for its facts
 * (micrometres per pixel, level-0 size) and a low-resolution image to find
 * the tissue on; and writing the found tissue as an annotation GeoJSON.
 *
 * @module
 */

import { basename } from "node:path";
import { closeSync, openSync, readSync, statSync } from "node:fs";
import { inputError } from "../errors.ts";
import { roundTo } from "../numbers.ts";
import type { MultiPolygonPx, RgbImage, SlideInfo } from "../types.ts";
import { decodeRgbImage, sniffImageFormat } from "../slide/decode_image.ts";
import { openSlide } from "../slide/open_slide.ts";
import { readInputFile } from "../io/read_input.ts";
import { checkPngBounds } from "../io/png_bounds.ts";
import { MAX_IMAGE_PIXELS, MAX_MASK_FILE_BYTES } from "../defaults.ts";
import { readOverview } from "../slide/read_overview.ts";
import {
  detectTissue,
  type DetectTissueOptions,
  type TissueDetection,
} from "../tissue/detect_tissue.ts";
import { MAX_PLAUSIBLE_MPP, MIN_PLAUSIBLE_MPP, type SlideMember } from "./slide_info.ts";

/** A slide file's own facts, as a `slide` member, and the file. */
export interface SlideFileFacts {
  /** `{id, mpp: [x, y], width, height}` read from the slide file. */
  member: SlideMember & { mpp: [number, number]; width: number; height: number };
  /** The slide file as given, for messages. */
  path: string;
  /** Where the slide file's mpp came from, for messages. */
  mppFrom: string;
}

/** Options of {@linkcode readSlideImage}. */
export interface ReadSlideImageOptions {
  /**
   * Micrometres per pixel of the file's own pixels: level 0 of a slide
   * (replacing what the file says), or the thumbnail's pixels.
   */
  mpp?: number | [number, number];
  /** Micrometres per level-0 pixel of the slide a thumbnail shows (thumbnails only). */
  slideMpp?: number | [number, number];
  /**
   * What is known of the slide from elsewhere (an annotation file): for a
   * thumbnail, its level-0 size lets the thumbnail's mpp be derived and its
   * aspect be checked, and its mpp serves as the level-0 mpp.
   */
  slide?: SlideInfo;
  /** Finest overview resolution read from a slide, µm/px. @default 8 */
  targetMpp?: number;
}

/** A slide's facts and a low-resolution image of all of it. */
export interface SlideImage {
  /** The file as given. */
  path: string;
  /** A whole-slide file read by OpenSlide, or a PNG/JPEG thumbnail. */
  kind: "slide" | "thumbnail";
  /** OpenSlide's format name, or `png` / `jpeg`. */
  format: string;
  /** Level-0 facts: id (the file stem), mpp, width and height. */
  slide: SlideInfo & { widthPx: number; heightPx: number };
  /** Where the level-0 mpp came from, in words. */
  mppFrom: string;
  /** The image. */
  image: RgbImage;
  /** Micrometres per image pixel along x. */
  imageMppX: number;
  /** Micrometres per image pixel along y. */
  imageMppY: number;
  /** Level-0 pixels per image pixel along x (level-0 width ÷ image width). */
  scaleX: number;
  /** Level-0 pixels per image pixel along y. */
  scaleY: number;
  /** The pyramid level read (slides), or null (thumbnails). */
  level: number | null;
  /** Recoverable oddities, one sentence each. */
  warnings: string[];
}

const pair = (v: number | [number, number]): [number, number] =>
  typeof v === "number" ? [v, v] : [v[0], v[1]];

/**
 * The stem of a file name: without folders and without its last extension.
 *
 * @example The stem of a slide path
 * ```ts
 * import { slideIdFromPath } from "./read_slide_file.ts";
 * if (slideIdFromPath("/slides/QVT-24-009.tiff") !== "QVT-24-009") throw new Error();
 * ```
 */
export function slideIdFromPath(path: string): string {
  const base = basename(path);
  const dot = base.lastIndexOf(".");
  return dot > 0 ? base.slice(0, dot) : base;
}

/**
 * Tells whether a file is a PNG or JPEG image (a thumbnail) from its first
 * bytes; anything else is taken for a slide file.
 *
 * @param path The file.
 * @returns `thumbnail` or `slide`.
 * @throws {Error} When the file cannot be read (names it).
 *
 * @example A PNG is a thumbnail, anything else a slide (needs write permission)
 * ```ts
 * import { slideFileKind } from "./read_slide_file.ts";
 * import { encode } from "fast-png";
 * if ((await Deno.permissions.query({ name: "write" })).state === "granted") {
 *   const png = Deno.makeTempFileSync({ suffix: ".png" });
 *   Deno.writeFileSync(png, encode({ width: 1, height: 1, data: new Uint8Array(3), channels: 3, depth: 8 }));
 *   const tif = Deno.makeTempFileSync({ suffix: ".tiff" });
 *   Deno.writeFileSync(tif, new Uint8Array([0x49, 0x49, 42, 0]));
 *   const kinds = [slideFileKind(png), slideFileKind(tif)];
 *   Deno.removeSync(png);
 *   Deno.removeSync(tif);
 *   if (kinds.join() !== "thumbnail,slide") throw new Error(kinds.join());
 * }
 * ```
 */
export function slideFileKind(path: string): "slide" | "thumbnail" {
  // looked up before it is opened: opening a named pipe blocks until a writer comes
  let info;
  try {
    info = statSync(path);
  } catch {
    info = undefined; // the open below names the problem
  }
  if (info !== undefined && !info.isFile()) {
    throw new Error(
      `Cannot read slide "${path}": ${
        info.isDirectory()
          ? "it is a folder, not a file"
          : info.isFIFO()
          ? "it is a named pipe (FIFO), not a regular file"
          : "it is not a regular file (a device?)"
      }`,
    );
  }
  let fd: number;
  try {
    fd = openSync(path, "r");
  } catch (e) {
    const code = (e as { code?: string }).code;
    throw new Error(
      `Cannot read slide "${path}": ${
        code === "ENOENT"
          ? "file not found"
          : code === "EISDIR"
          ? "it is a folder, not a file"
          : `the file cannot be read (${(e as Error).message})`
      }`,
    );
  }
  try {
    const head = new Uint8Array(8);
    const n = readSync(fd, head, 0, 8, 0);
    return sniffImageFormat(head.subarray(0, n)) === null ? "slide" : "thumbnail";
  } catch (e) {
    const code = (e as { code?: string }).code;
    throw new Error(
      `Cannot read slide "${path}": ${
        code === "EISDIR" ? "it is a folder, not a file" : (e as Error).message
      }`,
    );
  } finally {
    closeSync(fd);
  }
}

/** Throws when a level-0 mpp is implausible; `what` says where it came from. */
function checkLevel0Mpp(path: string, mpp: [number, number], what: string, fix: string): void {
  for (const v of mpp) {
    if (!(v > 0 && Number.isFinite(v))) {
      throw inputError(RangeError, "slide", path, `${what} is not a positive number: ${v}`);
    }
    if (v > MAX_PLAUSIBLE_MPP || v < MIN_PLAUSIBLE_MPP) {
      throw inputError(
        RangeError,
        "slide",
        path,
        `${what} ${
          fmt(v)
        } µm/px is implausible for level-0 pixels (plausible: ${MIN_PLAUSIBLE_MPP} to ${MAX_PLAUSIBLE_MPP} µm/px; scanners give about 0.1 to 1)${fix}`,
      );
    }
  }
}

/**
 * Reads a slide file (through OpenSlide) or a PNG/JPEG thumbnail: the
 * level-0 facts and an RGB image of the whole slide at about 8–16 µm/px.
 *
 * **Slide files.** The level-0 mpp is `mpp` when given, else what the file
 * says (OpenSlide's mpp properties, else the TIFF resolution tags with their
 * unit); the overview comes from the pyramid level nearest the target
 * resolution (see `readOverview`). Needs `--allow-ffi` and `libopenslide0`.
 *
 * **Thumbnails.** The level-0 mpp is `slideMpp`, else `slide`'s mpp. The
 * thumbnail's own mpp is `mpp`, else derived from `slide`'s level-0 size.
 * The level-0 size is `slide`'s, else the thumbnail's extent in µm over the
 * level-0 mpp. When the slide's size is known, the thumbnail's extent (or
 * aspect, when its mpp is derived) must match it within 1 thumbnail pixel
 * or 2 %.
 *
 * Level-0 mpp must lie between 0.01 and 5 µm/px.
 *
 * @param path The slide or thumbnail file.
 * @param options mpp values and known slide facts.
 * @returns The facts, the image and how it maps onto level 0.
 * @throws {Error} When the file is missing or OpenSlide cannot be used.
 * @throws {SyntaxError} When the file is not a slide or image, or is damaged.
 * @throws {TypeError} When an mpp is needed and not given (the message names the option).
 * @throws {RangeError} When an mpp is implausible or a thumbnail does not fit the slide.
 *
 * @example A PNG thumbnail at 16 µm/px of a slide at 0.5 µm/px
 * ```ts
 * import { encode } from "fast-png";
 * import { readSlideImage } from "hotfield";
 * if ((await Deno.permissions.query({ name: "write" })).state === "granted") {
 *   const path = Deno.makeTempFileSync({ prefix: "QVT-24-001-", suffix: ".png" });
 *   const data = new Uint8Array(40 * 30 * 3).fill(236);
 *   Deno.writeFileSync(path, encode({ width: 40, height: 30, data, channels: 3, depth: 8 }));
 *   const s = await readSlideImage(path, { mpp: 16, slideMpp: 0.5 });
 *   Deno.removeSync(path);
 *   if (s.slide.widthPx !== 1280 || s.scaleX !== 32 || s.kind !== "thumbnail") throw new Error();
 * }
 * ```
 */
export async function readSlideImage(
  path: string,
  options: ReadSlideImageOptions = {},
): Promise<SlideImage> {
  const kind = slideFileKind(path);
  return kind === "slide" ? readSlide(path, options) : await readThumbnail(path, options);
}

function readSlide(path: string, options: ReadSlideImageOptions): SlideImage {
  const warnings: string[] = [];
  const slide = openSlide(path);
  try {
    let mpp: [number, number];
    let mppFrom: string;
    if (options.mpp !== undefined) {
      mpp = pair(options.mpp);
      mppFrom = "given (--mpp)";
      if (slide.mpp !== null && (slide.mpp.mppX !== mpp[0] || slide.mpp.mppY !== mpp[1])) {
        warnings.push(
          `${path}: the given mpp ${fmtPair(mpp)} µm/px replaces the file's ${
            fmtPair([slide.mpp.mppX, slide.mpp.mppY])
          } µm/px (${slide.mpp.from})`,
        );
      }
      checkLevel0Mpp(path, mpp, "the given mpp", "");
    } else if (slide.mpp !== null) {
      mpp = [slide.mpp.mppX, slide.mpp.mppY];
      mppFrom = slide.mpp.from;
      checkLevel0Mpp(
        path,
        mpp,
        `its mpp from ${slide.mpp.from}`,
        `; most likely a default resolution, not the scan's: give the level-0 mpp with --mpp N`,
      );
    } else {
      throw inputError(
        TypeError,
        "slide",
        path,
        "it does not say its micrometres per pixel (no openslide.mpp-x/mpp-y properties and no TIFF resolution tags in centimetres or inches); give them with --mpp N (µm per level-0 pixel)",
      );
    }
    const o = readOverview(slide, { mppX: mpp[0], mppY: mpp[1], targetMpp: options.targetMpp });
    return {
      path,
      kind: "slide",
      format: slide.vendor,
      slide: {
        id: slideIdFromPath(path),
        mppX: mpp[0],
        mppY: mpp[1],
        widthPx: slide.widthPx,
        heightPx: slide.heightPx,
      },
      mppFrom,
      image: o.image,
      imageMppX: o.mppX,
      imageMppY: o.mppY,
      scaleX: o.scaleX,
      scaleY: o.scaleY,
      level: o.level,
      warnings,
    };
  } finally {
    slide.close();
  }
}

async function readThumbnail(path: string, options: ReadSlideImageOptions): Promise<SlideImage> {
  const warnings: string[] = [];
  const bytes = await readInputFile(path, { what: "slide", maxBytes: MAX_MASK_FILE_BYTES });
  // a PNG is sized from its header before it is decoded
  await checkPngBounds(bytes, { what: "slide", fileName: path, maxPixels: MAX_IMAGE_PIXELS });
  const format = sniffImageFormat(bytes) ?? "png";
  let image: RgbImage;
  try {
    image = decodeRgbImage(bytes, { fileName: path });
  } catch (e) {
    throw new SyntaxError((e as Error).message.replace(/^Cannot read image/, "Cannot read slide"));
  }
  const known = options.slide;
  let level0: [number, number];
  let mppFrom: string;
  if (options.slideMpp !== undefined) {
    level0 = pair(options.slideMpp);
    mppFrom = "given (--slide-mpp)";
  } else if (known !== undefined) {
    level0 = [known.mppX, known.mppY];
    mppFrom = "the annotations' slide member";
  } else {
    throw inputError(
      TypeError,
      "slide",
      path,
      "it is a thumbnail image, which does not say the slide's micrometres per level-0 pixel; give them with --slide-mpp N",
    );
  }
  checkLevel0Mpp(path, level0, "the slide mpp", "; give micrometres per level-0 pixel");
  const W = image.width, H = image.height;
  let thumb: [number, number];
  let widthPx: number, heightPx: number;
  const size = known?.widthPx !== undefined && known?.heightPx !== undefined
    ? [known.widthPx, known.heightPx]
    : undefined;
  if (options.mpp !== undefined) {
    thumb = pair(options.mpp);
    const ext = [W * thumb[0], H * thumb[1]];
    if (size !== undefined) {
      const names = ["width", "height"];
      for (let a = 0; a < 2; a++) {
        const slideUm = size[a] * level0[a];
        const tol = Math.max(thumb[a], 0.02 * slideUm);
        if (Math.abs(ext[a] - slideUm) > tol) {
          throw inputError(
            RangeError,
            "slide",
            path,
            `the thumbnail ${names[a]} is ${fmt(ext[a])} µm (${[W, H][a]} px at ${
              fmt(thumb[a])
            } µm/px) but the slide ${names[a]} is ${fmt(slideUm)} µm (${size[a]} px at ${
              fmt(level0[a])
            } µm/px)`,
          );
        }
      }
      [widthPx, heightPx] = size;
    } else {
      widthPx = Math.round(ext[0] / level0[0]);
      heightPx = Math.round(ext[1] / level0[1]);
    }
  } else if (size !== undefined) {
    // derived per axis; a thumbnail keeps the slide's aspect, so both must agree
    thumb = [size[0] * level0[0] / W, size[1] * level0[1] / H];
    // one thumbnail pixel of rounding on each axis, or 2 %
    if (Math.abs(thumb[0] / thumb[1] - 1) > Math.max(2 / Math.min(W, H), 0.02)) {
      throw inputError(
        RangeError,
        "slide",
        path,
        `the thumbnail's aspect (${W} × ${H} px, ${fmt(W / H)}:1) disagrees with the slide's (${
          size[0]
        } × ${size[1]} px at ${fmtPair(level0)} µm/px, ${
          fmt(size[0] * level0[0] / (size[1] * level0[1]))
        }:1): is it a thumbnail of this slide?`,
      );
    }
    [widthPx, heightPx] = size;
  } else {
    throw inputError(
      TypeError,
      "slide",
      path,
      "it is a thumbnail image, which does not say its own micrometres per pixel; give them with --mpp N",
    );
  }
  if (thumb[0] < level0[0] || thumb[1] < level0[1]) {
    warnings.push(
      `${path}: the thumbnail's ${fmtPair(thumb)} µm/px is finer than the slide's ${
        fmtPair(level0)
      } µm/px; thumbnails are usually coarser`,
    );
  }
  return {
    path,
    kind: "thumbnail",
    format,
    slide: { id: slideIdFromPath(path), mppX: level0[0], mppY: level0[1], widthPx, heightPx },
    mppFrom,
    image,
    imageMppX: widthPx * level0[0] / W,
    imageMppY: heightPx * level0[1] / H,
    scaleX: widthPx / W,
    scaleY: heightPx / H,
    level: null,
    warnings,
  };
}

/**
 * Finds the tissue on a slide image (see `detectTissue`), polygons in the
 * slide's level-0 pixels.
 *
 * @param image From {@linkcode readSlideImage}.
 * @param options Detection parameters (mpp and scale come from `image`).
 * @returns The detection; its warnings name the file.
 *
 * @example Glass only: no tissue, and a warning
 * ```ts
 * import { detectSlideTissue } from "hotfield";
 * import type { SlideImage } from "./read_slide_file.ts";
 * const image = { width: 50, height: 40, data: new Uint8Array(50 * 40 * 3).fill(236) };
 * const s = { path: "QVT-24-002.png", image, imageMppX: 16, imageMppY: 16, scaleX: 32,
 *   scaleY: 32 } as SlideImage;
 * const t = detectSlideTissue(s);
 * if (t.polygons.length !== 0 || !t.warnings[0].includes("QVT-24-002.png")) throw new Error();
 * ```
 */
export function detectSlideTissue(
  image: SlideImage,
  options: Partial<DetectTissueOptions> = {},
): TissueDetection {
  return detectTissue(image.image, {
    ...options,
    mppX: image.imageMppX,
    mppY: image.imageMppY,
    scaleX: image.scaleX,
    scaleY: image.scaleY,
    source: `"${image.path}"`,
  });
}

/**
 * The detected tissue as an annotation GeoJSON FeatureCollection (RFC 7946
 * structure, level-0 pixel coordinates, x right, y down), ready for
 * `report`: a `slide` member `{id, mpp: [x, y], width, height}` and one
 * feature with `role: "tissue"` (a Polygon for one piece, else a
 * MultiPolygon) whose `properties.method` records how it was found. With no
 * tissue the collection has no features.
 *
 * @param image The slide image the tissue was found on.
 * @param detection The detection.
 * @returns The FeatureCollection as a plain object.
 *
 * @example One square piece becomes a Polygon feature
 * ```ts
 * import { tissueFeatureCollection } from "hotfield";
 * import type { SlideImage } from "./read_slide_file.ts";
 * import type { TissueDetection } from "../tissue/detect_tissue.ts";
 * const sq: [number, number][] = [[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]];
 * const fc = tissueFeatureCollection(
 *   { path: "QVT-24-003.tiff", kind: "slide", format: "generic-tiff", level: 1, mppFrom: "",
 *     slide: { id: "QVT-24-003", mppX: 0.5, mppY: 0.5, widthPx: 100, heightPx: 80 } } as SlideImage,
 *   { polygons: [[sq]], areaMm2: 0.000025, method: {}, warnings: [] } as unknown as TissueDetection,
 * );
 * if (fc.features[0].geometry.type !== "Polygon" || fc.slide.width !== 100) throw new Error();
 * ```
 */
export function tissueFeatureCollection(image: SlideImage, detection: TissueDetection): {
  type: "FeatureCollection";
  slide: { id: string; mpp: [number, number]; width: number; height: number };
  features: {
    type: "Feature";
    properties: Record<string, unknown>;
    geometry: { type: "Polygon" | "MultiPolygon"; coordinates: unknown };
  }[];
} {
  const s = image.slide;
  const polys: MultiPolygonPx = detection.polygons;
  return {
    type: "FeatureCollection",
    slide: { id: s.id, mpp: [s.mppX, s.mppY], width: s.widthPx, height: s.heightPx },
    features: polys.length === 0 ? [] : [{
      type: "Feature",
      properties: {
        role: "tissue",
        area_mm2: roundTo(detection.areaMm2, 6),
        source: {
          file: image.path,
          kind: image.kind,
          format: image.format,
          level: image.level,
          mpp_from: image.mppFrom,
        },
        method: detection.method,
        warnings: detection.warnings,
      },
      geometry: polys.length === 1
        ? { type: "Polygon", coordinates: polys[0] }
        : { type: "MultiPolygon", coordinates: polys },
    }],
  };
}

function fmt(v: number): string {
  return String(roundTo(v, 4));
}

function fmtPair([x, y]: [number, number]): string {
  return x === y ? fmt(x) : `${fmt(x)}, ${fmt(y)}`;
}
