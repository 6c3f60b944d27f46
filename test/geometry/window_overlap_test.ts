import { strict as assert } from "node:assert";
import fc from "fast-check";
import {
  createOverlapIndex,
  diskOverlapArea,
  polygonOverlapArea,
  rectOverlapArea,
} from "../../lib/geometry/window_overlap.ts";
import { normalizeMultiPolygon } from "../../lib/geometry/normalize.ts";
import { multiPolygonAreaPx2 } from "../../lib/geometry/planar_area.ts";
import type { BBoxPx, MultiPolygonPx, Ring } from "../../lib/types.ts";
import {
  jstsIntersectionArea,
  randomPolygon,
  rectJsts,
  relErr,
  seededRandom,
  toJsts,
} from "./_shapes.ts";

const rect = (x0: number, y0: number, x1: number, y1: number): Ring => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
  [x0, y0],
];

/** Several random polygons with holes, spread so that some overlap windows partly. */
function randomRegion(seed: number, count = 3): MultiPolygonPx {
  const rnd = seededRandom(seed);
  const out: MultiPolygonPx = [];
  for (let i = 0; i < count; i++) {
    // centres 300 apart and radii ≤ 140 keep the polygons disjoint
    out.push(randomPolygon(rnd, 300 * i + 40 * rnd(), 200 + 40 * rnd(), 60 + 80 * rnd(), 30, 3));
  }
  return normalizeMultiPolygon(out);
}

Deno.test("rectOverlapArea() agrees with JSTS 2.12.1 intersections on random polygons with holes", () => {
  // reference: JSTS 2.12.1 OverlayOp.intersection(...).getArea(); tolerance 1e-9 relative to the
  // polygon's area (float rounding; JSTS rounds intersection vertices to doubles once)
  const rnd = seededRandom(99);
  for (let s = 0; s < 40; s++) {
    const region = randomRegion(1000 + s);
    const g = toJsts(region);
    const index = createOverlapIndex(region);
    const total = multiPolygonAreaPx2(region);
    for (let q = 0; q < 10; q++) {
      const x0 = -100 + 900 * rnd(), y0 = 20 * rnd() + 20 + 300 * rnd();
      const b: BBoxPx = [x0, y0, x0 + 10 + 400 * rnd(), y0 + 10 + 200 * rnd()];
      const want = jstsIntersectionArea(g, rectJsts(b));
      const plain = rectOverlapArea(region, b);
      const fast = index.rect(b);
      assert.ok(
        Math.abs(plain - want) <= 1e-9 * total,
        `seed ${s} query ${q}: ${plain} vs ${want}`,
      );
      assert.ok(Math.abs(fast - want) <= 1e-9 * total, `index, seed ${s} query ${q}`);
    }
  }
});

Deno.test("rectOverlapArea() handles hand-checkable cases: inside, outside, holes, touching edges", () => {
  const outer = rect(0, 0, 100, 100), hole = rect(40, 40, 60, 60);
  const region: MultiPolygonPx = [[outer, [...hole].reverse()]];
  // hand calculation: the window [30, 70]² holds 40² − 20² = 1200
  assert.equal(rectOverlapArea(region, [30, 30, 70, 70]), 1200);
  assert.equal(rectOverlapArea(region, [40, 40, 60, 60]), 0);
  assert.equal(rectOverlapArea(region, [-50, -50, 150, 150]), 10000 - 400);
  assert.equal(rectOverlapArea(region, [100, 0, 200, 100]), 0); // shares an edge only
  assert.equal(rectOverlapArea(region, [200, 0, 300, 100]), 0);
  assert.equal(rectOverlapArea(region, [10, 10, 10, 20]), 0); // zero width
  // winding of the input does not matter
  assert.equal(rectOverlapArea([[[...outer].reverse(), hole]], [30, 30, 70, 70]), 1200);
});

Deno.test("diskOverlapArea() gives π·r² inside a large square and the circular-segment closed form at a cut", () => {
  const big: MultiPolygonPx = [[rect(-1000, -1000, 1000, 1000)]];
  // disk fully inside: π·r² (standard geometry); tolerance 1e-12 relative (rounding)
  for (const r of [0.5, 3, 77.7]) {
    assert.ok(relErr(diskOverlapArea(big, [12.5, -40], r), Math.PI * r * r) < 1e-12);
  }
  // half-plane x ≤ d cut through a disk at the origin: the part beyond the line is the circular
  // segment r²·acos(d/r) − d·√(r² − d²) (standard geometry), so the overlap is π·r² − segment
  const r = 10;
  for (const d of [-9.5, -3, 0, 2.5, 7, 9.99]) {
    const half: MultiPolygonPx = [[rect(-1000, -1000, d, 1000)]];
    const segment = r * r * Math.acos(d / r) - d * Math.sqrt(r * r - d * d);
    const want = Math.PI * r * r - segment;
    const got = diskOverlapArea(half, [0, 0], r);
    assert.ok(Math.abs(got - want) < 1e-10 * Math.PI * r * r, `d = ${d}: ${got} vs ${want}`);
    assert.ok(Math.abs(createOverlapIndex(half).disk([0, 0], r) - want) < 1e-10 * Math.PI * r * r);
  }
  assert.equal(diskOverlapArea(big, [0, 0], 0), 0);
  assert.equal(diskOverlapArea(big, [5000, 0], 10), 0);
});

