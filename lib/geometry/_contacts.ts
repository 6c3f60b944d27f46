/**
 * Private: finding where polygon boundaries touch or cross, with a uniform
 * grid of edges (about one edge per cell, so roughly O(n) for outlines whose
 * edges are short compared with the whole).
 *
 * @module
 */

import type { PolygonPx } from "../types.ts";
import { provesNoContacts } from "./_sweep.ts";

import type { TaggedEdges } from "./_tagged_edges.ts";
export type { TaggedEdges };

/** Flattens normalized polygons (closed rings, no repeats) with a group per polygon. */
export function tagEdges(polys: PolygonPx[], groups: number[]): TaggedEdges {
  let n = 0, nr = 0;
  for (const p of polys) {
    for (const r of p) {
      n += r.length - 1;
      nr++;
    }
  }
  const t: TaggedEdges = {
    x0: new Float64Array(n),
    y0: new Float64Array(n),
    x1: new Float64Array(n),
    y1: new Float64Array(n),
    group: new Int32Array(n),
    ring: new Int32Array(n),
    pos: new Int32Array(n),
    ringEdges: new Int32Array(nr),
    count: n,
    minX: Infinity,
    minY: Infinity,
    maxX: -Infinity,
    maxY: -Infinity,
  };
  let k = 0, rid = 0;
  for (let pi = 0; pi < polys.length; pi++) {
    for (const r of polys[pi]) {
      const m = r.length - 1;
      t.ringEdges[rid] = m;
      for (let i = 0; i < m; i++) {
        const p = r[i], q = r[i + 1];
        t.x0[k] = p[0];
        t.y0[k] = p[1];
        t.x1[k] = q[0];
        t.y1[k] = q[1];
        t.group[k] = groups[pi];
        t.ring[k] = rid;
        t.pos[k] = i;
        if (p[0] < t.minX) t.minX = p[0];
        if (p[0] > t.maxX) t.maxX = p[0];
        if (p[1] < t.minY) t.minY = p[1];
        if (p[1] > t.maxY) t.maxY = p[1];
        k++;
      }
      rid++;
    }
  }
  return t;
}

/** One place where two edges meet. */
export interface Contact {
  a: number;
  b: number;
  x: number;
  y: number;
}

/** Edges from which the sized grid beats the uniform one (measured). */
const UNIFORM_BELOW = 50_000;
/** Edges from which the sweep beats the grid at proving no contact (measured). */
const SWEEP_FROM = 150_000;

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  const v = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

function onSeg(ax: number, ay: number, bx: number, by: number, px: number, py: number): boolean {
  return (px >= (ax < bx ? ax : bx) && px <= (ax < bx ? bx : ax) &&
    py >= (ay < by ? ay : by) && py <= (ay < by ? by : ay));
}

/**
 * Whether edges i and j of `t` meet in a way that matters. Adjacent edges of
 * one ring may share their common vertex, but not fold back onto each other.
 * Returns the meeting point or null.
 */
