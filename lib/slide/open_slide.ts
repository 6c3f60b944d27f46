/**
 * Opening whole-slide files with OpenSlide: level-0 size, pyramid levels,
 * micrometres per pixel and RGB regions.
 *
 * @module
 */

import { statSync } from "node:fs";
import { inputError } from "../errors.ts";
import type { RgbImage } from "../types.ts";
import { cString, openSlideLib, readCString, readCStringArray } from "./_openslide.ts";

/** One pyramid level of a slide. */
export interface SlideLevel {
  /** Width of the level in its own pixels. */
  widthPx: number;
  /** Height of the level in its own pixels. */
  heightPx: number;
  /** Level-0 pixels per pixel of this level, as OpenSlide reports it. */
  downsample: number;
}

/** Micrometres per level-0 pixel and where they were read. */
export interface SlideMpp {
  /** Micrometres per level-0 pixel along x. */
  mppX: number;
  /** Micrometres per level-0 pixel along y. */
  mppY: number;
  /** The properties they came from, e.g. `openslide.mpp-x, openslide.mpp-y`. */
  from: string;
}

/** An open slide file. Call `close()` when done. */
export interface SlideFile {
  /** The path as given. */
  path: string;
  /** OpenSlide's format name (`openslide.vendor`), e.g. `generic-tiff`. */
  vendor: string;
  /** Level-0 width in pixels. */
  widthPx: number;
  /** Level-0 height in pixels. */
  heightPx: number;
  /** Levels, level 0 first. */
  levels: SlideLevel[];
  /** Level-0 micrometres per pixel, or null when the file does not say. */
  mpp: SlideMpp | null;
  /** Every property OpenSlide reports, by name. */
  properties: Record<string, string>;
  /**
   * Reads an RGB region of one level; transparent pixels (outside the
   * scanned area) come out white.
   *
   * @param level The level.
   * @param x0Px Left edge in level-0 pixels.
   * @param y0Px Top edge in level-0 pixels.
   * @param width Width in pixels of `level`.
   * @param height Height in pixels of `level`.
   */
  readRegion(level: number, x0Px: number, y0Px: number, width: number, height: number): RgbImage;
  /** Releases the file. */
  close(): void;
}

const WHAT = "slide";

/**
 * Whether slide files can be read here (the OpenSlide library is installed
 * and FFI is permitted).
 *
 * @returns true, or the reason it cannot (with what to do).
 *
 * @example Either true or the reason
 * ```ts
 * import { isOpenSlideAvailable } from "hotfield";
 * const ok = isOpenSlideAvailable();
 * if (ok !== true && typeof ok !== "string") throw new Error();
 * ```
 */
export function isOpenSlideAvailable(): true | string {
  try {
    openSlideLib();
    return true;
  } catch (e) {
    return (e as Error).message;
  }
}

/**
 * Takes the level-0 micrometres per pixel from a slide's properties.
 *
 * OpenSlide's own `openslide.mpp-x`/`openslide.mpp-y` come first (a missing
 * y takes x). Generic TIFFs are reported by OpenSlide 3.4 only through their
 * resolution tags: `tiff.XResolution`/`tiff.YResolution` in pixels per
 * `tiff.ResolutionUnit`, which must be `centimeter` (10,000 µm) or `inch`
 * (25,400 µm, TIFF 6.0 §"ResolutionUnit"); a unit of `none`, a missing unit
 * or a resolution that is not a positive number gives null.
 *
 * @param props The slide's properties.
 * @returns The mpp, or null when the properties give none.
 *
 * @example Resolution tags in pixels per centimetre
 * ```ts
 * import { mppFromProperties } from "./open_slide.ts";
 * const m = mppFromProperties({
 *   "tiff.XResolution": "20000", "tiff.YResolution": "40000", "tiff.ResolutionUnit": "centimeter",
 * });
 * if (m?.mppX !== 0.5 || m.mppY !== 0.25) throw new Error(JSON.stringify(m));
 * ```
 */
export function mppFromProperties(props: Record<string, string>): SlideMpp | null {
  const num = (k: string): number | undefined => {
    const v = props[k];
    if (v === undefined || v.trim() === "") return undefined;
    const n = Number(v);
    return Number.isFinite(n) && n > 0 ? n : undefined;
  };
  const mx = num("openslide.mpp-x"), my = num("openslide.mpp-y");
  if (mx !== undefined || my !== undefined) {
    return {
      mppX: (mx ?? my)!,
      mppY: (my ?? mx)!,
      from: mx !== undefined && my !== undefined
        ? "openslide.mpp-x, openslide.mpp-y"
        : mx !== undefined
        ? "openslide.mpp-x"
        : "openslide.mpp-y",
    };
  }
  const unit = props["tiff.ResolutionUnit"]?.trim().toLowerCase();
  const umPerUnit = unit === "centimeter" ? 10_000 : unit === "inch" ? 25_400 : undefined;
  const rx = num("tiff.XResolution"), ry = num("tiff.YResolution");
  if (umPerUnit === undefined || (rx === undefined && ry === undefined)) return null;
  return {
    mppX: umPerUnit / (rx ?? ry)!,
    mppY: umPerUnit / (ry ?? rx)!,
    from: `tiff.XResolution, tiff.YResolution (pixels per ${unit})`,
  };
}

