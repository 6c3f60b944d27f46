/**
 * Checking and repairing the rings of one outline (a Polygon or MultiPolygon
 * feature) before its area is used.
 *
 * A polygon's area is its outer ring's minus its holes' (the shoelace sum).
 * That is the area of the region it describes only when the rings are
 * valid in the sense of the OGC Simple Features model: every hole inside its
 * outer ring, holes not overlapping one another, no ring crossing another or
 * itself, and the polygons of a MultiPolygon not overlapping. Otherwise the
 * sum silently gives a wrong area (a hole outside its outer ring is
 * subtracted all the same).
 *
 * hotfield reads every outline as the set it describes: each polygon is the
 * area inside its outer ring and outside all its holes, and a MultiPolygon is
 * the union of its polygons. An invalid outline is repaired into that set by
 * a planar union (the same one the valid region uses for outlines that cross
 * themselves), and every problem is reported; none is refused. So:
 *
 * | problem                                  | repaired outline                              |
 * | ---------------------------------------- | --------------------------------------------- |
 * | a hole wholly outside its outer ring     | the hole is dropped (it removes nothing)      |
 * | a hole inside another hole               | the inner hole is dropped                     |
 * | a hole crossing its outer ring           | only its part inside the outer ring is removed |
 * | holes overlapping each other             | their union is removed, once                  |
 * | a polygon inside another (nested shells) | the two are united (counted once)             |
 * | polygons overlapping each other          | the two are united (counted once)             |
 * | a ring crossing or touching itself       | the area it encloses, as a union              |
 *
 * Rings that merely touch at a shared vertex without crossing (a hole
 * touching its outer ring, a polygon in another's hole touching it) are
 * valid and kept as they are.
 *
 * @module
 */

import type { MultiPolygonPx, PolygonPx, Ring, Vec2 } from "../types.ts";
import { findContacts, tagEdges, type TaggedEdges } from "./_contacts.ts";
import { markProvenValid } from "./proven_outlines.ts";
import { bandOf, buildBands } from "./_edges.ts";
import { turfUnion } from "./_turf.ts";
import { badVertexTouches, isVertexContact } from "./_vertex_touches.ts";
import { cleanRing } from "./normalize.ts";
import { multiPolygonAreaPx2, ringAreaPx2 } from "./planar_area.ts";

/** Kinds of invalid rings {@linkcode checkOutline} finds. */
export type RingProblemKind =
  | "hole-outside-shell"
  | "hole-in-hole"
  | "hole-crosses-shell"
  | "holes-overlap"
  | "polygon-in-polygon"
  | "polygons-overlap"
  | "ring-crosses-itself";

/**
 * One problem: the ring at fault (indices into the input as given, 0-based;
 * ring 0 is the outer ring) and, for problems between two rings, the other.
 */
export interface RingProblem {
  /** What is wrong. */
  kind: RingProblemKind;
  /** Polygon of the ring at fault. */
  polygon: number;
  /** The ring at fault (0 for the outer ring, i.e. the polygon itself). */
  ring: number;
  /** Polygon of the other ring, for problems between two rings. */
  otherPolygon?: number;
  /** The other ring. */
  otherRing?: number;
  /** A place of the problem in level-0 pixels: where rings cross, else the ring's first position. */
  atPx: Vec2;
}

/** What {@linkcode checkOutline} returns. */
export interface CheckedOutline {
  /** The polygons: the input itself when valid, else the repaired set (normalized). */
  polygons: MultiPolygonPx;
  /** Problems found, in the order of the input's rings; empty when valid. */
  problems: RingProblem[];
  /** The shoelace sum of the input (outer rings minus holes), px². */
  drawnAreaPx2: number;
  /** Area of `polygons`, px² (equal to `drawnAreaPx2` when valid). */
  areaPx2: number;
}

/** A cleaned ring with where it came from. */
interface RingRef {
  polygon: number;
  ring: number;
  first: Vec2;
}

