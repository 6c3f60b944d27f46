import { strict as assert } from "node:assert";
import fc from "fast-check";
import { buildValidRegion } from "../../lib/geometry/valid_region.ts";
import { multiPolygonAreaPx2, ringAreaPx2 } from "../../lib/geometry/planar_area.ts";
import { createRegionIndex } from "../../lib/geometry/region_index.ts";
import type { MultiPolygonPx, PolygonPx, RegionPart, Ring } from "../../lib/types.ts";
import {
  jstsDifference,
  jstsIntersection,
  jstsUnion,
  randomPolygon,
  relErr,
  seededRandom,
  starRing,
  toJsts,
} from "./_shapes.ts";
import { checkOutline } from "../../lib/geometry/polygon_validity.ts";
import { isProvenValid } from "../../lib/geometry/proven_outlines.ts";
import { ENGINE_CASES, engineCase } from "../count/_engine_cases.ts";

const rect = (x0: number, y0: number, x1: number, y1: number): Ring => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
  [x0, y0],
];
const part = (polygons: MultiPolygonPx, source: string): RegionPart => ({ polygons, source });

/** JSTS 2.12.1 reference for V = ∪tissue ∩ ∪tumour − ∪exclude. */
function jstsValidArea(tissue: PolygonPx[], tumour: PolygonPx[], exclude: PolygonPx[]): number {
  // deno-lint-ignore no-explicit-any
  const union = (ps: PolygonPx[]): any =>
    ps.map((p) => toJsts([p])).reduce((a, b) => (a === null ? b : jstsUnion(a, b)), null);
  let v = tissue.length > 0 ? union(tissue) : null;
  if (tumour.length > 0) v = v === null ? union(tumour) : jstsIntersection(v, union(tumour));
  if (exclude.length > 0) v = jstsDifference(v, union(exclude));
  return v.getArea();
}

function checkNormalized(region: MultiPolygonPx): void {
  for (const p of region) {
    assert.ok(ringAreaPx2(p[0]) > 0, "outer ring positive");
    for (const h of p.slice(1)) assert.ok(ringAreaPx2(h) < 0, "hole negative");
  }
}

Deno.test("buildValidRegion() agrees with JSTS 2.12.1 on random tissue, tumour and exclusions", () => {
  // reference: JSTS 2.12.1 OverlayOp union/intersection/difference + getArea(); tolerance 1e-9
  // relative to the tissue area (both round crossing points to doubles once)
  const rnd = seededRandom(2024);
  for (let s = 0; s < 60; s++) {
    const tissue: PolygonPx[] = [randomPolygon(rnd, 0, 0, 200, 80, 5)];
    if (s % 3 === 0) tissue.push(randomPolygon(rnd, 150 + 100 * rnd(), 50, 120, 40, 2));
    const tumour: PolygonPx[] = s % 5 === 4 ? [] : [
      randomPolygon(
        rnd,
        150 * rnd() - 75,
        150 * rnd() - 75,
        60 + 120 * rnd(),
        40,
        s % 2 === 0 ? 2 : 0,
      ),
    ];
    const exclude: PolygonPx[] = [];
    for (let k = 0; k < s % 4; k++) {
      exclude.push([starRing(rnd, 300 * rnd() - 150, 300 * rnd() - 150, 12, 10, 50)]);
    }
    const v = buildValidRegion({
      tissue: tissue.map((p, i) => part([p], `QVT-24-00${s}.geojson feature ${i}`)),
      tumour: tumour.map((p) => part([p], "tumour")),
      exclude: exclude.map((p) => part([p], "exclude")),
    });
    const want = jstsValidArea(tissue, tumour, exclude);
    const scale = v.tissueAreaPx2;
    assert.ok(
      Math.abs(v.validAreaPx2 - want) <= 1e-9 * scale,
      `case ${s}: ${v.validAreaPx2} vs ${want}`,
    );
    assert.ok(Math.abs(multiPolygonAreaPx2(v.region) - v.validAreaPx2) <= 1e-9 * scale);
    checkNormalized(v.region);
    assert.ok(v.validAreaPx2 <= v.tissueAreaPx2 * (1 + 1e-12));
    if (tumour.length > 0) assert.ok(v.validAreaPx2 <= v.tumourAreaPx2 * (1 + 1e-12));
  }
});

