/**
 * Checking readers' chosen fields against the count map.
 *
 * @module
 */

import type { CountMap, FieldCheck, Placement, PreparedCase, WindowShape } from "./engine_types.ts";
import type { PolygonPx } from "../types.ts";
import { countInWindow, windowExtents } from "./window_contains.ts";
import { percentileRank } from "./percentile_rank.ts";
import { summarizeDistribution } from "./summarize_distribution.ts";
import {
  createOverlapIndex,
  createRegionIndex,
  polygonAreaPx2,
  polygonOverlapArea,
} from "./_geometry.ts";
import { roundTo } from "../numbers.ts";
import { pxToUm, ringPxToUm } from "../units.ts";
import type { OverlapIndex } from "../geometry/window_overlap.ts";

/** Options of {@linkcode checkFields}. */
export interface CheckFieldsOptions {
  /** Exact area index of V in µm, to reuse. */
  overlap?: OverlapIndex;
  /** Histogram of the map's admissible counts, to reuse. */
  histogram?: number[];
}

/** Relative area difference above which a polygon field gets a warning. */
const AREA_TOLERANCE = 0.05;

/**
 * Checks each reader's field (`prepared.fields`) against the map.
 *
 * A point field is the standard window centred there; a polygon field is
 * that area, centred at its centroid. A field of several parts (`polygons`:
 * separate areas; `circles`: one circular microscope field of the given
 * diameter at each point) is one reading: its count is the sum of the parts'
 * counts and its area the sum of their areas (a figure inside two overlapping
 * parts counts twice, as it would at the microscope; overlaps get a warning).
 *
 * Count: counted figures inside (closed: a figure on the edge is inside);
 * coverage: area(field ∩ V) / area(field), exact (summed over parts). The
 * field is compared with the map through its comparison count: the count
 * scaled to the window's area, c × window area / field area, for polygons
 * whose area differs from the window's by more than 5% and always for fields
 * of several parts (`countScaledToWindow`); else the count itself.
 * Percentile: 100 × (#positions with count < c + ½ × #positions with count =
 * c) / positions over admissible grid positions (null without positions).
 * Shortfall: hotspot count − c.
 *
 * @param prepared The prepared case (fields in pixels, figures in µm).
 * @param map The count map of the window.
 * @param hotspot The hotspot, or null.
 * @param window The standard window.
 * @returns One check per field, in input order.
 *
 * @example A point field on the only figure
 * ```ts
 * import { checkFields, computeCountMap, makeWindow, parseAnnotations, prepareCase } from "hotfield";
 * // A 4 × 4 mm tissue square at 1 µm/px, one figure in the middle and a reader's field on it.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 4000], [0, 4000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 2000]] } },
 *     { type: "Feature", properties: { role: "field", reader: "reader-a" }, geometry: { type: "Point", coordinates: [2000, 2000] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const prepared = prepareCase({ caseId: "QVT-24-001", ...parsed, sources: [] });
 * const window = makeWindow({ areaMm2: 1, aspect: [1, 1] });
 * const map = computeCountMap(prepared, window, { strideUm: 500 });
 * const [field] = checkFields(prepared, map, null, window);
 * if (field.count !== 1 || field.coverage !== 1) throw new Error(`count ${field.count}, coverage ${field.coverage}`);
 * // 40 of the 49 positions hold 0 figures and 9 hold 1: (40 + 9/2) / 49 = 90.8%.
 * if (Math.abs(field.percentile! - 100 * 44.5 / 49) > 1e-9) throw new Error(`percentile ${field.percentile}`);
 * ```
 */