function meet(t: TaggedEdges, i: number, j: number): [number, number] | null {
  const ax = t.x0[i], ay = t.y0[i], bx = t.x1[i], by = t.y1[i];
  const cx = t.x0[j], cy = t.y0[j], dx = t.x1[j], dy = t.y1[j];
  if (t.ring[i] === t.ring[j]) {
    const m = t.ringEdges[t.ring[i]];
    const pi = t.pos[i], pj = t.pos[j];
    let first = -1, second = -1;
    if ((pi + 1) % m === pj) {
      first = i;
      second = j;
    } else if ((pj + 1) % m === pi) {
      first = j;
      second = i;
    }
    if (first >= 0) {
      if (m === 2) return null;
      // first: p → v, second: v → q; they fold back when q is on p→v's line, same side
      const px = t.x0[first], py = t.y0[first], vx = t.x1[first], vy = t.y1[first];
      const qx = t.x1[second], qy = t.y1[second];
      const cr = (px - vx) * (qy - vy) - (py - vy) * (qx - vx);
      const dot = (px - vx) * (qx - vx) + (py - vy) * (qy - vy);
      return cr === 0 && dot > 0 ? [vx, vy] : null;
    }
  }
  const o1 = orient(ax, ay, bx, by, cx, cy), o2 = orient(ax, ay, bx, by, dx, dy);
  const o3 = orient(cx, cy, dx, dy, ax, ay), o4 = orient(cx, cy, dx, dy, bx, by);
  if (o1 !== o2 && o3 !== o4 && o1 !== 0 && o2 !== 0 && o3 !== 0 && o4 !== 0) {
    const den = (bx - ax) * (dy - cy) - (by - ay) * (dx - cx);
    const s = ((cx - ax) * (dy - cy) - (cy - ay) * (dx - cx)) / den;
    return [ax + s * (bx - ax), ay + s * (by - ay)];
  }
  if (o1 === 0 && onSeg(ax, ay, bx, by, cx, cy)) return [cx, cy];
  if (o2 === 0 && onSeg(ax, ay, bx, by, dx, dy)) return [dx, dy];
  if (o3 === 0 && onSeg(cx, cy, dx, dy, ax, ay)) return [ax, ay];
  if (o4 === 0 && onSeg(cx, cy, dx, dy, bx, by)) return [bx, by];
  return null;
}

/**
 * Finds contacts between edges. `mode` "all" tests every pair (except
 * harmless adjacent edges); "across" only pairs from different groups.
 * `firstOnly` returns at most the first contact.
 *
 * Contacts come in a fixed order that later steps depend on: by the cell
 * of a uniform grid of about one cell per edge over the edges' bounding box
 * that holds the meeting point (row-major), then by the two edge numbers; a
 * pair counts when both edges pass that cell (each edge's x-range in each
 * grid row, widened by one cell against rounding).
 *
 * Below 50,000 edges that grid is searched itself. From there a grid sized
 * to the edges is searched ({@linkcode sizedGridContacts}), and from 150,000
 * edges a set's own edges (mode "all") are first swept (`_sweep.ts`), which
 * proves in O(n log n) that the usual valid outline has no contact at all.
 */
export function findContacts(
  t: TaggedEdges,
  mode: "all" | "across",
  firstOnly: boolean,
): Contact[] {
  if (t.count < UNIFORM_BELOW) return uniformGridContacts(t, mode, firstOnly);
  if (
    mode === "all" && t.count >= SWEEP_FROM && provesNoContacts(t, mode, (i, j) => meet(t, i, j))
  ) {
    return [];
  }
  return sizedGridContacts(t, mode, firstOnly);
}

/**
 * {@linkcode findContacts} searched on a grid sized to the edges (cells the
 * mean of an edge's |dx| + |dy| wide, in a plain array or a hash table):
 * O(n) for outlines of many short edges whatever their bounding box, where
 * the uniform grid puts an outline's n edges into about √n cells of √n
 * edges each. The same contacts in the same order (exported for tests).
 */
