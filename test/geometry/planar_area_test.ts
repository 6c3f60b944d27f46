import { strict as assert } from "node:assert";
import fc from "fast-check";
import {
  multiPolygonAreaPx2,
  polygonAreaPx2,
  polygonCentroidPx,
  ringAreaPx2,
} from "../../lib/geometry/planar_area.ts";
import type { PolygonPx, Ring } from "../../lib/types.ts";
import { jstsCentroid, randomPolygon, relErr, seededRandom, toJsts } from "./_shapes.ts";

function regularPolygon(n: number, r: number): Ring {
  const ring: Ring = [];
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / n;
    ring.push([r * Math.cos(t), r * Math.sin(t)]);
  }
  ring.push(ring[0]);
  return ring;
}

Deno.test("ringAreaPx2() gives textbook areas: rectangle, 3-4-5 triangle, regular n-gons", () => {
  // hand calculation: 7 × 3 rectangle = 21
  assert.equal(ringAreaPx2([[1, 1], [8, 1], [8, 4], [1, 4], [1, 1]]), 21);
  // right triangle with legs 3 and 4 (hypotenuse 5): area ½·3·4 = 6 (standard geometry)
  assert.equal(ringAreaPx2([[0, 0], [3, 0], [0, 4], [0, 0]]), 6);
  // regular n-gon of circumradius r: (n/2)·r²·sin(2π/n), standard geometry (common practice);
  // tolerance 1e-12 relative (float rounding of the vertices)
  for (const n of [3, 4, 6, 12, 100, 1000]) {
    const r = 7.5;
    const want = (n / 2) * r * r * Math.sin((2 * Math.PI) / n);
    assert.ok(relErr(ringAreaPx2(regularPolygon(n, r)), want) < 1e-12, `n = ${n}`);
  }
  // … converging to π·r² as n grows: the deficit is about (2π³/3)·r²/n²
  const a = ringAreaPx2(regularPolygon(100000, 1));
  assert.ok(Math.abs(a - Math.PI) < 1e-8);
});

Deno.test("ringAreaPx2() is positive for the outer winding (clockwise on screen, y down) and negative reversed", () => {
  // (0,0) → (1,0) → (1,1): right along the top, then down: clockwise as drawn with y down
  const cw: Ring = [[0, 0], [1, 0], [1, 1], [0, 1], [0, 0]];
  assert.equal(ringAreaPx2(cw), 1);
  assert.equal(ringAreaPx2([...cw].reverse()), -1);
  // an unclosed ring gets its closing edge implied
  assert.equal(ringAreaPx2([[0, 0], [1, 0], [1, 1], [0, 1]]), 1);
  assert.equal(ringAreaPx2([[0, 0], [1, 0]]), 0);
});

Deno.test("polygonAreaPx2() subtracts holes whatever their winding", () => {
  const outer: Ring = [[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]];
  const hole: Ring = [[2, 2], [4, 2], [4, 4], [2, 4], [2, 2]];
  assert.equal(polygonAreaPx2([outer, hole]), 96);
  assert.equal(polygonAreaPx2([[...outer].reverse(), [...hole].reverse()]), 96);
  assert.equal(multiPolygonAreaPx2([[outer, hole], [hole]]), 100);
  assert.equal(multiPolygonAreaPx2([]), 0);
});

Deno.test("polygonAreaPx2() and polygonCentroidPx() agree with JSTS 2.12.1 on random polygons with holes", () => {
  // reference: JSTS 2.12.1 (npm "jsts", port of the JTS Topology Suite) Geometry.getArea() and
  // getCentroid(); tolerance 1e-9 relative (float rounding; both are shoelace sums)
  const rnd = seededRandom(20241);
  for (let i = 0; i < 200; i++) {
    const p = randomPolygon(
      rnd,
      1000 * rnd() - 500,
      40000 * rnd(),
      5 + 200 * rnd(),
      8 + (i % 40),
      4,
    );
    const g = toJsts([p]);
    assert.ok(relErr(polygonAreaPx2(p), g.getArea()) < 1e-9, `polygon ${i}`);
    const [jx, jy] = jstsCentroid(g);
    const [cx, cy] = polygonCentroidPx(p);
    const scale = Math.max(1, Math.abs(jx), Math.abs(jy));
    assert.ok(
      Math.abs(cx - jx) / scale < 1e-9 && Math.abs(cy - jy) / scale < 1e-9,
      `centroid ${i}`,
    );
  }
});

Deno.test("polygonAreaPx2() is invariant under start-vertex rotation, winding reversal and translation", () => {
  const rotate = (r: Ring, k: number): Ring => {
    const open = r.slice(0, -1);
    const s = [...open.slice(k % open.length), ...open.slice(0, k % open.length)];
    return [...s, s[0]];
  };
  fc.assert(
    fc.property(
      fc.integer({ min: 0, max: 2 ** 31 }),
      fc.integer({ min: 0, max: 50 }),
      fc.boolean(),
      fc.double({ min: -1e5, max: 1e5, noNaN: true }),
      fc.double({ min: -1e5, max: 1e5, noNaN: true }),
      (seed, k, rev, dx, dy) => {
        const p = randomPolygon(seededRandom(seed), 0, 0, 100, 20, 3);
        const a = polygonAreaPx2(p);
        const q: PolygonPx = p.map((r) => {
          const rr = rotate(r, k).map(([x, y]) => [x + dx, y + dy] as [number, number]);
          return rev ? rr.reverse() : rr;
        });
        // translation by up to 1e5 with coordinates ~1e2 loses about 1e5·ε per term
        assert.ok(Math.abs(polygonAreaPx2(q) - a) < 1e-6 * a);
        const [cx, cy] = polygonCentroidPx(p), [qx, qy] = polygonCentroidPx(q);
        assert.ok(Math.abs(qx - dx - cx) < 1e-6 && Math.abs(qy - dy - cy) < 1e-6);
      },
    ),
    { seed: 4242, numRuns: 200 },
  );
});
