/**
 * Private: intersection and difference of regions that call the general
 * planar clipper only for the rings that actually meet.
 *
 * A polygon is the intersection of "ring constraints": inside its outer
 * ring, outside each hole. So polygon a ∩ polygon b is the intersection of
 * all their rings' constraints, in any grouping. The rings are split into C,
 * the rings that touch or cross a ring of the other polygon (closed under
 * contact), and N, the rest. The clipper computes P = ⋂C (a large rectangle
 * stands in for an outer ring that is not in C); the N rings meet neither P's
 * boundary nor each other across polygons, so P ∩ ⋂N is finished ring by ring
 * with one point-in-region test per ring. A tumour outline crossing a few
 * holes of a 20,000-vertex tissue outline thus sends only those holes and the
 * tumour to the clipper.
 *
 * A − X is A ∩ (R − X) for a rectangle R around both.
 *
 * @module
 */

import type { MultiPolygonPx, PolygonPx, Ring } from "../types.ts";
import { findContacts, tagEdges } from "./_contacts.ts";
import { buildBands, classifyPoint, flattenEdges } from "./_edges.ts";
import { assembleRings, bboxOf, boxesMeet, intersectDisjointBoundaries } from "./_ring_sets.ts";
import { intersectCrossingRings } from "./_overlay.ts";
import { turfIntersect } from "./_turf.ts";
import { ringAreaPx2 } from "./planar_area.ts";

type BBox = [number, number, number, number];