export function checkFields(
  prepared: Pick<PreparedCase, "validUm" | "xUm" | "yUm" | "slide" | "fields">,
  map: Pick<CountMap, "counts" | "admissible">,
  hotspot: Placement | null,
  window: WindowShape,
  options: CheckFieldsOptions = {},
): FieldCheck[] {
  if (prepared.fields.length === 0) return [];
  const mpp = prepared.slide;
  const overlap = options.overlap ?? createOverlapIndex(prepared.validUm);
  const histogram = options.histogram ?? summarizeDistribution(map).histogram;
  const e = windowExtents(window);
  const windowAreaMm2 = e.areaUm2 / 1e6;
  const toUm = (poly: PolygonPx): PolygonPx => poly.map((ring) => ringPxToUm(ring, mpp));
  return prepared.fields.map((field, n) => {
    const centerUm = pxToUm(field.centerPx, mpp);
    const warnings: string[] = [];
    const who = `Field ${n + 1}${
      field.reader ? ` (${field.reader})` : ""
    }, feature ${field.featureIndex}`;
    let count = 0, coveredUm2 = 0, areaUm2 = 0, parts = 1;
    const several = field.kind === "polygons" || field.kind === "circles";
    if (field.kind === "polygon" && field.polygon) {
      const polyUm = toUm(field.polygon);
      const a = polygonCount(polyUm, prepared);
      count = a.count, coveredUm2 = a.coveredUm2, areaUm2 = a.areaUm2;
    } else if (field.kind === "polygons" && field.parts) {
      const polys = field.parts.map(toUm);
      parts = polys.length;
      for (const polyUm of polys) {
        const a = polygonCount(polyUm, prepared);
        count += a.count, coveredUm2 += a.coveredUm2, areaUm2 += a.areaUm2;
      }
      const pairs = overlappingPolygons(polys);
      if (pairs.length > 0) {
        warnings.push(
          `${who}: parts ${listPairs(pairs)} overlap; ` +
            `figures in an overlap are counted once per part`,
        );
      }
    } else if (field.kind === "circles" && field.pointsPx && field.diameterMm) {
      const rUm = (field.diameterMm * 1000) / 2;
      const centres = field.pointsPx.map((p) => pxToUm(p, mpp));
      parts = centres.length;
      for (const c of centres) {
        count += countInDisk(prepared.xUm, prepared.yUm, c, rUm);
        coveredUm2 += overlap.disk(c, rUm);
        areaUm2 += Math.PI * rUm * rUm;
      }
      const pairs: [number, number][] = [];
      for (let a = 0; a < centres.length; a++) {
        for (let b = a + 1; b < centres.length; b++) {
          const d = Math.hypot(centres[a][0] - centres[b][0], centres[a][1] - centres[b][1]);
          if (d < 2 * rUm * (1 - 1e-9)) pairs.push([a, b]);
        }
      }
      if (pairs.length > 0) {
        warnings.push(
          `${who}: circular fields ${listPairs(pairs)} overlap (centres closer than the ` +
            `${
              fmt(field.diameterMm, 3)
            } mm diameter); figures in an overlap are counted once per field`,
        );
      }
    } else {
      areaUm2 = e.areaUm2;
      count = countInWindow(prepared.xUm, prepared.yUm, window, centerUm[0], centerUm[1]);
      coveredUm2 = window.shape === "rect"
        ? overlap.rect([
          centerUm[0] - e.halfX,
          centerUm[1] - e.halfY,
          centerUm[0] + e.halfX,
          centerUm[1] + e.halfY,
        ])
        : overlap.disk(centerUm, e.halfX);
    }
    const areaMm2 = areaUm2 / 1e6;
    const coverage = areaUm2 > 0 ? clamp01(coveredUm2 / areaUm2) : 0;
    let countScaledToWindow: number | null = null;
    if (field.kind !== "point") {
      const rel = areaUm2 / e.areaUm2 - 1;
      const off = Math.abs(rel) > AREA_TOLERANCE;
      if (off || several) countScaledToWindow = areaUm2 > 0 ? (count * e.areaUm2) / areaUm2 : null;
      if (off) {
        warnings.push(
          `${who} covers ${fmt(areaMm2, 3)} mm²${several ? ` in ${parts} parts` : ""}, ${
            fmt(Math.abs(rel) * 100, 1)
          }% ${rel > 0 ? "more" : "less"} than the window's ${
            fmt(windowAreaMm2, 3)
          } mm²; its count scaled to the window is ${
            countScaledToWindow === null ? "undefined" : fmt(countScaledToWindow, 2)
          }`,
        );
      }
    }
    if (coverage < 1 - 1e-9) {
      warnings.push(
        `${who} lies ${fmt((1 - coverage) * 100, 1)}% outside the valid region`,
      );
    }
    const compared = countScaledToWindow ?? count;
    const check: FieldCheck = {
      reader: field.reader,
      kind: field.kind,
      centerPx: [field.centerPx[0], field.centerPx[1]] as [number, number],
      centerUm,
      count,
      parts,
      coverage,
      percentile: percentileRank(histogram, compared),
      shortfall: hotspot ? hotspot.count - compared : null,
      areaMm2,
      countScaledToWindow,
      featureIndex: field.featureIndex,
      warnings,
    };
    if (field.kind === "circles") check.diameterMm = field.diameterMm;
    if (field.date !== undefined) check.date = field.date;
    return check;
  });
}

/** Count, area and area inside V of one polygon in µm. */
function polygonCount(
  polyUm: PolygonPx,
  prepared: Pick<PreparedCase, "validUm" | "xUm" | "yUm">,
): { count: number; areaUm2: number; coveredUm2: number } {
  const areaUm2 = Math.abs(polygonAreaPx2(polyUm));
  const inside = createRegionIndex([polyUm]).containsPoints(prepared.xUm, prepared.yUm);
  let count = 0;
  for (let k = 0; k < inside.length; k++) if (inside[k]) count++;
  const coveredUm2 = areaUm2 > 0 ? polygonOverlapArea(prepared.validUm, polyUm) : 0;
  return { count, areaUm2, coveredUm2 };
}

/** Figures in the closed disk of radius r about c (µm). */
function countInDisk(
  xUm: Float64Array,
  yUm: Float64Array,
  c: [number, number],
  rUm: number,
): number {
  const r2 = rUm * rUm;
  let n = 0;
  for (let k = 0; k < xUm.length; k++) {
    const dx = xUm[k] - c[0], dy = yUm[k] - c[1];
    if (dx * dx + dy * dy <= r2) n++;
  }
  return n;
}

/** Pairs of parts whose interiors overlap (area above a relative 1e-9). */
function overlappingPolygons(polys: PolygonPx[]): [number, number][] {
  const pairs: [number, number][] = [];
  for (let a = 0; a < polys.length; a++) {
    for (let b = a + 1; b < polys.length; b++) {
      const shared = polygonOverlapArea([polys[a]], polys[b]);
      const scale = Math.min(
        Math.abs(polygonAreaPx2(polys[a])),
        Math.abs(polygonAreaPx2(polys[b])),
      );
      if (shared > 1e-9 * scale) pairs.push([a, b]);
    }
  }
  return pairs;
}

function listPairs(pairs: [number, number][]): string {
  const shown = pairs.slice(0, 5).map(([a, b]) => `${a + 1} and ${b + 1}`).join(", ");
  return pairs.length > 5 ? `${shown}, …` : shown;
}

function clamp01(v: number): number {
  return v < 0 ? 0 : v > 1 ? 1 : v;
}

function fmt(v: number, d: number): string {
  return String(roundTo(v, d));
}
