/**
 * The reader's side of `checkOutline`: an invalid outline is repaired, and a
 * warning names the feature, each problem and its place, and both areas, so
 * that no area changes silently.
 *
 * @module
 */

import { inputError } from "../errors.ts";
import { MAX_REGION_VERTICES } from "../defaults.ts";
import { checkOutlinePositions } from "./_plausibility.ts";
import { checkOutline, type RingProblem } from "../geometry/polygon_validity.ts";
import { roundTo } from "../numbers.ts";
import type { MultiPolygonPx, SlideInfo } from "../types.ts";
import { px2ToMm2 } from "../units.ts";

/** Where an outline was read, for messages. */
export interface OutlinePlace {
  /** The file. */
  file: string;
  /** The feature, e.g. `feature 7` or `feature 7 (role "field", reader "reader-a")`. */
  at: string;
  /** True for a MultiPolygon (rings are named with their polygon). */
  multi: boolean;
  /** The slide, for areas in mm². */
  slide: SlideInfo;
  /** Positions of the file's outlines so far, counted against `MAX_REGION_VERTICES`. */
  budget: { vertices: number };
}

/** At most this many problems are spelt out in one warning. */
const SHOWN = 4;

/**
 * Checks one outline: first that its positions are plausible (see
 * `_plausibility.ts`), then its rings; returns the polygons to use and, when
 * they were repaired, the warning.
 *
 * @throws {RangeError} Naming the file and feature, for an implausible
 *   position, when the file's outlines pass `MAX_REGION_VERTICES`
 *   positions, or in the unlikely case that the planar union cannot repair
 *   the outline.
 *
 * @example A stray hole is dropped, with a warning naming the feature
 * ```ts
 * import { checkFeatureOutline } from "./_outline_check.ts";
 * const sq = (x0: number, y0: number, x1: number, y1: number): [number, number][] =>
 *   [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
 * const r = checkFeatureOutline([[sq(0, 0, 4000, 4000), sq(5000, 0, 5100, 100)]], {
 *   file: "a.geojson", at: "feature 0", multi: false,
 *   slide: { id: "QVT-24-001", mppX: 0.25, mppY: 0.25 }, budget: { vertices: 0 },
 * });
 * if (r.polygons[0].length !== 1) throw new Error("the hole outside is dropped");
 * if (!r.warning?.startsWith("a.geojson feature 0: the outline is not valid")) throw new Error(`warning: ${r.warning}`);
 * ```
 */
export function checkFeatureOutline(
  polygons: MultiPolygonPx,
  place: OutlinePlace,
): { polygons: MultiPolygonPx; warning?: string } {
  for (const p of polygons) for (const r of p) place.budget.vertices += r.length;
  if (place.budget.vertices > MAX_REGION_VERTICES) {
    throw inputError(
      RangeError,
      "annotations",
      place.file,
      `the outlines hold more than ${
        MAX_REGION_VERTICES.toLocaleString("en-US")
      } positions by ${place.at}, the limit (see "Input limits" in the README); simplify them`,
    );
  }
  checkOutlinePositions(polygons, place.slide, place.file, place.at);
  let checked;
  try {
    checked = checkOutline(polygons);
  } catch (e) {
    throw inputError(
      RangeError,
      "annotations",
      place.file,
      `${place.at}: its outline is invalid and could not be repaired (${
        (e as Error).message
      }); redraw it without crossing or overlapping rings`,
      e,
    );
  }
  if (checked.problems.length === 0) return { polygons };
  const mm2 = (px2: number) => roundTo(px2ToMm2(px2, place.slide), 4);
  const listed = checked.problems.slice(0, SHOWN).map((p) => describeProblem(p, place.multi));
  const more = checked.problems.length - SHOWN;
  const warning = `${place.file} ${place.at}: the outline is not valid and was repaired as ` +
    `the area it describes (${mm2(checked.areaPx2)} mm²; its rings' shoelace sum would give ` +
    `${mm2(checked.drawnAreaPx2)} mm²): ${listed.join("; ")}${
      more > 0 ? `; and ${more} more problem${more === 1 ? "" : "s"}` : ""
    }`;
  return { polygons: checked.polygons, warning };
}

function describeProblem(p: RingProblem, multi: boolean): string {
  const near = `near (${Math.round(p.atPx[0])}, ${Math.round(p.atPx[1])}) px`;
  const ring = (polygon: number, r: number) =>
    r === 0
      ? (multi ? `polygon ${polygon}` : "the outer ring")
      : `${multi ? `polygon ${polygon} ` : ""}ring ${r} (a hole)`;
  const other = (polygon = 0, r = 0) => ring(polygon, r);
  switch (p.kind) {
    case "hole-outside-shell":
      return `${
        ring(p.polygon, p.ring)
      } lies outside its outer ring ${near}, so it removes nothing and was dropped`;
    case "hole-in-hole":
      return `${ring(p.polygon, p.ring)} lies inside ${
        other(p.otherPolygon, p.otherRing)
      } ${near}, so it removes nothing more and was dropped`;
    case "hole-crosses-shell":
      return `${
        ring(p.polygon, p.ring)
      } crosses its outer ring ${near}; only its part inside is taken out`;
    case "holes-overlap":
      return `${ring(p.polygon, p.ring)} overlaps ${
        other(p.otherPolygon, p.otherRing)
      } ${near}; the area they cover is taken out once`;
    case "polygon-in-polygon":
      return `polygon ${p.polygon} lies inside polygon ${p.otherPolygon} ${near}; they were united, their overlap counted once`;
    case "polygons-overlap":
      return `polygon ${p.polygon} overlaps polygon ${p.otherPolygon} ${near}; they were united, their overlap counted once`;
    case "ring-crosses-itself":
      return `${
        ring(p.polygon, p.ring)
      } crosses or touches itself ${near}; the area it encloses is kept`;
  }
}
