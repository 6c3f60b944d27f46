// checkOutline() against JSTS 2.12.1 (npm "jsts", a port of the JTS Topology
// Suite; key JSTS in test/reference/README.md): its IsValidOp decides whether
// an outline is valid and names the kind of problem (TopologyValidationError
// types), and its overlay gives the area the outline describes (each polygon's
// outer ring minus the union of its holes, the polygons united). Tolerance
// 1e-9 relative: both compute the same exact overlays in double precision.

import { strict as assert } from "node:assert";
import IsValidOp from "jsts/org/locationtech/jts/operation/valid/IsValidOp.js";
import TopologyValidationError from "jsts/org/locationtech/jts/operation/valid/TopologyValidationError.js";
import { checkOutline, type RingProblemKind } from "../../lib/geometry/polygon_validity.ts";
import { multiPolygonAreaPx2 } from "../../lib/geometry/planar_area.ts";
import { buildValidRegion } from "../../lib/geometry/valid_region.ts";
import type { MultiPolygonPx, Ring } from "../../lib/types.ts";
import {
  jstsDifference,
  jstsUnion,
  randomPolygon,
  relErr,
  seededRandom,
  toJsts,
} from "./_shapes.ts";

const sq = (x0: number, y0: number, x1: number, y1: number): Ring => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
  [x0, y0],
];

/** JSTS's verdict: null when valid, else the TopologyValidationError type. */
function jstsError(mp: MultiPolygonPx): number | null {
  const op = new IsValidOp(toJsts(mp));
  const err = op.getValidationError();
  return err === null ? null : err.getErrorType();
}

/** JSTS area of the set the outline describes: ∪ₚ (outer ring − ∪ holes). */
function jstsSetArea(mp: MultiPolygonPx): number {
  // deno-lint-ignore no-explicit-any
  let total: any = null;
  for (const p of mp) {
    let part = toJsts([[p[0]]]);
    for (const h of p.slice(1)) part = jstsDifference(part, toJsts([[h]]));
    total = total === null ? part : jstsUnion(total, part);
  }
  return total === null ? 0 : total.getArea();
}

const E = TopologyValidationError;

/** Each kind of problem, the JSTS error type for it, and the set area. */
const CASES: {
  name: string;
  mp: MultiPolygonPx;
  kind: RingProblemKind;
  jsts: number[];
  area: number;
}[] = [
  {
    name: "a hole wholly outside its outer ring",
    mp: [[sq(0, 0, 100, 100), sq(200, 0, 210, 10)]],
    kind: "hole-outside-shell",
    jsts: [E.HOLE_OUTSIDE_SHELL],
    area: 10000,
  },
  {
    name: "a hole inside another hole",
    mp: [[sq(0, 0, 100, 100), sq(10, 10, 90, 90), sq(40, 40, 60, 60)]],
    kind: "hole-in-hole",
    jsts: [E.NESTED_HOLES],
    area: 10000 - 6400,
  },
  {
    name: "a hole crossing its outer ring",
    mp: [[sq(0, 0, 100, 100), sq(80, 40, 120, 60)]],
    kind: "hole-crosses-shell",
    jsts: [E.SELF_INTERSECTION],
    area: 10000 - 400,
  },
  {
    name: "two holes overlapping",
    mp: [[sq(0, 0, 100, 100), sq(10, 10, 50, 50), sq(30, 30, 70, 70)]],
    kind: "holes-overlap",
    jsts: [E.SELF_INTERSECTION],
    area: 10000 - (1600 + 1600 - 400),
  },
  {
    name: "a polygon inside another (nested shells)",
    mp: [[sq(0, 0, 100, 100)], [sq(20, 20, 40, 40)]],
    kind: "polygon-in-polygon",
    jsts: [E.NESTED_SHELLS],
    area: 10000,
  },
  {
    name: "two polygons overlapping",
    mp: [[sq(0, 0, 100, 100)], [sq(50, 50, 150, 150)]],
    kind: "polygons-overlap",
    jsts: [E.SELF_INTERSECTION],
    area: 17500,
  },
  {
    name: "a hole outside its own polygon but inside the next one",
    mp: [[sq(0, 0, 100, 100), sq(150, 10, 160, 20)], [sq(120, 0, 200, 100)]],
    kind: "hole-outside-shell",
    jsts: [E.HOLE_OUTSIDE_SHELL],
    area: 10000 + 8000,
  },
];

Deno.test("checkOutline() finds each kind of invalid outline that JSTS finds, and repairs it to JSTS's area", () => {
  for (const c of CASES) {
    const err = jstsError(c.mp);
    assert.ok(err !== null && c.jsts.includes(err), `${c.name}: JSTS says ${err}`);
    const got = checkOutline(c.mp);
    assert.deepEqual(got.problems.map((p) => p.kind), [c.kind], c.name);
    const ref = jstsSetArea(c.mp);
    assert.ok(relErr(ref, c.area) < 1e-9, `${c.name}: hand area ${c.area}, JSTS ${ref}`);
    assert.ok(relErr(got.areaPx2, ref) < 1e-9, `${c.name}: area ${got.areaPx2}, JSTS ${ref}`);
    assert.ok(relErr(multiPolygonAreaPx2(got.polygons), ref) < 1e-9, c.name);
    assert.equal(jstsError(got.polygons), null, `${c.name}: the repair is valid for JSTS`);
    assert.equal(
      checkOutline(got.polygons).problems.length,
      0,
      `${c.name}: the repair passes again`,
    );
  }
});

