/**
 * Sizing a PNG before decoding it, so that a small file cannot make the
 * decoder take gigabytes: the header (IHDR) gives width, height, bit depth
 * and colour type, hence the exact number of bytes the image data must
 * inflate to; a picture over a stated number of pixels is refused at once,
 * and image data that inflates to more than its size needs (a decompression
 * bomb) is refused after inflating no more than that.
 *
 * Follows the PNG Specification (W3C, Second Edition, 2003 / ISO/IEC
 * 15948:2004): §5.2 signature, §11.2.2 IHDR, §7.2 scanlines with a filter
 * byte each, §8.2 Adam7 passes.
 *
 * @module
 */

import { inputError } from "../errors.ts";

/** What the IHDR chunk says. */
export interface PngHeader {
  /** Width in pixels. */
  width: number;
  /** Height in pixels. */
  height: number;
  /** Bits per sample: 1, 2, 4, 8 or 16. */
  bitDepth: number;
  /** 0 grey, 2 RGB, 3 palette, 4 grey + alpha, 6 RGBA. */
  colorType: number;
  /** 0 none, 1 Adam7. */
  interlace: number;
  /** Bytes the image data inflates to (scanlines with their filter bytes). */
  rawBytes: number;
}

const SIGNATURE = [137, 80, 78, 71, 13, 10, 26, 10];
const CHANNELS: Record<number, number> = { 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 };
// Adam7: [x start, y start, x step, y step] of the seven passes
const ADAM7 = [[0, 0, 8, 8], [4, 0, 8, 8], [0, 4, 4, 8], [2, 0, 4, 4], [0, 2, 2, 4], [1, 0, 2, 2], [
  0,
  1,
  1,
  2,
]];

function u32(b: Uint8Array, at: number): number {
  return ((b[at] << 24) >>> 0) + (b[at + 1] << 16) + (b[at + 2] << 8) + b[at + 3];
}

/**
 * Reads the header of a PNG, or returns `null` when the bytes do not start
 * with a PNG signature and a well-formed IHDR chunk (the decoder then
 * reports the problem).
 *
 * @param bytes The file's bytes.
 * @returns The header, with the inflated size of the image data.
 *
 * @example A 3 × 2 greyscale PNG inflates to 2 rows of 1 + 3 bytes
 * ```ts
 * import { encode } from "fast-png";
 * import { readPngHeader } from "./png_bounds.ts";
 * const png = encode({ width: 3, height: 2, data: new Uint8Array(6), channels: 1, depth: 8 });
 * const h = readPngHeader(png);
 * if (h?.width !== 3 || h.height !== 2 || h.rawBytes !== 8) throw new Error(JSON.stringify(h));
 * ```
 */
export function readPngHeader(bytes: Uint8Array): PngHeader | null {
  if (bytes.length < 33) return null;
  for (let i = 0; i < 8; i++) if (bytes[i] !== SIGNATURE[i]) return null;
  if (u32(bytes, 8) !== 13 || String.fromCharCode(...bytes.subarray(12, 16)) !== "IHDR") {
    return null;
  }
  const width = u32(bytes, 16), height = u32(bytes, 20);
  const bitDepth = bytes[24], colorType = bytes[25], interlace = bytes[28];
  const channels = CHANNELS[colorType];
  if (channels === undefined || ![1, 2, 4, 8, 16].includes(bitDepth) || interlace > 1) return null;
  const rowBytes = (w: number) => w === 0 ? 0 : 1 + Math.ceil((w * channels * bitDepth) / 8);
  let rawBytes = 0;
  if (interlace === 0) rawBytes = height * rowBytes(width);
  else {
    for (const [x0, y0, dx, dy] of ADAM7) {
      const w = Math.max(0, Math.ceil((width - x0) / dx));
      const h = Math.max(0, Math.ceil((height - y0) / dy));
      if (w > 0) rawBytes += h * rowBytes(w);
    }
  }
  return { width, height, bitDepth, colorType, interlace, rawBytes };
}

/** Options of {@linkcode checkPngBounds}. */
export interface PngBoundsOptions {
  /** What is read, for messages: `tissue mask`, `image`. */
  what: string;
  /** The file, for messages. */
  fileName: string;
  /** Largest width × height accepted. */
  maxPixels: number;
}

