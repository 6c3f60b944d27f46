/**
 * Private: a plane sweep that proves that no two edges of a set of rings
 * meet, in O(n log n), so the contact search can skip its pair tests in the
 * usual case of valid outlines. (A grid tests every pair of edges sharing a
 * cell: few for smooth outlines, but a zigzag outline of many short spikes,
 * whose edges crowd into a band, gives a number of pairs that grows with the
 * square of its vertices.)
 *
 * The sweep is that of Shamos and Hoey (1976): edges enter in the order of
 * their left ends along x and are kept sorted by height where the sweep
 * line crosses them; two edges that meet are neighbours in that order before
 * the first place where they meet, so only neighbours are tested. Orders are
 * decided by orientation tests whose floating-point error is bounded
 * (Shewchuk's bound); a test too close to zero to be sure, an end lying on
 * another edge, overlapping edges, or any pair the contact test would report
 * end the sweep with "not proved", and the full search runs.
 *
 * @module
 */

import type { TaggedEdges } from "./_tagged_edges.ts";

/** Thrown inside the sweep when it cannot prove there is no contact. */
const MAYBE = new Error("the sweep cannot prove there is no contact");

/** Shewchuk's bound on the error of the floating-point orientation, (3 + 16ε)ε. */
const ORIENT_BOUND = (3 + 16 * 2 ** -53) * 2 ** -53;

/** Skip list levels. */
const LEVELS = 24;

/**
 * The sign of (bx − ax)(cy − ay) − (by − ay)(cx − ax) when its
 * floating-point value is sure of it, else 0 (zero or too near to tell).
 */
function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  const l = (bx - ax) * (cy - ay), r = (by - ay) * (cx - ax);
  const det = l - r;
  const bound = ORIENT_BOUND * (Math.abs(l) + Math.abs(r));
  return det > bound ? 1 : -det > bound ? -1 : 0;
}

/**
 * True when the sweep proves that `meet(i, j)` (i < j) is null for every
 * pair of edges of `t` (in "across" mode, every pair from different groups);
 * false when it cannot, and the full search must decide.
 *
 * @param t The edges, ring by ring (each ring's edges chained and closed).
 * @param mode "all" or "across".
 * @param meet The contact test the full search uses.
 * @returns Whether no contact is proved.
 */
export function provesNoContacts(
  t: TaggedEdges,
  mode: "all" | "across",
  meet: (i: number, j: number) => unknown,
): boolean {
  try {
    sweep(t, mode === "across", meet);
    return true;
  } catch (e) {
    if (e === MAYBE) return false;
    throw e;
  }
}

