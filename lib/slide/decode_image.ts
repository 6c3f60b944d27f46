/**
 * Decoding PNG and JPEG thumbnails into RGB, without OpenSlide.
 *
 * @module
 */

import { decode as decodePng } from "fast-png";
import { decode as decodeJpeg } from "jpeg-js";
import { MAX_IMAGE_PIXELS } from "../defaults.ts";
import { inputError } from "../errors.ts";
import type { RgbImage } from "../types.ts";

/** The image formats {@linkcode decodeRgbImage} reads. */
export type ImageFormat = "png" | "jpeg";

/**
 * Tells PNG and JPEG files from their first bytes (PNG signature, ISO/IEC
 * 15948 §5.2; JPEG start-of-image marker FF D8 FF, ITU-T T.81 Annex B).
 *
 * @param bytes At least the first 8 bytes of the file.
 * @returns The format, or null for anything else.
 *
 * @example A PNG signature, and a TIFF header that is neither
 * ```ts
 * import { sniffImageFormat } from "./decode_image.ts";
 * const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
 * if (sniffImageFormat(png) !== "png") throw new Error();
 * if (sniffImageFormat(new Uint8Array([0x49, 0x49, 0x2a, 0])) !== null) throw new Error("TIFF");
 * ```
 */
export function sniffImageFormat(bytes: Uint8Array): ImageFormat | null {
  const png = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  if (bytes.length >= 8 && png.every((b, i) => bytes[i] === b)) return "png";
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) {
    return "jpeg";
  }
  return null;
}

/** Options of {@linkcode decodeRgbImage}. */
export interface DecodeRgbImageOptions {
  /** The file name as the user gave it, for messages. */
  fileName: string;
}

/**
 * Decodes a PNG or JPEG image into 8-bit RGB.
 *
 * Grey images are spread over the three channels; 16-bit samples keep their
 * high byte; palette colours are looked up; transparency (an alpha channel
 * or a `tRNS` entry) is composited over white, as a slide's empty glass.
 *
 * @param bytes The file's bytes.
 * @param options `fileName` for messages.
 * @returns The image.
 * @throws {SyntaxError} When the bytes are neither PNG nor JPEG or cannot be decoded.
 *
 * @example A 1 × 1 half-transparent black PNG comes out mid grey
 * ```ts
 * import { encode } from "fast-png";
 * import { decodeRgbImage } from "./decode_image.ts";
 * const png = encode({ width: 1, height: 1, data: new Uint8Array([0, 0, 0, 128]), channels: 4, depth: 8 });
 * const img = decodeRgbImage(png, { fileName: "QVT-24-001-thumb.png" });
 * if (img.data.join() !== "127,127,127") throw new Error(img.data.join());
 * ```
 */
export function decodeRgbImage(bytes: Uint8Array, options: DecodeRgbImageOptions): RgbImage {
  const file = options.fileName;
  const format = sniffImageFormat(bytes);
  if (format === null) {
    throw inputError(SyntaxError, "image", file, "not a PNG or JPEG image");
  }
  return format === "png" ? pngToRgb(bytes, file) : jpegToRgb(bytes, file);
}

function jpegToRgb(bytes: Uint8Array, file: string): RgbImage {
  try {
    const img = decodeJpeg(bytes, {
      useTArray: true,
      formatAsRGBA: false,
      maxResolutionInMP: MAX_IMAGE_PIXELS / 1e6,
    });
    if (!(img.width > 0 && img.height > 0) || img.data.length < img.width * img.height * 3) {
      throw new Error("no image data");
    }
    return { width: img.width, height: img.height, data: new Uint8Array(img.data) };
  } catch (e) {
    throw inputError(SyntaxError, "image", file, `not a readable JPEG image (${errText(e)})`);
  }
}

function pngToRgb(bytes: Uint8Array, file: string): RgbImage {
  let png: ReturnType<typeof decodePng>;
  try {
    png = decodePng(bytes, { checkCrc: true });
  } catch (e) {
    throw inputError(SyntaxError, "image", file, `not a readable PNG image (${errText(e)})`);
  }
  const { width, height, channels, depth } = png;
  if (!(width > 0 && height > 0)) {
    throw inputError(SyntaxError, "image", file, `the image is empty (${width} × ${height})`);
  }
  const src = png.data;
  const rowSamples = width * channels;
  const rowBytes = Math.ceil(rowSamples * depth / 8);
  if (src.length < (depth < 8 ? rowBytes * height : rowSamples * height)) {
    throw inputError(SyntaxError, "image", file, "the image data is truncated");
  }
  const max = (1 << Math.min(depth, 8)) - 1;
  // one sample scaled to 0..255
  const sample = (y: number, s: number): number => {
    if (depth === 8) return src[y * rowSamples + s];
    if (depth === 16) return src[y * rowSamples + s] >> 8;
    const bit = s * depth;
    const v = (src[y * rowBytes + (bit >> 3)] >> (8 - depth - (bit & 7))) & max;
    return png.palette ? v : Math.round(v * 255 / max);
  };
  const raw = (y: number, s: number): number => {
    if (depth >= 8) return src[y * rowSamples + s];
    const bit = s * depth;
    return (src[y * rowBytes + (bit >> 3)] >> (8 - depth - (bit & 7))) & max;
  };
  const out = new Uint8Array(width * height * 3);
  const palette = png.palette;
  const trns = png.transparency;
  const colours = channels === 2 || channels === 4 ? channels - 1 : channels;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const s = x * channels;
      let r: number, g: number, b: number, a = 255;
      if (palette !== undefined) {
        const c = palette[raw(y, s)];
        if (c === undefined) {
          throw inputError(
            SyntaxError,
            "image",
            file,
            `pixel (${x}, ${y}) uses a colour missing from the palette`,
          );
        }
        [r, g, b] = c;
        if (c.length > 3) a = c[3];
      } else {
        r = sample(y, s);
        g = colours === 3 ? sample(y, s + 1) : r;
        b = colours === 3 ? sample(y, s + 2) : r;
        if (colours < channels) a = sample(y, s + colours);
        else if (trns !== undefined && trns.length === colours) {
          let same = true;
          for (let c = 0; c < colours; c++) if (raw(y, s + c) !== trns[c]) same = false;
          if (same) a = 0;
        }
      }
      const o = 3 * (y * width + x);
      if (a === 255) {
        out[o] = r;
        out[o + 1] = g;
        out[o + 2] = b;
      } else {
        // straight alpha over white
        out[o] = Math.round((r * a + 255 * (255 - a)) / 255);
        out[o + 1] = Math.round((g * a + 255 * (255 - a)) / 255);
        out[o + 2] = Math.round((b * a + 255 * (255 - a)) / 255);
      }
    }
  }
  return { width, height, data: out };
}

function errText(e: unknown): string {
  // the decoder may quote damaged bytes (a chunk type): keep the message on one printable line
  return (e instanceof Error ? e.message : String(e)).replace(/[^\x20-\x7e]/g, "?");
}
