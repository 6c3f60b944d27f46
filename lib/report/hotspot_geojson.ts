/**
 * The windows of a case result as a GeoJSON FeatureCollection in level-0
 * pixels, so any viewer that reads GeoJSON can overlay them on the slide.
 *
 * @module
 */

import type { Placement, WindowShape } from "../count/engine_types.ts";
import type { CaseResult } from "../pipeline/case_result.ts";
import type { Ring } from "../types.ts";
import { ringUmToPx } from "../units.ts";

/** Vertices used to draw a circular window as a polygon. */
const CIRCLE_VERTICES = 128;

/**
 * Outline of a window centred at `centerUm`, in micrometres, as a closed ring.
 * Circles become regular 128-gons (drawing only; counts use the true circle).
 *
 * @example A circle's ring has 129 positions
 * ```ts
 * import { windowRingUm } from "./hotspot_geojson.ts";
 * const ring = windowRingUm({ shape: "circle", areaMm2: 1, diameterUm: 1000 }, [0, 0]);
 * if (ring.length !== 129 || ring[0][0] !== 500) {
 *   throw new Error(`${ring.length} positions starting at x ${ring[0][0]}; expected 129 from x 500`);
 * }
 * ```
 */
export function windowRingUm(window: WindowShape, centerUm: [number, number]): Ring {
  const [cx, cy] = centerUm;
  const ring: Ring = [];
  if (window.shape === "rect") {
    const hw = window.widthUm / 2, hh = window.heightUm / 2;
    ring.push([cx - hw, cy - hh], [cx + hw, cy - hh], [cx + hw, cy + hh], [cx - hw, cy + hh]);
  } else {
    const r = window.diameterUm / 2;
    for (let k = 0; k < CIRCLE_VERTICES; k++) {
      const t = (2 * Math.PI * k) / CIRCLE_VERTICES;
      ring.push([cx + r * Math.cos(t), cy + r * Math.sin(t)]);
    }
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/**
 * Outline of a window centred at `centerUm`, in level-0 pixels, as a closed ring.
 * Circles become regular 128-gons (drawing only; counts use the true circle).
 *
 * @example A rectangle's ring
 * ```ts
 * import { windowRingPx } from "./hotspot_geojson.ts";
 * const ring = windowRingPx(
 *   { shape: "rect", areaMm2: 1, widthUm: 1000, heightUm: 1000, aspect: [1, 1] },
 *   [500, 500],
 *   { mppX: 0.5, mppY: 0.5 },
 * );
 * // 1000 µm at 0.5 µm/px is 2000 px.
 * if (ring.length !== 5 || ring[0][0] !== 0 || ring[2][0] !== 2000) throw new Error(`ring ${JSON.stringify(ring)}`);
 * ```
 */
export function windowRingPx(
  window: WindowShape,
  centerUm: [number, number],
  mpp: { mppX: number; mppY: number },
): Ring {
  return ringUmToPx(windowRingUm(window, centerUm), mpp);
}

/** One window of `hotspot.geojson`: a GeoJSON Polygon in level-0 pixels. */
export interface HotspotFeature {
  /** Always "Feature". */
  type: "Feature";
  /** What the window is and what it holds. */
  properties: {
    /** The hotspot, one of the top-k windows, or one of the best separate fields. */
    kind: "hotspot" | "top" | "best-field";
    /** Rank within its kind, from 1. */
    rank: number;
    /** Counted figures in the closed window. */
    count: number;
    /** Share of the window inside the valid region, 0–1 (not rounded). */
    coverage: number;
    /** `count` per mm² of window (not rounded). */
    per_mm2: number;
    /** Window centre, level-0 pixels (not rounded). */
    center_px: [number, number];
    /** Window shape. */
    shape: "rect" | "circle";
    /** Window area, mm². */
    area_mm2: number;
  };
  /** The window outline: one closed ring in level-0 pixels (a circle as a polygon). */
  geometry: { type: "Polygon"; coordinates: Ring[] };
}

/** The `hotspot.geojson` FeatureCollection of one case. */
export interface HotspotFeatureCollection {
  /** Always "FeatureCollection". */
  type: "FeatureCollection";
  /** The case id (a foreign member). */
  case: string;
  /** Hotspot first, then the top-k windows, then the best fields. */
  features: HotspotFeature[];
}

/**
 * Builds the `hotspot.geojson` FeatureCollection of a case result: the
 * hotspot (`properties.kind: "hotspot"`), the top-k windows (`"top"`) and the
 * best set of separate fields (`"best-field"`), each with its count.
 *
 * @example An empty result gives an empty collection
 * ```ts
 * import { hotspotFeatureCollection } from "./hotspot_geojson.ts";
 * const fc = hotspotFeatureCollection({
 *   window: { shape: "circle", areaMm2: 1, diameterUm: 1128.4 },
 *   hotspot: null, top: [], bestFields: [], bestFieldWindow: null,
 *   caseId: "QVT-24-001", mpp: { mppX: 0.25, mppY: 0.25 },
 * });
 * if (fc.features.length !== 0) throw new Error(`${fc.features.length} features from no placement`);
 * ```
 */
export function hotspotFeatureCollection(input: {
  window: WindowShape;
  hotspot: Placement | null;
  top: Placement[];
  bestFields: Placement[];
  bestFieldWindow: WindowShape | null;
  caseId: string;
  mpp: { mppX: number; mppY: number };
}): HotspotFeatureCollection {
  const feature = (
    p: Placement,
    w: WindowShape,
    kind: HotspotFeature["properties"]["kind"],
    rank: number,
  ): HotspotFeature => ({
    type: "Feature",
    properties: {
      kind,
      rank,
      count: p.count,
      coverage: p.coverage,
      per_mm2: p.perMm2,
      center_px: p.centerPx,
      shape: w.shape,
      area_mm2: w.areaMm2,
    },
    geometry: { type: "Polygon", coordinates: [windowRingPx(w, p.centerUm, input.mpp)] },
  });
  const features: HotspotFeature[] = [];
  if (input.hotspot) features.push(feature(input.hotspot, input.window, "hotspot", 1));
  input.top.forEach((p, i) => features.push(feature(p, input.window, "top", i + 1)));
  if (input.bestFieldWindow) {
    const w = input.bestFieldWindow;
    input.bestFields.forEach((p, i) => features.push(feature(p, w, "best-field", i + 1)));
  }
  return { type: "FeatureCollection", case: input.caseId, features };
}

/**
 * The `hotspot.geojson` collection of a whole {@linkcode CaseResult}.
 *
 * @example A hotspot gives one feature
 * ```ts
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { caseHotspotGeoJson } from "./hotspot_geojson.ts";
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [4000, 0], [4000, 3000], [0, 3000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: [[2000, 1500], [2100, 1400], [500, 500]] } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * // No top-k windows and no best fields: the hotspot alone.
 * const result = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, {
 *   strideUm: 100, top: 0, bestN: 0,
 * });
 * const fc = caseHotspotGeoJson(result);
 * const kinds = fc.features.map((f) => f.properties.kind).join();
 * if (kinds !== "hotspot" || fc.features[0].properties.count !== 3) throw new Error(`features ${kinds}`);
 * ```
 */
export function caseHotspotGeoJson(
  result: CaseResult,
): HotspotFeatureCollection {
  return hotspotFeatureCollection({
    window: result.window,
    hotspot: result.hotspot,
    top: result.top,
    bestFields: result.bestFields,
    bestFieldWindow: result.bestFieldWindow,
    caseId: result.prepared.caseId,
    mpp: result.prepared.slide,
  });
}
