/**
 * The one place where micrometres per pixel are applied.
 *
 * Slide coordinates are level-0 pixels (x right, y down). A pixel is
 * `mppX` µm wide and `mppY` µm tall; the two may differ.
 *
 * @module
 */

import type { SlideInfo, Vec2 } from "./types.ts";

/** Micrometres per pixel along x and y. */
export interface Mpp {
  mppX: number;
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
 * import { px2ToMm2 } from "./units.ts";
 * // 4000 × 4000 px at 0.25 µm/px = 1 mm × 1 mm
 * if (Math.abs(px2ToMm2(16e6, { mppX: 0.25, mppY: 0.25 }) - 1) > 1e-12) throw new Error();
 * ```
 */
export function px2ToMm2(areaPx2: number, mpp: Mpp): number {
  return areaPx2 * mpp.mppX * mpp.mppY / 1e6;
}

/**
 * Converts an area in mm² to px².
 *
 * @example
 * ```ts
 * import { mm2ToPx2 } from "./units.ts";
 * if (mm2ToPx2(1, { mppX: 0.5, mppY: 0.5 }) !== 4e6) throw new Error();
 * ```
 */
export function mm2ToPx2(areaMm2: number, mpp: Mpp): number {
  return areaMm2 * 1e6 / (mpp.mppX * mpp.mppY);
}

/**
 * Converts a pixel position to micrometres from the slide origin.
 *
 * @example
 * ```ts
 * import { pxToUm } from "./units.ts";
 * const [x, y] = pxToUm([100, 100], { mppX: 0.25, mppY: 0.5 });
 * if (x !== 25 || y !== 50) throw new Error();
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
 * import { umToPx } from "./units.ts";
 * const [x, y] = umToPx([25, 50], { mppX: 0.25, mppY: 0.5 });
 * if (x !== 100 || y !== 100) throw new Error();
 * ```
 */
export function umToPx(pointUm: Vec2, mpp: Mpp): Vec2 {
  return [pointUm[0] / mpp.mppX, pointUm[1] / mpp.mppY];
}

/**
 * Takes the micrometres per pixel of a slide.
 *
 * @example
 * ```ts
 * import { mppOf } from "./units.ts";
 * const m = mppOf({ id: "s", mppX: 0.25, mppY: 0.26 });
 * if (m.mppY !== 0.26) throw new Error();
 * ```
 */
export function mppOf(slide: SlideInfo): Mpp {
  return { mppX: slide.mppX, mppY: slide.mppY };
}
