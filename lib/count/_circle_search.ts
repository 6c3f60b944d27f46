/**
 * Best-first branch-and-bound search for circular windows, kept between
 * picks so the top-k and best-field searches do not start over.
 *
 * @module
 */

import type { Placement } from "./engine_types.ts";
import { circleCellFigures } from "./_circle_cell.ts";
import { heapPop, heapPush } from "./_heap.ts";
import {
  addWork,
  ADMIT_EPS,
  blockForbidden,
  type Candidate,
  cellTightBound,
  coverageGrowth,
  exactCoverage,
  isBetter,
  isSeparate,
  placement,
  type SearchState,
  surelyBelow,
} from "./_search_state.ts";

/** Intersections of circles (a, ra) and (b, rb). */
function circleIntersections(
  ax: number,
  ay: number,
  ra: number,
  bx: number,
  by: number,
  rb: number,
): [number, number][] {
  const dx = bx - ax, dy = by - ay;
  const d2 = dx * dx + dy * dy;
  if (d2 === 0) return [];
  const d = Math.sqrt(d2);
  if (d > ra + rb || d < Math.abs(ra - rb)) return [];
  const l = (ra * ra - rb * rb + d2) / (2 * d);
  const h = Math.sqrt(Math.max(0, ra * ra - l * l));
  const mx = ax + (l * dx) / d, my = ay + (l * dy) / d;
  const ux = -dy / d, uy = dx / d;
  return [[mx + h * ux, my + h * uy], [mx - h * ux, my - h * uy]];
}

/**
 * One entry of the circle search's queue: no admissible count in what it
 * stands for exceeds `bound`. Kinds, in queue order at equal bounds:
 * −1 one stride cell queued again at its tighter bound (`cells[0]`; first,
 * so it is opened whenever it could have been at its grid bound and the
 * search finds what it finds without it), 0 sorted candidates of a leaf
 * (the next one is `list[at]`), 1 a square of centres (half side `h`,
 * figures `sureIn` surely inside every window centred in it, the uncertain
 * ones `A`), 2 the stride cells not yet opened (grid indices `cells`, next
 * `cells[at]`).
 */
interface Item {
  bound: number;
  kind: -1 | 0 | 1 | 2;
  x: number;
  y: number;
  h: number;
  sureIn: number;
  A: number[] | null;
  list: Candidate[] | null;
  cells: Int32Array | null;
  at: number;
  /** Squares: 1 when every window centred in it is surely admissible. */
  safe: number;
}

/** A leaf whose candidates were listed, kept to list again near later fields. */
interface Leaf {
  x: number;
  y: number;
  h: number;
  sureIn: number;
  A: number[];
  item: Item | null;
}

/** What the circle search keeps between picks. */
export interface CircleSearchMemo {
  heap: Item[];
  /** The chosen windows the queue already accounts for. */
  chosen: Placement[];
  leaves: Leaf[];
}

/** Leaves of the circle subdivision are at most this fraction of the stride wide. */
const CIRCLE_LEAF = 1 / 64;
/** A square with at most this many uncertain figures is a leaf. */
const LEAF_FIGURES = 24;
/** Equal-count candidates compared on coverage after the first admissible one. */
const TIE_LIMIT = 32;

function item(
  kind: -1 | 0 | 1 | 2,
  bound: number,
  x: number,
  y: number,
  h = 0,
  sureIn = 0,
  A: number[] | null = null,
  list: Candidate[] | null = null,
  cells: Int32Array | null = null,
): Item {
  return { bound, kind, x, y, h, sureIn, A, list, cells, at: 0, safe: 0 };
}

/** Queue order: higher bound, then kind, then smaller y, then smaller x. */
function before(a: Item, b: Item): boolean {
  if (a.bound !== b.bound) return a.bound > b.bound;
  if (a.kind !== b.kind) return a.kind < b.kind;
  if (a.y !== b.y) return a.y < b.y;
  return a.x < b.x;
}

function push(heap: Item[], it: Item): void {
  heapPush(heap, it, before);
}

function pop(heap: Item[]): Item {
  return heapPop(heap, before);
}

/** Re-queues a list item at its next candidate, if any. */
function pushList(heap: Item[], it: Item): void {
  const list = it.list!;
  if (it.at >= list.length) return;
  const c = list[it.at];
  it.bound = c.count;
  it.x = c.cx;
  it.y = c.cy;
  push(heap, it);
}

