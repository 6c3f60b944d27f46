/**
 * The valid counting region of a case: tissue ∩ tumour − exclusions.
 *
 * @module
 */

import type { MultiPolygonPx, PolygonPx, RegionPart } from "../types.ts";
import { inputError } from "../errors.ts";
import { bandOf, buildBands, type EdgeBands } from "./_edges.ts";
import { findContacts, tagEdges, type TaggedEdges } from "./_contacts.ts";
import { isProvenValid } from "./proven_outlines.ts";
import { badVertexTouches, isVertexContact } from "./_vertex_touches.ts";
import { bboxOf, boxesMeet } from "./_ring_sets.ts";
import { intersectRegions, subtractRegions, unionRegions } from "./_pair_ops.ts";
import { turfUnion } from "./_turf.ts";
import { orientPolygon } from "./normalize.ts";
import { multiPolygonAreaPx2 } from "./planar_area.ts";

/** The region parts of a case, by role. */
export interface ValidRegionParts {
  /** Tissue outlines (none: tissue does not restrict). */
  tissue: RegionPart[];
  /** Tumour outlines (none: tumour does not restrict). */
  tumour: RegionPart[];
  /** Outlines taken out. */
  exclude: RegionPart[];
}

/** The valid region and its pieces, in level-0 pixels. */
export interface ValidRegion {
  /** V = ∪tissue ∩ ∪tumour − ∪exclude, normalized and non-overlapping. */
  region: MultiPolygonPx;
  /** ∪tissue (empty when no tissue part was given). */
  tissue: MultiPolygonPx;
  /** ∪tumour (empty when no tumour part was given). */
  tumour: MultiPolygonPx;
  /** ∪exclude (empty when none was given). */
  exclude: MultiPolygonPx;
  /** Area of ∪tissue, px². */
  tissueAreaPx2: number;
  /** Area of ∪tumour, px². */
  tumourAreaPx2: number;
  /** Area removed from tissue ∩ tumour by the exclusions, px². */
  excludedAreaPx2: number;
  /** Area of `region`, px². */
  validAreaPx2: number;
  /** Recoverable problems (repaired outlines), one sentence each. */
  warnings: string[];
}

function fmt(v: number): string {
  return String(Math.round(v));
}

/**
 * Ring nesting of polygons whose edges meet at most at shared vertices is
 * consistent: outer rings at even depth, holes at odd depth, counting the
 * rings around the midpoint of each ring's first edge (a point on no other
 * ring). False also when that midpoint lies on another ring.
 */
function nestingIsConsistent(t: TaggedEdges, polys: PolygonPx[]): boolean {
  const bands: EdgeBands = buildBands(t, 4, 0, true);
  let rid = 0;
  for (const p of polys) {
    for (let r = 0; r < p.length; r++, rid++) {
      const x = (p[r][0][0] + p[r][1][0]) / 2, y = (p[r][0][1] + p[r][1][1]) / 2;
      const k = bandOf(bands, y);
      let parity = 0;
      for (let s = bands.start[k], f = bands.start[k + 1]; s < f; s++) {
        const i = bands.ids[s];
        if (t.ring[i] === rid) continue;
        const ay = t.y0[i], by = t.y1[i];
        if ((ay > y) !== (by > y)) {
          const ax = t.x0[i], bx = t.x1[i];
          const cr = (bx - ax) * (y - ay) - (by - ay) * (x - ax);
          if (cr === 0) return false;
          if ((cr > 0) === (by > ay)) parity ^= 1;
        } else if (ay === y && by === y) {
          // a horizontal edge on the test line matters only if it holds the point
          const ax = t.x0[i], bx = t.x1[i];
          if ((x >= ax && x <= bx) || (x >= bx && x <= ax)) return false;
        }
      }
      if (parity !== (r === 0 ? 0 : 1)) return false;
    }
  }
  return true;
}

/**
 * Union of the parts of one role. Parts whose outlines meet at most at
 * shared vertices (without crossing) and nest consistently are kept as they
 * are. Parts that are valid on their own but overlap each other are united
 * one by one. Otherwise (a part crossing, folding back on or overlapping
 * itself) the whole role goes through the general planar union, which
 * repairs self-intersections, and each such part gets a warning.
 */