/**
 * Refuses a PNG whose decoded size is over the limit, or whose image data
 * inflates to more bytes than its size needs; returns the header otherwise
 * (`null` for bytes that are no PNG at all, left to the decoder).
 *
 * The image data is inflated once as a stream, counting its bytes and
 * keeping none, and stopped as soon as it passes the size the header
 * implies: a decompression bomb costs neither memory nor more time than a
 * genuine image of its size.
 *
 * @param bytes The file's bytes.
 * @param options What is read, the file and the pixel limit.
 * @returns The header, or `null`.
 * @throws {RangeError} Naming the file, giving the size and the limit.
 *
 * @example A 40,000 × 30,000 mask is refused from its header
 * ```ts
 * import { encode } from "fast-png";
 * import { checkPngBounds } from "./png_bounds.ts";
 * const png = encode({ width: 4, height: 3, data: new Uint8Array(12), channels: 1, depth: 8 });
 * new DataView(png.buffer).setUint32(16, 40000); // width in IHDR (the CRC no longer matches; never decoded)
 * new DataView(png.buffer).setUint32(20, 30000);
 * let message = "";
 * try { await checkPngBounds(png, { what: "tissue mask", fileName: "m.png", maxPixels: 1e8 }); } catch (e) { message = (e as Error).message; }
 * if (!message.includes("40000 × 30000")) throw new Error(`the size is named: ${message}`);
 * ```
 */
export async function checkPngBounds(
  bytes: Uint8Array,
  options: PngBoundsOptions,
): Promise<PngHeader | null> {
  const h = readPngHeader(bytes);
  if (h === null) return null;
  const { what, fileName, maxPixels } = options;
  if (h.width * h.height > maxPixels) {
    throw inputError(
      RangeError,
      what,
      fileName,
      `the image is ${h.width} × ${h.height} pixels (${
        Math.round(h.width * h.height / 1e6)
      } megapixels), more than the limit of ${
        Math.round(maxPixels / 1e6)
      } megapixels (see "Input limits" in the README); give a coarser image`,
    );
  }
  // the IDAT chunks' data, in order (chunk: length, type, data, CRC)
  const parts: Uint8Array[] = [];
  for (let at = 8; at + 12 <= bytes.length;) {
    const len = u32(bytes, at);
    const type = String.fromCharCode(...bytes.subarray(at + 4, at + 8));
    if (at + 12 + len > bytes.length) break; // truncated: the decoder says so
    if (type === "IDAT") {
      parts.push(bytes.subarray(at + 8, at + 8 + len));
    } else if (type === "IEND") break;
    at += 12 + len;
  }
  if (await inflatesBeyond(parts, h.rawBytes)) {
    throw inputError(
      RangeError,
      what,
      fileName,
      `the image data inflates to more than the ${h.rawBytes} bytes a ${h.width} × ${h.height} image needs (a decompression bomb?)`,
    );
  }
  return h;
}

/**
 * Whether zlib data split in `parts` inflates to more than `limit` bytes.
 * The data goes in 1 kB at a time (at most about 1 MB of output each, the
 * deflate format's ratio being about 1:1032), and the output is counted and
 * dropped, so memory stays small whatever the data. Damaged data counts as
 * not (the decoder reports it).
 */
async function inflatesBeyond(parts: Uint8Array[], limit: number): Promise<boolean> {
  const stream = new DecompressionStream("deflate");
  const writer = stream.writable.getWriter();
  const reader = stream.readable.getReader();
  let n = 0;
  let over = false;
  const counting = (async () => {
    try {
      for (;;) {
        const { done, value } = await reader.read();
        if (done) return;
        n += value.length;
        if (n > limit) {
          over = true;
          await reader.cancel();
          return;
        }
      }
    } catch {
      // damaged data: left to the decoder
    }
  })();
  try {
    for (const p of parts) {
      for (let i = 0; i < p.length && !over; i += 1024) {
        await writer.write(p.slice(i, i + 1024)); // a copy: its own ArrayBuffer
      }
    }
    if (!over) await writer.close();
  } catch {
    // cancelled once over the limit, or damaged data
  }
  await counting;
  return over;
}
