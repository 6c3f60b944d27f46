/**
 * Simplifying traced outlines without making them cross. Private to
 * lib/tissue.
 *
 * Rings are simplified one by one with the Douglas–Peucker algorithm
 * (Douglas and Peucker 1973, Cartographica 10(2):112–122), distances measured
 * in µm so that the tolerance means the same along x and y. A simplified
 * ring can come to cross itself or another ring where outlines run close
 * together; every such ring is put back as traced (traced rings meet at most
 * at shared corners), and the check repeats until nothing crosses.
 *
 * @module
 */

import type { MultiPolygonPx, Ring } from "../types.ts";

/**
 * Douglas–Peucker simplification of one closed ring (first = last).
 * Coordinates are scaled by (sx, sy) to measure distances.
 */
function simplifyRing(ring: Ring, tolerance: number, sx: number, sy: number): Ring {
  const n = ring.length - 1; // distinct vertices
  if (n <= 4 || tolerance <= 0) return ring;
  const X = (i: number) => ring[i % n][0] * sx, Y = (i: number) => ring[i % n][1] * sy;
  // anchor at vertex 0 and the vertex farthest from it
  let far = 0, farD = -1;
  for (let i = 1; i < n; i++) {
    const d = (X(i) - X(0)) ** 2 + (Y(i) - Y(0)) ** 2;
    if (d > farD) {
      farD = d;
      far = i;
    }
  }
  const keep = new Uint8Array(n + 1);
  keep[0] = keep[far] = keep[n] = 1;
  const stack: [number, number][] = [[0, far], [far, n]];
  const tol2 = tolerance * tolerance;
  while (stack.length > 0) {
    const [a, b] = stack.pop()!;
    if (b - a < 2) continue;
    const ax = X(a), ay = Y(a), bx = X(b), by = Y(b);
    const dx = bx - ax, dy = by - ay, len2 = dx * dx + dy * dy;
    let worst = -1, worstD = -1;
    for (let i = a + 1; i < b; i++) {
      const px = X(i) - ax, py = Y(i) - ay;
      let d: number;
      if (len2 === 0) d = px * px + py * py;
      else {
        const cross = px * dy - py * dx;
        d = cross * cross / len2;
      }
      if (d > worstD) {
        worstD = d;
        worst = i;
      }
    }
    if (worstD > tol2) {
      keep[worst] = 1;
      stack.push([a, worst], [worst, b]);
    }
  }
  const out: Ring = [];
  for (let i = 0; i < n; i++) if (keep[i]) out.push([ring[i][0], ring[i][1]]);
  if (out.length < 4) return ring; // would collapse a small ring: keep it as traced
  out.push([out[0][0], out[0][1]]);
  return out;
}

/**
 * Simplifies every ring of `mp` with `tolerance` (in the units of the
 * scaled coordinates, x·sx and y·sy), keeping the traced ring wherever the
 * simplified one would meet another ring or itself except at a shared
 * vertex.
 *
 * @returns The simplified polygons and how many rings had to stay as traced.
 */
export function simplifyPolygons(
  mp: MultiPolygonPx,
  tolerance: number,
  sx: number,
  sy: number,
): { polygons: MultiPolygonPx; keptAsTraced: number } {
  const traced: Ring[] = mp.flat();
  const current: Ring[] = traced.map((r) => simplifyRing(r, tolerance, sx, sy));
  const reverted = new Set<number>();
  for (let round = 0; round <= traced.length; round++) {
    const bad = crossingRings(current);
    let changed = false;
    for (const r of bad) {
      if (current[r] !== traced[r]) {
        current[r] = traced[r];
        reverted.add(r);
        changed = true;
      }
    }
    if (!changed) break;
  }
  const polygons: MultiPolygonPx = [];
  let k = 0;
  for (const p of mp) polygons.push(p.map(() => current[k++]));
  return { polygons, keptAsTraced: reverted.size };
}

/**
 * Rings with an edge that meets another edge anywhere but at a vertex both
 * edges share (crossings, a vertex on another edge, overlaps). Edges are
 * sorted into a uniform grid so the check is about linear in the edge count.
 */
