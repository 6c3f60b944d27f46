/**
 * Test helpers: a plain count map built here (independent of the engine) and
 * seeded uniform points in simple regions.
 */

import type { StrideGrid, WindowShape } from "../../lib/count/engine_types.ts";
import type { MultiPolygonPx } from "../../lib/types.ts";
import { seededRandom } from "../../lib/random.ts";

/** Exact closed-window counts at every grid centre (direct stamping, per point and row). */
export function windowCountsHere(
  xUm: Float64Array,
  yUm: Float64Array,
  window: WindowShape,
  grid: StrideGrid,
): Int32Array {
  const { x0Um, y0Um, strideUm: s, nx, ny } = grid;
  const counts = new Int32Array(nx * ny);
  const hw = window.shape === "rect" ? window.widthUm / 2 : window.diameterUm / 2;
  const hh = window.shape === "rect" ? window.heightUm / 2 : window.diameterUm / 2;
  for (let k = 0; k < xUm.length; k++) {
    const x = xUm[k], y = yUm[k];
    const j0 = Math.max(0, Math.ceil((y - hh - y0Um) / s) - 1);
    const j1 = Math.min(ny - 1, Math.floor((y + hh - y0Um) / s) + 1);
    const i0 = Math.max(0, Math.ceil((x - hw - x0Um) / s) - 1);
    const i1 = Math.min(nx - 1, Math.floor((x + hw - x0Um) / s) + 1);
    for (let j = j0; j <= j1; j++) {
      const dy = y - (y0Um + j * s);
      for (let i = i0; i <= i1; i++) {
        const dx = x - (x0Um + i * s);
        const inside = window.shape === "rect"
          ? Math.abs(dx) <= hw && Math.abs(dy) <= hh
          : dx * dx + dy * dy <= hw * hw;
        if (inside) counts[j * nx + i]++;
      }
    }
  }
  return counts;
}

/** Admissible flags: the whole window inside an axis-aligned box [minX, minY, maxX, maxY]. */
export function admissibleInBox(
  window: WindowShape,
  grid: StrideGrid,
  box: [number, number, number, number],
): Uint8Array {
  const hw = window.shape === "rect" ? window.widthUm / 2 : window.diameterUm / 2;
  const hh = window.shape === "rect" ? window.heightUm / 2 : window.diameterUm / 2;
  const out = new Uint8Array(grid.nx * grid.ny);
  for (let j = 0; j < grid.ny; j++) {
    for (let i = 0; i < grid.nx; i++) {
      const x = grid.x0Um + i * grid.strideUm, y = grid.y0Um + j * grid.strideUm;
      if (x - hw >= box[0] && x + hw <= box[2] && y - hh >= box[1] && y + hh <= box[3]) {
        out[j * grid.nx + i] = 1;
      }
    }
  }
  return out;
}

/** A rectangle region [minX, minY, maxX, maxY] as a MultiPolygon (µm). */
export function boxRegion(box: [number, number, number, number]): MultiPolygonPx {
  const [a, b, c, d] = box;
  return [[[[a, b], [c, b], [c, d], [a, d], [a, b]]]];
}

/** n seeded uniform points in a box. */
export function uniformInBox(
  n: number,
  box: [number, number, number, number],
  seed: number,
): { xUm: Float64Array; yUm: Float64Array } {
  const random = seededRandom(seed);
  const xUm = new Float64Array(n), yUm = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    xUm[k] = box[0] + random() * (box[2] - box[0]);
    yUm[k] = box[1] + random() * (box[3] - box[1]);
  }
  return { xUm, yUm };
}
