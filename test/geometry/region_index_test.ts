import { strict as assert } from "node:assert";
import fc from "fast-check";
import { createRegionIndex } from "../../lib/geometry/region_index.ts";
import { normalizeMultiPolygon } from "../../lib/geometry/normalize.ts";
import type { MultiPolygonPx, Ring } from "../../lib/types.ts";
import { randomPolygon, seededRandom } from "./_shapes.ts";

/** Brute-force even-odd crossing-number test over every edge (no index). */
function bruteInside(region: MultiPolygonPx, x: number, y: number): boolean {
  let inside = false;
  for (const poly of region) {
    for (const ring of poly) {
      for (let i = 0; i + 1 < ring.length; i++) {
        const [ax, ay] = ring[i], [bx, by] = ring[i + 1];
        if ((ay > y) !== (by > y) && x < ax + ((y - ay) / (by - ay)) * (bx - ax)) inside = !inside;
      }
    }
  }
  return inside;
}

const rect = (x0: number, y0: number, x1: number, y1: number): Ring => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
  [x0, y0],
];

Deno.test("createRegionIndex() agrees with a brute-force crossing-number test on random points", () => {
  fc.assert(
    fc.property(fc.integer({ min: 0, max: 1e6 }), (seed) => {
      const rnd = seededRandom(seed);
      const region = normalizeMultiPolygon([
        randomPolygon(rnd, 0, 0, 100, 60, 4),
        randomPolygon(rnd, 250, 30, 80, 30, 2),
      ]);
      const index = createRegionIndex(region);
      const n = 2000;
      const xs = new Float64Array(n), ys = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        xs[i] = -120 + 470 * rnd();
        ys[i] = -120 + 240 * rnd();
      }
      const got = index.containsPoints(xs, ys);
      for (let i = 0; i < n; i++) {
        assert.equal(got[i] === 1, bruteInside(region, xs[i], ys[i]), `point ${xs[i]}, ${ys[i]}`);
        assert.equal(index.containsPoint(xs[i], ys[i]), got[i] === 1);
      }
    }),
    { seed: 31337, numRuns: 40 },
  );
});

Deno.test("createRegionIndex() counts points on the boundary as inside, holes as outside", () => {
  const region: MultiPolygonPx = [[rect(0, 0, 10, 10), [...rect(4, 4, 6, 6)].reverse()]];
  const idx = createRegionIndex(region);
  const onBoundary: [number, number][] = [
    [0, 0],
    [10, 10],
    [0, 5],
    [10, 5],
    [5, 0],
    [5, 10], // outer edges and corners
    [4, 5],
    [6, 5],
    [5, 4],
    [5, 6],
    [4, 4],
    [6, 6], // hole edges and corners
  ];
  for (const [x, y] of onBoundary) assert.ok(idx.containsPoint(x, y), `(${x}, ${y})`);
  assert.ok(!idx.containsPoint(5, 5));
  assert.ok(!idx.containsPoint(10.000001, 5));
  assert.ok(!idx.containsPoint(-1e-9, 0));
  // a slanted edge: (0,0)–(10,10) of a triangle; its midpoint is exactly representable
  const tri = createRegionIndex([[[[0, 0], [10, 0], [10, 10], [0, 0]]]]);
  assert.ok(tri.containsPoint(5, 5));
  assert.ok(tri.containsPoint(2.5, 2.5));
  assert.ok(!tri.containsPoint(2.5, 2.6));
  // touching polygons: the shared edge is inside
  const two = createRegionIndex([[rect(0, 0, 1, 1)], [rect(1, 0, 2, 1)]]);
  assert.ok(
    two.containsPoint(1, 0.5) && two.containsPoint(1.5, 0.5) && !two.containsPoint(2.5, 0.5),
  );
});

Deno.test("createRegionIndex() is unchanged by start-vertex rotation, winding reversal and translation", () => {
  const rnd = seededRandom(8);
  const base = randomPolygon(rnd, 0, 0, 100, 40, 3);
  const dx = 1234.5, dy = -987.25;
  const moved = base.map((r) => {
    const open = r.slice(0, -1);
    const k = 7 % open.length;
    const rot = [...open.slice(k), ...open.slice(0, k)];
    return [...rot, rot[0]].map(([x, y]) => [x + dx, y + dy] as [number, number]).reverse();
  });
  const a = createRegionIndex([base]), b = createRegionIndex([moved]);
  for (let i = 0; i < 3000; i++) {
    // grid points: exact after translation by these dyadic offsets
    const x = -110 + (i % 60) * 3.75, y = -110 + Math.floor(i / 60) * 4.5;
    assert.equal(a.containsPoint(x, y), b.containsPoint(x + dx, y + dy));
  }
});

Deno.test("createRegionIndex() handles empty regions and mismatched arrays", () => {
  const idx = createRegionIndex([]);
  assert.ok(!idx.containsPoint(0, 0));
  assert.deepEqual([...idx.containsPoints(new Float64Array([1]), new Float64Array([1]))], [0]);
  assert.throws(
    () => idx.containsPoints(new Float64Array(2), new Float64Array(1)),
    RangeError,
    "xs and ys differ in length",
  );
});

Deno.test("createRegionIndex() counts every vertex and edge midpoint of a large outline as inside", () => {
  // many edges, so the coarse raster is in use; axis-aligned steps keep midpoints exact
  const ring: Ring = [];
  for (let i = 0; i < 500; i++) ring.push([i * 2, (i % 7) * 3], [i * 2 + 2, (i % 7) * 3]);
  ring.push([1000, 100], [0, 100], [0, 0]);
  const region: MultiPolygonPx = normalizeMultiPolygon([[ring]]);
  const idx = createRegionIndex(region);
  const r = region[0][0];
  for (let i = 0; i + 1 < r.length; i++) {
    const [ax, ay] = r[i], [bx, by] = r[i + 1];
    assert.ok(idx.containsPoint(ax, ay), `vertex ${i}`);
    assert.ok(idx.containsPoint((ax + bx) / 2, (ay + by) / 2), `midpoint ${i}`);
  }
  assert.ok(
    idx.containsPoint(500, 50) && !idx.containsPoint(500, 100.5) && !idx.containsPoint(-0.5, 50),
  );
});
