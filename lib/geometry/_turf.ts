/**
 * Private: planar set operations through Turf (polygon clipping only; Turf's
 * geodesic measuring helpers are never used). Inputs and outputs are plain
 * multipolygons; outputs are normalized.
 *
 * @module
 */

import union from "@turf/union";
import intersect from "@turf/intersect";
import { featureCollection, multiPolygon } from "@turf/helpers";
import type { MultiPolygonPx } from "../types.ts";
import { normalizeMultiPolygon } from "./normalize.ts";

type AnyFeature = ReturnType<typeof multiPolygon>;
type OpResult = ReturnType<typeof intersect>;

function toFeature(mp: MultiPolygonPx): AnyFeature {
  return multiPolygon(mp as number[][][][]);
}

function fromFeature(f: OpResult): MultiPolygonPx {
  if (f === null || f.geometry === null) return [];
  const g = f.geometry;
  const mp = (g.type === "Polygon" ? [g.coordinates] : g.coordinates) as MultiPolygonPx;
  return normalizeMultiPolygon(mp);
}

/** Union of several multipolygons (also resolves self-overlaps). */
export function turfUnion(parts: MultiPolygonPx[]): MultiPolygonPx {
  const nonEmpty = parts.filter((p) => p.length > 0);
  if (nonEmpty.length === 0) return [];
  if (nonEmpty.length === 1) {
    // a union needs two features; a polygon united with nothing is itself, resolved
    return fromFeature(union(featureCollection([toFeature(nonEmpty[0]), toFeature([])])));
  }
  return fromFeature(union(featureCollection(nonEmpty.map(toFeature))));
}

/** Intersection a ∩ b. */
export function turfIntersect(a: MultiPolygonPx, b: MultiPolygonPx): MultiPolygonPx {
  if (a.length === 0 || b.length === 0) return [];
  return fromFeature(intersect(featureCollection([toFeature(a), toFeature(b)])));
}