function candidateItem(c: Candidate): Item {
  return item(0, c.count, c.cx, c.cy, 0, 0, null, [c]);
}

/** A fresh queue: every stride cell that might hold an admissible window. */
function startCircleSearch(st: SearchState): CircleSearchMemo {
  const { map } = st;
  const { nx, ny, x0Um, y0Um, strideUm: s } = map.grid;
  const minCov = map.minCoverage - ADMIT_EPS;
  // By descending bound, row-major among equal bounds: a counting sort, as
  // bounds are small whole numbers.
  const n = nx * ny, cov = map.coverage, bound = st.bound, slack = st.coverageSlack;
  let maxBound = 0, kept = 0;
  for (let k = 0; k < n; k++) {
    if (cov[k] + slack < minCov) continue;
    kept++;
    if (bound[k] > maxBound) maxBound = bound[k];
  }
  const start = new Int32Array(maxBound + 2);
  for (let k = 0; k < n; k++) if (cov[k] + slack >= minCov) start[maxBound - bound[k] + 1]++;
  for (let b = 0; b <= maxBound; b++) start[b + 1] += start[b];
  const sorted = new Int32Array(kept);
  for (let k = 0; k < n; k++) {
    if (cov[k] + slack >= minCov) sorted[start[maxBound - bound[k]]++] = k;
  }
  const heap: Item[] = [];
  if (sorted.length > 0) {
    const k = sorted[0];
    const it = item(2, st.bound[k], x0Um + (k % nx) * s, y0Um + Math.floor(k / nx) * s);
    it.cells = sorted;
    push(heap, it);
  }
  return { heap, chosen: [], leaves: [] };
}

/**
 * Accounts for a newly chosen window p: leaves near the boundary of the zone
 * it excludes are listed again (their new vertices lie on that boundary),
 * leaves inside the zone are dropped.
 */
function applyChosen(st: SearchState, cs: CircleSearchMemo, p: Placement): void {
  const r = st.e.halfX, tol = 1e-6 * r;
  const [qx, qy] = p.centerUm;
  const kept: Leaf[] = [];
  addWork(st, cs.leaves.length);
  for (const leaf of cs.leaves) {
    const halfDiag = (leaf.h + tol) * Math.SQRT2;
    const dq = Math.hypot(leaf.x - qx, leaf.y - qy);
    if (Math.abs(dq - 2 * r) > 2 * halfDiag && dq >= 2 * r) {
      kept.push(leaf);
      continue;
    }
    if (leaf.item) leaf.item.list = null;
    leaf.item = null;
    if (dq + halfDiag < 2 * r) continue;
    push(
      cs.heap,
      item(1, leaf.sureIn + leaf.A.length, leaf.x, leaf.y, leaf.h, leaf.sureIn, leaf.A),
    );
  }
  cs.leaves = kept;
}

/** Whether every centre of the square (cx, cy, half side h) overlaps a chosen window. */
function squareForbidden(
  st: SearchState,
  cx: number,
  cy: number,
  h: number,
  chosen: Placement[],
): boolean {
  const reach = (h + 1e-6 * st.e.halfX) * Math.SQRT2;
  for (const p of chosen) {
    if (Math.hypot(cx - p.centerUm[0], cy - p.centerUm[1]) + reach < 2 * st.e.halfX) return true;
  }
  return false;
}

/**
 * Splits the figures P (a parent's uncertain ones, or all nearby) for the
 * square of centres (cx, cy, half side h) into a count surely inside every
 * window centred in it and a list of uncertain ones, within (h + tol)·√2 +
 * tol of the rim; the others are outside every such window.
 */
