/**
 * Reading a whole slide at low resolution (about 8–16 µm per pixel) from the
 * pyramid level nearest that resolution.
 *
 * @module
 */

import type { RgbImage } from "../types.ts";
import type { SlideFile } from "./open_slide.ts";

/** Options of {@linkcode readOverview}. */
export interface ReadOverviewOptions {
  /** Level-0 micrometres per pixel along x. */
  mppX: number;
  /** Level-0 micrometres per pixel along y. */
  mppY: number;
  /** Finest wanted resolution of the overview, µm/px. @default 8 */
  targetMpp?: number;
  /** Coarsest level read as it is, µm/px. @default 16 */
  maxMpp?: number;
  /** Most pixels read from the slide in one call. @default 4194304 */
  pieceMaxPx?: number;
}

/** The overview and how it maps onto level 0. */
export interface Overview {
  /** The RGB image covering the whole slide. */
  image: RgbImage;
  /** The level read. */
  level: number;
  /** Level pixels averaged into one overview pixel along each axis. */
  factor: number;
  /** Level-0 pixels per overview pixel along x (slide width ÷ image width). */
  scaleX: number;
  /** Level-0 pixels per overview pixel along y. */
  scaleY: number;
  /** Micrometres per overview pixel along x. */
  mppX: number;
  /** Micrometres per overview pixel along y. */
  mppY: number;
}

/**
 * Reads an RGB overview of a whole slide.
 *
 * The level read is the coarsest whose pixels are at most `maxMpp` µm
 * (level 0 when none is); when it is finer than `targetMpp`, blocks of
 * `factor` × `factor` level pixels are averaged, `factor` = ⌊targetMpp ÷
 * level mpp⌋, so the overview lands between `targetMpp` and `maxMpp` µm/px
 * whenever the pyramid allows. Large levels are read in pieces of at most
 * `pieceMaxPx` pixels (whole rows of blocks), so memory stays bounded by the
 * overview plus one piece. The overview covers the slide exactly: its
 * pixel (i, j) stands for level-0 pixels [i·scaleX, (i+1)·scaleX) ×
 * [j·scaleY, (j+1)·scaleY), x right, y down.
 *
 * @param slide An open slide.
 * @param options Level-0 mpp and the wanted resolution.
 * @returns The overview image, the level and the scale to level 0.
 * @throws {RangeError} When the mpp or resolutions are not positive.
 *
 * @example A fake two-level slide of uniform pink
 * ```ts
 * import { readOverview } from "./read_overview.ts";
 * import type { SlideFile } from "./open_slide.ts";
 * const levels = [{ widthPx: 4000, heightPx: 3000, downsample: 1 },
 *   { widthPx: 1000, heightPx: 750, downsample: 4 }];
 * const slide = { path: "QVT-24-001.tif", vendor: "", widthPx: 4000, heightPx: 3000, levels,
 *   mpp: null, properties: {}, close() {},
 *   readRegion: (_l: number, _x: number, _y: number, w: number, h: number) =>
 *     ({ width: w, height: h, data: new Uint8Array(w * h * 3).fill(200) }) } as SlideFile;
 * const o = readOverview(slide, { mppX: 2, mppY: 2 });
 * if (o.level !== 1 || o.factor !== 1 || o.mppX !== 8 || o.image.width !== 1000) throw new Error();
 * ```
 */
export function readOverview(slide: SlideFile, options: ReadOverviewOptions): Overview {
  const { mppX, mppY } = options;
  const targetMpp = options.targetMpp ?? 8;
  const maxMpp = options.maxMpp ?? 16;
  const pieceMaxPx = options.pieceMaxPx ?? 4 * 1024 * 1024;
  for (const [name, v] of [["mppX", mppX], ["mppY", mppY], ["targetMpp", targetMpp]] as const) {
    if (!(v > 0 && Number.isFinite(v))) {
      throw new RangeError(`Cannot read an overview: ${name} must be a positive number: got ${v}`);
    }
  }
  if (!(maxMpp >= targetMpp)) {
    throw new RangeError(
      `Cannot read an overview: maxMpp must be at least targetMpp (${targetMpp}): got ${maxMpp}`,
    );
  }
  const W0 = slide.widthPx, H0 = slide.heightPx;
  // a level's pixel size from its actual dimensions (downsamples are rounded in some files)
  const levelMpp = (l: number) =>
    Math.max(mppX * W0 / slide.levels[l].widthPx, mppY * H0 / slide.levels[l].heightPx);
  let level = 0;
  for (let l = 1; l < slide.levels.length; l++) {
    if (levelMpp(l) <= maxMpp && levelMpp(l) > levelMpp(level)) level = l;
  }
  const factor = Math.max(1, Math.floor(targetMpp / levelMpp(level)));
  const LW = slide.levels[level].widthPx, LH = slide.levels[level].heightPx;
  const ds = slide.levels[level].downsample;
  const W = Math.ceil(LW / factor), H = Math.ceil(LH / factor);
  const data = new Uint8Array(W * H * 3);
  // pieces: full-width strips of block rows, or columns of them when a row is too wide
  const blockRowsPerPiece = Math.max(1, Math.floor(pieceMaxPx / (LW * factor)));
  const blockColsPerPiece = blockRowsPerPiece > 1 || LW * factor <= pieceMaxPx
    ? W
    : Math.max(1, Math.floor(pieceMaxPx / (factor * factor)));
  const sum = new Float64Array(W * 3);
  const cnt = new Float64Array(W);
  for (let bj = 0; bj < H; bj += blockRowsPerPiece) {
    const bj1 = Math.min(H, bj + blockRowsPerPiece);
    const ly0 = bj * factor, ly1 = Math.min(LH, bj1 * factor);
    for (let bi = 0; bi < W; bi += blockColsPerPiece) {
      const bi1 = Math.min(W, bi + blockColsPerPiece);
      const lx0 = bi * factor, lx1 = Math.min(LW, bi1 * factor);
      const piece = slide.readRegion(
        level,
        Math.round(lx0 * ds),
        Math.round(ly0 * ds),
        lx1 - lx0,
        ly1 - ly0,
      );
      const pw = piece.width, pd = piece.data;
      for (let j = bj; j < bj1; j++) {
        sum.fill(0, bi * 3, bi1 * 3);
        cnt.fill(0, bi, bi1);
        const ya = j * factor - ly0, yb = Math.min(ly1, (j + 1) * factor) - ly0;
        for (let y = ya; y < yb; y++) {
          let s = y * pw * 3;
          for (let x = 0; x < pw; x++, s += 3) {
            const i = bi + Math.floor(x / factor);
            sum[i * 3] += pd[s];
            sum[i * 3 + 1] += pd[s + 1];
            sum[i * 3 + 2] += pd[s + 2];
            cnt[i]++;
          }
        }
        for (let i = bi; i < bi1; i++) {
          const o = (j * W + i) * 3;
          data[o] = Math.round(sum[i * 3] / cnt[i]);
          data[o + 1] = Math.round(sum[i * 3 + 1] / cnt[i]);
          data[o + 2] = Math.round(sum[i * 3 + 2] / cnt[i]);
        }
      }
    }
  }
  const scaleX = W0 / W, scaleY = H0 / H;
  return {
    image: { width: W, height: H, data },
    level,
    factor,
    scaleX,
    scaleY,
    mppX: scaleX * mppX,
    mppY: scaleY * mppY,
  };
}
