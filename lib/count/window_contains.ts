/**
 * The one membership test of a closed window, shared by every count.
 *
 * @module
 */

import type { WindowShape } from "./engine_types.ts";

/** Derived constants of a window that every membership test uses. */
export interface WindowExtents {
  /** Half width (rect) or radius (circle), µm. */
  halfX: number;
  /** Half height (rect) or radius (circle), µm. */
  halfY: number;
  /** Squared radius (circle) or 0 (rect), µm². */
  radius2: number;
  /** Window area, µm². */
  areaUm2: number;
}

/**
 * Half extents, squared radius and area of a window, µm. Computed in one
 * place so that grid stamping and exact counting compare the same numbers.
 *
 * @example A 1000 × 500 µm rectangle
 * ```ts
 * import { windowExtents } from "./window_contains.ts";
 * const e = windowExtents({ shape: "rect", areaMm2: 0.5, widthUm: 1000, heightUm: 500, aspect: [2, 1] });
 * if (e.halfX !== 500 || e.halfY !== 250 || e.areaUm2 !== 500000) throw new Error(`extents ${JSON.stringify(e)}`);
 * ```
 */
export function windowExtents(window: WindowShape): WindowExtents {
  if (window.shape === "rect") {
    return {
      halfX: window.widthUm / 2,
      halfY: window.heightUm / 2,
      radius2: 0,
      areaUm2: window.widthUm * window.heightUm,
    };
  }
  const r = window.diameterUm / 2;
  return { halfX: r, halfY: r, radius2: r * r, areaUm2: Math.PI * r * r };
}

/**
 * Whether the closed window centred at (cx, cy) contains the point (x, y);
 * everything in µm. A point exactly on the edge is inside.
 *
 * Rectangle: |x − cx| ≤ W/2 and |y − cy| ≤ H/2. Circle: (x − cx)² + (y − cy)² ≤ r²,
 * evaluated as `dx * dx + dy * dy <= r * r` with dx = x − cx, dy = y − cy,
 * exactly as the grid stamping evaluates it.
 *
 * @example A figure on the edge counts
 * ```ts
 * import { windowContains, windowExtents } from "./window_contains.ts";
 * const e = windowExtents({ shape: "rect", areaMm2: 1, widthUm: 1000, heightUm: 1000, aspect: [1, 1] });
 * if (!windowContains(e, true, 0, 0, 500, -500)) throw new Error("corner is inside");
 * if (windowContains(e, true, 0, 0, 500.001, 0)) throw new Error("outside");
 * ```
 */
export function windowContains(
  e: WindowExtents,
  isRect: boolean,
  cx: number,
  cy: number,
  x: number,
  y: number,
): boolean {
  if (isRect) return Math.abs(x - cx) <= e.halfX && Math.abs(y - cy) <= e.halfY;
  const dx = x - cx, dy = y - cy;
  return dx * dx + dy * dy <= e.radius2;
}

/**
 * Exact count of points inside the closed window centred at (cx, cy).
 *
 * @example
 * ```ts
 * import { countInWindow } from "./window_contains.ts";
 * const w = { shape: "circle" as const, areaMm2: Math.PI * 1e-6, diameterUm: 2 };
 * const n = countInWindow(new Float64Array([0, 1, 2]), new Float64Array([0, 0, 0]), w, 0, 0);
 * if (n !== 2) throw new Error(`${n} figures in the closed circle, expected 2 (one on its edge)`);
 * ```
 */
export function countInWindow(
  xUm: Float64Array,
  yUm: Float64Array,
  window: WindowShape,
  cx: number,
  cy: number,
): number {
  const e = windowExtents(window);
  const rect = window.shape === "rect";
  let n = 0;
  for (let k = 0; k < xUm.length; k++) {
    if (windowContains(e, rect, cx, cy, xUm[k], yUm[k])) n++;
  }
  return n;
}
