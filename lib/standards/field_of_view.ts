/**
 * Microscope field optics: field diameter and area from the eyepiece field
 * number and the magnifications, fields needed for a standard area, counts
 * converted between areas, and rectangular digital fields.
 *
 * @module
 */

import { roundTo } from "../numbers.ts";

/** Largest field diameter accepted, mm: wider fields are not high-power fields. */
export const MAX_FIELD_DIAMETER_MM = 2;

/** Options of {@linkcode fieldOfView}. */
export interface FieldOfViewOptions {
  /** Eyepiece field number, mm (e.g. 22 for a 10×/22 eyepiece). */
  fieldNumberMm: number;
  /** Objective magnification (e.g. 40). */
  objective: number;
  /**
   * Any intermediate (tube) magnification factor.
   * @default 1
   */
  tube?: number;
}

/** A circular field of view. */
export interface FieldOfView {
  /** Diameter in the specimen plane, mm. */
  diameterMm: number;
  /** Area π(d/2)², mm². */
  areaMm2: number;
}

/**
 * Field of view of a microscope: d = FN / (objective × tube), area = π(d/2)².
 *
 * @param options Field number (mm), objective and tube factor.
 * @returns Diameter (mm) and area (mm²).
 * @throws {RangeError} When a value is not a finite number > 0, or the field
 * diameter comes out over 2 mm.
 * @see Renne SL et al. Pathologica 2023;115(6):302-307, doi:10.32074/1591-951X-900
 *
 * @example 10×/22 eyepiece, 40× objective
 * ```ts
 * import { fieldOfView } from "hotfield";
 * const f = fieldOfView({ fieldNumberMm: 22, objective: 40 });
 * // FN 22 / 40 = 0.55 mm across; π × 0.275² = 0.237583 mm².
 * if (Math.abs(f.diameterMm - 0.55) > 1e-12 || Math.abs(f.areaMm2 - 0.237583) > 1e-6) {
 *   throw new Error(`field ${f.diameterMm} mm, ${f.areaMm2} mm²`);
 * }
 * ```
 */
export function fieldOfView(options: FieldOfViewOptions): FieldOfView {
  const { fieldNumberMm, objective } = options;
  const tube = options.tube ?? 1;
  positive(fieldNumberMm, "Field number", " mm");
  positive(objective, "Objective magnification", "");
  positive(tube, "Tube factor", "");
  const diameterMm = fieldNumberMm / (objective * tube);
  if (diameterMm > MAX_FIELD_DIAMETER_MM) {
    throw new RangeError(
      `Field diameter must be at most ${MAX_FIELD_DIAMETER_MM} mm for a high-power field: got ` +
        `${
          roundTo(diameterMm, 4)
        } mm (field number ${fieldNumberMm} mm, objective ${objective}×, ` +
        `tube ${tube}×)`,
    );
  }
  return { diameterMm, areaMm2: Math.PI * (diameterMm / 2) ** 2 };
}

/**
 * How many fields of a given area make a target area: the exact ratio and
 * that ratio rounded up to whole fields.
 *
 * @param fieldAreaMm2 Area of one field, mm² (> 0).
 * @param targetMm2 Target area, mm² (> 0).
 * @returns `{ exact, rounded }`.
 * @throws {RangeError} When an area is not a finite number > 0.
 *
 * @example 42 fields of 0.55 mm make about 10 mm²
 * ```ts
 * import { fieldOfView, fieldsForArea } from "hotfield";
 * const f = fieldsForArea(fieldOfView({ fieldNumberMm: 22, objective: 40 }).areaMm2, 10);
 * if (f.rounded !== 43 || Math.abs(f.exact - 42.09) > 0.005) throw new Error(`${f.exact} fields, rounded ${f.rounded}`);
 * ```
 */
export function fieldsForArea(
  fieldAreaMm2: number,
  targetMm2: number,
): { exact: number; rounded: number } {
  positive(fieldAreaMm2, "Field area", " mm²");
  positive(targetMm2, "Target area", " mm²");
  const exact = targetMm2 / fieldAreaMm2;
  // A ratio a rounding error above a whole number stays that number.
  return { exact, rounded: Math.ceil(exact - 1e-9 * Math.max(1, exact)) };
}

/**
 * Converts a count over one area to the same density over another:
 * count × toMm2 / fromMm2.
 *
 * @param count Count (≥ 0).
 * @param fromMm2 Area the count was made over, mm² (> 0).
 * @param toMm2 Area to express it for, mm² (> 0).
 * @returns The scaled count (not rounded).
 * @throws {RangeError} When the count is negative or an area not > 0.
 *
 * @example 11 mitoses in 10 mm² are 2.2 per 2 mm²
 * ```ts
 * import { convertCount } from "hotfield";
 * const per2 = convertCount(11, 10, 2);
 * if (Math.abs(per2 - 2.2) > 1e-12) throw new Error(`11 per 10 mm² is ${per2} per 2 mm², expected 2.2`);
 * ```
 */
export function convertCount(count: number, fromMm2: number, toMm2: number): number {
  if (!(count >= 0) || !Number.isFinite(count)) {
    throw new RangeError(`Count must be a number ≥ 0: got ${count}`);
  }
  positive(fromMm2, "Area counted", " mm²");
  positive(toMm2, "Target area", " mm²");
  return (count * toMm2) / fromMm2;
}

/** Options of {@linkcode digitalFieldArea}. */
export interface DigitalFieldOptions {
  /** Viewport width, screen pixels. */
  widthPx: number;
  /** Viewport height, screen pixels. */
  heightPx: number;
  /** Micrometres of slide per screen pixel at the viewing magnification. */
  umPerScreenPx: number;
}

/**
 * Area of a rectangular digital field (a viewer's viewport): width × height ×
 * (µm per screen pixel)². Digital "high-power fields" are rectangles whose
 * area depends on the screen, so their area must be stated (Kim et al., J
 * Pathol Inform 2020).
 *
 * @param options Viewport size in screen pixels and µm per screen pixel.
 * @returns Width and height in µm, area in mm².
 * @throws {RangeError} When a value is not a finite number > 0.
 *
 * @example A 1920 × 1080 viewport at 0.25 µm per screen pixel
 * ```ts
 * import { digitalFieldArea } from "./field_of_view.ts";
 * const f = digitalFieldArea({ widthPx: 1920, heightPx: 1080, umPerScreenPx: 0.25 });
 * if (f.widthUm !== 480 || f.heightUm !== 270 || Math.abs(f.areaMm2 - 0.1296) > 1e-12) {
 *   throw new Error(`field ${f.widthUm} × ${f.heightUm} µm, ${f.areaMm2} mm²`);
 * }
 * ```
 */
export function digitalFieldArea(
  options: DigitalFieldOptions,
): { widthUm: number; heightUm: number; areaMm2: number } {
  positive(options.widthPx, "Viewport width", " px");
  positive(options.heightPx, "Viewport height", " px");
  positive(options.umPerScreenPx, "Micrometres per screen pixel", "");
  const widthUm = options.widthPx * options.umPerScreenPx;
  const heightUm = options.heightPx * options.umPerScreenPx;
  return { widthUm, heightUm, areaMm2: (widthUm * heightUm) / 1e6 };
}

function positive(v: number, what: string, unit: string): void {
  if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) {
    throw new RangeError(`${what} must be a number > 0${unit}: got ${v}`);
  }
}
