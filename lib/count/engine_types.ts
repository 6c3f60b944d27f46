/**
 * Types of the count engine, shared with the modules above it. Plain data
 * only, so a whole engine result can cross to a worker.
 *
 * The engine works in a micrometre plane: x_um = x_px · mppX, y_um = y_px · mppY
 * (x right, y down). Reports convert centres back to level-0 pixels.
 *
 * @module
 */

import type { FieldKind, FieldSpec, MultiPolygonPx, SlideInfo } from "../types.ts";

/** An axis-aligned rectangle window (W along slide x) of a given area. */
export interface RectWindow {
  /** A rectangle, sides parallel to the slide axes. */
  shape: "rect";
  /** Window area, mm², as asked for. */
  areaMm2: number;
  /** Width along slide x, µm (not rounded). */
  widthUm: number;
  /** Height along slide y, µm (not rounded). */
  heightUm: number;
  /** Aspect W:H as given. */
  aspect: [number, number];
}

/** A circular window of a given area. */
export interface CircleWindow {
  /** A circle. */
  shape: "circle";
  /** Window area, mm², as asked for. */
  areaMm2: number;
  /** Diameter, µm (not rounded). */
  diameterUm: number;
}

/** A counting window. */
export type WindowShape = RectWindow | CircleWindow;

/** Figure tallies of a case (as in `hotfield inspect`). */
export interface FigureTally {
  /** All figure points of any label. */
  total: number;
  /** Counted label, score passes, inside the valid region. */
  counted: number;
  /** Counted label, score passes, outside the valid region. */
  outside_valid: number;
  /** Counted label, score below the minimum. */
  below_score: number;
  /** All figure points by label. */
  by_label: Record<string, number>;
}

/**
 * A case ready for counting: counted figures and the valid region in the
 * micrometre plane, with everything needed to report back in pixels.
 */
export interface PreparedCase {
  /** The case id. */
  caseId: string;
  /** The slide: id and micrometres per pixel. */
  slide: SlideInfo;
  /** Valid region V in micrometres. */
  validUm: MultiPolygonPx;
  /** Valid region V in level-0 pixels (for outputs). */
  validPx: MultiPolygonPx;
  /** Area of V in mm². */
  validAreaMm2: number;
  /** Areas of union(tissue), union(tumour), union(exclude), mm² (0 when absent). */
  areasMm2: { tissue: number; tumour: number; excluded: number; valid: number };
  /** x of the counted figures (label counted, score passes, inside V), µm. */
  xUm: Float64Array;
  /** y of the counted figures, µm (same order as `xUm`). */
  yUm: Float64Array;
  /** Figure tallies by reason. */
  tally: FigureTally;
  /** The readers' fields as read (pixels). */
  fields: FieldSpec[];
  /** Exclusion polygons in pixels, with reasons, for drawing. */
  excludePx: { polygons: MultiPolygonPx; reason?: string }[];
  /** The minimum score used. */
  minScore: number;
  /** The labels counted. */
  countLabels: string[];
  /** Warnings from reading the case and building V. */
  warnings: string[];
}

/**
 * The stride grid of window centres: centre (i, j) is at
 * (x0Um + i·strideUm, y0Um + j·strideUm), i < nx, j < ny. Computed as
 * origin + i × stride, never by repeated addition.
 */
export interface StrideGrid {
  /** x of the first centre, µm from the slide origin. */
  x0Um: number;
  /** y of the first centre, µm from the slide origin. */
  y0Um: number;
  /** Spacing of centres along x and y, µm. */
  strideUm: number;
  /** Centres along x. */
  nx: number;
  /** Centres along y. */
  ny: number;
}

/** Window counts and coverage at every grid centre (row-major, index j·nx + i). */
export interface CountMap {
  /** The grid of window centres. */
  grid: StrideGrid;
  /** The window counted at each centre. */
  window: WindowShape;
  /** Exact count of counted figures in the closed window at each centre. */
  counts: Int32Array;
  /** area(window ∩ V) / area(window) at each centre. */
  coverage: Float32Array;
  /** 1 where coverage ≥ minCoverage. */
  admissible: Uint8Array;
  /** The least coverage admitted, (0, 1]. */
  minCoverage: number;
  /** Number of admissible centres. */
  positions: number;
  /** Plain-words statement of the map's discretization error. */
  discretization: string;
  /**
   * Bound on |coverage − true coverage| at any centre (fraction of the window
   * area): 0 for rectangles (exact up to rounding), the raster bound for circles.
   */
  coverageError?: number;
  /**
   * With `computeCountMap`'s `coverageUpperBound`: a lower bound of the true
   * coverage at each centre (`coverage` then holds an upper bound).
   */
  coverageLow?: Float32Array;
}

/**
 * The work the exact placement searches of one case may do, in figure tests
 * (a figure tested against a window or square, or a step of like cost).
 * Searches given the same budget share it and add to `spent`; past `limit`
 * they stop with a `SearchWorkError`. Plain data, so it can travel to a worker.
 */
export interface SearchBudget {
  /** Work done so far. */
  spent: number;
  /** Most work allowed. */
  limit: number;
}

/** One placed window. */
export interface Placement {
  /** Window centre, µm from the slide origin. */
  centerUm: [number, number];
  /** Window centre, level-0 pixels. */
  centerPx: [number, number];
  /** Counted figures in the closed window. */
  count: number;
  /** area(window ∩ V) / area(window), 0–1. */
  coverage: number;
  /** `count` per mm² of window. */
  perMm2: number;
  /**
   * How far (µm) the centre can move in any direction before the count
   * changes; set by `settlePlacement`, absent elsewhere.
   */
  marginUm?: number;
}

/** One reader's field checked against the count map (see `checkFields`). */
export interface FieldCheck {
  /** The reader's name ("" when none). */
  reader: string;
  /** What the field is: a point, a polygon, separate polygons or circular fields (see `FieldKind`). */
  kind: FieldKind;
  /** Centre in level-0 pixels (a polygon's centroid; the parts' weighted centroid). */
  centerPx: [number, number];
  /** Centre in µm from the slide origin. */
  centerUm: [number, number];
  /** Exact count of counted figures in the field (standard window, polygon, or the sum over parts). */
  count: number;
  /** Number of separate parts counted together (1 for a point or a polygon). */
  parts: number;
  /** Diameter of each circular field, mm (`circles` only). */
  diameterMm?: number;
  /** When the field was read (ISO 8601), as given. */
  date?: string;
  /** area(field ∩ V) / area(field). */
  coverage: number;
  /**
   * Mid-rank percentile of the field's comparison count (`countScaledToWindow`
   * when set, else `count`) among admissible grid positions; null without positions.
   */
  percentile: number | null;
  /** Hotspot count − the comparison count; null without a hotspot. */
  shortfall: number | null;
  /** Field area, mm² (the sum over parts). */
  areaMm2: number;
  /**
   * count × window area / field area: for polygons more than 5% off the window
   * area, and always for fields of several parts; else null.
   */
  countScaledToWindow: number | null;
  /** Index of the field's feature in the annotation file, from 0. */
  featureIndex: number;
  /** Problems with this field, in words. */
  warnings: string[];
}
