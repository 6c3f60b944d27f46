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
 * that area, centred at its centroid. Count: counted figures inside (closed:
 * a figure on the edge is inside); coverage: area(field ∩ V) / area(field),
 * exact. Percentile: 100 × (#positions with count < c + ½ × #positions with
 * count = c) / positions over admissible grid positions (null without
 * positions). Shortfall: hotspot count − c. A polygon whose area differs
 * from the window's by more than 5% gets a warning and
 * `countScaledToWindow` = c × window area / polygon area.
 *
 * @param prepared The prepared case (fields in pixels, figures in µm).
 * @param map The count map of the window.
 * @param hotspot The hotspot, or null.
 * @param window The standard window.
 * @returns One check per field, in input order.
 *
 * @example A point field on the only figure
 * ```ts
 * import { checkFields } from "./check_fields.ts";
 * import { makeWindow } from "./make_window.ts";
 * const sq = [[[0, 0], [4000, 0], [4000, 4000], [0, 4000], [0, 0]]] as [number, number][][];
 * const prepared = {
 *   validUm: [sq], slide: { id: "QVT-24-001", mppX: 1, mppY: 1 },
 *   xUm: new Float64Array([2000]), yUm: new Float64Array([2000]),
 *   fields: [{ reader: "reader-a", kind: "point", centerPx: [2000, 2000], featureIndex: 4 }],
 * };
 * const map = { counts: new Int32Array([0, 0, 1, 0]), admissible: new Uint8Array([1, 1, 1, 1]) };
 * const w = makeWindow({ areaMm2: 1, aspect: [1, 1] });
 * // deno-lint-ignore no-explicit-any
 * const [f] = checkFields(prepared as any, map as any, null, w);
 * if (f.count !== 1 || f.coverage !== 1 || f.percentile !== 87.5) throw new Error(JSON.stringify(f));
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
  return prepared.fields.map((field, n) => {
    const centerUm = pxToUm(field.centerPx, mpp);
    const warnings: string[] = [];
    const who = `Field ${n + 1}${
      field.reader ? ` (${field.reader})` : ""
    }, feature ${field.featureIndex}`;
    let count: number, coverage: number, areaMm2: number;
    let countScaledToWindow: number | null = null;
    if (field.kind === "polygon" && field.polygon) {
      const polyUm: PolygonPx = field.polygon.map((ring) => ringPxToUm(ring, mpp));
      const areaUm2 = Math.abs(polygonAreaPx2(polyUm));
      areaMm2 = areaUm2 / 1e6;
      const inside = createRegionIndex([polyUm]).containsPoints(prepared.xUm, prepared.yUm);
      count = 0;
      for (let k = 0; k < inside.length; k++) if (inside[k]) count++;
      coverage = areaUm2 > 0 ? clamp01(polygonOverlapArea(prepared.validUm, polyUm) / areaUm2) : 0;
      const rel = areaUm2 / e.areaUm2 - 1;
      if (Math.abs(rel) > AREA_TOLERANCE) {
        countScaledToWindow = areaUm2 > 0 ? (count * e.areaUm2) / areaUm2 : null;
        warnings.push(
          `${who} covers ${fmt(areaMm2, 3)} mm², ${fmt(Math.abs(rel) * 100, 1)}% ${
            rel > 0 ? "more" : "less"
          } than the window's ${fmt(windowAreaMm2, 3)} mm²; its count scaled to the window is ${
            countScaledToWindow === null ? "undefined" : fmt(countScaledToWindow, 2)
          }`,
        );
      }
    } else {
      areaMm2 = windowAreaMm2;
      count = countInWindow(prepared.xUm, prepared.yUm, window, centerUm[0], centerUm[1]);
      const a = window.shape === "rect"
        ? overlap.rect([
          centerUm[0] - e.halfX,
          centerUm[1] - e.halfY,
          centerUm[0] + e.halfX,
          centerUm[1] + e.halfY,
        ])
        : overlap.disk(centerUm, e.halfX);
      coverage = clamp01(a / e.areaUm2);
    }
    if (coverage < 1 - 1e-9) {
      warnings.push(
        `${who} lies ${fmt((1 - coverage) * 100, 1)}% outside the valid region`,
      );
    }
    return {
      reader: field.reader,
      kind: field.kind,
      centerPx: [field.centerPx[0], field.centerPx[1]] as [number, number],
      centerUm,
      count,
      coverage,
      percentile: percentileRank(histogram, count),
      shortfall: hotspot ? hotspot.count - count : null,
      areaMm2,
      countScaledToWindow,
      featureIndex: field.featureIndex,
      warnings,
    };
  });
}

function clamp01(v: number): number {
  return v < 0 ? 0 : v > 1 ? 1 : v;
}

function fmt(v: number, d: number): string {
  return String(roundTo(v, d));
}
