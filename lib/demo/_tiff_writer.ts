/**
 * A tiny writer of tiled, pyramidal RGB TIFF files (TIFF 6.0, little-endian,
 * classic 32-bit offsets), enough for the synthetic slides of tests, demo and
 * benchmark. Private to lib/demo.
 *
 * Layout: the 8-byte header, every level's image file directory (IFD) with
 * its out-of-line values, then the tile data. Levels after the first are
 * marked as reduced-resolution images (NewSubfileType 1), as generic
 * pyramidal TIFF readers expect. Tiles given as the same `Uint8Array`
 * object are stored once and shared.
 *
 * @module
 */

import { deflateSync } from "node:zlib";

/** One level of the pyramid. */
export interface TiffLevel {
  /** Image width in pixels. */
  width: number;
  /** Image height in pixels. */
  height: number;
  /** Tile width and height in pixels (a multiple of 16). */
  tileSize: number;
  /** Encoded tiles in row-major tile order (see {@linkcode encodeTile}). */
  tiles: Uint8Array[];
  /** Tiles are deflated (see {@linkcode encodeTile}). */
  deflate: boolean;
  /** Pixels per centimetre along x and y, or undefined to write no resolution tags. */
  pixelsPerCm?: [number, number];
}

/**
 * Encodes one tile: `tileSize`² RGB pixels, 3 bytes each, deflated (TIFF
 * compression 8, a zlib stream) or as they are (compression 1).
 *
 * @param rgb The tile's pixels, row-major.
 * @param deflate Compress the tile.
 * @returns The encoded bytes.
 */
export function encodeTile(rgb: Uint8Array, deflate: boolean): Uint8Array {
  return deflate ? new Uint8Array(deflateSync(rgb, { level: 6 })) : rgb;
}

/**
 * Builds the bytes of a tiled pyramidal TIFF.
 *
 * @param levels Level 0 first, then each reduced level.
 * @returns The file's bytes.
 * @throws {RangeError} When the file would pass the 4 GiB limit of classic TIFF.
 */
export function writeTiledTiff(levels: TiffLevel[]): Uint8Array {
  type Entry = { tag: number; type: number; count: number; value: number[] };
  const SHORT = 3, LONG = 4, RATIONAL = 5;
  const typeSize: Record<number, number> = { [SHORT]: 2, [LONG]: 4, [RATIONAL]: 8 };
  const ifds: Entry[][] = levels.map((lv, i) => {
    const entries: Entry[] = [
      { tag: 254, type: LONG, count: 1, value: [i === 0 ? 0 : 1] },
      { tag: 256, type: LONG, count: 1, value: [lv.width] },
      { tag: 257, type: LONG, count: 1, value: [lv.height] },
      { tag: 258, type: SHORT, count: 3, value: [8, 8, 8] },
      { tag: 259, type: SHORT, count: 1, value: [lv.deflate ? 8 : 1] },
      { tag: 262, type: SHORT, count: 1, value: [2] }, // RGB
      { tag: 277, type: SHORT, count: 1, value: [3] },
    ];
    if (lv.pixelsPerCm !== undefined) {
      entries.push(
        { tag: 282, type: RATIONAL, count: 1, value: rational(lv.pixelsPerCm[0]) },
        { tag: 283, type: RATIONAL, count: 1, value: rational(lv.pixelsPerCm[1]) },
      );
    }
    entries.push({ tag: 284, type: SHORT, count: 1, value: [1] }); // chunky
    if (lv.pixelsPerCm !== undefined) {
      entries.push({ tag: 296, type: SHORT, count: 1, value: [3] }); // centimetre
    }
    entries.push(
      { tag: 322, type: LONG, count: 1, value: [lv.tileSize] },
      { tag: 323, type: LONG, count: 1, value: [lv.tileSize] },
      { tag: 324, type: LONG, count: lv.tiles.length, value: [] }, // offsets, filled below
      { tag: 325, type: LONG, count: lv.tiles.length, value: lv.tiles.map((t) => t.length) },
    );
    return entries;
  });
  // sizes: each IFD is 2 + 12·n + 4 bytes, then its values longer than 4 bytes
  const extraSize = (e: Entry) => {
    const n = typeSize[e.type] * e.count;
    return n > 4 ? n + (n & 1) : 0;
  };
  let pos = 8;
  const ifdAt: number[] = [];
  for (const entries of ifds) {
    ifdAt.push(pos);
    pos += 2 + 12 * entries.length + 4;
    for (const e of entries) pos += extraSize(e);
  }
  // tile data, each distinct array once
  const dataAt = new Map<Uint8Array, number>();
  for (let l = 0; l < levels.length; l++) {
    for (const t of levels[l].tiles) {
      if (dataAt.has(t)) continue;
      dataAt.set(t, pos);
      pos += t.length;
    }
    const offsets = ifds[l].find((e) => e.tag === 324)!;
    offsets.value = levels[l].tiles.map((t) => dataAt.get(t)!);
  }
  if (pos > 0xffff_ffff) {
    throw new RangeError(`Cannot write a TIFF of ${pos} bytes: classic TIFF stops at 4 GiB`);
  }
  const out = new Uint8Array(pos);
  const dv = new DataView(out.buffer);
  out.set([0x49, 0x49, 42, 0]); // "II", 42
  dv.setUint32(4, ifdAt[0], true);
  for (let l = 0; l < ifds.length; l++) {
    const entries = ifds[l];
    let p = ifdAt[l];
    let extra = p + 2 + 12 * entries.length + 4;
    dv.setUint16(p, entries.length, true);
    p += 2;
    for (const e of entries) {
      dv.setUint16(p, e.tag, true);
      dv.setUint16(p + 2, e.type, true);
      dv.setUint32(p + 4, e.count, true);
      const n = typeSize[e.type] * e.count;
      let q = n > 4 ? extra : p + 8;
      if (n > 4) {
        dv.setUint32(p + 8, extra, true);
        extra += n + (n & 1);
      }
      for (const v of e.value) {
        if (e.type === SHORT) {
          dv.setUint16(q, v, true);
          q += 2;
        } else {
          dv.setUint32(q, v, true);
          q += 4;
        }
      }
      p += 12;
    }
    dv.setUint32(p, l + 1 < ifds.length ? ifdAt[l + 1] : 0, true);
  }
  for (const [t, at] of dataAt) out.set(t, at);
  return out;
}

/** A positive number as a TIFF RATIONAL [numerator, denominator], exact for up to 6 decimals. */
function rational(v: number): [number, number] {
  let den = 1_000_000;
  let num = Math.round(v * den);
  const gcd = (a: number, b: number): number => (b === 0 ? a : gcd(b, a % b));
  const g = gcd(num, den);
  num /= g;
  den /= g;
  while (num > 0xffff_ffff) {
    num = Math.round(num / 10);
    den = Math.max(1, Math.round(den / 10));
  }
  return [num, den];
}
