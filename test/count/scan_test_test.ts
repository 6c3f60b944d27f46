// Monte Carlo scan test. The published method is the spatial scan statistic
// (Kulldorff M, Commun Stat Theory Methods 1997;26(6):1481-1496); hotfield uses
// its fixed-size form (maximum admissible window count). A valid Monte Carlo
// test has p-values roughly uniform under the null (Kulldorff 1997; common
// practice for Monte Carlo tests, p = (1 + #sims ≥ obs)/(1 + sims)). Observed
// count maps are built here by direct counting (test/stats/_helpers.ts), not
// with the engine.

import { strict as assert } from "node:assert";
import { scanTest } from "../../lib/count/scan_test.ts";
import type { WindowShape } from "../../lib/count/engine_types.ts";
import { admissibleInBox, boxRegion, uniformInBox, windowCountsHere } from "../stats/_helpers.ts";

const BOX: [number, number, number, number] = [0, 0, 8000, 6000];
// 4:3 rectangle and circle of 2.37 mm² (REFERENCES.md §1, C): 1777.6 × 1333.2 µm, Ø 1737.1 µm.
const RECT: WindowShape = {
  shape: "rect",
  areaMm2: 2.37,
  widthUm: 1777.6,
  heightUm: 1333.2,
  aspect: [4, 3],
};
const CIRCLE: WindowShape = { shape: "circle", areaMm2: 2.37, diameterUm: 1737.1 };
const GRID = { x0Um: -100, y0Um: -100, strideUm: 100, nx: 83, ny: 63 };

function nullPValues(window: WindowShape, replicates: number, sims: number, n: number) {
  const admissible = admissibleInBox(window, GRID, BOX);
  const ps: number[] = [];
  for (let rep = 0; rep < replicates; rep++) {
    const { xUm, yUm } = uniformInBox(n, BOX, 5000 + rep);
    const counts = windowCountsHere(xUm, yUm, window, GRID);
    const r = scanTest(
      { validUm: boxRegion(BOX), totalCount: n, map: { grid: GRID, counts, admissible }, window },
      { simulations: sims, seed: 77 + rep },
    );
    ps.push(r.p);
  }
  return ps;
}

/** Kolmogorov–Smirnov distance of a sample from Uniform(0, 1). */
function ksUniform(ps: number[]): number {
  const s = [...ps].sort((a, b) => a - b);
  let d = 0;
  s.forEach((p, i) => {
    d = Math.max(d, Math.abs((i + 1) / s.length - p), Math.abs(i / s.length - p));
  });
  return d;
}

for (const window of [RECT, CIRCLE]) {
  Deno.test(`scanTest() p-values are roughly uniform under the null (${window.shape})`, () => {
    // 40 null replicates (400 uniform figures in 8 × 6 mm), 99 simulations each.
    // Loose bound: KS distance < 0.3 (the 1% critical value for n = 40 is about
    // 0.25; ties in the maximum make p slightly conservative). And the test must
    // not reject too often: at most 4 of 40 (10%) at p ≤ 0.05.
    const ps = nullPValues(window, 40, 99, 400);
    const d = ksUniform(ps);
    assert.ok(d < 0.3, `KS distance ${d.toFixed(3)}: ${ps.join(" ")}`);
    assert.ok(ps.filter((p) => p <= 0.05).length <= 4, ps.join(" "));
  });
}

Deno.test("scanTest() gives a small p for a planted focus", () => {
  // 400 uniform figures plus 60 in a 600 × 600 µm focus: the focus window holds
  // far more than any null maximum, so p = 1/(1 + 99).
  const base = uniformInBox(400, BOX, 42);
  const focus = uniformInBox(60, [3700, 2700, 4300, 3300], 43);
  const xUm = new Float64Array([...base.xUm, ...focus.xUm]);
  const yUm = new Float64Array([...base.yUm, ...focus.yUm]);
  for (const window of [RECT, CIRCLE]) {
    const counts = windowCountsHere(xUm, yUm, window, GRID);
    const admissible = admissibleInBox(window, GRID, BOX);
    const r = scanTest({
      validUm: boxRegion(BOX),
      totalCount: xUm.length,
      map: { grid: GRID, counts, admissible },
      window,
    }, { simulations: 99, seed: 1 });
    assert.equal(r.p, 0.01, `${window.shape}: observed ${r.observed}`);
    assert.equal(r.simulations, 99);
  }
});