/**
 * Opens a slide file with OpenSlide (any format it reads: generic tiled
 * TIFF, and the scanner formats it supports).
 *
 * Needs Deno's `--allow-ffi` and the OpenSlide library (`libopenslide0`).
 *
 * @param path The slide file.
 * @returns The open slide.
 * @throws {Error} When the file is missing, OpenSlide is not installed or FFI
 *   is not permitted (the message says what to do).
 * @throws {SyntaxError} When OpenSlide does not recognise the file or reports
 *   an error reading it (its message is wrapped, naming the file).
 *
 * @example Refusing a file that is not a slide (needs --allow-ffi and OpenSlide)
 * ```ts
 * import { openSlide } from "hotfield";
 * const ffi = (await Deno.permissions.query({ name: "ffi" })).state === "granted";
 * let ok = false;
 * try { Deno.dlopen("libopenslide.so.0", {}).close(); ok = ffi; } catch { ok = false; }
 * if (ok) {
 *   const path = Deno.makeTempFileSync({ suffix: ".tif" });
 *   Deno.writeTextFileSync(path, "QVT-24-001 is not a slide");
 *   let message = "";
 *   try { openSlide(path); } catch (e) { message = (e as Error).message; }
 *   Deno.removeSync(path);
 *   if (!message.includes("does not recognise")) throw new Error(message);
 * }
 * ```
 */
export function openSlide(path: string): SlideFile {
  try {
    const s = statSync(path);
    if (!s.isFile()) {
      // never hand a pipe or device to the library: opening it may block
      throw inputError(
        TypeError,
        WHAT,
        path,
        s.isDirectory()
          ? "it is a folder, not a file"
          : "it is not a regular file (a pipe or a device?)",
      );
    }
  } catch (e) {
    if (e instanceof TypeError) throw e;
    const code = (e as { code?: string }).code;
    throw new Error(
      `Cannot read ${WHAT} "${path}": ${
        code === "ENOENT" ? "file not found" : `the file cannot be read (${(e as Error).message})`
      }`,
    );
  }
  const lib = openSlideLib();
  const osr = lib.openslide_open(cString(path));
  if (osr === null) {
    throw inputError(
      SyntaxError,
      WHAT,
      path,
      "OpenSlide does not recognise it as a slide file (a damaged or truncated file, a TIFF without tiles, or not a slide at all)",
    );
  }
  let closed = false;
  const close = () => {
    if (!closed) lib.openslide_close(osr);
    closed = true;
  };
  const check = () => {
    const err = readCString(lib.openslide_get_error(osr));
    if (err !== null) {
      close();
      throw inputError(SyntaxError, WHAT, path, `OpenSlide reports: ${err}`);
    }
  };
  check();
  const levelCount = lib.openslide_get_level_count(osr);
  check();
  const levels: SlideLevel[] = [];
  const w = new BigInt64Array(1), h = new BigInt64Array(1);
  for (let i = 0; i < levelCount; i++) {
    lib.openslide_get_level_dimensions(osr, i, w, h);
    levels.push({
      widthPx: Number(w[0]),
      heightPx: Number(h[0]),
      downsample: lib.openslide_get_level_downsample(osr, i),
    });
  }
  check();
  if (levels.length === 0 || !(levels[0].widthPx > 0 && levels[0].heightPx > 0)) {
    close();
    throw inputError(SyntaxError, WHAT, path, "OpenSlide finds no image in it");
  }
  const properties: Record<string, string> = {};
  for (const name of readCStringArray(lib.openslide_get_property_names(osr))) {
    properties[name] = readCString(lib.openslide_get_property_value(osr, cString(name))) ?? "";
  }
  const readRegion = (
    level: number,
    x0Px: number,
    y0Px: number,
    width: number,
    height: number,
  ): RgbImage => {
    if (closed) throw new Error(`Cannot read ${WHAT} "${path}": the slide was closed`);
    const argb = new Uint32Array(width * height);
    lib.openslide_read_region(
      osr,
      argb,
      BigInt(x0Px),
      BigInt(y0Px),
      level,
      BigInt(width),
      BigInt(height),
    );
    check();
    const rgb = new Uint8Array(width * height * 3);
    for (let i = 0, j = 0; i < argb.length; i++, j += 3) {
      const p = argb[i];
      // premultiplied alpha: colour over white is c + (255 − a)
      const under = 255 - (p >>> 24);
      rgb[j] = ((p >>> 16) & 255) + under;
      rgb[j + 1] = ((p >>> 8) & 255) + under;
      rgb[j + 2] = (p & 255) + under;
    }
    return { width, height, data: rgb };
  };
  return {
    path,
    vendor: properties["openslide.vendor"] ?? "",
    widthPx: levels[0].widthPx,
    heightPx: levels[0].heightPx,
    levels,
    mpp: mppFromProperties(properties),
    properties,
    readRegion,
    close,
  };
}
