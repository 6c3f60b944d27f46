import type { MultiPolygonPx } from "../types.ts";

/** Bounding box of a region's outer rings, `[minX, minY, maxX, maxY]`; null when empty. */
export function regionBounds(region: MultiPolygonPx): [number, number, number, number] | null {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const poly of region) {
    const outer = poly[0];
    if (!outer) continue;
    for (const [x, y] of outer) {
      if (x < minX) minX = x;
      if (x > maxX) maxX = x;
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
  }
  return minX <= maxX ? [minX, minY, maxX, maxY] : null;
}