/**
 * Checks the rings of one outline and repairs an invalid one (see the module
 * documentation for what counts as invalid and how it is repaired).
 *
 * Coordinates are level-0 pixels (x right, y down); either ring winding is
 * accepted; repeated positions and rings without three distinct positions
 * are ignored (a polygon whose outer ring is such is dropped, as the valid
 * region drops it). Speed: one search for meeting edges on a grid (about
 * O(n) for n edges) and, when no edges meet, one crossing count per ring.
 *
 * @param polygons The outline's polygons (a Polygon is one of them), rings as given.
 * @returns The polygons to use, the problems, and both areas.
 *
 * @example A hole outside its polygon removes nothing
 * ```ts
 * import { checkOutline, type Ring } from "hotfield";
 * const square = (x0: number, y0: number, x1: number, y1: number): Ring =>
 *   [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
 * const c = checkOutline([[square(0, 0, 10, 10), square(20, 0, 21, 1)]]);
 * if (c.problems[0]?.kind !== "hole-outside-shell") throw new Error(`found ${JSON.stringify(c.problems)}`);
 * if (c.areaPx2 !== 100 || c.drawnAreaPx2 !== 99) {
 *   throw new Error(`area ${c.areaPx2} (the shoelace sum would give ${c.drawnAreaPx2}); expected 100 and 99`);
 * }
 * ```
 */
export function checkOutline(polygons: MultiPolygonPx): CheckedOutline {
  const polys: PolygonPx[] = [];
  const refs: RingRef[] = [];
  const groups: number[] = [];
  let drawnAreaPx2 = 0;
  for (let p = 0; p < polygons.length; p++) {
    const out: PolygonPx = [];
    for (let r = 0; r < polygons[p].length; r++) {
      const ring = cleanRing(polygons[p][r]);
      if (ring === null) {
        if (r === 0) break;
        continue;
      }
      const a = ringAreaPx2(ring);
      drawnAreaPx2 += r === 0 ? Math.abs(a) : -Math.abs(a);
      // outer rings positive, holes negative (solid on the right, as the vertex rule needs)
      out.push((r === 0) === (a >= 0) ? ring : ring.reverse());
      refs.push({ polygon: p, ring: r, first: polygons[p][r][0] });
    }
    if (out.length > 0) {
      polys.push(out);
      groups.push(p);
    }
  }
  const valid = { polygons, problems: [], drawnAreaPx2, areaPx2: drawnAreaPx2 };
  if (polys.length === 0) return valid;
  const t = tagEdges(polys, groups);
  const problems = crossingProblems(t, refs);
  if (problems.length === 0) problems.push(...nestingProblems(t, polys, refs));
  if (problems.length === 0) {
    // The valid region need not search these edges again.
    markProvenValid(polygons);
    return valid;
  }
  const repaired = turfUnion([polys]);
  return { polygons: repaired, problems, drawnAreaPx2, areaPx2: multiPolygonAreaPx2(repaired) };
}