function crossingRings(rings: Ring[]): Set<number> {
  const ax: number[] = [], ay: number[] = [], bx: number[] = [], by: number[] = [];
  const ringOf: number[] = [], idx: number[] = [], lenOf: number[] = [];
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity, total = 0;
  rings.forEach((r, ri) => {
    for (let i = 0; i + 1 < r.length; i++) {
      ax.push(r[i][0]), ay.push(r[i][1]), bx.push(r[i + 1][0]), by.push(r[i + 1][1]);
      ringOf.push(ri), idx.push(i), lenOf.push(r.length - 1);
      minX = Math.min(minX, r[i][0]), maxX = Math.max(maxX, r[i][0]);
      minY = Math.min(minY, r[i][1]), maxY = Math.max(maxY, r[i][1]);
      total += Math.hypot(r[i + 1][0] - r[i][0], r[i + 1][1] - r[i][1]);
    }
  });
  const m = ax.length;
  const bad = new Set<number>();
  if (m === 0) return bad;
  const cell = Math.max(1e-9, 2 * total / m, (maxX - minX + maxY - minY) / 2048);
  const nx = Math.floor((maxX - minX) / cell) + 1, ny = Math.floor((maxY - minY) / cell) + 1;
  const grid = new Map<number, number[]>();
  const cx = (x: number) => Math.min(nx - 1, Math.floor((x - minX) / cell));
  const cy = (y: number) => Math.min(ny - 1, Math.floor((y - minY) / cell));
  for (let e = 0; e < m; e++) {
    const i0 = cx(Math.min(ax[e], bx[e])), i1 = cx(Math.max(ax[e], bx[e]));
    const j0 = cy(Math.min(ay[e], by[e])), j1 = cy(Math.max(ay[e], by[e]));
    for (let j = j0; j <= j1; j++) {
      for (let i = i0; i <= i1; i++) {
        const key = j * nx + i;
        const list = grid.get(key);
        if (list === undefined) grid.set(key, [e]);
        else list.push(e);
      }
    }
  }
  for (const [key, list] of grid) {
    const ci = key % nx, cj = (key - ci) / nx;
    for (let s = 0; s < list.length; s++) {
      for (let t = s + 1; t < list.length; t++) {
        const e = list[s], f = list[t];
        // test each pair once: in the first cell both edges' boxes share
        const i0 = Math.max(cx(Math.min(ax[e], bx[e])), cx(Math.min(ax[f], bx[f])));
        const j0 = Math.max(cy(Math.min(ay[e], by[e])), cy(Math.min(ay[f], by[f])));
        if (i0 !== ci || j0 !== cj) continue;
        if (ringOf[e] === ringOf[f]) {
          const d = Math.abs(idx[e] - idx[f]);
          if (d === 1 || d === lenOf[e] - 1) {
            // neighbours along the ring share one vertex; they only fail by folding back
            if (foldsBack(e, f)) bad.add(ringOf[e]);
            continue;
          }
        }
        if (edgesMeetBadly(e, f)) {
          bad.add(ringOf[e]);
          bad.add(ringOf[f]);
        }
      }
    }
  }
  return bad;

  function orient(px: number, py: number, qx: number, qy: number, rx: number, ry: number) {
    const v = (qx - px) * (ry - py) - (qy - py) * (rx - px);
    return v > 0 ? 1 : v < 0 ? -1 : 0;
  }
  function onSegment(e: number, x: number, y: number): boolean {
    return Math.min(ax[e], bx[e]) <= x && x <= Math.max(ax[e], bx[e]) &&
      Math.min(ay[e], by[e]) <= y && y <= Math.max(ay[e], by[e]);
  }
  function isEnd(e: number, x: number, y: number): boolean {
    return (ax[e] === x && ay[e] === y) || (bx[e] === x && by[e] === y);
  }
  function foldsBack(e: number, f: number): boolean {
    // consecutive edges overlap when collinear and pointing back at each other
    const o = orient(ax[e], ay[e], bx[e], by[e], ax[f], ay[f]) === 0 &&
      orient(ax[e], ay[e], bx[e], by[e], bx[f], by[f]) === 0;
    if (!o) return false;
    const ex = bx[e] - ax[e], ey = by[e] - ay[e], fx = bx[f] - ax[f], fy = by[f] - ay[f];
    return ex * fx + ey * fy < 0;
  }
  function edgesMeetBadly(e: number, f: number): boolean {
    const o1 = orient(ax[e], ay[e], bx[e], by[e], ax[f], ay[f]);
    const o2 = orient(ax[e], ay[e], bx[e], by[e], bx[f], by[f]);
    const o3 = orient(ax[f], ay[f], bx[f], by[f], ax[e], ay[e]);
    const o4 = orient(ax[f], ay[f], bx[f], by[f], bx[e], by[e]);
    if (o1 * o2 < 0 && o3 * o4 < 0) return true; // a proper crossing
    const sameA = isEnd(f, ax[e], ay[e]), sameB = isEnd(f, bx[e], by[e]);
    if (sameA && sameB) return true; // the same edge twice
    // an end point lying on the other edge, other than a shared vertex
    if (o1 === 0 && onSegment(e, ax[f], ay[f]) && !isEnd(e, ax[f], ay[f])) return true;
    if (o2 === 0 && onSegment(e, bx[f], by[f]) && !isEnd(e, bx[f], by[f])) return true;
    if (o3 === 0 && onSegment(f, ax[e], ay[e]) && !isEnd(f, ax[e], ay[e])) return true;
    if (o4 === 0 && onSegment(f, bx[e], by[e]) && !isEnd(f, bx[e], by[e])) return true;
    // collinear edges sharing one vertex but running along each other
    if ((sameA || sameB) && o1 === 0 && o2 === 0) {
      const [px, py] = sameA ? [ax[e], ay[e]] : [bx[e], by[e]];
      const [qx, qy] = sameA ? [bx[e], by[e]] : [ax[e], ay[e]];
      const [rx, ry] = ax[f] === px && ay[f] === py ? [bx[f], by[f]] : [ax[f], ay[f]];
      return (qx - px) * (rx - px) + (qy - py) * (ry - py) > 0;
    }
    return false;
  }
}
