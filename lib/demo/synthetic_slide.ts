/**
 * A seeded generator of small whole-slide files: a pyramidal tiled TIFF with
 * resolution tags showing H&E-like tissue, and the true tissue outline it was
 * drawn from, for tests, the demo and the benchmark.
 *
 * The invented slide holds a main tissue piece with a glass hole in it, a
 * pale (weakly stained) piece, dust specks and a blue pen stroke on the
 * glass, and a grey shadow along the left edge. Colours follow the
 * Beer–Lambert law with the haematoxylin and eosin optical-density vectors of
 * Ruifrok and Johnston (2001, Anal Quant Cytol Histol 23:291–299; values
 * from memory), with a mottled stain density and nuclei on a jittered 12 µm
 * grid. Level-0 pixels, x right, y down.
 *
 * @module
 */

import type { MultiPolygonPx, PolygonPx, RgbImage, Ring } from "../types.ts";
import { type Random, seededRandom } from "../random.ts";
import { blobRing, type Frame, inAny, randomProfile, rasterize, reversed } from "./_shapes.ts";
import { encodeTile, type TiffLevel, writeTiledTiff } from "./_tiff_writer.ts";

/** Options of {@linkcode generateSyntheticSlide}. */
export interface SyntheticSlideOptions {
  /** Slide id (the file stem when written by the demo). @default "QVT-24-S01" */
  id?: string;
  /** Level-0 width in pixels. @default 4000 */
  widthPx?: number;
  /** Level-0 height in pixels. @default 3000 */
  heightPx?: number;
  /** Level-0 micrometres per pixel, one value or `[x, y]`. @default 2 */
  mpp?: number | [number, number];
  /** Tile width and height. @default 256 */
  tileSize?: number;
  /** Write the TIFF resolution tags (pixels per centimetre). @default true */
  resolutionTags?: boolean;
  /**
   * Levels with more pixels than this are not drawn pixel by pixel: their
   * tiles are flat colours of what lies at each tile's centre (shared tiles,
   * so a 40,000 × 30,000 px slide stays a few megabytes). @default 20000000
   */
  detailMaxPx?: number;
  /** Add the blue pen stroke. @default true */
  pen?: boolean;
}

/** One written level. */
export interface SyntheticLevel {
  /** Width of the level in its own pixels. */
  widthPx: number;
  /** Height of the level in its own pixels. */
  heightPx: number;
  /** Drawn pixel by pixel (true) or made of flat tiles (false). */
  detailed: boolean;
}

/** A generated slide: the file's bytes and what is on it. */
export interface SyntheticSlide {
  /** The slide id. */
  id: string;
  /** Level-0 width, px. */
  widthPx: number;
  /** Level-0 height, px. */
  heightPx: number;
  /** Level-0 micrometres per pixel along x. */
  mppX: number;
  /** Level-0 micrometres per pixel along y. */
  mppY: number;
  /** The levels written, level 0 first. */
  levels: SyntheticLevel[];
  /** The true tissue: the main piece (with its glass hole) and the pale piece, level-0 px. */
  tissue: MultiPolygonPx;
  /** The glass hole inside the main piece, as a polygon. */
  glassHole: PolygonPx;
  /** The pale piece. */
  palePiece: PolygonPx;
  /** Dust specks on the glass. */
  specks: MultiPolygonPx;
  /** The pen stroke (empty when `pen` is false). */
  penStroke: MultiPolygonPx;
  /** The TIFF file. */
  bytes: Uint8Array;
  /** The coarsest level's pixels (a thumbnail of the whole slide). */
  thumbnail: RgbImage;
}

// Optical density per unit stain for (R, G, B): Ruifrok & Johnston (2001), from memory.
const HAEMATOXYLIN = [0.65, 0.704, 0.286];
const EOSIN = [0.072, 0.99, 0.105];
const BLUE_INK = [0.9, 0.45, 0.12];
const GLASS = [236, 236, 240];
const LN10 = Math.LN10;