function square(
  st: SearchState,
  cx: number,
  cy: number,
  h: number,
  sureInParent: number,
  P: number[],
): Item {
  const r = st.e.halfX;
  const tol = 1e-6 * r;
  const band = (h + tol) * Math.SQRT2 + tol;
  const lo = r - band, hi = r + band;
  const lo2 = lo > 0 ? lo * lo : -1, hi2 = hi * hi;
  const A: number[] = [];
  let sureIn = sureInParent;
  // Each figure tested, and the square's own queueing (measured at about 16 tests).
  addWork(st, P.length + 16);
  const xU = st.xUm, yU = st.yUm;
  for (let t = 0; t < P.length; t++) {
    const k = P[t];
    const dx = xU[k] - cx, dy = yU[k] - cy;
    const d2 = dx * dx + dy * dy;
    if (d2 < lo2) sureIn++;
    else if (d2 <= hi2) A.push(k);
  }
  return item(1, sureIn + A.length, cx, cy, h, sureIn, A);
}

/**
 * The best admissible circle placement separate from `chosen` (which must
 * extend the `chosen` of the previous call on `st`, or the search restarts).
 *
 * Best-first branch and bound over one queue: stride cells by their grid
 * bound (window enlarged by s·√2/2 in radius); a cell opened (after one
 * exact coverage query rules it in) gives its grid centre as a candidate and
 * its square of centres; smaller squares may be ruled out by a query of their
 * own where the coverage limit binds; a square is split into
 * four while it has many uncertain figures (its bound is the sure count plus
 * the uncertain ones, so splitting tightens it); a leaf lists its
 * arrangement vertices (see {@linkcode circleLeaf}) with exact counts. The
 * first admissible candidate taken from the queue holds at least as many
 * figures as anything left in it. Equal counts are then compared on coverage
 * among the candidates already listed (at most {@linkcode TIE_LIMIT} more),
 * then smaller y, then smaller x. The queue is kept: later picks resume it,
 * relisting only leaves near the new no-overlap zone.
 */
export function circleSearchBest(st: SearchState, chosen: Placement[]): Placement | null {
  let cs = st.circle as CircleSearchMemo | null;
  const fresh = !cs || cs.chosen.length > chosen.length ||
    cs.chosen.some((p, i) => chosen[i] !== p);
  if (fresh) st.circle = cs = startCircleSearch(st);
  for (let i = cs!.chosen.length; i < chosen.length; i++) applyChosen(st, cs!, chosen[i]);
  cs!.chosen = chosen.slice();
  const heap = cs!.heap;
  const { map } = st;
  const { nx, x0Um, y0Um, strideUm: s } = map.grid;
  const minCov = map.minCoverage - ADMIT_EPS;
  const r = st.e.halfX, tol = 1e-6 * r;
  const reachUm = s / 2 + 4e-6 * r;
  let best: Placement | null = null;
  let ties = 0;
  const held: Candidate[] = [];
  while (heap.length > 0) {
    const top = heap[0];
    if (best) {
      if (top.bound < best.count) break;
      if (top.bound === best.count) {
        if (top.kind !== 0 || best.coverage >= 1 - 1e-9 || ties >= TIE_LIMIT) break;
      }
    }
    pop(heap);
    if (top.kind === 2 || top.kind === -1) {
      const cells = top.cells!;
      const k = cells[top.at++];
      if (top.at < cells.length) {
        const k2 = cells[top.at];
        top.bound = st.bound[k2];
        top.x = x0Um + (k2 % nx) * s;
        top.y = y0Um + Math.floor(k2 / nx) * s;
        push(heap, top);
      }
      if (blockForbidden(st, k, chosen)) continue;
      if (top.kind === 2) {
        // A tighter bound queues the cell again, to be opened only if it still could win.
        const tight = cellTightBound(st, k);
        if (tight < st.bound[k]) {
          const again = item(-1, tight, x0Um + (k % nx) * s, y0Um + Math.floor(k / nx) * s);
          again.cells = Int32Array.of(k);
          push(heap, again);
          continue;
        }
      }
      st.stats.blocks++;
      st.opened++;
      const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
      // One exact query bounds every centre of the cell (candidates may sit a
      // circle tolerance outside it) more tightly than the map's slack; a map
      // of coverage bounds may already settle it either way (a cell kept or
      // left safe only for want of the query just gets more exact queries later).
      const grow = coverageGrowth(st, reachUm, reachUm) + 1e-7;
      const low = map.coverageLow;
      let cov: number;
      if (low && map.coverage[k] + grow < minCov) continue;
      if (low && low[k] - grow >= minCov) cov = low[k];
      else cov = exactCoverage(st, cx, cy);
      if (cov + grow < minCov) continue;
      const F = circleCellFigures(st, cx, cy, s / 2);
      push(heap, candidateItem({ cx, cy, count: F.count }));
      const root = item(1, F.sureIn + F.A.length, cx, cy, s / 2, F.sureIn, F.A);
      if (root.bound > st.bound[k]) root.bound = st.bound[k];
      if (cov - grow >= minCov) root.safe = 1;
      push(heap, root);
    } else if (top.kind === 1) {
      if (squareForbidden(st, top.x, top.y, top.h, chosen)) continue;
      if (surelyBelow(st, top.x, top.y, minCov, top.h + tol)) continue;
      // Below the cell, one exact query can rule out a whole square where the
      // coverage limit binds (the cell's own query was at its centre).
      if (!top.safe && top.h < s / 2 && top.h >= s / 16) {
        const cov = exactCoverage(st, top.x, top.y);
        if (cov + coverageGrowth(st, top.h + tol, top.h + tol) + 1e-7 < minCov) continue;
      }
      const A = top.A!;
      if (top.h <= s * CIRCLE_LEAF / 2 || A.length <= LEAF_FIGURES) {
        const out: Candidate[] = [];
        circleLeaf(st, top.x, top.y, top.h, top.sureIn, A, chosen, out);
        st.stats.candidates += out.length;
        out.sort((a, b) => b.count - a.count || a.cy - b.cy || a.cx - b.cx);
        const leaf: Leaf = { x: top.x, y: top.y, h: top.h, sureIn: top.sureIn, A, item: null };
        cs!.leaves.push(leaf);
        if (out.length > 0) {
          const li = item(0, 0, 0, 0, 0, 0, null, out);
          leaf.item = li;
          pushList(heap, li);
        }
        continue;
      }
      const q = top.h / 2;
      for (const [dx, dy] of QUADRANTS) {
        const child = square(st, top.x + dx * q, top.y + dy * q, q, top.sureIn, A);
        if (child.bound > top.bound) child.bound = top.bound;
        child.safe = top.safe;
        push(heap, child);
      }
    } else {
      if (!top.list) continue;
      const c = top.list[top.at++];
      pushList(heap, top);
      if (!isSeparate(st, c.cx, c.cy, chosen)) continue;
      if (surelyBelow(st, c.cx, c.cy, minCov)) continue;
      const cov = exactCoverage(st, c.cx, c.cy);
      if (cov < minCov) continue;
      const p = placement(st, c.cx, c.cy, c.count, cov);
      held.push(c);
      if (best) ties++;
      if (isBetter(p, best)) best = p;
    }
  }
  // Admissible candidates go back: a caller may not keep the result.
  for (const c of held) push(heap, candidateItem(c));
  return best;
}