Deno.test("buildValidRegion() handles a tumour crossing holes and the outline of a large tissue polygon", () => {
  // the fast path (own overlay of crossing rings) against JSTS 2.12.1, tolerance 1e-9 relative
  const rnd = seededRandom(77);
  for (let s = 0; s < 12; s++) {
    const outer = starRing(rnd, 0, 0, 2000, 700, 1000);
    const holes: Ring[] = [];
    for (let k = 0; k < 12; k++) {
      const t = (2 * Math.PI * k) / 12;
      holes.push(starRing(rnd, 400 * Math.cos(t), 400 * Math.sin(t), 30, 40, 90).reverse());
    }
    const tissue: PolygonPx = [outer, ...holes];
    const tumour: PolygonPx = [starRing(rnd, 300 + 400 * rnd(), 200 * rnd(), 300, 200, 600)];
    const exclude: PolygonPx[] = [[starRing(rnd, 500, 0, 20, 50, 150)], [
      starRing(rnd, 0, 0, 20, 30, 80),
    ]];
    const v = buildValidRegion({
      tissue: [part([tissue], "t")],
      tumour: [part([tumour], "u")],
      exclude: exclude.map((p) => part([p], "x")),
    });
    const want = jstsValidArea([tissue], [tumour], exclude);
    assert.ok(relErr(v.validAreaPx2, want) < 1e-9, `case ${s}: ${v.validAreaPx2} vs ${want}`);
    checkNormalized(v.region);
  }
});

Deno.test("buildValidRegion() region agrees with brute-force point tests (fast-check)", () => {
  fc.assert(
    fc.property(fc.integer({ min: 0, max: 1e6 }), (seed) => {
      const rnd = seededRandom(seed);
      const tissue = randomPolygon(rnd, 0, 0, 100, 40, 3);
      const tumour = randomPolygon(rnd, 60 * rnd() - 30, 60 * rnd() - 30, 80, 30, 1);
      const ex: PolygonPx = [starRing(rnd, 50 * rnd() - 25, 50 * rnd() - 25, 10, 5, 30)];
      const v = buildValidRegion({
        tissue: [part([tissue], "t")],
        tumour: [part([tumour], "u")],
        exclude: [part([ex], "x")],
      });
      const tIdx = createRegionIndex([tissue]), uIdx = createRegionIndex([tumour]);
      const xIdx = createRegionIndex([ex]), vIdx = createRegionIndex(v.region);
      for (let i = 0; i < 300; i++) {
        const x = 240 * rnd() - 120, y = 240 * rnd() - 120;
        const want = tIdx.containsPoint(x, y) && uIdx.containsPoint(x, y) &&
          !xIdx.containsPoint(x, y);
        // points within rounding of a crossing may differ; random doubles essentially never are
        assert.equal(vIdx.containsPoint(x, y), want, `(${x}, ${y})`);
      }
      assert.ok(
        v.validAreaPx2 <= v.tissueAreaPx2 + 1e-9 && v.validAreaPx2 <= v.tumourAreaPx2 + 1e-9,
      );
    }),
    { seed: 99, numRuns: 60 },
  );
});

Deno.test("buildValidRegion() subtracts exclude polygons and keeps the unions", () => {
  const v = buildValidRegion({
    tissue: [part([[rect(0, 0, 100, 100)]], "a"), part([[rect(100, 0, 200, 100)]], "b")],
    tumour: [],
    exclude: [part([[rect(10, 10, 20, 20)]], "x1"), part([[rect(15, 15, 30, 30)]], "x2")],
  });
  // hand calculation: 20,000 − (100 + 225 − 25) = 19,700
  assert.ok(Math.abs(v.validAreaPx2 - 19700) < 1e-9);
  assert.ok(Math.abs(v.tissueAreaPx2 - 20000) < 1e-9);
  assert.ok(Math.abs(v.excludedAreaPx2 - 300) < 1e-9);
  assert.equal(v.tumour.length, 0);
  assert.deepEqual(v.warnings, []);
});