/**
 * Generates a synthetic slide.
 *
 * @param seed Any integer; equal seeds and options give byte-identical files.
 * @param options Size, mpp, tiling and what to draw.
 * @returns The TIFF bytes and the true outlines.
 *
 * @example A small slide
 * ```ts
 * import { generateSyntheticSlide } from "./synthetic_slide.ts";
 * const s = generateSyntheticSlide(1, { widthPx: 800, heightPx: 600, mpp: 8 });
 * if (s.levels.length !== 2 || s.bytes[0] !== 0x49 || s.tissue.length !== 2) throw new Error();
 * ```
 */
export function generateSyntheticSlide(
  seed: number,
  options: SyntheticSlideOptions = {},
): SyntheticSlide {
  const id = options.id ?? "QVT-24-S01";
  const W = options.widthPx ?? 4000, H = options.heightPx ?? 3000;
  const [mppX, mppY] = typeof options.mpp === "number"
    ? [options.mpp, options.mpp]
    : options.mpp ?? [2, 2];
  const tileSize = options.tileSize ?? 256;
  const detailMaxPx = options.detailMaxPx ?? 20_000_000;
  const random = seededRandom(seed);
  const Wum = W * mppX, Hum = H * mppY;
  const px = (ring: Ring): Ring => ring.map(([x, y]) => [x / mppX, y / mppY]);

  // the scene, drawn in µm, then put in level-0 px
  const main: Frame = {
    cx: 0.36 * Wum,
    cy: 0.5 * Hum,
    rx: 0.25 * Wum,
    ry: 0.36 * Hum,
    rotation: 0.2,
  };
  const mainOuter = px(blobRing(main, randomProfile(random, 0.15, 6), 720));
  const holeRing = px(
    blobRing(main, randomProfile(random, 0.1, 4), 180, { u0: 0.22, v0: -0.12, scale: 0.22 }),
  );
  const paleFrame: Frame = {
    cx: 0.79 * Wum,
    cy: 0.3 * Hum,
    rx: 0.1 * Wum,
    ry: 0.13 * Hum,
    rotation: -0.4,
  };
  const paleOuter = px(blobRing(paleFrame, randomProfile(random, 0.12, 5), 360));
  const penStroke: MultiPolygonPx = options.pen === false ? [] : [[
    px(
      strokeRing([0.7 * Wum, 0.95 * Hum], [0.93 * Wum, 0.85 * Hum], [0.97 * Wum, 0.62 * Hum], 180),
    ),
  ]];
  const tissue: MultiPolygonPx = [[mainOuter, reversed(holeRing)], [paleOuter]];
  const specks = placeSpecks(random, Wum, Hum, [...tissue, ...penStroke], mppX, mppY);
  const shadowUm = 120;

  // levels, each a quarter of the one before, down to about 512 px
  const dims: [number, number][] = [[W, H]];
  while (Math.max(...dims[dims.length - 1]) > 512) {
    const [w, h] = dims[dims.length - 1];
    dims.push([Math.ceil(w / 4), Math.ceil(h / 4)]);
  }
  let detailLevel = dims.findIndex(([w, h]) => w * h <= detailMaxPx);
  if (detailLevel < 0) detailLevel = dims.length - 1;

  // draw the detailed level
  const [dw, dh] = dims[detailLevel];
  const cell = 4 ** detailLevel; // level-0 px per pixel of this level
  const inside = (polys: MultiPolygonPx) => rasterize(polys, dw, dh, cell);
  const tissueMask = inside(tissue), paleMask = inside([[paleOuter]]);
  const penMask = inside(penStroke), speckMask = inside(specks);
  const noiseSeed = Math.floor(random() * 2 ** 31);
  const rgbs: Uint8Array[] = [];
  const detail = new Uint8Array(dw * dh * 3);
  const od = new Float64Array(3);
  for (let j = 0; j < dh; j++) {
    const yUm = (j + 0.5) * cell * mppY;
    for (let i = 0; i < dw; i++) {
      const k = j * dw + i;
      const xUm = (i + 0.5) * cell * mppX;
      od[0] = od[1] = od[2] = 0;
      if (tissueMask[k]) {
        const pale = paleMask[k] !== 0;
        const density = 0.6 + 0.6 * valueNoise(xUm / 350, yUm / 350, noiseSeed);
        const eosin = (pale ? 0.05 : 0.26) * density;
        let haem = pale ? 0.012 : 0.035;
        haem += nucleus(xUm, yUm, noiseSeed, pale ? 0.15 : 0.6) * (pale ? 0.25 : 0.85);
        for (let c = 0; c < 3; c++) od[c] = eosin * EOSIN[c] + haem * HAEMATOXYLIN[c];
      } else if (penMask[k]) {
        for (let c = 0; c < 3; c++) od[c] = BLUE_INK[c];
      } else if (speckMask[k]) {
        od[0] = 0.55, od[1] = 0.57, od[2] = 0.6; // dark, nearly neutral dust
      }
      const shade = xUm < shadowUm ? 0.72 + 0.28 * xUm / shadowUm : 1;
      // six bytes of one hash: a triangular noise of ±3 levels per channel
      const h1 = hashInt(i, j, noiseSeed), h2 = hashInt(j, i, noiseSeed + 1);
      for (let c = 0; c < 3; c++) {
        const n = (((h1 >>> (8 * c)) & 255) + ((h2 >>> (8 * c)) & 255) - 255) * (3 / 255);
        const t = od[c] === 0 ? 1 : Math.exp(-LN10 * od[c]);
        const v = GLASS[c] * shade * t + n;
        detail[3 * k + c] = v < 0 ? 0 : v > 255 ? 255 : Math.round(v);
      }
    }
  }
  rgbs[detailLevel] = detail;
  for (let l = detailLevel + 1; l < dims.length; l++) {
    rgbs[l] = shrink4(rgbs[l - 1], dims[l - 1][0], dims[l - 1][1], dims[l][0], dims[l][1]);
  }

  // flat colours for levels finer than the detailed one
  const flatColour = (x: number, y: number): number[] => {
    const mix = (o: number[]) => GLASS.map((g, c) => Math.round(g * Math.pow(10, -o[c])));
    if (inAny(tissue, x, y)) {
      const pale = inAny([[paleOuter]], x, y);
      const e = pale ? 0.05 : 0.26, h = pale ? 0.03 : 0.2;
      return mix(EOSIN.map((v, c) => e * v + h * HAEMATOXYLIN[c]));
    }
    if (inAny(penStroke, x, y)) return mix(BLUE_INK);
    return [...GLASS];
  };

  const levels: TiffLevel[] = [];
  const flatTiles = new Map<string, Uint8Array>();
  for (let l = 0; l < dims.length; l++) {
    const [w, h] = dims[l];
    const nx = Math.ceil(w / tileSize), ny = Math.ceil(h / tileSize);
    const tiles: Uint8Array[] = [];
    const scale = 4 ** l;
    for (let ty = 0; ty < ny; ty++) {
      for (let tx = 0; tx < nx; tx++) {
        if (l < detailLevel) {
          const colour = flatColour(
            Math.min(W, (tx + 0.5) * tileSize * scale),
            Math.min(H, (ty + 0.5) * tileSize * scale),
          );
          const key = colour.join();
          let t = flatTiles.get(key);
          if (t === undefined) {
            const rgb = new Uint8Array(tileSize * tileSize * 3);
            for (let p = 0; p < rgb.length; p += 3) rgb.set(colour, p);
            t = encodeTile(rgb, true);
            flatTiles.set(key, t);
          }
          tiles.push(t);
        } else {
          tiles.push(encodeTile(cutTile(rgbs[l], w, h, tx, ty, tileSize), false));
        }
      }
    }
    levels.push({
      width: w,
      height: h,
      tileSize,
      tiles,
      deflate: l < detailLevel,
      pixelsPerCm: options.resolutionTags === false
        ? undefined
        : [10_000 / (mppX * W / w), 10_000 / (mppY * H / h)],
    });
  }
  const last = dims.length - 1;
  return {
    id,
    widthPx: W,
    heightPx: H,
    mppX,
    mppY,
    levels: dims.map(([w, h], l) => ({ widthPx: w, heightPx: h, detailed: l >= detailLevel })),
    tissue,
    glassHole: [holeRing],
    palePiece: [paleOuter],
    specks,
    penStroke,
    bytes: writeTiledTiff(levels),
    thumbnail: { width: dims[last][0], height: dims[last][1], data: rgbs[last] },
  };
}