function unionRole(parts: RegionPart[], role: string, warnings: string[]): MultiPolygonPx {
  const polys: PolygonPx[] = [];
  const groups: number[] = [];
  const normalized: MultiPolygonPx[] = [];
  parts.forEach((part, i) => {
    const mp: MultiPolygonPx = [];
    for (const p of part.polygons) {
      const q = orientPolygon(p, true);
      if (q.length > 0) mp.push(q);
    }
    normalized.push(mp);
    for (const p of mp) {
      polys.push(p);
      groups.push(i);
    }
  });
  if (polys.length === 0) return [];
  // One part whose outline the reader already proved valid is kept as it is.
  if (parts.length === 1 && isProvenValid(parts[0].polygons)) return polys;
  const tagged = tagEdges(polys, groups);
  const contacts = findContacts(tagged, "all", false);
  // polygons that only touch at shared vertices (as traced masks do) need no union
  const bad = contacts.filter((c) => !isVertexContact(tagged, c));
  if (bad.length === 0) bad.push(...badVertexTouches(tagged, contacts));
  if (bad.length === 0 && nestingIsConsistent(tagged, polys)) return polys;
  const warned = new Set<number>();
  const selfBad = bad.some((c) => tagged.group[c.a] === tagged.group[c.b]);
  if (!selfBad) {
    // parts that are valid on their own but overlap each other: unite them one by one
    // (one polygon can be nested wrongly too: a hole outside its outer ring)
    const nestedWrongly = normalized.findIndex((mp, i) =>
      !nestingIsConsistent(tagEdges(mp, mp.map(() => i)), mp)
    );
    if (nestedWrongly < 0) {
      let u: MultiPolygonPx = [];
      for (const mp of normalized) u = unionRegions(u, mp);
      return u;
    }
    warned.add(nestedWrongly);
    warnings.push(
      `The ${role} outline ${
        parts[nestedWrongly].source
      } has polygons lying inside one another (or a hole outside its polygon); they were repaired by a planar union`,
    );
  }
  for (const c of bad) {
    const g = tagged.group[c.a];
    if (g !== tagged.group[c.b] || warned.has(g)) continue;
    warned.add(g);
    warnings.push(
      `The ${role} outline ${parts[g].source} crosses or touches itself near (${fmt(c.x)}, ${
        fmt(c.y)
      }) px; it was repaired by a planar union, which keeps every area the outline encloses`,
    );
  }
  return turfUnion(normalized);
}

/** Splits `a` into polygons whose box meets `box` and the rest. */
function splitByBox(
  a: MultiPolygonPx,
  box: [number, number, number, number],
): [MultiPolygonPx, MultiPolygonPx] {
  const near: MultiPolygonPx = [], far: MultiPolygonPx = [];
  for (const p of a) (boxesMeet(bboxOf([p]), box) ? near : far).push(p);
  return [near, far];
}

function subtractNear(a: MultiPolygonPx, x: MultiPolygonPx): MultiPolygonPx {
  if (a.length === 0 || x.length === 0) return a;
  const [xn] = splitByBox(x, bboxOf(a));
  if (xn.length === 0) return a;
  const [an, af] = splitByBox(a, bboxOf(xn));
  if (an.length === 0) return a;
  return [...subtractRegions(an, xn), ...af];
}

