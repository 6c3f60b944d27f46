/**
 * Private: the intersection of ring constraints (inside each outer ring,
 * outside each hole) when rings cross only properly, without the general
 * clipper.
 *
 * Every edge is split at its crossings. Between two consecutive crossings a
 * ring runs as one chain that lies wholly inside or outside each other ring,
 * so one midpoint test per chain decides whether it bounds the result (it
 * does when it lies inside every other constraint). The kept chains are
 * joined at the crossings (one kept chain ends and one starts at each) into
 * rings of the result, with outer rings positive and holes negative.
 *
 * Returns null on anything degenerate (rings touching at a vertex, running
 * along each other, three edges through a point, a midpoint exactly on
 * another ring): the caller then uses the general clipper.
 *
 * @module
 */

import type { Ring } from "../types.ts";
import { bandOf, buildBands } from "./_edges.ts";
import type { Contact, TaggedEdges } from "./_contacts.ts";

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  return (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
}

/**
 * @param rings Ring list (closed, oriented: outers positive, holes negative).
 * @param isOuter Whether each ring is an outer ring (constraint "inside").
 * @param use Which rings take part (the others are ignored).
 * @param tagged Edges of all rings, tagged with ring = ring index.
 * @param contacts Contacts between edges of different rings.
 * @returns The result's rings (unassembled), or null when degenerate.
 */
export function intersectCrossingRings(
  rings: Ring[],
  isOuter: boolean[],
  use: Uint8Array,
  tagged: TaggedEdges,
  contacts: Contact[],
): Ring[] | null {
  // crossings per edge: [t along the edge, crossing id]
  const splits = new Map<number, [number, number][]>();
  const points: [number, number][] = [];
  const { x0, y0, x1, y1 } = tagged;
  for (const c of contacts) {
    const ri = tagged.ring[c.a], rj = tagged.ring[c.b];
    if (!use[ri] && !use[rj]) continue;
    if (!use[ri] || !use[rj]) return null; // a used ring touches an unused one
    const i = c.a, j = c.b;
    const o1 = orient(x0[i], y0[i], x1[i], y1[i], x0[j], y0[j]);
    const o2 = orient(x0[i], y0[i], x1[i], y1[i], x1[j], y1[j]);
    const o3 = orient(x0[j], y0[j], x1[j], y1[j], x0[i], y0[i]);
    const o4 = orient(x0[j], y0[j], x1[j], y1[j], x1[i], y1[i]);
    if (o1 === 0 || o2 === 0 || o3 === 0 || o4 === 0) return null;
    if ((o1 > 0) === (o2 > 0) || (o3 > 0) === (o4 > 0)) return null;
    const id = points.length;
    points.push([c.x, c.y]);
    const ti = o3 / (o3 - o4);
    const tj = o1 / (o1 - o2);
    for (const [e, t] of [[i, ti], [j, tj]] as [number, number][]) {
      let list = splits.get(e);
      if (list === undefined) splits.set(e, list = []);
      list.push([t, id]);
    }
  }
  if (points.length === 0) return null;
  // chains of each used ring, from crossing to crossing
  interface Chain {
    ring: number;
    from: number;
    to: number;
    pts: [number, number][];
  }
  const chains: Chain[] = [];
  let edgeBase = 0;
  const ringStart: number[] = [];
  for (let r = 0; r < rings.length; r++) {
    ringStart.push(edgeBase);
    edgeBase += rings[r].length - 1;
  }
  for (let r = 0; r < rings.length; r++) {
    if (!use[r]) continue;
    const ring = rings[r];
    const m = ring.length - 1;
    // walk the ring once, starting at its first crossing
    const seq: ({ id: number } | [number, number])[] = [];
    for (let k = 0; k < m; k++) {
      seq.push(ring[k]);
      const list = splits.get(ringStart[r] + k);
      if (list !== undefined) {
        list.sort((p, q) => p[0] - q[0]);
        for (let s = 1; s < list.length; s++) if (list[s][0] === list[s - 1][0]) return null;
        for (const [, id] of list) seq.push({ id });
      }
    }
    const firstCross = seq.findIndex((s) => !Array.isArray(s));
    if (firstCross < 0) return null; // a used ring that crosses nothing
    const n = seq.length;
    let cur: Chain | null = null;
    for (let s = 0; s <= n; s++) {
      const item = seq[(firstCross + s) % n];
      if (!Array.isArray(item)) {
        const p = points[item.id];
        if (cur !== null) {
          cur.to = item.id;
          cur.pts.push(p);
          chains.push(cur);
        }
        if (s === n) break;
        cur = { ring: r, from: item.id, to: -1, pts: [p] };
      } else if (cur !== null) cur.pts.push(item);
    }
  }
  // classify each chain by the midpoint of its first piece against every other used ring
  const usedOuterCount = rings.reduce((s, _, r) => s + (use[r] && isOuter[r] ? 1 : 0), 0);
  const bands = buildBands(tagged, 4, 0, true);
  const parity = new Uint8Array(rings.length);
  const touched: number[] = [];
  const keep: Chain[] = [];
  for (const ch of chains) {
    const mx = (ch.pts[0][0] + ch.pts[1][0]) / 2, my = (ch.pts[0][1] + ch.pts[1][1]) / 2;
    const k = bandOf(bands, my);
    for (let s = bands.start[k], f = bands.start[k + 1]; s < f; s++) {
      const e = bands.ids[s];
      const r = tagged.ring[e];
      if (!use[r] || r === ch.ring) continue;
      const ay = y0[e], by = y1[e];
      if ((ay > my) !== (by > my)) {
        const cr = orient(x0[e], ay, x1[e], by, mx, my);
        if (cr === 0) return null;
        if ((cr > 0) === (by > ay)) {
          if (parity[r] === 0) touched.push(r);
          parity[r] ^= 1;
        }
      } else if (ay === my && by === my) {
        const ax = x0[e], bx = x1[e];
        if ((mx >= ax && mx <= bx) || (mx >= bx && mx <= ax)) return null;
      }
    }
    let insideOuters = 0, insideHoles = 0;
    for (const r of touched) {
      if (parity[r] === 1) {
        if (isOuter[r]) insideOuters++;
        else insideHoles++;
      }
      parity[r] = 0;
    }
    touched.length = 0;
    const othersOuter = usedOuterCount - (isOuter[ch.ring] ? 1 : 0);
    if (insideOuters === othersOuter && insideHoles === 0) keep.push(ch);
  }
  // join kept chains at crossings
  const startsAt = new Map<number, number>();
  for (let c = 0; c < keep.length; c++) {
    if (startsAt.has(keep[c].from)) return null;
    startsAt.set(keep[c].from, c);
  }
  const done = new Uint8Array(keep.length);
  const out: Ring[] = [];
  for (let c0 = 0; c0 < keep.length; c0++) {
    if (done[c0]) continue;
    const ring: Ring = [];
    let c = c0;
    for (let guard = 0; guard <= keep.length; guard++) {
      if (done[c]) return null;
      done[c] = 1;
      const pts = keep[c].pts;
      for (let k = 0; k < pts.length - 1; k++) ring.push([pts[k][0], pts[k][1]]);
      const next = startsAt.get(keep[c].to);
      if (next === undefined) return null;
      if (next === c0) break;
      c = next;
    }
    ring.push([ring[0][0], ring[0][1]]);
    out.push(ring);
  }
  return out;
}