function rectRing(b: BBox, grow: number): Ring {
  const x0 = b[0] - grow, y0 = b[1] - grow, x1 = b[2] + grow, y1 = b[3] + grow;
  return [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
}

function margin(b: BBox): number {
  return Math.max(b[2] - b[0], b[3] - b[1], 1) * 0.125 + 1;
}

function unionBox(p: BBox, q: BBox): BBox {
  return [Math.min(p[0], q[0]), Math.min(p[1], q[1]), Math.max(p[2], q[2]), Math.max(p[3], q[3])];
}

/** a ∩ b for two normalized polygons. */
export function intersectPolygons(a: PolygonPx, b: PolygonPx): MultiPolygonPx {
  const rings = [...a, ...b];
  const na = a.length;
  const tagged = tagEdges(rings.map((r) => [r]), rings.map((_, i) => i));
  const contacts = findContacts(tagged, "across", false);
  if (contacts.length === 0) return intersectDisjointBoundaries([a], [b]);
  // rings touching the other polygon seed C; rings touching C join it
  const adj: number[][] = rings.map(() => []);
  const inC = new Uint8Array(rings.length);
  const stack: number[] = [];
  for (const c of contacts) {
    const ra = tagged.ring[c.a], rb = tagged.ring[c.b];
    adj[ra].push(rb);
    adj[rb].push(ra);
    if ((ra < na) !== (rb < na)) {
      for (const r of [ra, rb]) {
        if (!inC[r]) {
          inC[r] = 1;
          stack.push(r);
        }
      }
    }
  }
  if (stack.length === 0) return intersectDisjointBoundaries([a], [b]);
  while (stack.length > 0) {
    const r = stack.pop()!;
    for (const s of adj[r]) {
      if (!inC[s]) {
        inC[s] = 1;
        stack.push(s);
      }
    }
  }
  const box = unionBox(bboxOf([a]), bboxOf([b]));
  const m = margin(box);
  const side = (start: number, end: number, wantC: boolean, grow: number): PolygonPx => {
    const outer = (inC[start] === 1) === wantC ? rings[start] : rectRing(box, grow);
    const holes: Ring[] = [];
    for (let i = start + 1; i < end; i++) if ((inC[i] === 1) === wantC) holes.push(rings[i]);
    return [outer, ...holes];
  };
  const isOuter = rings.map((_, i) => i === 0 || i === na);
  const soup = intersectCrossingRings(rings, isOuter, inC, tagged, contacts);
  let result: MultiPolygonPx;
  if (soup !== null) {
    // ⋂C is unbounded when C holds holes only: bound it by a rectangle
    if (!inC[0] && !inC[na]) soup.push(rectRing(box, m));
    result = assembleRings(soup);
  } else {
    const aC = side(0, na, true, m), bC = side(na, rings.length, true, 2 * m);
    result = turfIntersect([aC], [bC]);
  }
  const qa = side(0, na, false, 3 * m), qb = side(na, rings.length, false, 4 * m);
  // skip constraints that are only the stand-in rectangle
  if (result.length > 0 && (inC[0] === 0 || qa.length > 1)) {
    result = intersectDisjointBoundaries(result, [qa]);
  }
  if (result.length > 0 && (inC[na] === 0 || qb.length > 1)) {
    result = intersectDisjointBoundaries(result, [qb]);
  }
  return result;
}

/**
 * A ∩ B for normalized, non-overlapping regions. Boundary contacts between A
 * and B are found once; a polygon of A that meets no boundary of B and holds
 * no ring of B inside its box is wholly inside or outside B (one point test);
 * the others are intersected pair by pair with the polygons of B near them.
 */
export function intersectRegions(a: MultiPolygonPx, b: MultiPolygonPx): MultiPolygonPx {
  const out: MultiPolygonPx = [];
  if (a.length === 0 || b.length === 0) return out;
  const boxA = bboxOf(a), boxB = bboxOf(b);
  const an = a.filter((p) => boxesMeet(bboxOf([p]), boxB));
  const bn = b.filter((p) => boxesMeet(bboxOf([p]), boxA));
  if (an.length === 0 || bn.length === 0) return out;
  const bb = bn.map((p) => bboxOf([p]));
  if (an.length * bn.length <= 4) {
    for (const p of an) {
      const pb = bboxOf([p]);
      for (let j = 0; j < bn.length; j++) {
        if (boxesMeet(pb, bb[j])) {
          for (const piece of intersectPolygons(p, bn[j])) out.push(piece);
        }
      }
    }
    return out;
  }
  const tagged = tagEdges([...an, ...bn], [...an.map(() => 0), ...bn.map(() => 1)]);
  const ringPoly: number[] = [];
  [...an, ...bn].forEach((p, i) => p.forEach(() => ringPoly.push(i)));
  const touched = new Uint8Array(an.length + bn.length);
  for (const c of findContacts(tagged, "across", false)) {
    touched[ringPoly[tagged.ring[c.a]]] = 1;
    touched[ringPoly[tagged.ring[c.b]]] = 1;
  }
  const bBands = buildBands(flattenEdges(bn), 4, 0, true);
  const ringBoxes = bn.map((p) => p.map((r) => bboxOf([[r]])));
  for (let i = 0; i < an.length; i++) {
    const p = an[i];
    const pb = bboxOf([p]);
    const near: number[] = [];
    let ringsInside = false;
    for (let j = 0; j < bn.length; j++) {
      if (!boxesMeet(pb, bb[j])) continue;
      near.push(j);
      for (const rb of ringBoxes[j]) {
        if (rb[0] >= pb[0] && rb[1] >= pb[1] && rb[2] <= pb[2] && rb[3] <= pb[3]) {
          ringsInside = true;
        }
      }
    }
    if (near.length === 0) continue;
    if (!touched[i] && !ringsInside) {
      // no boundary of B meets p and none lies within it: p is inside B or outside it
      if (classifyRingAgainst(bBands, p[0]) === 1) out.push(p);
      continue;
    }
    if (!touched[i]) {
      for (const piece of intersectDisjointBoundaries([p], near.map((j) => bn[j]))) out.push(piece);
      continue;
    }
    for (const j of near) for (const piece of intersectPolygons(p, bn[j])) out.push(piece);
  }
  return out;
}

/** 1 when the ring (meeting no edge of the banded region) lies inside it, else 0. */
function classifyRingAgainst(bands: ReturnType<typeof buildBands>, r: Ring): 0 | 1 {
  for (let k = 0; k < r.length - 1; k++) {
    const c = classifyPoint(bands, r[k][0], r[k][1]);
    if (c !== 2) return c;
  }
  return 0;
}

/** A − X for normalized, non-overlapping regions. */
export function subtractRegions(a: MultiPolygonPx, x: MultiPolygonPx): MultiPolygonPx {
  if (a.length === 0 || x.length === 0) return a;
  const box = unionBox(bboxOf(a), bboxOf(x));
  // A ∩ the complement of X in a rectangle around everything
  return intersectRegions(a, complementIn(x, box, 5 * margin(box)));
}

/** The complement of X inside the rectangle `box` grown by `grow` (X well inside it). */
function complementIn(x: MultiPolygonPx, box: BBox, grow: number): MultiPolygonPx {
  const frame: PolygonPx = [rectRing(box, grow)];
  const islands: MultiPolygonPx = [];
  for (const p of x) {
    frame.push([...p[0]].reverse());
    for (let i = 1; i < p.length; i++) islands.push([[...p[i]].reverse()]);
  }
  return [frame, ...islands];
}

/**
 * A ∪ B for normalized regions that are each non-overlapping, as
 * R − ((R − A) ∩ (R − B)) for a rectangle R around both (two slightly
 * different rectangles, so that their edges never meet).
 */
export function unionRegions(a: MultiPolygonPx, b: MultiPolygonPx): MultiPolygonPx {
  if (a.length === 0) return b;
  if (b.length === 0) return a;
  const box = unionBox(bboxOf(a), bboxOf(b));
  const m = margin(box);
  const y = intersectRegions(complementIn(a, box, m), complementIn(b, box, 2 * m));
  // y holds the smaller frame as an outer ring; every other ring of y, reversed, bounds A ∪ B
  const frameArea = (box[2] - box[0] + 2 * m) * (box[3] - box[1] + 2 * m);
  const rings: Ring[] = [];
  for (const p of y) {
    for (let i = 0; i < p.length; i++) {
      if (i === 0 && ringAreaPx2(p[0]) >= frameArea * (1 - 1e-9)) continue;
      rings.push([...p[i]].reverse());
    }
  }
  return assembleRings(rings);
}