Deno.test("checkOutline() names the ring at fault and a place", () => {
  const [outside] = checkOutline(CASES[0].mp).problems;
  assert.deepEqual(outside, { kind: "hole-outside-shell", polygon: 0, ring: 1, atPx: [200, 0] });
  const [nested] = checkOutline(CASES[1].mp).problems;
  assert.deepEqual(nested, {
    kind: "hole-in-hole",
    polygon: 0,
    ring: 2,
    otherPolygon: 0,
    otherRing: 1,
    atPx: [40, 40],
  });
  const [crossing] = checkOutline(CASES[2].mp).problems;
  assert.equal(crossing.ring, 1);
  assert.equal(crossing.otherRing, 0);
  assert.ok(crossing.atPx[0] === 100 && (crossing.atPx[1] === 40 || crossing.atPx[1] === 60));
  const [shells] = checkOutline(CASES[4].mp).problems;
  assert.equal(shells.polygon, 1);
  assert.equal(shells.otherPolygon, 0);
});

Deno.test("checkOutline() repairs a bow-tie to its two triangles", () => {
  // hand calculation: the ring crosses itself at (50, 50); two triangles of 100·50/2 each
  const bow: MultiPolygonPx = [[[[0, 0], [100, 100], [100, 0], [0, 100], [0, 0]]]];
  const err = jstsError(bow);
  assert.ok(err === E.SELF_INTERSECTION || err === E.RING_SELF_INTERSECTION, `JSTS ${err}`);
  const got = checkOutline(bow);
  assert.deepEqual(got.problems.map((p) => [p.kind, p.atPx]), [["ring-crosses-itself", [50, 50]]]);
  assert.equal(got.areaPx2, 5000);
  assert.equal(got.drawnAreaPx2, 0);
});

Deno.test("checkOutline() keeps valid outlines as they are: islands in holes, rings touching at a vertex", () => {
  const valid: [string, MultiPolygonPx][] = [
    ["an island in a hole", [[sq(0, 0, 100, 100), sq(10, 10, 90, 90)], [sq(20, 20, 80, 80)]]],
    ["a hole touching its outer ring at a corner", [[sq(0, 0, 100, 100), [[0, 0], [10, 20], [
      20,
      10,
    ], [0, 0]]]]],
    ["two polygons sharing a corner", [[sq(0, 0, 10, 10)], [sq(10, 10, 20, 20)]]],
    ["an island touching its hole at a vertex", [[sq(0, 0, 100, 100), sq(10, 10, 90, 90)], [[
      [10, 10],
      [50, 20],
      [20, 50],
      [10, 10],
    ]]]],
    ["clockwise and anticlockwise rings mixed", [[
      sq(0, 0, 100, 100).reverse(),
      sq(10, 10, 20, 20).reverse(),
    ], [sq(200, 0, 300, 100)]]],
  ];
  for (const [name, mp] of valid) {
    assert.equal(jstsError(mp), null, `${name}: JSTS finds it valid`);
    const got = checkOutline(mp);
    assert.deepEqual(got.problems, [], name);
    assert.equal(got.polygons, mp, `${name}: returned unchanged`);
    assert.equal(got.areaPx2, got.drawnAreaPx2);
  }
});

Deno.test("checkOutline() agrees with JSTS on random polygons with holes moved about", () => {
  const rnd = seededRandom(16);
  let invalid = 0;
  for (let k = 0; k < 150; k++) {
    const p = randomPolygon(rnd, 500, 500, 300, 20, 4);
    const mp: MultiPolygonPx = [p];
    if (rnd() < 0.3) mp.push(randomPolygon(rnd, 500 + 700 * (rnd() - 0.3), 500, 200, 12, 2));
    // move one hole by up to 1.3 radii: it may stay inside, cross the outer ring or leave
    const holes = mp.flatMap((q, qi) => q.slice(1).map((_, hi) => [qi, hi + 1]));
    if (holes.length > 0) {
      const [qi, hi] = holes[Math.floor(rnd() * holes.length)];
      const dx = (rnd() - 0.5) * 780, dy = (rnd() - 0.5) * 780;
      mp[qi][hi] = mp[qi][hi].map(([x, y]) => [x + dx, y + dy] as [number, number]);
    }
    const err = jstsError(mp);
    const got = checkOutline(mp);
    if (err === null || err === E.DISCONNECTED_INTERIOR) {
      assert.deepEqual(got.problems, [], `case ${k}: JSTS finds it valid`);
    } else {
      invalid++;
      assert.ok(got.problems.length > 0, `case ${k}: JSTS error ${err}, none found`);
      const ref = jstsSetArea(mp);
      assert.ok(relErr(got.areaPx2, ref) < 1e-9, `case ${k}: ${got.areaPx2} vs JSTS ${ref}`);
    }
  }
  assert.ok(invalid > 20, `enough invalid cases drawn (${invalid})`);
});

Deno.test("checkOutline() does not depend on ring start, winding or a shift of all positions", () => {
  for (const c of CASES) {
    const moved: MultiPolygonPx = c.mp.map((p) =>
      p.map((r) => {
        const open = r.slice(0, -1).map(([x, y]) => [x + 1000.5, y - 333.25] as [number, number]);
        const turned = [...open.slice(1), open[0]].reverse();
        return [...turned, turned[0]];
      })
    );
    const a = checkOutline(c.mp), b = checkOutline(moved);
    assert.deepEqual(b.problems.map((p) => p.kind), a.problems.map((p) => p.kind), c.name);
    assert.ok(relErr(b.areaPx2, a.areaPx2) < 1e-9, c.name);
  }
});

Deno.test("buildValidRegion() no longer subtracts a hole lying outside its polygon", () => {
  const v = buildValidRegion({
    tissue: [{ polygons: CASES[0].mp, source: "QVT-24-065.geojson feature 0" }],
    tumour: [],
    exclude: [],
  });
  assert.equal(v.tissueAreaPx2, 10000);
  assert.match(v.warnings.join("\n"), /QVT-24-065\.geojson feature 0/);
});
