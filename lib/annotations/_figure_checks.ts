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
  const isDup = markDuplicates(figures.xPx, figures.yPx);
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

/**
 * Marks every point equal (x and y, with 0 = −0) to an earlier one, in O(n)
 * with an open-addressing hash table over the coordinates' bits.
 */
function markDuplicates(x: Float64Array, y: Float64Array): Uint8Array {
  const n = x.length;
  const isDup = new Uint8Array(n);
  let size = 16;
  while (size < 2 * n) size *= 2;
  const mask = size - 1;
  const table = new Int32Array(size).fill(-1);
  const f = new Float64Array(2);
  const u = new Uint32Array(f.buffer);
  for (let i = 0; i < n; i++) {
    f[0] = x[i] + 0; // −0 + 0 is +0, so both zeros hash alike
    f[1] = y[i] + 0;
    let h = Math.imul(u[0] ^ Math.imul(u[1], 0x9e3779b1), 0x85ebca6b) ^
      Math.imul(u[2] ^ Math.imul(u[3], 0xc2b2ae35), 0x27d4eb2f);
    h ^= h >>> 15;
    let slot = h & mask;
    for (;;) {
      const j = table[slot];
      if (j < 0) {
        table[slot] = i;
        break;
      }
      if (x[j] === x[i] && y[j] === y[i]) {
        isDup[i] = 1;
        break;
      }
      slot = (slot + 1) & mask;
    }
  }
  return isDup;
}
