/**
 * Warnings about figure points that are readable but odd: outside the slide,
 * at negative coordinates, or duplicated.
 *
 * @module
 */

import type { FigureSet, SlideInfo } from "../types.ts";

const SHOW = 5;

/**
 * Checks figure positions against the slide bounds (when known) and for
 * negative coordinates and exact duplicates.
 *
 * @param figures The points.
 * @param slide The slide (width and height optional).
 * @param source How to name the input, e.g. `"a.geojson"`.
 * @param originName How to name an origin, `"feature"` or `"line"`.
 */
export function figurePositionWarnings(
  figures: FigureSet,
  slide: SlideInfo,
  source: string,
  originName: "feature" | "line",
): string[] {
  const warnings: string[] = [];
  const n = figures.xPx.length;
  const negative: number[] = [];
  const outside: number[] = [];
  let negativeCount = 0;
  let outsideCount = 0;
  const w = slide.widthPx;
  const h = slide.heightPx;
  const seen = new Map<string, number>();
  let dupCount = 0;
  const dups: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = figures.xPx[i];
    const y = figures.yPx[i];
    const o = figures.origin[i];
    if (x < 0 || y < 0) {
      negativeCount++;
      if (negative.length < SHOW && !negative.includes(o)) negative.push(o);
    } else if ((w !== undefined && x > w) || (h !== undefined && y > h)) {
      outsideCount++;
      if (outside.length < SHOW && !outside.includes(o)) outside.push(o);
    }
    const key = `${x},${y}`;
    if (seen.has(key)) {
      dupCount++;
      if (dups.length < SHOW && !dups.includes(o)) dups.push(o);
    } else seen.set(key, o);
  }
  const list = (os: number[], count: number) =>
    `${originName}s ${os.join(", ")}${count > os.length ? ", ..." : ""}`;
  if (negativeCount > 0) {
    warnings.push(
      `${source}: ${negativeCount} figure point${
        negativeCount === 1 ? " has" : "s have"
      } negative coordinates, left of or above the slide (${list(negative, negativeCount)})`,
    );
  }
  if (outsideCount > 0) {
    warnings.push(
      `${source}: ${outsideCount} figure point${
        outsideCount === 1 ? " lies" : "s lie"
      } beyond the slide's ${w ?? "?"} × ${h ?? "?"} px (${list(outside, outsideCount)})`,
    );
  }
  if (dupCount > 0) {
    warnings.push(
      `${source}: ${dupCount} figure point${
        dupCount === 1 ? " repeats" : "s repeat"
      } the exact position of an earlier one (${
        list(dups, dupCount)
      }); each is counted, check for figures marked twice`,
    );
  }
  return warnings;
}
