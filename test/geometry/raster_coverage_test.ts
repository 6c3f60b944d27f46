import { strict as assert } from "node:assert";
import {
  createRowRasterizer,
  rasterizeArea,
  uniformEdges,
} from "../../lib/geometry/raster_coverage.ts";
import { normalizeMultiPolygon } from "../../lib/geometry/normalize.ts";
import { multiPolygonAreaPx2 } from "../../lib/geometry/planar_area.ts";
import type { MultiPolygonPx, Ring } from "../../lib/types.ts";
import { jstsIntersectionArea, randomPolygon, rectJsts, seededRandom, toJsts } from "./_shapes.ts";

const rect = (x0: number, y0: number, x1: number, y1: number): Ring => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
  [x0, y0],
];

function randomRegion(seed: number): MultiPolygonPx {
  const rnd = seededRandom(seed);
  return normalizeMultiPolygon([
    randomPolygon(rnd, 100, 100, 90, 40, 3),
    randomPolygon(rnd, 320, 120, 100, 25, 2),
  ]);
}

/** Strictly increasing, irregular edges from a to b. */
function irregularEdges(seed: number, a: number, b: number, n: number): Float64Array {
  const rnd = seededRandom(seed);
  const w = Array.from({ length: n }, () => 0.1 + rnd());
  const total = w.reduce((s, v) => s + v, 0);
  const out = new Float64Array(n + 1);
  let acc = 0;
  out[0] = a;
  for (let i = 0; i < n; i++) {
    acc += w[i];
    out[i + 1] = a + ((b - a) * acc) / total;
  }
  out[n] = b;
  return out;
}

Deno.test("uniformEdges() computes start + i·step without accumulating rounding", () => {
  const e = uniformEdges(0.1, 0.1, 1001);
  assert.equal(e[1000], 0.1 + 1000 * 0.1);
  assert.equal(e.length, 1001);
  assert.equal(uniformEdges(5, 1, 0).length, 0);
});

Deno.test("rasterizeArea() cells sum to the region's area when the grid covers it", () => {
  for (let s = 0; s < 20; s++) {
    const region = randomRegion(s);
    const a = rasterizeArea(region, uniformEdges(-5, 7.3, 70), irregularEdges(s, -10, 240, 37));
    const sum = a.reduce((t, v) => t + v, 0);
    // tolerance 1e-9 relative: float rounding of the cut points
    assert.ok(Math.abs(sum - multiPolygonAreaPx2(region)) < 1e-9 * multiPolygonAreaPx2(region));
  }
});

Deno.test("rasterizeArea() matches JSTS 2.12.1 cell by cell, on uniform and non-uniform grids", () => {
  // reference: JSTS 2.12.1 OverlayOp.intersection(region, cell).getArea(); tolerance 1e-9 of the
  // cell's area (float rounding of cut points, both sides)
  for (let s = 0; s < 6; s++) {
    const region = randomRegion(100 + s);
    const g = toJsts(region);
    const xs = s % 2 === 0 ? uniformEdges(-20, 23, 21) : irregularEdges(s, -20, 440, 20);
    const ys = irregularEdges(s + 50, -15, 230, 12);
    const a = rasterizeArea(region, xs, ys);
    const nx = xs.length - 1;
    for (let j = 0; j + 1 < ys.length; j++) {
      for (let i = 0; i + 1 < xs.length; i++) {
        const cellArea = (xs[i + 1] - xs[i]) * (ys[j + 1] - ys[j]);
        const want = jstsIntersectionArea(g, rectJsts([xs[i], ys[j], xs[i + 1], ys[j + 1]]));
        assert.ok(
          Math.abs(a[j * nx + i] - want) <= 1e-9 * cellArea,
          `seed ${s} cell (${i}, ${j}): ${a[j * nx + i]} vs ${want}`,
        );
      }
    }
  }
});

Deno.test("rasterizeArea() ignores parts outside the grid and passes parts left of it into the row", () => {
  // a square [0, 100]² over a grid [40, 60] × [20, 30] (two cells), the rest outside all around
  const sq: MultiPolygonPx = [[rect(0, 0, 100, 100)]];
  const a = rasterizeArea(sq, new Float64Array([40, 50, 60]), new Float64Array([20, 30]));
  assert.deepEqual([...a], [100, 100]);
  // a polygon only left of the grid contributes nothing; a slanted edge entering from the left
  const left: MultiPolygonPx = [[rect(-50, 0, -10, 10)]];
  assert.deepEqual([...rasterizeArea(left, new Float64Array([0, 1]), new Float64Array([0, 10]))], [
    0,
  ]);
  // triangle (−10, 0), (10, 0), (−10, 20): over the cell [0, 10] × [0, 20] the part is the
  // triangle (0,0), (10,0), (0,10): 50 (hand calculation)
  const tri: MultiPolygonPx = normalizeMultiPolygon([[[[-10, 0], [10, 0], [-10, 20], [-10, 0]]]]);
  assert.ok(
    Math.abs(rasterizeArea(tri, new Float64Array([0, 10]), new Float64Array([0, 20]))[0] - 50) <
      1e-12,
  );
  // above and below the grid: nothing
  assert.deepEqual(
    [...rasterizeArea(sq, new Float64Array([0, 100]), new Float64Array([200, 300]))],
    [0],
  );
});

Deno.test("rasterizeArea() refuses edges that do not increase", () => {
  assert.throws(
    () => rasterizeArea([], new Float64Array([0, 1, 1]), new Float64Array([0, 1])),
    RangeError,
    "xEdges must be strictly increasing",
  );
  assert.throws(
    () => rasterizeArea([], new Float64Array([0, 1]), new Float64Array([0])),
    {
      name: "RangeError",
      message: "Cannot rasterize a region: yEdges needs at least 2 values, got 1",
    },
  );
});

Deno.test("createRowRasterizer() gives rasterizeArea()'s cells bit for bit, in any bands", () => {
  // Self-consistency (the values themselves are checked against JSTS above): a row depends
  // only on its own y edges, so bands of any size, in order or not, give the same bits.
  for (let s = 0; s < 8; s++) {
    const region = randomRegion(200 + s);
    const xs = s % 2 === 0 ? uniformEdges(-20, 9.7, 50) : irregularEdges(s, -20, 440, 45);
    const ys = irregularEdges(s + 70, -15, 240, 40);
    const whole = rasterizeArea(region, xs, ys);
    const nx = xs.length - 1;
    const rnd = seededRandom(s);
    const r = createRowRasterizer(region, xs);
    let at = 0;
    while (at < ys.length - 1) {
      const n = 1 + Math.floor(rnd() * 7);
      const to = Math.min(ys.length - 1, at + n);
      const cells = r.rows(ys.subarray(at, to + 1));
      assert.deepEqual(
        [...cells],
        [...whole.subarray(at * nx, to * nx)],
        `seed ${s} rows ${at}…${to}`,
      );
      // Going back (out of order) still gives the same rows.
      if (rnd() < 0.3 && at > 0) {
        const back = r.rows(ys.subarray(0, 2));
        assert.deepEqual([...back], [...whole.subarray(0, nx)]);
      }
      at = to;
    }
  }
});
