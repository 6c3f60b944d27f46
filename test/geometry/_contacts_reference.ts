/**
 * The edge-contact search as it was before it was indexed by edge length
 * (a uniform grid over the bounding box), kept as the reference the
 * indexed search must reproduce contact for contact, in the same order.
 *
 * @module
 */
import type { PolygonPx } from "../../lib/types.ts";

/** Edges of a list of rings, each tagged with a group (e.g. part or set) and its ring. */
export interface TaggedEdges {
  x0: Float64Array;
  y0: Float64Array;
  x1: Float64Array;
  y1: Float64Array;
  /** Group of each edge (part index, or set 0/1). */
  group: Int32Array;
  /** Global ring number of each edge. */
  ring: Int32Array;
  /** Position of the edge in its ring. */
  pos: Int32Array;
  /** Number of edges of each ring, by global ring number. */
  ringEdges: Int32Array;
  count: number;
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

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
 * `limitPerGroup` stops after that many contacts involving a group
 * (0 = stop at the first contact overall).
 */
export function findContacts(
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