export function sizedGridContacts(
  t: TaggedEdges,
  mode: "all" | "across",
  firstOnly: boolean,
): Contact[] {
  const n = t.count;
  const out: Contact[] = [];
  if (n < 2) return out;
  const order = reportingGrid(t);
  const { x0, y0, x1, y1 } = t;
  const g = t.group;
  // The search grid: cells the mean of an edge's |dx| + |dy| wide, so each
  // edge passes two or three. An edge is entered in every cell it
  // passes (its x-range in each row of cells it spans), grown by `tol` far
  // above rounding: edges that meet share a cell, and in a cell only edges
  // that pass it are paired (not all whose boxes reach it, which matters for
  // zigzag outlines whose boxes overlap many neighbours).
  let length = 0;
  for (let e = 0; e < n; e++) length += Math.abs(x1[e] - x0[e]) + Math.abs(y1[e] - y0[e]);
  const w = t.maxX - t.minX, h = t.maxY - t.minY;
  const tol = 1e-9 * (w + h);
  let size = Math.max(length / n, 1e3 * tol);
  if (!(size > 0)) size = 1;
  const cols = Math.floor((w + 2 * tol) / size) + 3;
  const visit = (e: number, f: (key: number) => void) => {
    const ax = x0[e], ay = y0[e], bx = x1[e], by = y1[e];
    const ylo = ay < by ? ay : by, yhi = ay < by ? by : ay;
    const ja = Math.floor((ylo - tol - t.minY) / size);
    const jb = Math.floor((yhi + tol - t.minY) / size);
    const k = ay === by ? 0 : (bx - ax) / (by - ay);
    for (let j = ja; j <= jb; j++) {
      let xa: number, xb: number;
      if (ja === jb || ax === bx || ay === by) {
        xa = ax;
        xb = bx;
      } else {
        const r0 = t.minY + j * size, r1 = r0 + size;
        const ya = r0 > ylo ? r0 : ylo, yb = r1 < yhi ? r1 : yhi;
        xa = ax + (ya - ay) * k;
        xb = ax + (yb - ay) * k;
      }
      const ia = Math.floor(((xa < xb ? xa : xb) - tol - t.minX) / size);
      const ib = Math.floor(((xa < xb ? xb : xa) + tol - t.minX) / size);
      for (let i = ia; i <= ib; i++) f((j + 1) * cols + i + 1);
    }
  };
  let count = 0;
  for (let e = 0; e < n; e++) visit(e, () => count++);
  // Cells in a plain array when there are not many more of them than entries,
  // else in a hash table.
  const rows = Math.floor((h + 2 * tol) / size) + 3;
  const dense = cols * rows <= 8 * count + 1024;
  let buckets = 16;
  while (buckets < 2 * count) buckets *= 2;
  if (dense) buckets = cols * rows;
  const mask = buckets - 1;
  const hash = dense ? (key: number) => key : (key: number) => {
    // murmur3's finalizer: every key bit reaches the low bits.
    let h = (key % 4294967296) ^ Math.imul(Math.floor(key / 4294967296), 0x9e3779b1);
    h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
    h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
    return (h ^ (h >>> 16)) & mask;
  };
  const start = new Int32Array(buckets + 1);
  for (let e = 0; e < n; e++) visit(e, (key) => start[hash(key) + 1]++);
  for (let b = 0; b < buckets; b++) start[b + 1] += start[b];
  const fill = start.slice(0, buckets);
  const ids = new Int32Array(count), keys = new Float64Array(count);
  for (let e = 0; e < n; e++) {
    visit(e, (key) => {
      const at = fill[hash(key)]++;
      ids[at] = e;
      keys[at] = key;
    });
  }
  const found: [number, number, number, number, number][] = [];
  // A cell's edges, copied together and sorted by their left x, so that
  // each is paired only with those whose x-range meets its own.
  let cap = 64;
  let E = new Int32Array(cap), AX = new Float64Array(cap), AY = new Float64Array(cap);
  let BX = new Float64Array(cap), BY = new Float64Array(cap);
  let LX = new Float64Array(cap), RX = new Float64Array(cap);
  let LY = new Float64Array(cap), HY = new Float64Array(cap);
  let sortKey = new Float64Array(cap), order2 = new Int32Array(cap);
  const across = mode === "across";
  for (let bucket = 0; bucket < buckets; bucket++) {
    const s0 = start[bucket], f0 = start[bucket + 1];
    if (f0 - s0 < 2) continue;
    // A bucket may hold several cells: take them one key at a time.
    for (let p0 = s0; p0 < f0; p0++) {
      const key = keys[p0];
      if (key !== key) continue; // NaN: taken with an earlier key
      let m = 0;
      for (let p = p0; p < f0; p++) {
        if (keys[p] !== key) continue;
        if (p > p0) keys[p] = NaN;
        if (m === cap) {
          cap *= 2;
          const grow = <T extends Int32Array | Float64Array>(a: T, b: T) => (b.set(a), b);
          E = grow(E, new Int32Array(cap));
          sortKey = grow(sortKey, new Float64Array(cap));
        }
        E[m++] = ids[p];
      }
      if (m < 2) continue;
      if (across) {
        // Only pairs across groups count: a cell of one group has none.
        let mixed = false;
        for (let p = 1; p < m && !mixed; p++) if (g[E[p]] !== g[E[0]]) mixed = true;
        if (!mixed) continue;
      }
      if (AX.length < m) {
        AX = new Float64Array(cap);
        AY = new Float64Array(cap);
        BX = new Float64Array(cap);
        BY = new Float64Array(cap);
        LX = new Float64Array(cap);
        RX = new Float64Array(cap);
        LY = new Float64Array(cap);
        HY = new Float64Array(cap);
      }
      // Order by left x (ties by position).
      for (let p = 0; p < m; p++) {
        const e = E[p];
        sortKey[p] = p;
        LX[p] = x0[e] < x1[e] ? x0[e] : x1[e];
      }
      const slots = sortKey.subarray(0, m);
      if (m > 16) slots.sort((u, v) => LX[u] - LX[v] || u - v);
      for (let r = 0; r < m; r++) {
        const e = E[slots[r]];
        AX[r] = x0[e];
        AY[r] = y0[e];
        BX[r] = x1[e];
        BY[r] = y1[e];
      }
      if (order2.length < m) order2 = new Int32Array(cap);
      for (let r = 0; r < m; r++) order2[r] = E[slots[r]];
      for (let r = 0; r < m; r++) {
        const ax = AX[r], ay = AY[r], bx = BX[r], by = BY[r];
        LX[r] = ax < bx ? ax : bx;
        RX[r] = ax < bx ? bx : ax;
        LY[r] = ay < by ? ay : by;
        HY[r] = ay < by ? by : ay;
      }
      for (let p = 0; p < m; p++) {
        const rx = RX[p], ly = LY[p], hy = HY[p];
        const ep = order2[p];
        for (let q = p + 1; q < m; q++) {
          if (LX[q] > rx) {
            if (m > 16) break; // sorted by left x: no later edge reaches this one
            continue;
          }
          if (LY[q] > hy || HY[q] < ly) continue;
          const eq = order2[q];
          if (across && g[ep] === g[eq]) continue;
          // The pair in edge order, as the reporting order has it.
          const lo = ep < eq ? p : q, hi = ep < eq ? q : p;
          const ax = AX[lo], ay = AY[lo], dx = BX[lo] - ax, dy = BY[lo] - ay;
          const cx = AX[hi], cy = AY[hi], ex = BX[hi], ey = BY[hi];
          // Both ends of one edge strictly on one side of the other's line
          // (and no end on a line): meet() would say no (same expressions).
          const o1 = dx * (cy - ay) - dy * (cx - ax), o2 = dx * (ey - ay) - dy * (ex - ax);
          if ((o1 > 0 && o2 > 0) || (o1 < 0 && o2 < 0)) {
            const fx = ex - cx, fy = ey - cy;
            const o3 = fx * (ay - cy) - fy * (ax - cx);
            const o4 = fx * (BY[lo] - cy) - fy * (BX[lo] - cx);
            if (o3 !== 0 && o4 !== 0) continue;
          }
          const i = order2[lo], j = order2[hi];
          const mp = meet(t, i, j);
          if (mp === null) continue;
          const c = order.cellOf(mp[0], mp[1]);
          if (!order.passes(i, c) || !order.passes(j, c)) continue;
          found.push([c, i, j, mp[0], mp[1]]);
        }
      }
    }
  }
  found.sort((u, v) => u[0] - v[0] || u[1] - v[1] || u[2] - v[2]);
  for (let k = 0; k < found.length; k++) {
    const [c, a, b, x, y] = found[k];
    // A pair sharing several search cells is found more than once.
    if (k > 0 && found[k - 1][0] === c && found[k - 1][1] === a && found[k - 1][2] === b) continue;
    out.push({ a, b, x, y });
    if (firstOnly) return out;
  }
  return out;
}

