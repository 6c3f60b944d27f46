/**
 * Test helpers: seeded random polygons and a bridge to JSTS 2.12.1 (a port of
 * the JTS Topology Suite), the independent reference for planar areas and
 * intersections.
 *
 * @module
 */

import GeoJSONReader from "jsts/org/locationtech/jts/io/GeoJSONReader.js";
import Centroid from "jsts/org/locationtech/jts/algorithm/Centroid.js";
import OverlayOp from "jsts/org/locationtech/jts/operation/overlay/OverlayOp.js";
import GeometryFactory from "jsts/org/locationtech/jts/geom/GeometryFactory.js";
import type { BBoxPx, MultiPolygonPx, PolygonPx, Ring } from "../../lib/types.ts";
import { type Random, seededRandom } from "../../lib/random.ts";

export { seededRandom };
export type { Random };

/** A star-shaped ring about (cx, cy): n vertices, radii in [rMin, rMax]. */
export function starRing(
  rnd: Random,
  cx: number,
  cy: number,
  n: number,
  rMin: number,
  rMax: number,
): Ring {
  const ring: Ring = [];
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * (i + 0.2 + 0.6 * rnd())) / n;
    const r = rMin + (rMax - rMin) * rnd();
    ring.push([cx + r * Math.cos(t), cy + r * Math.sin(t)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/**
 * A random polygon with holes: a star-shaped outer ring (radii R/2 … R) and
 * up to `maxHoles` small star-shaped holes well inside it, not touching each
 * other. Winding is left as generated (outer positive in the shoelace sense).
 */
export function randomPolygon(
  rnd: Random,
  cx: number,
  cy: number,
  R: number,
  n = 24,
  maxHoles = 3,
): PolygonPx {
  const outer = starRing(rnd, cx, cy, n, R / 2, R);
  const k = Math.floor(rnd() * (maxHoles + 1));
  const holes: Ring[] = [];
  for (let i = 0; i < k; i++) {
    const t = (2 * Math.PI * i) / Math.max(k, 1) + 0.3 * rnd();
    const hx = cx + 0.28 * R * Math.cos(t), hy = cy + 0.28 * R * Math.sin(t);
    holes.push(starRing(rnd, hx, hy, 5 + Math.floor(rnd() * 6), 0.03 * R, 0.09 * R).reverse());
  }
  return [outer, ...holes];
}

const reader = new GeoJSONReader();

// deno-lint-ignore no-explicit-any
type JstsGeometry = any;

/** A multipolygon as a JSTS geometry. */
export function toJsts(mp: MultiPolygonPx): JstsGeometry {
  return reader.read({ type: "MultiPolygon", coordinates: mp });
}

/** A rectangle as a JSTS geometry. */
export function rectJsts(b: BBoxPx): JstsGeometry {
  const [x0, y0, x1, y1] = b;
  return reader.read({
    type: "Polygon",
    coordinates: [[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]],
  });
}

/** JSTS area of a ∩ b. */
export function jstsIntersectionArea(a: JstsGeometry, b: JstsGeometry): number {
  return OverlayOp.intersection(a, b).getArea();
}

/** JSTS area of a − b. */
export function jstsDifferenceArea(a: JstsGeometry, b: JstsGeometry): number {
  return OverlayOp.difference(a, b).getArea();
}

const factory = new GeometryFactory();

/**
 * Keeps the polygonal part of an overlay result: JSTS returns a
 * GeometryCollection when an overlay also produces lines or points.
 */
function polygonal(g: JstsGeometry): JstsGeometry {
  if (g.getGeometryType() !== "GeometryCollection") return g;
  let out: JstsGeometry = factory.createPolygon();
  for (let i = 0; i < g.getNumGeometries(); i++) {
    const c = g.getGeometryN(i);
    const t = c.getGeometryType();
    if (t === "Polygon" || t === "MultiPolygon") out = OverlayOp.union(out, c);
  }
  return out;
}

/** JSTS union of geometries. */
export function jstsUnion(a: JstsGeometry, b: JstsGeometry): JstsGeometry {
  return polygonal(OverlayOp.union(a, b));
}

/** JSTS intersection geometry. */
export function jstsIntersection(a: JstsGeometry, b: JstsGeometry): JstsGeometry {
  return polygonal(OverlayOp.intersection(a, b));
}

/** JSTS difference geometry. */
export function jstsDifference(a: JstsGeometry, b: JstsGeometry): JstsGeometry {
  return polygonal(OverlayOp.difference(a, b));
}

/** Relative difference |a − b| / max(1, |b|). */
export function relErr(a: number, b: number): number {
  return Math.abs(a - b) / Math.max(1, Math.abs(b));
}

/** JSTS area centroid of a geometry. */
export function jstsCentroid(g: JstsGeometry): [number, number] {
  const c = Centroid.getCentroid(g);
  return [c.x, c.y];
}