function sweep(t: TaggedEdges, across: boolean, meet: (i: number, j: number) => unknown): void {
  const n = t.count;
  if (n < 2) return;
  const { x0, y0, x1, y1, group } = t;
  // Left (lexicographically smaller) and right ends of each edge.
  const LX = new Float64Array(n), LY = new Float64Array(n);
  const RX = new Float64Array(n), RY = new Float64Array(n);
  for (let e = 0; e < n; e++) {
    if (x0[e] === x1[e] && y0[e] === y1[e]) throw MAYBE; // a zero-length edge
    const first = x0[e] < x1[e] || (x0[e] === x1[e] && y0[e] < y1[e]);
    LX[e] = first ? x0[e] : x1[e];
    LY[e] = first ? y0[e] : y1[e];
    RX[e] = first ? x1[e] : x0[e];
    RY[e] = first ? y1[e] : y0[e];
  }
  // Vertices in sweep order: each is the start of one edge and the end of
  // the one before it in its ring.
  const order = new Int32Array(n);
  for (let e = 0; e < n; e++) order[e] = e;
  order.sort((a, b) => x0[a] - x0[b] || y0[a] - y0[b] || a - b);
  const before = (e: number) => {
    const m = t.ringEdges[t.ring[e]];
    return e - t.pos[e] + (t.pos[e] + m - 1) % m;
  };

  // The status: a skip list of edges by height, lowest first; node n is the head.
  const head = n;
  const level = new Uint8Array(n + 1);
  const at = new Int32Array(n + 1);
  const present = new Uint8Array(n);
  let NEXT = new Int32Array(Math.ceil(1.5 * n) + 2 * LEVELS).fill(-1);
  let PREV = new Int32Array(NEXT.length).fill(-1);
  let used = LEVELS;
  level[head] = LEVELS;
  at[head] = 0;
  const update = new Int32Array(LEVELS);
  let seed = 0x9e3779b9;

  const insert = (s: number) => {
    const px = LX[s], py = LY[s], qx = RX[s], qy = RY[s];
    const vertical = qx === px;
    let x = head;
    for (let l = LEVELS - 1; l >= 0; l--) {
      for (;;) {
        const a = NEXT[at[x] + l];
        if (a < 0) break;
        // Is s above a where the sweep line crosses both?
        let c: number;
        if (LX[a] === px && LY[a] === py) {
          // Both start here: by direction (a vertical edge goes up).
          const av = RX[a] === px;
          if (vertical && av) throw MAYBE;
          c = vertical ? 1 : av ? -1 : orient(px, py, RX[a], RY[a], qx, qy);
        } else {
          if (RX[a] === LX[a]) throw MAYBE; // this vertex on an open vertical edge
          c = orient(LX[a], LY[a], RX[a], RY[a], px, py);
        }
        if (c === 0) throw MAYBE; // on edge a, or too near to be sure
        if (c < 0) break;
        x = a;
      }
      update[l] = x;
    }
    // A level with probability 4^−k (xorshift32, seeded: the same every run).
    seed ^= seed << 13;
    seed ^= seed >>> 17;
    seed ^= seed << 5;
    seed >>>= 0;
    let levels = 1;
    for (let r = seed; levels < LEVELS && (r & 3) === 0; r >>>= 2) levels++;
    if (used + levels > NEXT.length) {
      const grow = (a: Int32Array) => {
        const b = new Int32Array(2 * a.length).fill(-1);
        b.set(a);
        return b;
      };
      NEXT = grow(NEXT);
      PREV = grow(PREV);
    }
    const base = used;
    used += levels;
    level[s] = levels;
    at[s] = base;
    for (let l = 0; l < levels; l++) {
      const p = update[l], nx = NEXT[at[p] + l];
      NEXT[base + l] = nx;
      PREV[base + l] = p;
      NEXT[at[p] + l] = s;
      if (nx >= 0) PREV[at[nx] + l] = s;
    }
    present[s] = 1;
  };
  const remove = (e: number) => {
    const base = at[e];
    for (let l = 0; l < level[e]; l++) {
      const p = PREV[base + l], nx = NEXT[base + l];
      NEXT[at[p] + l] = nx;
      if (nx >= 0) PREV[at[nx] + l] = p;
    }
    present[e] = 0;
  };

  /** Two edges at one vertex: they may only be a ring's harmless corner. */
  const pairAtVertex = (i: number, j: number) => {
    if (i === j || (across && group[i] === group[j])) return;
    if (meet(i < j ? i : j, i < j ? j : i) !== null) throw MAYBE;
  };
  /**
   * Neighbours a and b must not meet, but at a shared end (whose contact
   * test ran at that vertex). Tested as the contact test orders the pair
   * (lower number first, each edge from its own start): an edge wholly on
   * one side of the other's line, with every sign sure, is apart, and the
   * contact test, computing the very same values, says so too.
   */
  const neighbours = (a: number, b: number) => {
    if (a < 0 || b < 0 || a === head || b === head) return;
    const i = a < b ? a : b, j = a < b ? b : a;
    const ax = x0[i], ay = y0[i], bx = x1[i], by = y1[i];
    const cx = x0[j], cy = y0[j], dx = x1[j], dy = y1[j];
    const o1 = orient(ax, ay, bx, by, cx, cy), o2 = orient(ax, ay, bx, by, dx, dy);
    const o3 = orient(cx, cy, dx, dy, ax, ay), o4 = orient(cx, cy, dx, dy, bx, by);
    if ((o1 !== 0 && o1 === o2) || (o3 !== 0 && o3 === o4)) {
      // Surely apart. With every sign sure the contact test says no too;
      // else ask it (it may call a near point a touch).
      if (o1 !== 0 && o2 !== 0 && o3 !== 0 && o4 !== 0) return;
      if ((across && group[i] === group[j]) || meet(i, j) === null) return;
      throw MAYBE;
    }
    // One shared end, the others surely off each other's line: they touch only there.
    const sc = (cx === ax && cy === ay) || (cx === bx && cy === by);
    const sd = (dx === ax && dy === ay) || (dx === bx && dy === by);
    if (sc !== sd) {
      const jOff = sc ? o2 : o1;
      const iOff = (sc ? (cx === ax && cy === ay) : (dx === ax && dy === ay)) ? o4 : o3;
      if (jOff !== 0 && iOff !== 0) return;
    }
    throw MAYBE;
  };

  const incident: number[] = [];
  for (let k = 0; k < n;) {
    const px = x0[order[k]], py = y0[order[k]];
    // Every edge with an end here.
    incident.length = 0;
    while (k < n && x0[order[k]] === px && y0[order[k]] === py) {
      incident.push(order[k], before(order[k]));
      k++;
    }
    for (let u = 0; u < incident.length; u++) {
      for (let v = u + 1; v < incident.length; v++) pairAtVertex(incident[u], incident[v]);
    }
    // Edges ending here leave the order; their neighbours become adjacent.
    for (const e of incident) {
      if (RX[e] !== px || RY[e] !== py || !present[e]) continue;
      const below = PREV[at[e]], above = NEXT[at[e]];
      remove(e);
      neighbours(below, above);
    }
    // Edges starting here enter it.
    for (const e of incident) {
      if (LX[e] !== px || LY[e] !== py || present[e]) continue;
      insert(e);
      neighbours(PREV[at[e]], e);
      neighbours(e, NEXT[at[e]]);
    }
  }
}