Deno.test("buildValidRegion() uses the tumour alone when no tissue is given", () => {
  const v = buildValidRegion({
    tissue: [],
    tumour: [part([[[...rect(0, 0, 10, 10)].reverse()]], "u")],
    exclude: [part([[rect(8, 8, 12, 12)]], "x")],
  });
  assert.ok(Math.abs(v.validAreaPx2 - 96) < 1e-12);
  assert.equal(v.tissueAreaPx2, 0);
  checkNormalized(v.region);
});

Deno.test("buildValidRegion() repairs a bow-tie outline and warns with its source and place", () => {
  // a bow-tie crossing itself at (50, 50): repaired into its two triangles of 2,500 px² each
  const bow: Ring = [[0, 0], [100, 100], [100, 0], [0, 100], [0, 0]];
  const v = buildValidRegion({
    tissue: [part([[bow]], "QVT-24-003.geojson feature 2")],
    tumour: [],
    exclude: [],
  });
  assert.ok(Math.abs(v.validAreaPx2 - 5000) < 1e-9);
  assert.equal(v.region.length, 2);
  assert.equal(v.warnings.length, 1);
  assert.match(v.warnings[0], /QVT-24-003\.geojson feature 2/);
  assert.match(v.warnings[0], /near \(50, 50\) px/);
  checkNormalized(v.region);
});

Deno.test("buildValidRegion() keeps touching polygons and vertex-touching holes without warnings", () => {
  // two squares sharing an edge, and a polygon whose hole touches its outer ring at one vertex
  const touchHole: PolygonPx = [rect(0, 0, 10, 10), [[0, 0], [5, 2], [2, 5], [0, 0]]];
  const v = buildValidRegion({
    tissue: [
      part([[rect(20, 0, 30, 10)]], "a"),
      part([[rect(30, 0, 40, 10)]], "b"),
      part([touchHole], "c"),
    ],
    tumour: [],
    exclude: [],
  });
  // hand calculation: 100 + 100 + (100 − 10.5); the hole triangle has area ½·|5·5 − 2·2| = 10.5
  assert.ok(Math.abs(v.validAreaPx2 - 289.5) < 1e-9, String(v.validAreaPx2));
  assert.deepEqual(v.warnings, []);
  // corner-to-corner pieces (as a traced mask gives) are valid too
  const diag = buildValidRegion({
    tissue: [part([[rect(0, 0, 1, 1)], [rect(1, 1, 2, 2)]], "mask.png")],
    tumour: [],
    exclude: [],
  });
  assert.deepEqual(diag.warnings, []);
  assert.equal(diag.region.length, 2);
  // a hole crossing its outer ring at a vertex is not a mere touch: repaired, with a warning
  const crossing = buildValidRegion({
    tissue: [part([[rect(0, 0, 10, 10), [[0, 0], [-2, 5], [5, 2], [0, 0]]]], "bad")],
    tumour: [],
    exclude: [],
  });
  assert.equal(crossing.warnings.length, 1);
  checkNormalized(v.region);
});

Deno.test("buildValidRegion() merges overlapping parts of one role", () => {
  const v = buildValidRegion({
    tissue: [part([[rect(0, 0, 10, 10)]], "a"), part([[rect(5, 0, 15, 10)]], "b")],
    tumour: [part([[rect(-5, 2, 20, 4)]], "u")],
    exclude: [],
  });
  assert.ok(Math.abs(v.tissueAreaPx2 - 150) < 1e-9);
  assert.ok(Math.abs(v.validAreaPx2 - 30) < 1e-9);
  assert.equal(v.warnings.length, 0);
});