/**
 * Generates a synthetic slide and writes its TIFF to `path`.
 *
 * @param path Where to write (e.g. `QVT-24-S01.tiff`).
 * @param seed The seed.
 * @param options As for {@linkcode generateSyntheticSlide}.
 * @returns The generated slide.
 *
 * @example Writing a small slide (needs write permission)
 * ```ts
 * import { writeSyntheticSlide } from "hotfield";
 * if ((await Deno.permissions.query({ name: "write" })).state === "granted") {
 *   const path = Deno.makeTempFileSync({ suffix: ".tiff" });
 *   const s = writeSyntheticSlide(path, 2, { widthPx: 600, heightPx: 400, mpp: 8 });
 *   if (Deno.statSync(path).size !== s.bytes.length) throw new Error();
 *   Deno.removeSync(path);
 * }
 * ```
 */
export function writeSyntheticSlide(
  path: string,
  seed: number,
  options: SyntheticSlideOptions = {},
): SyntheticSlide {
  const slide = generateSyntheticSlide(seed, options);
  Deno.writeFileSync(path, slide.bytes);
  return slide;
}

/** A band of `widthUm` along a quadratic Bézier curve, as a closed ring in µm. */
function strokeRing(a: number[], b: number[], c: number[], widthUm: number): Ring {
  const n = 48;
  const left: Ring = [], right: Ring = [];
  for (let i = 0; i <= n; i++) {
    const t = i / n, u = 1 - t;
    const x = u * u * a[0] + 2 * u * t * b[0] + t * t * c[0];
    const y = u * u * a[1] + 2 * u * t * b[1] + t * t * c[1];
    const dx = 2 * u * (b[0] - a[0]) + 2 * t * (c[0] - b[0]);
    const dy = 2 * u * (b[1] - a[1]) + 2 * t * (c[1] - b[1]);
    const len = Math.hypot(dx, dy);
    const nx = -dy / len * widthUm / 2, ny = dx / len * widthUm / 2;
    left.push([x + nx, y + ny]);
    right.push([x - nx, y - ny]);
  }
  const ring = [...left, ...right.reverse()];
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/** Small dark discs (6–30 µm radius) on the glass, at least 200 µm from everything else. */
function placeSpecks(
  random: Random,
  Wum: number,
  Hum: number,
  avoid: MultiPolygonPx,
  mppX: number,
  mppY: number,
): MultiPolygonPx {
  const specks: MultiPolygonPx = [];
  const margin = 200;
  for (let tries = 0; specks.length < 14 && tries < 2000; tries++) {
    const x = margin + random() * (Wum - 2 * margin), y = margin + random() * (Hum - 2 * margin);
    let clear = true;
    for (let a = 0; a < 8 && clear; a++) {
      const ax = x + margin * Math.cos(a * Math.PI / 4),
        ay = y + margin * Math.sin(a * Math.PI / 4);
      if (inAny(avoid, ax / mppX, ay / mppY)) clear = false;
    }
    if (!clear || inAny(avoid, x / mppX, y / mppY)) continue;
    const r = 6 + 24 * random();
    const ring: Ring = [];
    for (let k = 0; k < 24; k++) {
      const t = 2 * Math.PI * k / 24;
      ring.push([(x + r * Math.cos(t)) / mppX, (y + r * Math.sin(t)) / mppY]);
    }
    ring.push([ring[0][0], ring[0][1]]);
    specks.push([ring]);
  }
  return specks;
}

/** A 32-bit hash of three integers. */
function hashInt(a: number, b: number, c: number): number {
  let h = Math.imul(a | 0, 0x27d4eb2d) ^ Math.imul(b | 0, 0x165667b1) ^
    Math.imul(c | 0, 0x9e3779b1);
  h = Math.imul(h ^ (h >>> 15), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/** A hash of three integers to [0, 1). */
function hash3(a: number, b: number, c: number): number {
  return hashInt(a, b, c) / 4294967296;
}

/** Smooth value noise in [0, 1) on a unit grid (bilinear between hashed corners). */
function valueNoise(x: number, y: number, seed: number): number {
  const ix = Math.floor(x), iy = Math.floor(y);
  const fx = x - ix, fy = y - iy;
  const sx = fx * fx * (3 - 2 * fx), sy = fy * fy * (3 - 2 * fy);
  const a = hash3(ix, iy, seed), b = hash3(ix + 1, iy, seed);
  const c = hash3(ix, iy + 1, seed), d = hash3(ix + 1, iy + 1, seed);
  return a + (b - a) * sx + (c - a) * sy + (a - b - c + d) * sx * sy;
}

/** 1 inside a nucleus (radius 3.2 µm, one per 12 µm cell with probability `p`), else 0. */
function nucleus(xUm: number, yUm: number, seed: number, p: number): number {
  const gx = Math.floor(xUm / 12), gy = Math.floor(yUm / 12);
  if (hash3(gx, gy, seed + 11) >= p) return 0;
  const cx = (gx + 0.3 + 0.4 * hash3(gx, gy, seed + 12)) * 12;
  const cy = (gy + 0.3 + 0.4 * hash3(gx, gy, seed + 13)) * 12;
  const dx = xUm - cx, dy = yUm - cy;
  return dx * dx + dy * dy <= 3.2 * 3.2 ? 1 : 0;
}

/** Averages 4 × 4 blocks (partial blocks at the right and bottom edges). */
function shrink4(src: Uint8Array, w: number, h: number, w2: number, h2: number): Uint8Array {
  const out = new Uint8Array(w2 * h2 * 3);
  for (let j = 0; j < h2; j++) {
    for (let i = 0; i < w2; i++) {
      let r = 0, g = 0, b = 0, n = 0;
      for (let y = 4 * j; y < Math.min(h, 4 * j + 4); y++) {
        for (let x = 4 * i; x < Math.min(w, 4 * i + 4); x++) {
          const s = 3 * (y * w + x);
          r += src[s];
          g += src[s + 1];
          b += src[s + 2];
          n++;
        }
      }
      const o = 3 * (j * w2 + i);
      out[o] = Math.round(r / n);
      out[o + 1] = Math.round(g / n);
      out[o + 2] = Math.round(b / n);
    }
  }
  return out;
}

/** One tile of an RGB image, padded with white beyond the image. */
function cutTile(
  rgb: Uint8Array,
  w: number,
  h: number,
  tx: number,
  ty: number,
  size: number,
): Uint8Array {
  const out = new Uint8Array(size * size * 3).fill(255);
  const x0 = tx * size, y0 = ty * size;
  const cw = Math.min(size, w - x0);
  for (let y = 0; y < size && y0 + y < h; y++) {
    const s = 3 * ((y0 + y) * w + x0);
    out.set(rgb.subarray(s, s + 3 * cw), 3 * y * size);
  }
  return out;
}
