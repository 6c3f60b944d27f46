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
  let dupCount = 0;
  const dups: number[] = [];
  const more = new Set<number[]>();
  const note = (os: number[], o: number) => {
    if (os.includes(o)) return;
    if (os.length < SHOW) os.push(o);
    else more.add(os);
  };
  // exact duplicates: sort point indices by (x, y) and compare neighbours
  const order = Uint32Array.from({ length: n }, (_, i) => i).sort((a, b) =>
    figures.xPx[a] - figures.xPx[b] || figures.yPx[a] - figures.yPx[b] || a - b
  );
  const isDup = new Uint8Array(n);
  for (let k = 1; k < n; k++) {
    const a = order[k - 1], b = order[k];
    if (figures.xPx[a] === figures.xPx[b] && figures.yPx[a] === figures.yPx[b]) isDup[b] = 1;
  }
  for (let i = 0; i < n; i++) {
    if (isDup[i]) {
      dupCount++;
      note(dups, figures.origin[i]);
    }
    const x = figures.xPx[i];
    const y = figures.yPx[i];
    const o = figures.origin[i];
    if (x < 0 || y < 0) {
      negativeCount++;
      note(negative, o);
    } else if ((w !== undefined && x > w) || (h !== undefined && y > h)) {
      outsideCount++;
      note(outside, o);
    }
  }
  const list = (os: number[]) => `${originName}s ${os.join(", ")}${more.has(os) ? ", ..." : ""}`;
  if (negativeCount > 0) {
    warnings.push(
      `${source}: ${negativeCount} figure point${
        negativeCount === 1 ? " has" : "s have"
      } negative coordinates, left of or above the slide (${list(negative)})`,
    );
  }
  if (outsideCount > 0) {
    warnings.push(
      `${source}: ${outsideCount} figure point${
        outsideCount === 1 ? " lies" : "s lie"
      } beyond the slide's ${w ?? "?"} × ${h ?? "?"} px (${list(outside)})`,
    );
  }
  if (dupCount > 0) {
    warnings.push(
      `${source}: ${dupCount} figure point${
        dupCount === 1 ? " repeats" : "s repeat"
      } the exact position of an earlier one (${
        list(dups)
      }); each is counted, check for figures marked twice`,
    );
  }
  return warnings;
}