Deno.test("buildValidRegion() is unchanged by start-vertex rotation, winding reversal and translation", () => {
  const rnd = seededRandom(3);
  const tissue = randomPolygon(rnd, 0, 0, 100, 50, 3);
  const tumour = randomPolygon(rnd, 40, 10, 70, 30, 1);
  const base = buildValidRegion({
    tissue: [part([tissue], "t")],
    tumour: [part([tumour], "u")],
    exclude: [],
  });
  const move = (p: PolygonPx): PolygonPx =>
    p.map((r) => {
      const open = r.slice(0, -1);
      const k = 5 % open.length;
      const rot = [...open.slice(k), ...open.slice(0, k)];
      return [...rot, rot[0]].map(([x, y]) => [x + 4096, y - 2048] as [number, number]).reverse();
    });
  const moved = buildValidRegion({
    tissue: [part([move(tissue)], "t")],
    tumour: [part([move(tumour)], "u")],
    exclude: [],
  });
  // tolerance 1e-9 relative: translation changes rounding of crossing points only
  assert.ok(relErr(moved.validAreaPx2, base.validAreaPx2) < 1e-9);
});

Deno.test("buildValidRegion() refuses a case with neither tissue nor tumour", () => {
  assert.throws(
    () =>
      buildValidRegion({
        tissue: [],
        tumour: [],
        exclude: [part([[rect(0, 0, 1, 1)]], "QVT-24-009.geojson feature 0")],
      }),
    {
      name: "TypeError",
      message:
        'Cannot read case "QVT-24-009.geojson feature 0": has neither a tissue nor a tumour region with any area; at least one is needed',
    },
  );
  assert.throws(
    () => buildValidRegion({ tissue: [part([], "t")], tumour: [], exclude: [] }),
    TypeError,
  );
});

Deno.test("buildValidRegion() agrees with JSTS 2.12.1 on grid-aligned shapes with shared edges and corners", () => {
  // degenerate contacts (collinear edges, shared vertices) take the general clipper;
  // reference JSTS 2.12.1, tolerance 1e-9 relative (integer coordinates: results are exact)
  const rnd = seededRandom(11);
  const r = (n: number) => Math.floor(rnd() * n);
  for (let s = 0; s < 40; s++) {
    const boxes = (k: number): PolygonPx[] =>
      Array.from({ length: k }, () => {
        const x = r(20), y = r(20);
        return [rect(x, y, x + 1 + r(10), y + 1 + r(10))];
      });
    const tissue = boxes(1 + r(3)), tumour = boxes(r(3)), exclude = boxes(r(3));
    const v = buildValidRegion({
      tissue: tissue.map((p, i) => part([p], `t${i}`)),
      tumour: tumour.map((p, i) => part([p], `u${i}`)),
      exclude: exclude.map((p, i) => part([p], `x${i}`)),
    });
    const want = jstsValidArea(tissue, tumour, exclude);
    assert.ok(
      Math.abs(v.validAreaPx2 - want) < 1e-9 * Math.max(1, want),
      `case ${s}: ${v.validAreaPx2} vs ${want}`,
    );
    checkNormalized(v.region);
  }
});

Deno.test("buildValidRegion() handles holes crossing holes, and exclusions with holes", () => {
  // reference: JSTS 2.12.1 overlay areas; tolerance 1e-9 relative
  const rnd = seededRandom(404);
  for (let s = 0; s < 20; s++) {
    // tissue and tumour outers far apart from each other's boundary; only their holes cross
    const tissue: PolygonPx = [
      starRing(rnd, 0, 0, 60, 900, 1000),
      starRing(rnd, 0, 0, 30, 100, 200).reverse(),
    ];
    const tumour: PolygonPx = [
      starRing(rnd, 0, 0, 40, 500, 600),
      starRing(rnd, 80 + 60 * rnd(), 40 * rnd(), 25, 80, 180).reverse(),
    ];
    // an exclusion ring with a hole (the hole stays counted), crossing the tumour's outline
    const exclude: PolygonPx = [
      starRing(rnd, 550, 0, 30, 100, 150),
      starRing(rnd, 550, 0, 12, 20, 40).reverse(),
    ];
    const v = buildValidRegion({
      tissue: [part([tissue], "t")],
      tumour: [part([tumour], "u")],
      exclude: [part([exclude], "x")],
    });
    const want = jstsValidArea([tissue], [tumour], [exclude]);
    assert.ok(relErr(v.validAreaPx2, want) < 1e-9, `case ${s}: ${v.validAreaPx2} vs ${want}`);
    checkNormalized(v.region);
    const idx = createRegionIndex(v.region);
    // the exclusion's hole stays in V wherever the tumour covers it
    assert.equal(idx.containsPoint(550, 0), createRegionIndex([tumour]).containsPoint(550, 0));
  }
});

