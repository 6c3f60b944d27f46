/**
 * Moving a placement off the knife edge: the exact hotspot search often
 * returns a centre with figures exactly on the window's rim, so a centre
 * printed to two decimals may recount one or two fewer. Settling moves the
 * centre, within the placements that hold exactly the same figures, to one
 * far from every rim, and says how far it may move (`marginUm`).
 *
 * @module
 */

import type { Placement, PreparedCase, WindowShape } from "./engine_types.ts";
import { windowExtents } from "./window_contains.ts";
import { umToPx } from "../units.ts";

/** Options of {@linkcode settlePlacement}. */
export interface SettlePlacementOptions {
  /** Exact area of the valid region inside a window (µm²), as the search uses. */
  overlap: {
    rect(bbox: [number, number, number, number]): number;
    disk(center: [number, number], radius: number): number;
  };
  /** Least coverage of an admissible window. */
  minCoverage: number;
}

/** Coverage is compared with this slack, as in the search. */
const ADMIT_EPS = 1e-9;

/**
 * Settles a placement: the same figures in the window, the same count, an
 * admissible coverage, and the centre as far from a count change as a
 * deterministic pattern search finds.
 *
 * The margin at a centre is the least distance it can move (along x or y for
 * rectangles, any direction for circles; in µm) before a figure leaves or
 * enters the closed window: for a rectangle min over figures inside of
 * min(W/2 − |dx|, H/2 − |dy|) and over figures outside of
 * max(|dx| − W/2, |dy| − H/2); for a circle r − d inside and d − r outside.
 * A margin of 0 means the figures span the window exactly, so only that
 * centre holds them all.
 *
 * @param prepared The counted figures in µm and the slide's mpp.
 * @param window The window of the placement.
 * @param p The placement (from the search: count exact, centre on a rim).
 * @param options Exact coverage and the least coverage.
 * @returns The settled placement with `marginUm` set.
 *
 * @example Two figures 400 µm apart in a 1000 µm wide window
 * ```ts
 * import { settlePlacement } from "./settle_placement.ts";
 * const window = { shape: "rect" as const, areaMm2: 1, widthUm: 1000, heightUm: 1000, aspect: [1, 1] as [number, number] };
 * const prepared = {
 *   xUm: new Float64Array([0, 400]), yUm: new Float64Array([0, 0]),
 *   slide: { id: "QVT-24-900", mppX: 0.5, mppY: 0.5 },
 * };
 * const everywhere = { rect: (b: number[]) => (b[2] - b[0]) * (b[3] - b[1]), disk: (_c: number[], r: number) => Math.PI * r * r };
 * // The search's centre puts the first figure on the left rim.
 * const p = { centerUm: [500, 0] as [number, number], centerPx: [1000, 0] as [number, number], count: 2, coverage: 1, perMm2: 2 };
 * const s = settlePlacement(prepared, window, p, { overlap: everywhere, minCoverage: 0.95 });
 * if (s.count !== 2 || !(s.marginUm! > 250)) throw new Error(`margin ${s.marginUm}`);
 * ```
 */
export function settlePlacement(
  prepared: Pick<PreparedCase, "xUm" | "yUm" | "slide">,
  window: WindowShape,
  p: Placement,
  options: SettlePlacementOptions,
): Placement {
  const e = windowExtents(window);
  const rect = window.shape === "rect";
  const [c0x, c0y] = p.centerUm;
  // The centre moves at most one half-window; figures farther than that plus
  // a whole window can neither leave nor enter.
  const maxMove = Math.max(e.halfX, e.halfY);
  const reach = 3 * maxMove;
  // Only figures within reach of the window's possible moves matter.
  const xs: number[] = [], ys: number[] = [], inside: boolean[] = [];
  const { xUm, yUm } = prepared;
  for (let k = 0; k < xUm.length; k++) {
    const dx = xUm[k] - c0x, dy = yUm[k] - c0y;
    if (Math.abs(dx) > reach || Math.abs(dy) > reach) continue;
    xs.push(xUm[k]);
    ys.push(yUm[k]);
    inside.push(
      rect ? Math.abs(dx) <= e.halfX && Math.abs(dy) <= e.halfY : dx * dx + dy * dy <= e.radius2,
    );
  }
  const r = e.halfX;
  const margin = (cx: number, cy: number): number => {
    let m = Infinity;
    for (let k = 0; k < xs.length; k++) {
      const dx = Math.abs(xs[k] - cx), dy = Math.abs(ys[k] - cy);
      let d: number;
      if (rect) {
        d = inside[k] ? Math.min(e.halfX - dx, e.halfY - dy) : Math.max(dx - e.halfX, dy - e.halfY);
      } else {
        const dist = Math.hypot(dx, dy);
        d = inside[k] ? r - dist : dist - r;
      }
      if (d < m) m = d;
    }
    return m;
  };
  const coverage = (cx: number, cy: number): number => {
    const a = rect
      ? options.overlap.rect([cx - e.halfX, cy - e.halfY, cx + e.halfX, cy + e.halfY])
      : options.overlap.disk([cx, cy], r);
    const v = a / e.areaUm2;
    return v < 0 ? 0 : v > 1 ? 1 : v;
  };
  let cx = c0x, cy = c0y;
  let best = margin(cx, cy);
  let cov = p.coverage;
  if (best < 0) return { ...p, marginUm: 0 }; // not the search's own placement: leave it
  const dirs = [[1, 0], [-1, 0], [0, 1], [0, -1], [1, 1], [1, -1], [-1, 1], [-1, -1]];
  let step = Math.max(e.halfX, e.halfY) / 4;
  const minStep = 1e-4 * Math.max(e.halfX, e.halfY);
  for (let iter = 0; iter < 400 && step >= minStep; iter++) {
    let moved = false;
    for (const [ux, uy] of dirs) {
      const nx = cx + ux * step, ny = cy + uy * step;
      if (Math.abs(nx - c0x) > maxMove || Math.abs(ny - c0y) > maxMove) continue;
      const m = margin(nx, ny);
      if (!(m > best + 1e-9)) continue;
      const c = coverage(nx, ny);
      if (c < options.minCoverage - ADMIT_EPS) continue;
      cx = nx, cy = ny, best = m, cov = c, moved = true;
      break;
    }
    if (!moved) step /= 2;
  }
  return {
    centerUm: [cx, cy],
    centerPx: umToPx([cx, cy], prepared.slide),
    count: p.count,
    coverage: cov,
    perMm2: p.perMm2,
    // Capped at the largest move looked at (half the window).
    marginUm: Math.min(maxMove, Math.max(0, best)),
  };
}