Deno.test("scanTest() is reproducible from its seed", () => {
  const { xUm, yUm } = uniformInBox(300, BOX, 9);
  const counts = windowCountsHere(xUm, yUm, RECT, GRID);
  const input = {
    validUm: boxRegion(BOX),
    totalCount: 300,
    map: { grid: GRID, counts, admissible: admissibleInBox(RECT, GRID, BOX) },
    window: RECT,
  };
  const a = scanTest(input, { simulations: 49, seed: 5 });
  const b = scanTest(input, { simulations: 49, seed: 5 });
  assert.deepEqual(Array.from(a.simulatedMax), Array.from(b.simulatedMax));
  assert.equal(a.p, b.p);
});

Deno.test("scanTest() keeps the total: a window covering all of V always holds N", () => {
  // A 8 × 6 mm window centred on V holds every figure in every simulation
  // (figures never leave a box-shaped V, whose edges fall on cell edges here).
  const window: WindowShape = {
    shape: "rect",
    areaMm2: 48,
    widthUm: 8000,
    heightUm: 6000,
    aspect: [4, 3],
  };
  const grid = { x0Um: 4000, y0Um: 3000, strideUm: 100, nx: 1, ny: 1 };
  const r = scanTest({
    validUm: boxRegion(BOX),
    totalCount: 123,
    map: { grid, counts: [123], admissible: [1] },
    window,
  }, { simulations: 19, seed: 3 });
  assert.deepEqual(Array.from(r.simulatedMax), new Array(19).fill(123));
  assert.equal(r.p, 1);
});

Deno.test("scanTest() places figures only where V has area (a region with a hole)", () => {
  // V = 8 × 6 mm box minus a 4 × 2 mm hole; a window inside the hole never
  // holds a simulated figure, one beside it does.
  const hole: [number, number][] = [[2000, 2000], [2000, 4000], [6000, 4000], [6000, 2000], [
    2000,
    2000,
  ]];
  const validUm = [[boxRegion(BOX)[0][0], hole]];
  const window: WindowShape = {
    shape: "rect",
    areaMm2: 1,
    widthUm: 1000,
    heightUm: 1000,
    aspect: [1, 1],
  };
  // Two positions: centre of the hole, and centre of the band below it.
  const grid = { x0Um: 4000, y0Um: 1000, strideUm: 2000, nx: 1, ny: 2 };
  // Position (0, 1) is at y = 3000 (hole), (0, 0) at y = 1000 (tissue).
  const r = scanTest({
    validUm,
    totalCount: 400,
    map: { grid, counts: [0, 0], admissible: [0, 1] },
    window,
  }, { simulations: 19, seed: 2 });
  assert.deepEqual(Array.from(r.simulatedMax), new Array(19).fill(0));
  const r2 = scanTest({
    validUm,
    totalCount: 400,
    map: { grid, counts: [0, 0], admissible: [1, 0] },
    window,
  }, { simulations: 19, seed: 2 });
  // 400 figures over 40 mm²: about 10 in a 1 mm² window.
  const mean = Array.from(r2.simulatedMax).reduce((a, b) => a + b) / 19;
  assert.ok(mean > 5 && mean < 15, `mean ${mean}`);
});

Deno.test("scanTest() rejects simulations outside 19–100,000", () => {
  const input = {
    validUm: boxRegion(BOX),
    totalCount: 1,
    map: { grid: GRID, counts: new Int32Array(83 * 63), admissible: new Uint8Array(83 * 63) },
    window: RECT,
  };
  for (const sims of [18, 100_001, 99.5, 0]) {
    assert.throws(() => scanTest(input, { simulations: sims }), {
      name: "RangeError",
      message: `Simulations must be a whole number from 19 to 100,000: got ${sims}`,
    });
  }
  assert.equal(scanTest(input, { simulations: 19 }).simulations, 19);
});

Deno.test("scanTest() rejects map arrays that do not match the grid", () => {
  assert.throws(
    () =>
      scanTest({
        validUm: boxRegion(BOX),
        totalCount: 1,
        map: { grid: GRID, counts: [1, 2], admissible: [1, 1] },
        window: RECT,
      }),
    RangeError,
  );
});
