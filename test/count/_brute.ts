// Tiny brute-force helpers for the count engine tests (no pruning, no grids).
import { seededRandom } from "../../lib/random.ts";

/** Seeded clustered points in a box, µm. */
export function randomPoints(
  seed: number,
  n: number,
  box: [number, number, number, number],
  clusters = 3,
): { x: Float64Array; y: Float64Array } {
  const rnd = seededRandom(seed);
  const [x0, y0, x1, y1] = box;
  const cs = Array.from({ length: clusters }, () => [
    x0 + rnd() * (x1 - x0),
    y0 + rnd() * (y1 - y0),
  ]);
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    if (rnd() < 0.5) {
      x[k] = x0 + rnd() * (x1 - x0);
      y[k] = y0 + rnd() * (y1 - y0);
    } else {
      const c = cs[Math.floor(rnd() * clusters)];
      const sx = (x1 - x0) / 12, sy = (y1 - y0) / 12;
      x[k] = Math.min(x1, Math.max(x0, c[0] + (rnd() - 0.5) * sx));
      y[k] = Math.min(y1, Math.max(y0, c[1] + (rnd() - 0.5) * sy));
    }
  }
  return { x, y };
}

/** Direct count in a closed rectangle or circle. */
export function directCount(
  x: Float64Array,
  y: Float64Array,
  shape: "rect" | "circle",
  cx: number,
  cy: number,
  a: number,
  b: number,
): number {
  let n = 0;
  for (let k = 0; k < x.length; k++) {
    if (shape === "rect") {
      if (Math.abs(x[k] - cx) <= a && Math.abs(y[k] - cy) <= b) n++;
    } else {
      const dx = x[k] - cx, dy = y[k] - cy;
      if (dx * dx + dy * dy <= a * a) n++;
    }
  }
  return n;
}
