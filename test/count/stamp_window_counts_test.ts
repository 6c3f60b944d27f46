import { strict as assert } from "node:assert";
import { stampWindowCounts } from "../../lib/count/stamp_window_counts.ts";
import { makeWindow } from "../../lib/count/make_window.ts";
import { countInWindow } from "../../lib/count/window_contains.ts";
import type { StrideGrid } from "../../lib/count/engine_types.ts";
import { directCount, randomPoints } from "./_brute.ts";
import { seededRandom } from "../../lib/random.ts";

const grid: StrideGrid = { x0Um: -100, y0Um: 50, strideUm: 7.3, nx: 61, ny: 47 };

for (const shape of ["rect", "circle"] as const) {
  Deno.test(`stampWindowCounts() equals a direct count at every grid centre (${shape})`, () => {
    const w = makeWindow({ areaMm2: 0.02, shape, aspect: [5, 3] });
    for (const seed of [1, 2, 3]) {
      const { x, y } = randomPoints(seed, 300, [-120, 30, 360, 420]);
      const counts = stampWindowCounts(x, y, w, grid);
      for (let j = 0; j < grid.ny; j++) {
        for (let i = 0; i < grid.nx; i++) {
          const cx = grid.x0Um + i * grid.strideUm, cy = grid.y0Um + j * grid.strideUm;
          assert.equal(counts[j * grid.nx + i], countInWindow(x, y, w, cx, cy));
        }
      }
    }
  });
}

Deno.test("stampWindowCounts() counts figures exactly on a window edge", () => {
  // Grid centres on integers; points placed exactly at distance W/2 and r.
  const g: StrideGrid = { x0Um: 0, y0Um: 0, strideUm: 1, nx: 21, ny: 21 };
  const rect = makeWindow({ areaMm2: 8e-6, aspect: [2, 1] }); // 4 × 2 µm
  const counts = stampWindowCounts(new Float64Array([10]), new Float64Array([10]), rect, g);
  // Centres with |cx − 10| ≤ 2 and |cy − 10| ≤ 1: 5 × 3 = 15, edges included.
  assert.equal(counts.reduce((a, b) => a + b, 0), 15);
  assert.equal(counts[9 * 21 + 12], 1);
  assert.equal(counts[9 * 21 + 13], 0);
  const circle = { shape: "circle" as const, areaMm2: Math.PI * 25e-6, diameterUm: 10 };
  const c2 = stampWindowCounts(new Float64Array([10]), new Float64Array([10]), circle, g);
  assert.equal(c2[10 * 21 + 15], 1); // distance exactly 5 = r
  assert.equal(c2[10 * 21 + 16], 0);
  assert.equal(c2[13 * 21 + 14], 1); // 3-4-5 triangle: on the rim
  // Lattice points within a closed disk of radius 5: 81 (hand count, Gauss circle problem N(5) = 81).
  assert.equal(c2.reduce((a, b) => a + b, 0), 81);
});

Deno.test("stampWindowCounts() matches an independent brute force with unequal half sizes", () => {
  const g: StrideGrid = { x0Um: 0, y0Um: 0, strideUm: 2.5, nx: 80, ny: 60 };
  const { x, y } = randomPoints(9, 500, [0, 0, 200, 150]);
  const w = makeWindow({ areaMm2: 0.0012, aspect: [4, 3] }); // 40 × 30 µm
  const counts = stampWindowCounts(x, y, w, g);
  let checked = 0;
  for (let j = 0; j < g.ny; j += 3) {
    for (let i = 0; i < g.nx; i += 3) {
      const cx = i * 2.5, cy = j * 2.5;
      if (w.shape !== "rect") throw new Error();
      assert.equal(
        counts[j * g.nx + i],
        directCount(x, y, "rect", cx, cy, w.widthUm / 2, w.heightUm / 2),
      );
      checked++;
    }
  }
  assert.ok(checked > 400);
});

Deno.test("stampWindowCounts() is exact for windows narrower than a stride and figures on edges", () => {
  // Brute force: the closed-window test itself at every centre (no outside source needed).
  const rnd = seededRandom(7);
  for (let trial = 0; trial < 120; trial++) {
    const s = [1, 2.5, 7, 0.1][trial % 4];
    const nx = 5 + Math.floor(rnd() * 20), ny = 5 + Math.floor(rnd() * 20);
    const x0 = rnd() * 10 - 5, y0 = rnd() * 10 - 5;
    const w = [0.05, s, 3 * s, 7.3 * s, 100 * s][trial % 5];
    const h = [0.05, s * 2, 0.7 * s, 11 * s][trial % 4];
    const n = 40;
    const xs = new Float64Array(n), ys = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      // A third of the points sit exactly on a window edge of some grid centre.
      const gx = Math.floor(rnd() * (nx + 4)) - 2, gy = Math.floor(rnd() * (ny + 4)) - 2;
      xs[k] = rnd() < 0.3
        ? x0 + gx * s + (rnd() < 0.5 ? w / 2 : -w / 2)
        : x0 + (rnd() * (nx + 4) - 2) * s;
      ys[k] = rnd() < 0.3
        ? y0 + gy * s + (rnd() < 0.5 ? h / 2 : -h / 2)
        : y0 + (rnd() * (ny + 4) - 2) * s;
    }
    const win = {
      shape: "rect" as const,
      widthUm: w,
      heightUm: h,
      areaMm2: w * h / 1e6,
      aspect: [1, 1] as [number, number],
    };
    const got = stampWindowCounts(xs, ys, win, { x0Um: x0, y0Um: y0, strideUm: s, nx, ny });
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        assert.equal(got[j * nx + i], countInWindow(xs, ys, win, x0 + i * s, y0 + j * s));
      }
    }
  }
});