/**
 * The uniform grid whose cells order the contacts: about one cell per edge
 * (at most 4M) over the edges' bounding box, with whether an edge passes a cell.
 */
function reportingGrid(
  t: TaggedEdges,
): { cellOf(x: number, y: number): number; passes(e: number, c: number): boolean } {
  const n = t.count;
  const w = t.maxX - t.minX, h = t.maxY - t.minY;
  const cellsWanted = Math.max(1, Math.min(n, 1 << 22));
  let nx = Math.max(1, Math.round(Math.sqrt(cellsWanted * (w > 0 ? w : 1) / (h > 0 ? h : 1))));
  let ny = Math.max(1, Math.round(cellsWanted / nx));
  if (!(w > 0)) nx = 1;
  if (!(h > 0)) ny = 1;
  const cw = w > 0 ? w / nx : 1, ch = h > 0 ? h / ny : 1;
  const cellX = (x: number) => {
    const k = Math.floor((x - t.minX) / cw);
    return k < 0 ? 0 : k >= nx ? nx - 1 : k;
  };
  const cellY = (y: number) => {
    const k = Math.floor((y - t.minY) / ch);
    return k < 0 ? 0 : k >= ny ? ny - 1 : k;
  };
  const { x0, y0, x1, y1 } = t;
  return {
    cellOf: (x, y) => cellX(x) + nx * cellY(y),
    // Whether edge e is among cell c's edges: its x-range in row j, widened
    // by one cell (or its whole box when it stays in one row or is vertical).
    passes(e, c) {
      const ci = c % nx, cj = (c - ci) / nx;
      const ax = x0[e], ay = y0[e], bx = x1[e], by = y1[e];
      const ja = cellY(ay < by ? ay : by), jb = cellY(ay < by ? by : ay);
      if (cj < ja || cj > jb) return false;
      if (ja === jb || ax === bx) {
        return ci >= cellX(ax < bx ? ax : bx) && ci <= cellX(ax < bx ? bx : ax);
      }
      const k = (bx - ax) / (by - ay);
      const ylo = ay < by ? ay : by, yhi = ay < by ? by : ay;
      const r0 = t.minY + cj * ch, r1 = r0 + ch;
      const ya = r0 > ylo ? r0 : ylo, yb = r1 < yhi ? r1 : yhi;
      const xa = ax + (ya - ay) * k, xb = ax + (yb - ay) * k;
      let ia = cellX(xa < xb ? xa : xb) - 1, ib = cellX(xa < xb ? xb : xa) + 1;
      if (ia < 0) ia = 0;
      if (ib > nx - 1) ib = nx - 1;
      return ci >= ia && ci <= ib;
    },
  };
}