Deno.test("diskOverlapArea() agrees with a fine numeric integration on random polygons", () => {
  // reference: midpoint-rule integration of the indicator over the disk, by columns: each column
  // of width h is cut exactly by the polygon along y (rectOverlapArea on the column ∩ disk chord
  // box would not be independent), so we count the polygon's vertical chords with a crossing
  // test. Error ~ h²·perimeter; with 20,000 columns the tolerance is 1e-5 relative.
  const region = randomRegion(7, 1);
  const ring = region[0];
  const cx = 30, cy = 220, r = 70;
  const n = 20000, h = (2 * r) / n;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const x = cx - r + (i + 0.5) * h;
    const half = Math.sqrt(Math.max(0, r * r - (x - cx) ** 2));
    const lo = cy - half, hi = cy + half;
    // crossings of the vertical line x with every ring, sorted, give inside intervals
    const ys: number[] = [];
    for (const rr of ring) {
      for (let k = 0; k + 1 < rr.length; k++) {
        const [ax, ay] = rr[k], [bx, by] = rr[k + 1];
        if ((ax > x) !== (bx > x)) ys.push(ay + ((x - ax) / (bx - ax)) * (by - ay));
      }
    }
    ys.sort((a, b) => a - b);
    for (let k = 0; k + 1 < ys.length; k += 2) {
      const a = Math.max(lo, ys[k]), b = Math.min(hi, ys[k + 1]);
      if (b > a) sum += (b - a) * h;
    }
  }
  const got = diskOverlapArea(region, [cx, cy], r);
  assert.ok(got > 0);
  assert.ok(relErr(got, sum) < 1e-5, `${got} vs ${sum}`);
  assert.ok(Math.abs(createOverlapIndex(region).disk([cx, cy], r) - got) < 1e-9 * got);
});

Deno.test("createOverlapIndex().disk() equals the plain sum for centres inside, outside and on the boundary", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 0, max: 1e6 }),
      fc.double({ min: -100, max: 800, noNaN: true }),
      fc.double({ min: 50, max: 400, noNaN: true }),
      fc.double({ min: 0.1, max: 300, noNaN: true }),
      (seed, cx, cy, r) => {
        const region = randomRegion(seed);
        const a = diskOverlapArea(region, [cx, cy], r);
        const b = createOverlapIndex(region).disk([cx, cy], r);
        assert.ok(Math.abs(a - b) <= 1e-9 * Math.PI * r * r, `${a} vs ${b}`);
        assert.ok(a >= -1e-9 && a <= Math.PI * r * r * (1 + 1e-12));
      },
    ),
    { seed: 77, numRuns: 150 },
  );
  // centre exactly on an edge and on a vertex
  const sq: MultiPolygonPx = [[rect(0, 0, 100, 100)]];
  const idx = createOverlapIndex(sq);
  assert.ok(relErr(idx.disk([50, 0], 10), (Math.PI * 100) / 2) < 1e-12);
  assert.ok(relErr(idx.disk([0, 0], 10), (Math.PI * 100) / 4) < 1e-12);
});

Deno.test("polygonOverlapArea() agrees with JSTS 2.12.1 on random polygons", () => {
  // reference: JSTS 2.12.1 OverlayOp.intersection(...).getArea(); tolerance 1e-9 relative
  // (both round intersection vertices to doubles once)
  const rnd = seededRandom(5);
  for (let s = 0; s < 30; s++) {
    const region = randomRegion(500 + s);
    const poly = randomPolygon(rnd, 900 * rnd(), 200 + 100 * rnd(), 50 + 150 * rnd(), 20, 2);
    const want = jstsIntersectionArea(toJsts(region), toJsts([poly]));
    const got = polygonOverlapArea(region, poly);
    assert.ok(
      relErr(got, want) < 1e-9 || Math.abs(got - want) < 1e-9,
      `seed ${s}: ${got} vs ${want}`,
    );
  }
});

Deno.test("createOverlapIndex() matches the plain sums on rectilinear regions with long and short edges", () => {
  // a traced-mask-like region: rectangles of very different widths (wide and narrow edges);
  // the plain functions sum every edge without an index; tolerance 1e-9 of the window area
  const rnd = seededRandom(61);
  const polys: MultiPolygonPx = [];
  for (let i = 0; i < 60; i++) {
    const x = Math.floor(rnd() * 50) * 20, y = i * 20;
    const w = rnd() < 0.2 ? 400 + Math.floor(rnd() * 600) : 10 + Math.floor(rnd() * 30);
    polys.push([rect(x, y, x + w, y + 10 + Math.floor(rnd() * 10))]);
  }
  const index = createOverlapIndex(polys);
  for (let q = 0; q < 300; q++) {
    const x = -100 + 1300 * rnd(), y = -50 + 1300 * rnd();
    const b: BBoxPx = [x, y, x + 5 + 300 * rnd(), y + 5 + 200 * rnd()];
    const area = (b[2] - b[0]) * (b[3] - b[1]);
    assert.ok(Math.abs(index.rect(b) - rectOverlapArea(polys, b)) <= 1e-9 * area, `rect ${q}`);
    const r = 1 + 150 * rnd();
    const d = diskOverlapArea(polys, [x, y], r);
    assert.ok(Math.abs(index.disk([x, y], r) - d) <= 1e-9 * Math.PI * r * r, `disk ${q}`);
  }
  // and one check of the plain rectangle sum against JSTS 2.12.1 (tolerance as above)
  const b: BBoxPx = [100.5, 200.25, 700.75, 900.5];
  const want = jstsIntersectionArea(toJsts(polys), rectJsts(b));
  assert.ok(Math.abs(rectOverlapArea(polys, b) - want) <= 1e-9 * (600 * 700));
});
