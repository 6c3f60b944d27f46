/**
 * The stride grid of window centres.
 *
 * @module
 */

import type { StrideGrid } from "./engine_types.ts";

/** Options of {@linkcode makeStrideGrid}. */
export interface MakeStrideGridOptions {
  /** Grid step, µm. */
  strideUm: number;
  /** Extra margin added on each side of the box along x and y, µm. @default [0, 0] */
  marginUm?: [number, number];
}

/**
 * Builds the grid of centres covering a box in the micrometre plane.
 *
 * The origin is the box minimum (less the margin) rounded down to a multiple
 * of the stride, so two cases that differ by a shift of a whole number of
 * strides get the same grid, shifted. Centre (i, j) is
 * (x0Um + i·strideUm, y0Um + j·strideUm), never computed by repeated addition;
 * the last centre is the last one not beyond the box maximum (plus margin).
 *
 * @param bboxUm `[minX, minY, maxX, maxY]` in µm.
 * @returns The grid.
 * @throws RangeError when the stride is not positive.
 *
 * @example A 100 µm box at a 25 µm stride
 * ```ts
 * import { makeStrideGrid } from "./stride_grid.ts";
 * const g = makeStrideGrid([10, 0, 110, 50], { strideUm: 25 });
 * if (g.x0Um !== 0 || g.nx !== 5 || g.ny !== 3) throw new Error(JSON.stringify(g));
 * ```
 */
export function makeStrideGrid(
  bboxUm: [number, number, number, number],
  options: MakeStrideGridOptions,
): StrideGrid {
  const s = options.strideUm;
  if (!Number.isFinite(s) || s <= 0) {
    throw new RangeError(`Stride must be a positive number of µm: got ${s}`);
  }
  const [mx, my] = options.marginUm ?? [0, 0];
  const [minX, minY, maxX, maxY] = bboxUm;
  const x0Um = Math.floor((minX - mx) / s) * s;
  const y0Um = Math.floor((minY - my) / s) * s;
  const nx = Math.max(1, Math.floor((maxX + mx - x0Um) / s) + 1);
  const ny = Math.max(1, Math.floor((maxY + my - y0Um) / s) + 1);
  return { x0Um, y0Um, strideUm: s, nx, ny };
}

/**
 * Number of grid cells `makeStrideGrid` would make, without allocating.
 *
 * @example
 * ```ts
 * import { strideGridSize } from "./stride_grid.ts";
 * const cells = strideGridSize([0, 0, 100, 100], 10);
 * if (cells !== 121) throw new Error(`11 × 11 centres expected, got ${cells}`);
 * ```
 */
export function strideGridSize(
  bboxUm: [number, number, number, number],
  strideUm: number,
  marginUm: [number, number] = [0, 0],
): number {
  const [minX, minY, maxX, maxY] = bboxUm;
  const x0 = Math.floor((minX - marginUm[0]) / strideUm) * strideUm;
  const y0 = Math.floor((minY - marginUm[1]) / strideUm) * strideUm;
  const nx = Math.max(1, Math.floor((maxX + marginUm[0] - x0) / strideUm) + 1);
  const ny = Math.max(1, Math.floor((maxY + marginUm[1] - y0) / strideUm) + 1);
  return nx * ny;
}