/**
 * Builds the valid counting region V from a case's tissue, tumour and
 * exclude parts.
 *
 * - V = ∪tissue ∩ ∪tumour − ∪exclude when both tissue and tumour are given;
 * - V = ∪tumour − ∪exclude when only tumour is given;
 * - V = ∪tissue − ∪exclude when only tissue is given.
 *
 * Coordinates are level-0 pixels (x right, y down); either ring winding is
 * accepted and the result is normalized (outer rings positive shoelace area,
 * holes negative) with polygons that do not overlap (they may touch).
 *
 * **Self-intersecting outlines are repaired, not rejected:** when a part's
 * outline crosses itself (e.g. a bow-tie), runs back along itself, or its
 * polygons overlap, the role is replaced by the planar union of its parts,
 * which keeps every area the outline encloses (a bow-tie becomes its two
 * triangles), and a warning names the part's `source` and the approximate
 * position of the problem in pixels. Rings that merely touch at a shared
 * vertex without crossing (a hole touching its outer ring, or traced mask
 * pieces meeting corner to corner) are valid and kept as they are.
 * Overlapping parts of one role are united without a warning (as
 * R − ((R − A) ∩ (R − B)) with the same ring-by-ring clipping as below).
 *
 * Speed: planar set operations are avoided wherever they cannot change the
 * result. A role whose outlines meet nowhere needs no union; polygons whose
 * bounding boxes miss the other operand are passed through or dropped;
 * operands whose boundaries do not meet are combined ring by ring (one
 * point-in-region test per ring); and when they do meet, only the rings
 * involved are clipped, by splitting them at their crossings and keeping the
 * pieces inside every other ring's constraint (one midpoint test per piece).
 * The general clipper is used only for degenerate contacts (shared edges,
 * vertices on edges). Contacts are found with a grid of edges in about O(n).
 *
 * @param parts Tissue, tumour and exclude parts as read.
 * @returns The region, the unions, their areas (px²) and warnings (also
 *   when nothing is left to count: `region` is then `[]`).
 * @throws {TypeError} When neither a tissue nor a tumour part has any area.
 *
 * @example A tumour outline over tissue, minus a necrotic patch
 * ```ts
 * import { buildValidRegion } from "hotfield";
 * const rect = (x0: number, y0: number, x1: number, y1: number): [number, number][] =>
 *   [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
 * const v = buildValidRegion({
 *   tissue: [{ polygons: [[rect(0, 0, 100, 100)]], source: "QVT-24-001.geojson feature 0" }],
 *   tumour: [{ polygons: [[rect(50, 0, 150, 100)]], source: "QVT-24-001.geojson feature 1" }],
 *   exclude: [{ polygons: [[rect(60, 10, 70, 20)]], source: "QVT-24-001.geojson feature 2" }],
 * });
 * if (Math.abs(v.validAreaPx2 - (5000 - 100)) > 1e-9) throw new Error(String(v.validAreaPx2));
 * if (v.excludedAreaPx2 !== 100) throw new Error(String(v.excludedAreaPx2));
 * ```
 */
export function buildValidRegion(parts: ValidRegionParts): ValidRegion {
  const warnings: string[] = [];
  const tissue = unionRole(parts.tissue, "tissue", warnings);
  const tumour = unionRole(parts.tumour, "tumour", warnings);
  if (tissue.length === 0 && tumour.length === 0) {
    const src = [...parts.tissue, ...parts.tumour, ...parts.exclude][0]?.source ?? "case";
    throw inputError(
      TypeError,
      "case",
      src,
      "has neither a tissue nor a tumour region with any area; at least one is needed",
    );
  }
  const exclude = unionRole(parts.exclude, "exclude", warnings);
  const base = tissue.length === 0 ? tumour : tumour.length === 0 ? tissue : intersectRegions(
    tissue,
    tumour,
  );
  const region = subtractNear(base, exclude);
  const baseArea = multiPolygonAreaPx2(base);
  const validAreaPx2 = multiPolygonAreaPx2(region);
  if (tissue.length > 0 && tumour.length > 0 && baseArea === 0) {
    warnings.push(
      "The tumour region does not overlap the tissue region, so no area is left to count",
    );
  } else if (baseArea > 0 && validAreaPx2 === 0) {
    warnings.push(
      "The exclude regions cover all of the counting region, so no area is left to count",
    );
  }
  return {
    region,
    tissue,
    tumour,
    exclude,
    tissueAreaPx2: multiPolygonAreaPx2(tissue),
    tumourAreaPx2: multiPolygonAreaPx2(tumour),
    excludedAreaPx2: Math.max(0, baseArea - validAreaPx2),
    validAreaPx2,
    warnings,
  };
}
