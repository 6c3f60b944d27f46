/**
 * Fast point-in-region tests for many points.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";
import { buildBands, classifyPoint, type EdgeBands, flattenEdges } from "./_edges.ts";

/** A prepared region answering point-in-region queries. */
export interface RegionIndex {
  /** True when `(x, y)` is inside the region or exactly on its boundary. */
  containsPoint(x: number, y: number): boolean;
  /** For each `i`, 1 when `(xs[i], ys[i])` is inside or on the boundary, else 0. */
  containsPoints(xs: Float64Array, ys: Float64Array): Uint8Array;
}

/**
 * Prepares a region for point-in-region queries.
 *
 * A coarse raster of cells answers most points at once: cells more than
 * one cell away from every edge are wholly inside or outside (decided by an
 * exact test once per run of such cells along a row). Points in cells near
 * the boundary get the exact crossing-number test, over the edges of one
 * horizontal band only. Coordinates are any planar
 * unit (level-0 pixels, x right, y down, in hotfield).
 *
 * **Boundary rule:** a point exactly on an edge or vertex (exact cross
 * product zero) counts as inside. Holes exclude their interior; their
 * boundary counts as inside too. The region should be non-overlapping
 * (normalized, e.g. from `buildValidRegion`): overlapping polygons are
 * combined by the even-odd rule.
 *
 * Cost: O(n) to build for n edges (plus the raster, up to 4n cells); a query
 * costs O(1) away from the boundary, else the number of edges crossing its
 * band (about the boundary crossings of a horizontal line, plus a few).
 *
 * @param region Polygons (either winding).
 * @returns The index; the region may be changed afterwards without effect.
 *
 * @example A square with a hole; the boundary is inside
 * ```ts
 * import { createRegionIndex } from "hotfield";
 * const outer: [number, number][] = [[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]];
 * const hole: [number, number][] = [[4, 4], [6, 4], [6, 6], [4, 6], [4, 4]];
 * const index = createRegionIndex([[outer, hole]]);
 * if (!index.containsPoint(1, 1)) throw new Error("inside");
 * if (index.containsPoint(5, 5)) throw new Error("in the hole");
 * if (!index.containsPoint(10, 3) || !index.containsPoint(4, 5)) throw new Error("boundary is inside");
 * const inside = index.containsPoints(new Float64Array([1, 5, 11]), new Float64Array([1, 5, 1]));
 * if (inside.join() !== "1,0,0") throw new Error(inside.join());
 * ```
 */
export function createRegionIndex(region: MultiPolygonPx): RegionIndex {
  const edges = flattenEdges(region);
  const bands: EdgeBands = buildBands(edges, 4, 0, true);
  const grid = buildCellGrid(bands);
  const test = (x: number, y: number): boolean => {
    if (grid !== null) {
      const gx = Math.floor((x - grid.x0) / grid.cw), gy = Math.floor((y - grid.y0) / grid.ch);
      if (gx >= 0 && gy >= 0 && gx < grid.nx && gy < grid.ny) {
        const st = grid.state[gy * grid.nx + gx];
        if (st !== BOUNDARY) return st === INSIDE;
      }
    }
    return classifyPoint(bands, x, y) !== 0;
  };
  return {
    containsPoint: test,
    containsPoints(xs: Float64Array, ys: Float64Array): Uint8Array {
      if (xs.length !== ys.length) {
        throw new RangeError(
          `Cannot test points: xs and ys differ in length (${xs.length} and ${ys.length})`,
        );
      }
      const out = new Uint8Array(xs.length);
      for (let i = 0; i < xs.length; i++) out[i] = test(xs[i], ys[i]) ? 1 : 0;
      return out;
    },
  };
}

const OUTSIDE = 0, INSIDE = 1, BOUNDARY = 2;

interface CellGrid {
  x0: number;
  y0: number;
  cw: number;
  ch: number;
  nx: number;
  ny: number;
  state: Uint8Array;
}

/**
 * A coarse raster over the region's box: cells within one cell of an edge
 * are "boundary"; every other cell is wholly inside or outside, decided by
 * one exact test at the start of each run of such cells along a row.
 */
function buildCellGrid(bands: EdgeBands): CellGrid | null {
  const e = bands.edges;
  const n = e.count;
  const w = e.maxX - e.minX, h = e.maxY - e.minY;
  if (n === 0 || !(w > 0) || !(h > 0)) return null;
  const cells = Math.min(1 << 20, Math.max(64, 4 * n));
  const nx = Math.max(1, Math.round(Math.sqrt((cells * w) / h)));
  const ny = Math.max(1, Math.round(cells / nx));
  const cw = w / nx, ch = h / ny;
  const state = new Uint8Array(nx * ny);
  const cellX = (x: number) => {
    const k = Math.floor((x - e.minX) / cw);
    return k < 0 ? 0 : k >= nx ? nx - 1 : k;
  };
  const cellY = (y: number) => {
    const k = Math.floor((y - e.minY) / ch);
    return k < 0 ? 0 : k >= ny ? ny - 1 : k;
  };
  const { x0, y0, x1, y1 } = e;
  for (let i = 0; i < n; i++) {
    const ax = x0[i], ay = y0[i], bx = x1[i], by = y1[i];
    const ylo = ay < by ? ay : by, yhi = ay < by ? by : ay;
    const ja = Math.max(0, cellY(ylo) - 1), jb = Math.min(ny - 1, cellY(yhi) + 1);
    for (let j = ja; j <= jb; j++) {
      // x-range of the edge within the row (widened by a cell against rounding)
      let xa: number, xb: number;
      if (ay === by) {
        xa = ax;
        xb = bx;
      } else {
        const r0 = e.minY + j * ch, r1 = r0 + ch;
        const ya = r0 > ylo ? r0 : ylo, yb = r1 < yhi ? r1 : yhi;
        const k = (bx - ax) / (by - ay);
        xa = ax + ((ya < yb ? ya : ylo) - ay) * k;
        xb = ax + ((ya < yb ? yb : yhi) - ay) * k;
      }
      const ia = Math.max(0, cellX(xa < xb ? xa : xb) - 1);
      const ib = Math.min(nx - 1, cellX(xa < xb ? xb : xa) + 1);
      for (let c = ia; c <= ib; c++) state[j * nx + c] = BOUNDARY;
    }
  }
  for (let j = 0; j < ny; j++) {
    let run = -1; // state of the current run of non-boundary cells, −1 when unknown
    for (let i = 0; i < nx; i++) {
      const c = j * nx + i;
      if (state[c] === BOUNDARY) {
        run = -1;
        continue;
      }
      if (run < 0) {
        const where = classifyPoint(bands, e.minX + (i + 0.5) * cw, e.minY + (j + 0.5) * ch);
        run = where === 2 ? -1 : where;
        if (where === 2) {
          state[c] = BOUNDARY;
          continue;
        }
      }
      state[c] = run === 1 ? INSIDE : OUTSIDE;
    }
  }
  return { x0: e.minX, y0: e.minY, cw, ch, nx, ny, state };
}
