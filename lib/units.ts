/**
 * The one place where micrometres per pixel are applied.
 *
 * Slide coordinates are level-0 pixels (x right, y down). A pixel is
 * `mppX` µm wide and `mppY` µm tall; the two may differ.
 *
 * @module
 */

import type { MultiPolygonPx, Ring, Vec2 } from "./types.ts";

/** Micrometres per pixel along x and y. */
export interface Mpp {
  /** Micrometres per pixel along x. */
  mppX: number;
  /** Micrometres per pixel along y. */
  mppY: number;
}

/**
 * Converts a pixel area (px²) to mm².
 *
 * @param areaPx2 Area in square level-0 pixels.
 * @param mpp Micrometres per pixel.
 * @returns Area in mm² (1 mm² = 10⁶ µm²).
 *
 * @example Converting an area
 * ```ts
 * import { px2ToMm2 } from "hotfield";
 * // 4000 × 4000 px at 0.25 µm/px = 1 mm × 1 mm
 * const mm2 = px2ToMm2(16e6, { mppX: 0.25, mppY: 0.25 });
 * if (Math.abs(mm2 - 1) > 1e-12) throw new Error(`16e6 px² at 0.25 µm/px is ${mm2} mm², expected 1`);
 * ```
 */
export function px2ToMm2(areaPx2: number, mpp: Mpp): number {
  return areaPx2 * mpp.mppX * mpp.mppY / 1e6;
}

/**
 * Converts a pixel position to micrometres from the slide origin.
 *
 * @example
 * ```ts
 * import { pxToUm } from "hotfield";
 * const [x, y] = pxToUm([100, 100], { mppX: 0.25, mppY: 0.5 });
 * if (x !== 25 || y !== 50) throw new Error(`(100, 100) px is (${x}, ${y}) µm, expected (25, 50)`);
 * ```
 */
export function pxToUm(pointPx: Vec2, mpp: Mpp): Vec2 {
  return [pointPx[0] * mpp.mppX, pointPx[1] * mpp.mppY];
}

/**
 * Converts a position in micrometres to pixels.
 *
 * @example
 * ```ts
 * import { umToPx } from "hotfield";
 * const [x, y] = umToPx([25, 50], { mppX: 0.25, mppY: 0.5 });
 * if (x !== 100 || y !== 100) throw new Error(`(25, 50) µm is (${x}, ${y}) px, expected (100, 100)`);
 * ```
 */
export function umToPx(pointUm: Vec2, mpp: Mpp): Vec2 {
  return [pointUm[0] / mpp.mppX, pointUm[1] / mpp.mppY];
}

/**
 * Converts a ring from pixels to micrometres from the slide origin.
 *
 * @param ringPx Positions in level-0 pixels.
 * @param mpp Micrometres per pixel (x and y may differ).
 * @returns A new ring in µm; the input is not changed.
 *
 * @example Unequal mpp
 * ```ts
 * import { ringPxToUm } from "./units.ts";
 * const ring = ringPxToUm([[0, 0], [100, 0], [100, 100], [0, 0]], { mppX: 0.25, mppY: 0.5 });
 * if (ring[2].join() !== "25,50") throw new Error(`corner at ${ring[2]}`);
 * ```
 */
export function ringPxToUm(ringPx: Ring, mpp: Mpp): Ring {
  const { mppX, mppY } = mpp;
  return ringPx.map(([x, y]) => [x * mppX, y * mppY]);
}

/**
 * Converts a ring from micrometres (from the slide origin) to pixels.
 *
 * @param ringUm Positions in µm.
 * @param mpp Micrometres per pixel (x and y may differ).
 * @returns A new ring in level-0 pixels; the input is not changed.
 *
 * @example Back to pixels
 * ```ts
 * import { ringUmToPx } from "./units.ts";
 * const ring = ringUmToPx([[0, 0], [25, 0], [25, 50], [0, 0]], { mppX: 0.25, mppY: 0.5 });
 * if (ring[2].join() !== "100,100") throw new Error(`corner at ${ring[2]}`);
 * ```
 */
export function ringUmToPx(ringUm: Ring, mpp: Mpp): Ring {
  const { mppX, mppY } = mpp;
  return ringUm.map(([x, y]) => [x / mppX, y / mppY]);
}

/**
 * Converts a region from pixels to micrometres from the slide origin.
 *
 * Positive mpp keep the winding, so a normalized region stays normalized.
 *
 * @param regionPx Polygons in level-0 pixels.
 * @param mpp Micrometres per pixel (x and y may differ).
 * @returns A new region in µm; the input is not changed.
 *
 * @example A 400 × 400 px square at 0.25 × 0.5 µm/px
 * ```ts
 * import { regionPxToUm } from "./units.ts";
 * const square: [number, number][] = [[0, 0], [400, 0], [400, 400], [0, 400], [0, 0]];
 * const [[ring]] = regionPxToUm([[square]], { mppX: 0.25, mppY: 0.5 });
 * if (ring[2].join() !== "100,200") throw new Error(`corner at ${ring[2]}`);
 * ```
 */
export function regionPxToUm(regionPx: MultiPolygonPx, mpp: Mpp): MultiPolygonPx {
  return regionPx.map((polygon) => polygon.map((ring) => ringPxToUm(ring, mpp)));
}

/**
 * Converts columns of pixel positions to micrometres, keeping only the
 * positions whose `keep` flag is nonzero (all of them without `keep`).
 *
 * @param xPx x of each position, level-0 pixels.
 * @param yPx y of each position, level-0 pixels (same length as `xPx`).
 * @param mpp Micrometres per pixel (x and y may differ).
 * @param keep Optional flags, one per position: 0 drops it.
 * @returns The kept positions in µm, in their order.
 *
 * @example Two of three positions kept
 * ```ts
 * import { pointsPxToUm } from "./units.ts";
 * const { xUm, yUm } = pointsPxToUm([4, 8, 12], [4, 8, 12], { mppX: 0.25, mppY: 0.5 }, [1, 0, 1]);
 * if (xUm.join() !== "1,3" || yUm.join() !== "2,6") throw new Error(`kept ${xUm} / ${yUm}`);
 * ```
 */
export function pointsPxToUm(
  xPx: ArrayLike<number>,
  yPx: ArrayLike<number>,
  mpp: Mpp,
  keep?: ArrayLike<number>,
): { xUm: Float64Array; yUm: Float64Array } {
  const { mppX, mppY } = mpp;
  let n = xPx.length;
  if (keep) {
    n = 0;
    for (let k = 0; k < keep.length; k++) if (keep[k]) n++;
  }
  const xUm = new Float64Array(n), yUm = new Float64Array(n);
  for (let k = 0, m = 0; k < xPx.length; k++) {
    if (keep && !keep[k]) continue;
    xUm[m] = xPx[k] * mppX;
    yUm[m] = yPx[k] * mppY;
    m++;
  }
  return { xUm, yUm };
}