Deno.test("buildValidRegion() finds crossings of long slanted edges with a fine outline", () => {
  // a 3000-vertex wavy disk against a 7-spike star whose edges span the whole disk;
  // reference JSTS 2.12.1, tolerance 1e-9 relative
  const disk: Ring = [];
  for (let i = 0; i < 3000; i++) {
    const t = (2 * Math.PI * i) / 3000, r = 1000 * (1 + 0.05 * Math.sin(40 * t));
    disk.push([r * Math.cos(t), r * Math.sin(t)]);
  }
  disk.push(disk[0]);
  const star: Ring = [];
  for (let i = 0; i < 14; i++) {
    const t = (Math.PI * i) / 7 + 0.1, r = i % 2 === 0 ? 1400 : 90;
    star.push([30 + r * Math.cos(t), -20 + r * Math.sin(t)]);
  }
  star.push(star[0]);
  const v = buildValidRegion({
    tissue: [part([[disk]], "t")],
    tumour: [part([[star]], "u")],
    exclude: [],
  });
  const want = jstsValidArea([[disk]], [[star]], []);
  assert.ok(relErr(v.validAreaPx2, want) < 1e-9, `${v.validAreaPx2} vs ${want}`);
});

Deno.test("buildValidRegion() warns when nothing is left to count", () => {
  const apart = buildValidRegion({
    tissue: [part([[rect(0, 0, 10, 10)]], "t")],
    tumour: [part([[rect(20, 0, 30, 10)]], "u")],
    exclude: [],
  });
  assert.deepEqual(apart.region, []);
  assert.equal(apart.validAreaPx2, 0);
  assert.match(apart.warnings[0], /does not overlap the tissue/);
  const covered = buildValidRegion({
    tissue: [part([[rect(0, 0, 10, 10)]], "t")],
    tumour: [],
    exclude: [part([[rect(-1, -1, 11, 11)]], "x")],
  });
  assert.equal(covered.validAreaPx2, 0);
  assert.equal(covered.excludedAreaPx2, 100);
  assert.match(covered.warnings[0], /cover all of the counting region/);
});