const QUADRANTS: [number, number][] = [[-1, -1], [1, -1], [-1, 1], [1, 1]];

/**
 * Candidates of one leaf square (half side hCell): `sureIn` figures are inside
 * every window centred in it, `A` are the only others that can be. The
 * candidates are the vertices of the arrangement of radius-r circles about
 * the figures of A that fall in the square (two figures on the rim: the
 * intersections of their circles), the rim point of each figure nearest the
 * square's centre, and points on the boundary of each chosen window's
 * no-overlap zone. Each is nudged towards the lens of its figures until they
 * test inside, then counted exactly (sure ones plus A tested one by one).
 */
function circleLeaf(
  st: SearchState,
  cx: number,
  cy: number,
  hCell: number,
  sureIn: number,
  A: number[],
  chosen: Placement[],
  out: Candidate[],
): void {
  const { e } = st;
  const r = e.halfX, r2 = e.radius2;
  const tol = 1e-6 * r;
  const halfDiag = (hCell + tol) * Math.SQRT2;
  // Pairs of figures, then an exact count of each candidate (added below).
  addWork(st, (A.length * (A.length + 1)) / 2);
  const fx = new Float64Array(A.length), fy = new Float64Array(A.length);
  for (let t = 0; t < A.length; t++) {
    fx[t] = st.xUm[A[t]];
    fy[t] = st.yUm[A[t]];
  }
  const inCell = (x: number, y: number) =>
    Math.abs(x - cx) <= hCell + tol && Math.abs(y - cy) <= hCell + tol;
  const inside = (px: number, py: number, k: number) => {
    const dx = st.xUm[k] - px, dy = st.yUm[k] - py;
    return dx * dx + dy * dy <= r2;
  };
  // Exact: the sure figures test inside at every centre of the square.
  const exactCount = (px: number, py: number): number => {
    let n = sureIn;
    for (let t = 0; t < fx.length; t++) {
      const dx = fx[t] - px, dy = fy[t] - py;
      if (dx * dx + dy * dy <= r2) n++;
    }
    return n;
  };
  // Candidates before nudging: [x, y, figure a, figure b] (b = −1 for none).
  const est: [number, number, number, number][] = [];
  const near = hCell + 3 * tol;
  for (let t = 0; t < A.length; t++) {
    const f = A[t], ax = fx[t], ay = fy[t];
    // Single figure on the rim nearest the cell centre.
    const dc = Math.hypot(cx - ax, cy - ay);
    if (dc > 0) est.push([ax + (cx - ax) * (r / dc), ay + (cy - ay) * (r / dc), f, -1]);
    // Two figures on the rim: the intersections of their radius-r circles.
    for (let u = t + 1; u < A.length; u++) {
      const dx = fx[u] - ax, dy = fy[u] - ay;
      const d2 = dx * dx + dy * dy;
      if (d2 === 0 || d2 > 4 * r2) continue;
      const d = Math.sqrt(d2);
      const h = Math.sqrt(Math.max(0, r2 - d2 / 4));
      const mx = ax + dx / 2, my = ay + dy / 2, ux = (-dy / d) * h, uy = (dx / d) * h;
      if (Math.abs(mx + ux - cx) <= near && Math.abs(my + uy - cy) <= near) {
        est.push([mx + ux, my + uy, f, A[u]]);
      }
      if (Math.abs(mx - ux - cx) <= near && Math.abs(my - uy - cy) <= near) {
        est.push([mx - ux, my - uy, f, A[u]]);
      }
    }
  }
  for (const p of chosen) {
    const [qx, qy] = p.centerUm;
    const dq = Math.hypot(cx - qx, cy - qy);
    if (Math.abs(dq - 2 * r) > 2 * halfDiag) continue;
    if (dq > 0) {
      est.push([qx + (cx - qx) * (2 * r / dq), qy + (cy - qy) * (2 * r / dq), -2, -1]);
    }
    for (const f of A) {
      for (const [px, py] of circleIntersections(qx, qy, 2 * r, st.xUm[f], st.yUm[f], r)) {
        est.push([px, py, -2, f]);
      }
    }
  }
  // Nudge each into place and count exactly.
  addWork(st, est.length * (A.length + 1));
  for (const [px0, py0, a, b] of est) {
    let pt: [number, number] | null = null;
    if (a === -2) {
      // On an exclusion boundary: step away from the chosen centre.
      pt = null;
      for (const q of chosen) {
        const dx = px0 - q.centerUm[0], dy = py0 - q.centerUm[1];
        if (Math.abs(Math.hypot(dx, dy) - 2 * r) > 1e-6 * r) continue;
        for (const grow of [1e-12, 1e-9, 1e-7]) {
          const px = px0 + dx * grow, py = py0 + dy * grow;
          if ((px - q.centerUm[0]) ** 2 + (py - q.centerUm[1]) ** 2 > 4 * r2) {
            if (b < 0 || inside(px, py, b)) pt = [px, py];
            break;
          }
        }
        break;
      }
    } else if (a >= 0) {
      const ax = st.xUm[a], ay = st.yUm[a];
      // Towards the midpoint of the two figures (or towards f alone).
      const mx = b >= 0 ? (ax + st.xUm[b]) / 2 : ax, my = b >= 0 ? (ay + st.yUm[b]) / 2 : ay;
      for (const shrink of [0, 1e-12, 1e-9, 1e-7]) {
        const px = px0 + (mx - px0) * shrink, py = py0 + (my - py0) * shrink;
        if (inside(px, py, a) && (b < 0 || inside(px, py, b))) {
          pt = [px, py];
          break;
        }
      }
    } else pt = [px0, py0];
    if (!pt || !inCell(pt[0], pt[1])) continue;
    out.push({ cx: pt[0], cy: pt[1], count: exactCount(pt[0], pt[1]) });
  }
}
