/**
 * Plausibility of positions, checked while reading so that a corrupted or
 * mis-scaled file is refused as bad input (naming the file and the feature or
 * line) before any count grid is sized from it.
 *
 * - No position may lie more than `MAX_SLIDE_EXTENT_MM` from the slide origin
 *   along x or y (a glass slide is 75 mm long).
 * - When the slide's size is known, no region outline (tissue, tumour,
 *   exclude, field polygon) may reach beyond the slide by more than the
 *   slide's own width or height. Nearer excursions only warn, as before;
 *   figure points and the points of point fields beyond the slide also only
 *   warn (figures there are never counted).
 *
 * @module
 */

import { inputError } from "../errors.ts";
import { MAX_FIGURE_POINTS, MAX_SLIDE_EXTENT_MM } from "../defaults.ts";
import type { FigureSet, MultiPolygonPx, SlideInfo } from "../types.ts";

/** Largest plausible |x| and |y| in level-0 pixels, from the slide's mpp. */
function maxAbsPx(slide: { mppX: number; mppY: number }): [number, number] {
  // MAX_SLIDE_EXTENT_MM in µm, over µm per pixel
  return [MAX_SLIDE_EXTENT_MM * 1000 / slide.mppX, MAX_SLIDE_EXTENT_MM * 1000 / slide.mppY];
}

function absurd(
  x: number,
  y: number,
  slide: { mppX: number; mppY: number },
  where: string,
): string {
  const mm = Math.max(Math.abs(x) * slide.mppX, Math.abs(y) * slide.mppY) / 1000;
  return `${where} has position (${x}, ${y}) px, ${
    mm >= 1e6 ? mm.toExponential(2) : Math.round(mm)
  } mm from the slide origin at ${slide.mppX} × ${slide.mppY} µm/px; no slide reaches beyond ${MAX_SLIDE_EXTENT_MM} mm (coordinates in another unit, or a corrupted file?)`;
}

/**
 * Refuses an outline with a position of absurd magnitude or far outside the
 * slide (see the module documentation).
 *
 * @param polygons The outline.
 * @param slide The slide (mpp, and size when known).
 * @param file The file, for messages.
 * @param at The feature, e.g. `feature 7`.
 * @param nearSlide Also refuse positions far outside a slide of known size
 *   (outlines); false checks the magnitude only (a field's points).
 * @throws {RangeError} Naming the file, the feature and the position.
 *
 * @example A polygon at 1e15 px is refused
 * ```ts
 * import { checkOutlinePositions } from "./_plausibility.ts";
 * const slide = { id: "QVT-24-001", mppX: 0.25, mppY: 0.25 };
 * checkOutlinePositions([[[[0, 0], [10, 0], [10, 10], [0, 0]]]], slide, "a.geojson", "feature 0");
 * let refused = false;
 * try {
 *   checkOutlinePositions([[[[0, 0], [1e15, 0], [1e15, 10], [0, 0]]]], slide, "a.geojson", "feature 1");
 * } catch { refused = true; }
 * if (!refused) throw new Error("a position 250 million km away must be refused");
 * ```
 */
export function checkOutlinePositions(
  polygons: MultiPolygonPx,
  slide: SlideInfo,
  file: string,
  at: string,
  nearSlide = true,
): void {
  const [mx, my] = maxAbsPx(slide);
  const w = nearSlide ? slide.widthPx : undefined, h = nearSlide ? slide.heightPx : undefined;
  for (const p of polygons) {
    for (const r of p) {
      for (const q of r) {
        const x = q[0], y = q[1];
        if (!(Math.abs(x) <= mx && Math.abs(y) <= my)) {
          throw inputError(RangeError, "annotations", file, absurd(x, y, slide, at));
        }
        if (
          (w !== undefined && (x < -w || x > 2 * w)) || (h !== undefined && (y < -h || y > 2 * h))
        ) {
          throw inputError(
            RangeError,
            "annotations",
            file,
            `${at} reaches (${x}, ${y}) px, far outside the slide's ${w ?? "?"} × ${
              h ?? "?"
            } px (beyond it by more than the slide's own size); check the coordinates and the slide's width and height`,
          );
        }
      }
    }
  }
}

/**
 * Refuses figure points of absurd magnitude, naming the first one's feature
 * or line (its `origin`).
 *
 * @param figures The points.
 * @param slide The slide's mpp.
 * @param what What was read, e.g. `annotations` or `figures CSV`.
 * @param file The file, for messages.
 * @param originName How an origin is named: `feature` or `line`.
 * @throws {RangeError} Naming the file, the feature or line, and the position.
 *
 * @example
 * ```ts
 * import { checkFigureMagnitudes } from "./_plausibility.ts";
 * const figures = {
 *   xPx: new Float64Array([5, 1e15]), yPx: new Float64Array([5, 5]), labelIndex: new Uint32Array(2),
 *   labels: ["mitotic figure"], score: new Float64Array(2), origin: new Int32Array([2, 7]),
 * };
 * let message = "";
 * try { checkFigureMagnitudes(figures, { mppX: 0.25, mppY: 0.25 }, "figures CSV", "f.csv", "line"); } catch (e) { message = (e as Error).message; }
 * if (!message.includes("line 7 (a figure)")) throw new Error(`the message names line 7: ${message}`);
 * ```
 */
export function checkFigureMagnitudes(
  figures: FigureSet,
  slide: { mppX: number; mppY: number },
  what: string,
  file: string,
  originName: "feature" | "line",
): void {
  const [mx, my] = maxAbsPx(slide);
  const { xPx, yPx } = figures;
  for (let i = 0; i < xPx.length; i++) {
    const x = xPx[i], y = yPx[i];
    if (!(x <= mx && x >= -mx && y <= my && y >= -my)) {
      throw inputError(
        RangeError,
        what,
        file,
        absurd(x, y, slide, `${originName} ${figures.origin[i]} (a figure)`),
      );
    }
  }
}

/**
 * Refuses more figure points than `MAX_FIGURE_POINTS`.
 *
 * @param count Points read (or, for a CSV, lines counted before parsing).
 * @param what What was read, e.g. `annotations` or `figures CSV`.
 * @param file The file, for messages.
 * @param unit What `count` counts: `figure points` or `lines`.
 * @throws {RangeError} Naming the file, the count and the limit.
 *
 * @example
 * ```ts
 * import { checkFigureCount } from "./_plausibility.ts";
 * checkFigureCount(1000, "annotations", "a.geojson");
 * let refused = false;
 * try { checkFigureCount(6_000_000, "annotations", "a.geojson"); } catch { refused = true; }
 * if (!refused) throw new Error("six million figure points are over the limit");
 * ```
 */
export function checkFigureCount(
  count: number,
  what: string,
  file: string,
  unit: "figure points" | "lines" = "figure points",
): void {
  const limit = unit === "lines" ? MAX_FIGURE_POINTS + 1 : MAX_FIGURE_POINTS;
  if (count <= limit) return;
  throw inputError(
    RangeError,
    what,
    file,
    `the file holds ${count.toLocaleString("en-US")} ${unit}, more than the limit of ${
      MAX_FIGURE_POINTS.toLocaleString("en-US")
    } figure points (see "Input limits" in the README)`,
  );
}
