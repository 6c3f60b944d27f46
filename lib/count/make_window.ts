/**
 * Counting windows of a standard area.
 *
 * @module
 */

import type { WindowShape } from "./engine_types.ts";
import { DEFAULT_ASPECT, DEFAULT_WINDOW_AREA_MM2 } from "../defaults.ts";

/** Options of {@linkcode makeWindow}. */
export interface MakeWindowOptions {
  /** Window area in mm². @default 2.37 */
  areaMm2?: number;
  /** `rect` (axis-aligned, W along slide x) or `circle`. @default "rect" */
  shape?: "rect" | "circle";
  /** Rectangle aspect W:H (ignored for circles). @default [4, 3] */
  aspect?: [number, number];
}

/** The default window area, mm²: 10 fields of field number 22 at 40× (Meuten et al., Vet Pathol 2016). */

/**
 * Makes a counting window of a given area.
 *
 * A rectangle of area A (µm²) and aspect W:H has width √(A·W/H) and height
 * √(A·H/W); a circle has diameter 2√(A/π). Sizes are in micrometres of the
 * slide plane (x right, y down). The default area, 2.37 mm², is the standard
 * veterinary mitotic-count area (Meuten, Moore & George, Vet Pathol 2016,
 * doi:10.1177/0300985815593349).
 *
 * @param options Area, shape and aspect.
 * @returns The window.
 * @throws RangeError when the area is not a positive finite number, the shape
 *   is unknown, or the aspect is not two positive finite numbers.
 *
 * @example The default window is 1777.6 × 1333.2 µm
 * ```ts
 * import { makeWindow } from "hotfield";
 * const w = makeWindow({});
 * if (w.shape !== "rect") throw new Error(`default shape ${w.shape}, expected rect`);
 * if (Math.abs(w.widthUm - 1777.6) > 0.05 || Math.abs(w.heightUm - 1333.2) > 0.05) {
 *   throw new Error(`${w.widthUm} × ${w.heightUm}`);
 * }
 * const c = makeWindow({ shape: "circle" });
 * if (c.shape !== "circle" || Math.abs(c.diameterUm - 1737.1) > 0.05) {
 *   throw new Error(`a 2.37 mm² circle should be 1737.1 µm across: ${JSON.stringify(c)}`);
 * }
 * ```
 */
export function makeWindow(options: MakeWindowOptions = {}): WindowShape {
  const areaMm2 = options.areaMm2 ?? DEFAULT_WINDOW_AREA_MM2;
  const shape = options.shape ?? "rect";
  if (!Number.isFinite(areaMm2) || areaMm2 <= 0) {
    throw new RangeError(`Window area must be a positive number of mm²: got ${areaMm2}`);
  }
  const areaUm2 = areaMm2 * 1e6;
  if (shape === "circle") {
    return { shape, areaMm2, diameterUm: 2 * Math.sqrt(areaUm2 / Math.PI) };
  }
  if (shape !== "rect") {
    throw new RangeError(`Window shape must be "rect" or "circle": got "${shape}"`);
  }
  const aspect = options.aspect ?? [...DEFAULT_ASPECT] as [number, number];
  if (
    !Array.isArray(aspect) || aspect.length !== 2 ||
    !aspect.every((v) => Number.isFinite(v) && v > 0)
  ) {
    throw new RangeError(`Window aspect must be two positive numbers W:H: got ${aspect}`);
  }
  const [aw, ah] = aspect;
  return {
    shape,
    areaMm2,
    widthUm: Math.sqrt(areaUm2 * aw / ah),
    heightUm: Math.sqrt(areaUm2 * ah / aw),
    aspect: [aw, ah],
  };
}