Deno.test("buildValidRegion() intersects traced mask pieces with a tumour outline as JSTS 2.12.1 does", async () => {
  // mask pieces (many polygons, corner touches) against a tumour with vertices on and off the
  // pixel grid; reference JSTS 2.12.1, tolerance 1e-9 relative
  const { maskToPolygons } = await import("../../lib/tissue/read_mask.ts");
  const rnd = seededRandom(321);
  for (let s = 0; s < 6; s++) {
    const width = 40, height = 30;
    const data = new Uint8Array(width * height);
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        const d = Math.hypot(x - 20, y - 15);
        data[y * width + x] = (d < 12 && rnd() < 0.85) || rnd() < 0.05 ? 1 : 0;
      }
    }
    const tissue = maskToPolygons({ width, height, data }, { scaleX: 4, scaleY: 4 });
    const tumourRing = starRing(rnd, 80, 60, 24, 20, 50).map(([x, y], i) =>
      (i % 3 === 0 ? [Math.round(x / 4) * 4, Math.round(y / 4) * 4] : [x, y]) as [number, number]
    );
    tumourRing[tumourRing.length - 1] = tumourRing[0];
    const v = buildValidRegion({
      tissue: [part(tissue, "mask.png")],
      tumour: [part([[tumourRing]], "u")],
      exclude: [part([[rect(70, 50, 90, 58)]], "x")],
    });
    // reference, pixel by pixel: Σ over tissue pixels of area((pixel ∩ tumour) − exclude) by
    // JSTS 2.12.1 (its overlay of the whole traced mask trips on the corner touches)
    const tumourJ = toJsts([[tumourRing]]), excludeJ = toJsts([[rect(70, 50, 90, 58)]]);
    let want = 0;
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        if (!data[y * width + x]) continue;
        const pixel = toJsts([[rect(4 * x, 4 * y, 4 * x + 4, 4 * y + 4)]]);
        want += jstsDifference(jstsIntersection(pixel, tumourJ), excludeJ).getArea();
      }
    }
    assert.ok(relErr(v.validAreaPx2, want) < 1e-9, `case ${s}: ${v.validAreaPx2} vs ${want}`);
    assert.deepEqual(v.warnings, []);
    checkNormalized(v.region);
  }
});

Deno.test("buildValidRegion() repairs a part whose polygons lie inside one another, with a warning", () => {
  const v = buildValidRegion({
    tissue: [part([[rect(0, 0, 10, 10)], [rect(2, 2, 4, 4)]], "QVT-24-004.geojson feature 1")],
    tumour: [],
    exclude: [],
  });
  assert.ok(Math.abs(v.validAreaPx2 - 100) < 1e-9);
  assert.equal(v.warnings.length, 1);
  assert.match(
    v.warnings[0],
    /QVT-24-004\.geojson feature 1 has polygons lying inside one another/,
  );
});

Deno.test("buildValidRegion() does not depend on the order of the parts", () => {
  const rnd = seededRandom(12);
  const tissue = [0, 1, 2].map((i) => part([randomPolygon(rnd, 120 * i, 0, 90, 30, 2)], `t${i}`));
  const exclude = [0, 1, 2, 3].map((i) => part([[starRing(rnd, 60 * i, 10, 10, 10, 40)]], `x${i}`));
  const tumour = [part([randomPolygon(rnd, 100, 0, 150, 40, 1)], "u")];
  const a = buildValidRegion({ tissue, tumour, exclude });
  const b = buildValidRegion({
    tissue: [...tissue].reverse(),
    tumour,
    exclude: [exclude[2], exclude[0], exclude[3], exclude[1]],
  });
  // tolerance 1e-9 relative: a different order changes only the rounding of crossing points
  assert.ok(relErr(a.validAreaPx2, b.validAreaPx2) < 1e-9);
  assert.ok(relErr(a.tissueAreaPx2, b.tissueAreaPx2) < 1e-9);
  assert.ok(relErr(a.excludedAreaPx2, b.excludedAreaPx2) < 1e-9);
});

Deno.test("an outline the reader proved valid gives the same valid region without a second contact search", () => {
  // The sixty seeded engine cases (outlines with holes, a second tissue part,
  // tumour and exclusions): each role's parts proven by checkOutline, as the
  // reader does, must give exactly the region built from unproven copies.
  let shortcuts = 0;
  for (let c = 0; c < ENGINE_CASES; c++) {
    const { caseData } = engineCase(c);
    const copy = structuredClone({
      tissue: caseData.tissue,
      tumour: caseData.tumour,
      exclude: caseData.exclude,
    });
    for (const part of [...caseData.tissue, ...caseData.tumour, ...caseData.exclude]) {
      if (checkOutline(part.polygons).problems.length === 0) {
        assert.ok(isProvenValid(part.polygons));
        shortcuts++;
      }
    }
    assert.deepEqual(buildValidRegion(caseData), buildValidRegion(copy), `case ${c}`);
  }
  assert.ok(shortcuts > 60, `${shortcuts} outlines proven`);
});
