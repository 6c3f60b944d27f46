// Tests of inspectCase() and formatInspectTable(). Areas are checked against
// an independent planar reference, JSTS 2.12.1 (npm "jsts"; key JSTS in
// test/reference/README.md), and against hand calculation for
// rectangles. Tolerance 0.5 %: the task's bound for areas; the shapes here
// are exact polygons, so the real differences are at rounding level.

import { strict as assert } from "node:assert";
import GeoJSONReader from "jsts/org/locationtech/jts/io/GeoJSONReader.js";
import "jsts/org/locationtech/jts/monkey.js";
import { formatInspectTable, inspectCase } from "../../lib/pipeline/inspect_case.ts";
import { parseAnnotations } from "../../lib/annotations/read_annotations.ts";
import { loadCase } from "../../lib/annotations/read_case.ts";
import type { CaseData } from "../../lib/types.ts";

const FIXTURES = new URL("../fixtures/annotations/", import.meta.url).pathname;

type Ring = number[][];
function rect(x0: number, y0: number, x1: number, y1: number): Ring {
  return [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
}
function poly(...rings: Ring[]) {
  return { type: "Polygon", coordinates: rings };
}
function feature(role: string, geometry: unknown, props: Record<string, unknown> = {}) {
  return { type: "Feature", properties: { role, ...props }, geometry };
}

function caseFrom(features: unknown[], mpp: number | [number, number]): CaseData {
  const a = parseAnnotations(
    JSON.stringify({ type: "FeatureCollection", slide: { id: "QVT-24-030", mpp }, features }),
    { fileName: "QVT-24-030.geojson" },
  );
  return { caseId: "QVT-24-030", ...a, sources: [] };
}

function close(actual: number, expected: number, rel = 0.005, what = "") {
  assert.ok(
    Math.abs(actual - expected) <= rel * Math.abs(expected),
    `${what}: ${actual} is not within ${rel * 100}% of ${expected}`,
  );
}

// Tissue 4 mm × 3 mm at 0.25 µm/px = 16000 × 12000 px, with a 1 × 1 mm hole
// (4000 × 4000 px); tumour overlapping the tissue's right part and beyond; two
// overlapping exclusions, one a triangle and one reaching outside the tissue.
const TISSUE = poly(rect(0, 0, 16000, 12000), rect(2000, 2000, 6000, 6000).reverse());
const TUMOUR_A = poly(rect(8000, 0, 18000, 12000));
const TUMOUR_B = poly([[5000, 6000], [9000, 6000], [9000, 11000], [5000, 6000]]);
const EXCL_A = poly([[10000, 1000], [14000, 1000], [12000, 5000], [10000, 1000]]);
const EXCL_B = poly(rect(13000, 3000, 17000, 4000));
const FEATURES = [
  feature("tissue", TISSUE),
  feature("tumour", TUMOUR_A),
  feature("tumour", TUMOUR_B),
  feature("exclude", EXCL_A, { reason: "necrosis" }),
  feature("exclude", EXCL_B, { reason: "fold" }),
];

function jstsAreasPx2() {
  const r = new GeoJSONReader();
  const g = (geom: unknown) => r.read(geom);
  const tissue = g(TISSUE);
  const tumour = g(TUMOUR_A).union(g(TUMOUR_B));
  const exclude = g(EXCL_A).union(g(EXCL_B));
  const valid = tissue.intersection(tumour).difference(exclude);
  return {
    tissue: tissue.getArea(),
    tumour: tumour.getArea(),
    excluded: exclude.getArea(),
    valid: valid.getArea(),
  };
}

for (const mpp of [0.25, [0.25, 0.5]] as (number | [number, number])[]) {
  Deno.test(`inspectCase() areas agree with JSTS within 0.5% (mpp ${JSON.stringify(mpp)})`, () => {
    const [mx, my] = typeof mpp === "number" ? [mpp, mpp] : mpp;
    const result = inspectCase(caseFrom(FEATURES, mpp));
    const ref = jstsAreasPx2();
    const toMm2 = (px2: number) => px2 * mx * my / 1e6;
    for (const k of ["tissue", "tumour", "excluded", "valid"] as const) {
      close(result.areas_mm2[k], toMm2(ref[k]), 0.005, k);
    }
    assert.deepEqual(result.mpp, [mx, my]);
  });
}

Deno.test("inspectCase() areas of the rectangle fixture match hand calculation", async () => {
  const c = await loadCase({ annotationsPath: `${FIXTURES}QVT-24-010.geojson` });
  const r = inspectCase(c);
  // hand calculation at 0.25 µm/px (1 px² = 0.0625 µm²):
  // tissue 16000 × 12000 px = 4 × 3 mm = 12 mm², minus hole 4000 × 4000 px = 1 mm² → 11 mm²
  // tumour 10000 × 12000 px = 2.5 × 3 mm = 7.5 mm²
  // exclude 2000 × 4000 px = 0.5 × 1 mm = 0.5 mm²
  // valid = tissue ∩ tumour (x 8000..16000: 2 × 3 mm = 6 mm², the hole lies left of it) − 0.5 = 5.5 mm²
  close(r.areas_mm2.tissue, 11, 1e-9, "tissue");
  close(r.areas_mm2.tumour, 7.5, 1e-9, "tumour");
  close(r.areas_mm2.excluded, 0.5, 1e-9, "excluded");
  close(r.areas_mm2.valid, 5.5, 1e-9, "valid");
  assert.equal(r.fields, 2);
  assert.equal(r.case, "QVT-24-010");
});

Deno.test("inspectCase() areas double when mpp y doubles", async () => {
  const c = await loadCase({ annotationsPath: `${FIXTURES}QVT-24-010.geojson` });
  const r = inspectCase({ ...c, slide: { ...c.slide, mppY: 0.5 } });
  // hand calculation: 0.25 × 0.5 µm per px is twice 0.25 × 0.25
  close(r.areas_mm2.tissue, 22, 1e-9, "tissue");
  close(r.areas_mm2.valid, 11, 1e-9, "valid");
});

Deno.test("inspectCase() tallies the fixture exactly at three minimum scores", async () => {
  const c = await loadCase({ annotationsPath: `${FIXTURES}QVT-24-010.geojson` });
  // Figures of QVT-24-010 (hand placement, V = x 8000..16000 × y 0..12000 minus x 12000..14000 × y 4000..8000):
  //  f3 (9000,1000) s0.9 in V; f4 MultiPoint (10000,2000),(11000,2000) no score, in V;
  //  f5 (13000,6000) s0.8 in the exclusion; f6 (4000,4000) in the tissue hole; f7 (3000,1000)
  //  tissue but no tumour; f8 (9500,9500) s0.3 in V; f9 "mimic"; f10 (8000,5000) s0.6 on V's edge (inside).
  const at = (minScore: number) => inspectCase(c, { minScore }).figures;
  assert.deepEqual(at(0), {
    total: 9,
    counted: 5, // f3, f4 ×2, f8, f10
    outside_valid: 3, // f5, f6, f7
    below_score: 0,
    by_label: { "mitotic figure": 8, mimic: 1 },
  });
  assert.deepEqual(at(0.5), {
    total: 9,
    counted: 4, // f8 (0.3) drops to below_score
    outside_valid: 3,
    below_score: 1,
    by_label: { "mitotic figure": 8, mimic: 1 },
  });
  assert.deepEqual(at(0.85), {
    total: 9,
    counted: 3, // f3 (0.9) and f4 ×2 (no score passes)
    outside_valid: 2, // f6, f7 (no score); f5 (0.8) is below score first
    below_score: 3, // f5, f8, f10
    by_label: { "mitotic figure": 8, mimic: 1 },
  });
  const both = inspectCase(c, { countLabels: ["mitotic figure", "mimic"] }).figures;
  assert.equal(both.counted, 6, "f9 (9000,3000) lies in V");
});

Deno.test("inspectCase() keeps the JSON keys of the contract", async () => {
  const c = await loadCase({ annotationsPath: `${FIXTURES}QVT-24-010.geojson` });
  const r = inspectCase(c);
  for (const k of ["case", "mpp", "areas_mm2", "figures", "fields", "warnings"]) {
    assert.ok(k in r, k);
  }
  assert.deepEqual(Object.keys(r.areas_mm2), ["tissue", "tumour", "excluded", "valid"]);
  assert.deepEqual(Object.keys(r.figures), [
    "total",
    "counted",
    "outside_valid",
    "below_score",
    "by_label",
  ]);
  assert.equal(r.inputs[0].kind, "annotations");
  assert.equal(r.inputs[0].sha256.length, 64);
});

Deno.test("inspectCase() names a near-miss label and says nothing was counted", () => {
  const c = caseFrom([
    feature("tumour", poly(rect(0, 0, 100, 100))),
    feature("figure", { type: "Point", coordinates: [5, 5] }, { label: "Mitotic Figure" }),
  ], 0.25);
  const r = inspectCase(c, { minScore: 0.5 });
  assert.equal(r.figures.counted, 0);
  assert.deepEqual(r.warnings, [
    'Figure label "Mitotic Figure" is close to the counted label "mitotic figure" but differs, so its 1 figure(s) are not counted (add --count-label "Mitotic Figure", or "count_labels" in a case file, to count them)',
    "The minimum score 0.5 has no effect: no figure has a score",
    'Nothing counted: none of the 1 figure points has a counted label ("mitotic figure"); labels found: "Mitotic Figure". Did you mean --count-label "Mitotic Figure"?',
  ]);
});

Deno.test("inspectCase() with tumour only uses the tumour as the valid region", () => {
  const c = caseFrom([
    feature("tumour", poly(rect(0, 0, 4000, 4000))),
    feature("exclude", poly(rect(0, 0, 2000, 2000))),
  ], 0.25);
  const r = inspectCase(c);
  // hand calculation: 1 mm² tumour − 0.25 mm² exclusion
  close(r.areas_mm2.valid, 0.75, 1e-9, "valid");
  assert.equal(r.areas_mm2.tissue, 0);
});

Deno.test("formatInspectTable() shows areas, tallies and warnings", async () => {
  const c = await loadCase({ annotationsPath: `${FIXTURES}QVT-24-010.geojson` });
  const text = formatInspectTable(inspectCase(c));
  assert.match(text, /^Case QVT-24-010\n/);
  assert.match(text, /valid region\s+5\.5000/);
  assert.match(text, /counted\s+5\n/);
  assert.match(text, /mimic\s+1/);
  assert.match(text, /Warnings: none/);
});