/** Problems where edges of the outline cross, overlap or meet other than at a shared vertex. */
function crossingProblems(t: TaggedEdges, refs: RingRef[]): RingProblem[] {
  const contacts = findContacts(t, "all", false);
  let bad = contacts.filter((c) => !isVertexContact(t, c));
  if (bad.length === 0) bad = badVertexTouches(t, contacts);
  const seen = new Set<string>();
  const out: RingProblem[] = [];
  for (const c of bad) {
    let a = refs[t.ring[c.a]], b = refs[t.ring[c.b]];
    if (b.polygon < a.polygon || (b.polygon === a.polygon && b.ring < a.ring)) [a, b] = [b, a];
    let kind: RingProblemKind;
    if (a === b) kind = "ring-crosses-itself";
    else if (a.polygon !== b.polygon) kind = "polygons-overlap";
    else kind = a.ring === 0 ? "hole-crosses-shell" : "holes-overlap";
    const key = `${a.polygon}/${a.ring}/${b.polygon}/${b.ring}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const problem: RingProblem = kind === "ring-crosses-itself"
      ? { kind, polygon: a.polygon, ring: a.ring, atPx: [c.x, c.y] }
      : kind === "polygons-overlap"
      ? {
        kind,
        polygon: b.polygon,
        ring: 0,
        otherPolygon: a.polygon,
        otherRing: 0,
        atPx: [c.x, c.y],
      }
      : {
        kind,
        polygon: b.polygon,
        ring: b.ring,
        otherPolygon: a.polygon,
        otherRing: a.ring,
        atPx: [c.x, c.y],
      };
    if (kind === "polygons-overlap") {
      const k2 = `${a.polygon}/*/${b.polygon}`;
      if (seen.has(k2)) continue;
      seen.add(k2);
    }
    out.push(problem);
  }
  return out.sort((p, q) => p.polygon - q.polygon || p.ring - q.ring);
}

/**
 * Problems of rings that do not meet (but at shared vertices): for each
 * ring, the rings around the midpoint of its first edge, by crossing counts
 * along a horizontal ray (a point on no other ring, as no edges meet).
 */
function nestingProblems(t: TaggedEdges, polys: PolygonPx[], refs: RingRef[]): RingProblem[] {
  const bands = buildBands(t);
  const ringCount = refs.length;
  const parity = new Uint8Array(ringCount);
  const touched: number[] = [];
  // global ring id of each polygon's outer ring, and the polygon of each ring
  const shellOf: number[] = [];
  const polyOf = new Int32Array(ringCount);
  let rid = 0;
  for (let p = 0; p < polys.length; p++) {
    shellOf.push(rid);
    for (let r = 0; r < polys[p].length; r++) polyOf[rid++] = p;
  }
  const out: RingProblem[] = [];
  rid = 0;
  for (let p = 0; p < polys.length; p++) {
    for (let r = 0; r < polys[p].length; r++, rid++) {
      const ring: Ring = polys[p][r];
      const x = (ring[0][0] + ring[1][0]) / 2, y = (ring[0][1] + ring[1][1]) / 2;
      const k = bandOf(bands, y);
      for (let s = bands.start[k], f = bands.start[k + 1]; s < f; s++) {
        const i = bands.ids[s];
        const owner = t.ring[i];
        if (owner === rid) continue;
        const ay = t.y0[i], by = t.y1[i];
        if ((ay > y) !== (by > y)) {
          const ax = t.x0[i], bx = t.x1[i];
          const cr = (bx - ax) * (y - ay) - (by - ay) * (x - ax);
          if ((cr > 0) === (by > ay)) {
            if (parity[owner] === 0) touched.push(owner);
            parity[owner] ^= 1;
          }
        }
      }
      const around = new Set<number>();
      for (const o of touched) if (parity[o] === 1) around.add(o);
      for (const o of touched) parity[o] = 0;
      touched.length = 0;
      const ref = refs[rid];
      if (r > 0) {
        if (!around.has(shellOf[p])) {
          out.push({
            kind: "hole-outside-shell",
            polygon: ref.polygon,
            ring: ref.ring,
            atPx: ref.first,
          });
          continue;
        }
        for (const o of around) {
          if (polyOf[o] === p && o !== shellOf[p]) {
            const other = refs[o];
            out.push({
              kind: "hole-in-hole",
              polygon: ref.polygon,
              ring: ref.ring,
              otherPolygon: other.polygon,
              otherRing: other.ring,
              atPx: ref.first,
            });
            break;
          }
        }
      } else {
        // inside polygon q: inside its outer ring and none of its holes
        const inside = new Map<number, boolean>();
        for (const o of around) {
          const q = polyOf[o];
          inside.set(q, (inside.get(q) ?? true) && o === shellOf[q]);
        }
        for (const [q, yes] of inside) {
          if (yes && around.has(shellOf[q])) {
            out.push({
              kind: "polygon-in-polygon",
              polygon: ref.polygon,
              ring: 0,
              otherPolygon: refs[shellOf[q]].polygon,
              otherRing: 0,
              atPx: ref.first,
            });
            break;
          }
        }
      }
    }
  }
  return out;
}