/**
 * The contact search on a uniform grid of about one cell per edge over the
 * edges' bounding box: each cell's edges are paired, a pair reported in the
 * cell holding its meeting point. Quick for a few tens of thousands of
 * edges; an outline's n edges crowd into about √n cells, so its pairs grow
 * as n^1.5 (and as n² when edges zigzag).
 */
function uniformGridContacts(
  t: TaggedEdges,
  mode: "all" | "across",
  firstOnly: boolean,
): Contact[] {
  const n = t.count;
  const out: Contact[] = [];
  if (n < 2) return out;
  const w = t.maxX - t.minX, h = t.maxY - t.minY;
  const cellsWanted = Math.max(1, Math.min(n, 1 << 22));
  let nx = Math.max(1, Math.round(Math.sqrt(cellsWanted * (w > 0 ? w : 1) / (h > 0 ? h : 1))));
  let ny = Math.max(1, Math.round(cellsWanted / nx));
  if (!(w > 0)) nx = 1;
  if (!(h > 0)) ny = 1;
  const cw = w > 0 ? w / nx : 1, ch = h > 0 ? h / ny : 1;
  const cellX = (x: number) => {
    const k = Math.floor((x - t.minX) / cw);
    return k < 0 ? 0 : k >= nx ? nx - 1 : k;
  };
  const cellY = (y: number) => {
    const k = Math.floor((y - t.minY) / ch);
    return k < 0 ? 0 : k >= ny ? ny - 1 : k;
  };
  // counting pass, then fill (CSR)
  const counts = new Uint32Array(nx * ny + 1);
  const { x0, y0, x1, y1 } = t;
  // the cells an edge passes, row by row (its x-range within each row, widened
  // by one cell against rounding), so long slanted edges do not fill their box
  const visit = (e: number, f: (c: number) => void) => {
    const ax = x0[e], ay = y0[e], bx = x1[e], by = y1[e];
    const ja = cellY(ay < by ? ay : by), jb = cellY(ay < by ? by : ay);
    if (ja === jb || ax === bx) {
      const ia = cellX(ax < bx ? ax : bx), ib = cellX(ax < bx ? bx : ax);
      for (let j = ja; j <= jb; j++) for (let i = ia; i <= ib; i++) f(j * nx + i);
      return;
    }
    const k = (bx - ax) / (by - ay);
    const ylo = ay < by ? ay : by, yhi = ay < by ? by : ay;
    for (let j = ja; j <= jb; j++) {
      const r0 = t.minY + j * ch, r1 = r0 + ch;
      const ya = r0 > ylo ? r0 : ylo, yb = r1 < yhi ? r1 : yhi;
      const xa = ax + (ya - ay) * k, xb = ax + (yb - ay) * k;
      let ia = cellX(xa < xb ? xa : xb) - 1, ib = cellX(xa < xb ? xb : xa) + 1;
      if (ia < 0) ia = 0;
      if (ib > nx - 1) ib = nx - 1;
      for (let i = ia; i <= ib; i++) f(j * nx + i);
    }
  };
  for (let e = 0; e < n; e++) visit(e, (c) => counts[c]++);
  const start = new Uint32Array(nx * ny + 1);
  let total = 0;
  for (let c = 0; c < nx * ny; c++) {
    start[c] = total;
    total += counts[c];
  }
  start[nx * ny] = total;
  const ids = new Uint32Array(total);
  const fill = start.slice(0, nx * ny);
  for (let e = 0; e < n; e++) visit(e, (c) => ids[fill[c]++] = e);
  const g = t.group;
  for (let c = 0; c < nx * ny; c++) {
    const s = start[c], f = start[c + 1];
    if (f - s < 2) continue;
    for (let p = s; p < f; p++) {
      const i = ids[p];
      const ixa = x0[i] < x1[i] ? x0[i] : x1[i], ixb = x0[i] < x1[i] ? x1[i] : x0[i];
      const iya = y0[i] < y1[i] ? y0[i] : y1[i], iyb = y0[i] < y1[i] ? y1[i] : y0[i];
      for (let q = p + 1; q < f; q++) {
        const j = ids[q];
        if (mode === "across" && g[i] === g[j]) continue;
        // bbox reject
        if ((x0[j] < ixa && x1[j] < ixa) || (x0[j] > ixb && x1[j] > ixb)) continue;
        if ((y0[j] < iya && y1[j] < iya) || (y0[j] > iyb && y1[j] > iyb)) continue;
        const m = meet(t, i, j);
        if (m === null) continue;
        // report a pair once: in the cell holding the meeting point
        if (cellX(m[0]) + nx * cellY(m[1]) !== c) continue;
        out.push({ a: i, b: j, x: m[0], y: m[1] });
        if (firstOnly) return out;
      }
    }
  }
  return out;
}
