// Tests of parseAnnotations(). RFC 7946 rules are cited by section
// (Butler et al., "The GeoJSON Format", RFC 7946, IETF 2016; key RFC7946 in
// test/reference/README.md).

import { strict as assert } from "node:assert";
import { parseBoth } from "./_both_readers.ts";

// Every input here goes through both the ordinary reader and the byte
// scanner, which must agree (result, or error class and message).
const parseAnnotations = parseBoth;

const FILE = "QVT-24-001.geojson";
const SQUARE = [[[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]]];

type Feature = { type: string; properties?: unknown; geometry?: unknown };

function feature(role: unknown, geometry: unknown, props: Record<string, unknown> = {}): Feature {
  return { type: "Feature", properties: { role, ...props }, geometry };
}

function fc(features: unknown[], slide: unknown = { id: "QVT-24-001", mpp: 0.25 }): string {
  return JSON.stringify({ type: "FeatureCollection", slide, features });
}

const tissue = feature("tissue", { type: "Polygon", coordinates: SQUARE });

function parse(text: string) {
  return parseAnnotations(text, { fileName: FILE });
}

Deno.test("parseAnnotations() reads roles, slide, labels, scores and fields", () => {
  const a = parse(fc([
    tissue,
    feature("tumour", {
      type: "MultiPolygon",
      coordinates: [SQUARE, [[[200, 0], [300, 0], [300, 100], [200, 0]]]],
    }),
    feature("exclude", { type: "Polygon", coordinates: SQUARE }, { reason: "necrosis" }),
    feature("figure", { type: "Point", coordinates: [5, 6] }, { score: 0.75 }),
    feature("figure", { type: "Point", coordinates: [7, 8, 0] }, { label: "mimic" }),
    feature("field", { type: "Point", coordinates: [50, 50] }, { reader: "reader-a" }),
    feature("field", {
      type: "Polygon",
      coordinates: [[[0, 0], [0, 20], [40, 20], [40, 0], [0, 0]]],
    }, { reader: "trainee-2", label: "field 1" }),
  ], { id: "QVT-24-001", mpp: [0.25, 0.5], width: 1000, height: 800 }));
  assert.deepEqual(a.slide, {
    id: "QVT-24-001",
    mppX: 0.25,
    mppY: 0.5,
    widthPx: 1000,
    heightPx: 800,
  });
  assert.equal(a.tissue.length, 1);
  assert.equal(a.tumour[0].polygons.length, 2);
  assert.equal(a.exclude[0].reason, "necrosis");
  assert.equal(a.tissue[0].source, `${FILE} feature 0`);
  assert.deepEqual(Array.from(a.figures.xPx), [5, 7]);
  assert.deepEqual(a.figures.labels, ["mitotic figure", "mimic"]);
  assert.equal(a.figures.score[0], 0.75);
  assert.ok(Number.isNaN(a.figures.score[1]));
  assert.deepEqual(Array.from(a.figures.origin), [3, 4]);
  assert.equal(a.fields.length, 2);
  assert.deepEqual(a.fields[0], {
    reader: "reader-a",
    kind: "point",
    centerPx: [50, 50],
    featureIndex: 5,
  });
  // hand calculation: the 40 × 20 rectangle's centroid is (20, 10)
  assert.deepEqual(a.fields[1].centerPx, [20, 10]);
  assert.equal(a.fields[1].kind, "polygon");
  assert.deepEqual(a.fields[1].properties, { label: "field 1" });
  assert.deepEqual(a.warnings, []);
});

Deno.test("parseAnnotations() counts each position of a MultiPoint figure", () => {
  const a = parse(fc([
    tissue,
    feature("figure", { type: "MultiPoint", coordinates: [[1, 1], [2, 2], [3, 3]] }),
    feature("figure", { type: "Point", coordinates: [4, 4] }),
  ]));
  assert.equal(a.figures.xPx.length, 4);
  assert.deepEqual(Array.from(a.figures.origin), [1, 1, 1, 2]);
});

Deno.test("parseAnnotations() accepts either ring winding and a hole", () => {
  const cw = [[0, 0], [0, 100], [100, 100], [100, 0], [0, 0]];
  const hole = [[10, 10], [20, 10], [20, 20], [10, 20], [10, 10]];
  const a = parse(fc([feature("tissue", { type: "Polygon", coordinates: [cw, hole] })]));
  assert.equal(a.tissue[0].polygons[0].length, 2);
});

Deno.test("parseAnnotations() ignores a UTF-8 byte order mark", () => {
  const a = parse("\ufeff" + fc([tissue]));
  assert.equal(a.tissue.length, 1);
});

// ---- RFC 7946 rules, each with its section ----

Deno.test("parseAnnotations() rejects a ring that is not closed (RFC 7946 §3.1.6)", () => {
  // RFC 7946 §3.1.6: "The first and last positions are equivalent".
  const open = [[[0, 0], [100, 0], [100, 100], [0, 100], [0, 1]]];
  assert.throws(() => parse(fc([feature("tissue", { type: "Polygon", coordinates: open })])), {
    name: "TypeError",
    message:
      /^Cannot read annotations "QVT-24-001\.geojson": feature 0 ring 0 is not closed: first position \[0,0\] differs from last \[0,1\] \(RFC 7946 §3\.1\.6/,
  });
});

Deno.test("parseAnnotations() rejects a ring of fewer than 4 positions (RFC 7946 §3.1.6)", () => {
  // RFC 7946 §3.1.6: "A linear ring is a closed LineString with four or more positions".
  const tri = [[[0, 0], [100, 0], [0, 0]]];
  assert.throws(() => parse(fc([feature("tumour", { type: "Polygon", coordinates: tri })])), {
    name: "TypeError",
    message:
      /feature 0 ring 0 has 3 position\(s\); a polygon ring needs at least 4 \(RFC 7946 §3\.1\.6/,
  });
});

Deno.test("parseAnnotations() names the polygon and ring of a MultiPolygon problem (RFC 7946 §3.1.7)", () => {
  const bad = [SQUARE, [[[0, 0], [1, 0], [1, 1], [0, 0]], [[0, 0], [1, 1], [0, 0]]]];
  assert.throws(
    () => parse(fc([tissue, feature("exclude", { type: "MultiPolygon", coordinates: bad })])),
    {
      name: "TypeError",
      message: /feature 1 polygon 1 ring 1 has 3 position/,
    },
  );
});

Deno.test("parseAnnotations() requires a FeatureCollection (RFC 7946 §3.3)", () => {
  // RFC 7946 §3.3: a FeatureCollection has "type": "FeatureCollection" and a "features" array.
  assert.throws(() => parse(JSON.stringify(tissue)), {
    name: "TypeError",
    message: /not a GeoJSON FeatureCollection \(RFC 7946 §3\.3\): found "type" "Feature"; wrap/,
  });
  assert.throws(() => parse("[1, 2]"), {
    name: "TypeError",
    message: /not a GeoJSON FeatureCollection \(RFC 7946 §3\.3\): the file holds \[1,2\]/,
  });
  assert.throws(() => parse('{"type": "FeatureCollection", "slide": {"mpp": 0.25}}'), {
    name: "TypeError",
    message: /has no "features" array \(RFC 7946 §3\.3\)/,
  });
});

Deno.test("parseAnnotations() requires Feature members (RFC 7946 §3.2)", () => {
  assert.throws(() => parse(fc([tissue, { type: "Polygon", coordinates: SQUARE }])), {
    name: "TypeError",
    message: /feature 1 is not a GeoJSON Feature \(RFC 7946 §3\.2\): found "type" "Polygon"/,
  });
});

Deno.test("parseAnnotations() requires positions of two or more numbers (RFC 7946 §3.1.1)", () => {
  // RFC 7946 §3.1.1: "A position is an array of numbers. There MUST be two or more elements."
  assert.throws(() => parse(fc([tissue, feature("figure", { type: "Point", coordinates: [5] })])), {
    name: "TypeError",
    message:
      /feature 1: a position must be an array of at least two numbers \[x, y\] \(RFC 7946 §3\.1\.1\): found \[5\]/,
  });
  assert.throws(
    () =>
      parse(
        fc([tissue, feature("figure", { type: "MultiPoint", coordinates: [[1, 2], ["3", 4]] })]),
      ),
    {
      name: "TypeError",
      message:
        /feature 1 position 1: position \["3",4\] has a non-numeric coordinate "3" \(RFC 7946 §3\.1\.1/,
    },
  );
  const ringWithNull = [[[0, 0], [100, null], [100, 100], [0, 100], [0, 0]]];
  assert.throws(
    () => parse(fc([feature("tissue", { type: "Polygon", coordinates: ringWithNull })])),
    {
      name: "TypeError",
      message:
        /feature 0 ring 0 position 1: position \[100,null\] has a non-numeric coordinate null/,
    },
  );
});

Deno.test("parseAnnotations() rejects non-finite coordinates", () => {
  // 1e999 parses to Infinity in JSON.parse
  const text = fc([tissue]).replace("[]", "").replace(
    '"features":[',
    '"features":[{"type":"Feature","properties":{"role":"figure"},"geometry":{"type":"Point","coordinates":[1e999,5]}},',
  );
  assert.throws(() => parse(text), {
    name: "TypeError",
    message: /feature 0: position has a non-finite coordinate Infinity/,
  });
});

// ---- bad input: each message names the file, the place and the problem ----

Deno.test("parseAnnotations() gives line and column for text that is not JSON", () => {
  const text =
    '{\n  "type": "FeatureCollection",\n  "features": [\n    {"type": "Feature",}\n  ]\n}';
  assert.throws(() => parse(text), {
    name: "SyntaxError",
    message:
      /^Cannot read annotations "QVT-24-001\.geojson": not valid JSON: line 4, column 24: expected a property name in double quotes, found "}"$/,
  });
  assert.throws(() => parse('{"type": "FeatureCollection"'), {
    name: "SyntaxError",
    message:
      /not valid JSON: line 1, column 29: expected "," or "}" in an object, found the end of the file/,
  });
});

Deno.test("parseAnnotations() rejects an empty file and an empty FeatureCollection", () => {
  assert.throws(() => parse(""), {
    name: "SyntaxError",
    message: /^Cannot read annotations "QVT-24-001\.geojson": the file is empty \(0 bytes\)$/,
  });
  assert.throws(() => parse(fc([])), {
    name: "TypeError",
    message: /the FeatureCollection is empty: it has no features/,
  });
});

Deno.test("parseAnnotations() lists the known roles for an unknown or missing role", () => {
  assert.throws(
    () => parse(fc([tissue, feature("tumor", { type: "Polygon", coordinates: SQUARE })])),
    {
      name: "TypeError",
      message:
        /feature 1 has unknown role "tumor" \(did you mean "tumour"\?\); known roles: tissue, tumour, exclude, figure, field$/,
    },
  );
  assert.throws(
    () =>
      parse(
        fc([{ type: "Feature", properties: {}, geometry: { type: "Point", coordinates: [1, 2] } }]),
      ),
    {
      name: "TypeError",
      message:
        /feature 0 has no "role" in its properties; known roles: tissue, tumour, exclude, figure, field$/,
    },
  );
  assert.throws(() => parse(fc([{ type: "Feature", properties: null, geometry: null }])), {
    name: "TypeError",
    message: /feature 0 has no "role"/,
  });
});

Deno.test("parseAnnotations() rejects a geometry type wrong for the role", () => {
  assert.throws(() => parse(fc([feature("tumour", { type: "Point", coordinates: [1, 2] })])), {
    name: "TypeError",
    message:
      /^Cannot read annotations "QVT-24-001\.geojson": feature 0 has role "tumour" but geometry "Point"; role "tumour" takes Polygon or MultiPolygon$/,
  });
  assert.throws(
    () => parse(fc([tissue, feature("figure", { type: "Polygon", coordinates: SQUARE })])),
    {
      name: "TypeError",
      message:
        /feature 1 has role "figure" but geometry "Polygon"; role "figure" takes Point or MultiPoint/,
    },
  );
  assert.throws(
    () => parse(fc([tissue, feature("field", { type: "LineString", coordinates: SQUARE[0] })])),
    {
      name: "TypeError",
      message:
        /feature 1 has role "field" but geometry "LineString"; role "field" takes Point or Polygon or MultiPolygon or MultiPoint/,
    },
  );
  assert.throws(() => parse(fc([feature("tissue", null)])), {
    name: "TypeError",
    message: /feature 0 \(role "tissue"\) has no geometry/,
  });
});

Deno.test("parseAnnotations() rejects figure scores outside [0, 1] or not numeric", () => {
  const fig = (score: unknown) =>
    feature("figure", { type: "Point", coordinates: [1, 2] }, { score });
  assert.throws(() => parse(fc([tissue, fig(1.5)])), {
    name: "RangeError",
    message: /feature 1 \(role "figure"\) has score 1\.5 outside \[0, 1\] \(a percentage\?/,
  });
  assert.throws(() => parse(fc([tissue, fig(-0.1)])), {
    name: "RangeError",
    message: /feature 1 \(role "figure"\) has score -0\.1 outside \[0, 1\]$/,
  });
  assert.throws(() => parse(fc([tissue, fig("high")])), {
    name: "TypeError",
    message:
      /feature 1 \(role "figure"\) has a "score" that is not a number in \[0, 1\]: found "high"/,
  });
  // the ends of the interval are allowed; null means no score
  const a = parse(fc([tissue, fig(0), fig(1), fig(null)]));
  assert.deepEqual(Array.from(a.figures.score).slice(0, 2), [0, 1]);
  assert.ok(Number.isNaN(a.figures.score[2]));
});

Deno.test("parseAnnotations() rejects a missing, zero or negative mpp", () => {
  assert.throws(() => parse(fc([tissue], { id: "QVT-24-001" })), {
    name: "TypeError",
    message: /"slide\.mpp" is missing; give micrometres per level-0 pixel/,
  });
  assert.throws(() => parse(JSON.stringify({ type: "FeatureCollection", features: [tissue] })), {
    name: "TypeError",
    message: /no "slide" member; give the slide's micrometres per pixel/,
  });
  assert.throws(() => parse(fc([tissue], { mpp: 0 })), {
    name: "RangeError",
    message: /"slide\.mpp" must be a positive number of micrometres per pixel: found 0/,
  });
  assert.throws(() => parse(fc([tissue], { mpp: [0.25, -0.25] })), {
    name: "RangeError",
    message: /"slide\.mpp" must be a positive number of micrometres per pixel: found -0\.25/,
  });
  assert.throws(() => parse(fc([tissue], { mpp: "0.25" })), {
    name: "TypeError",
    message: /"slide\.mpp" must be a number or a pair \[x, y\] of numbers/,
  });
});

Deno.test("parseAnnotations() rejects an implausible mpp and says why", () => {
  assert.throws(() => parse(fc([tissue], { mpp: 8 })), {
    name: "RangeError",
    message:
      /"slide\.mpp" 8 µm\/px is implausible for level-0 slide pixels \(above 5 µm\/px\): likely the mpp of a downsampled image or a value in the wrong unit/,
  });
  assert.throws(() => parse(fc([tissue], { mpp: 0.00025 })), {
    name: "RangeError",
    message:
      /"slide\.mpp" 0\.00025 µm\/px is implausible \(below 0\.01 µm\/px\): likely a value in the wrong unit/,
  });
  // the bounds themselves are allowed
  assert.equal(parse(fc([tissue], { mpp: 5 })).slide.mppX, 5);
  assert.equal(parse(fc([tissue], { mpp: 0.01 })).slide.mppX, 0.01);
});

Deno.test("parseAnnotations() rejects a bad slide width", () => {
  assert.throws(() => parse(fc([tissue], { mpp: 0.25, width: -5 })), {
    name: "RangeError",
    message: /"slide\.width" must be a positive number of level-0 pixels: found -5/,
  });
});

Deno.test("parseAnnotations() warns about figures beyond the slide and at negative coordinates", () => {
  const a = parse(fc([
    tissue,
    feature("figure", { type: "Point", coordinates: [1200, 5] }),
    feature("figure", { type: "MultiPoint", coordinates: [[-3, 5], [5, -1]] }),
    feature("figure", { type: "Point", coordinates: [5, 900] }),
    feature("figure", { type: "Point", coordinates: [10, 10] }),
  ], { mpp: 0.25, width: 1000, height: 800 }));
  assert.equal(a.figures.xPx.length, 5);
  assert.deepEqual(a.warnings, [
    "QVT-24-001.geojson: 2 figure points have negative coordinates, left of or above the slide (features 2)",
    "QVT-24-001.geojson: 2 figure points lie beyond the slide's 1000 × 800 px (features 1, 3)",
  ]);
});

Deno.test("parseAnnotations() warns about figures marked twice at one position", () => {
  const a = parse(fc([
    tissue,
    feature("figure", { type: "Point", coordinates: [10, 10] }),
    feature("figure", { type: "Point", coordinates: [10, 10] }),
  ]));
  assert.equal(a.figures.xPx.length, 2);
  assert.match(
    a.warnings.join("\n"),
    /1 figure point repeats the exact position of an earlier one \(features 2\)/,
  );
});

Deno.test("parseAnnotations() lets given slide fields replace the file's, with a warning", () => {
  const a = parseAnnotations(fc([tissue], { id: "QVT-24-001", mpp: 0.5 }), {
    fileName: FILE,
    slide: { mpp: 0.25, width: 2000 },
  });
  assert.equal(a.slide.mppX, 0.25);
  assert.equal(a.slide.widthPx, 2000);
  assert.deepEqual(a.warnings, [
    "The case file sets slide mpp 0.25, replacing 0.5 from the annotation file",
  ]);
});

Deno.test("parseAnnotations() results do not depend on the ring's start vertex", () => {
  const ring = [[0, 0], [40, 0], [40, 20], [0, 20], [0, 0]];
  const rotated = [[40, 20], [0, 20], [0, 0], [40, 0], [40, 20]];
  const f = (r: number[][]) =>
    parse(fc([tissue, feature("field", { type: "Polygon", coordinates: [r] }, { reader: "a" })]))
      .fields[0].centerPx;
  assert.deepEqual(f(ring), f(rotated));
});

Deno.test("parseAnnotations() explains Polygon and MultiPolygon coordinates one level off", () => {
  assert.throws(() => parse(fc([feature("tissue", { type: "Polygon", coordinates: SQUARE[0] })])), {
    name: "TypeError",
    message:
      /feature 0: Polygon "coordinates" must be an array of rings.*one level of brackets missing\?/,
  });
  assert.throws(
    () => parse(fc([feature("tissue", { type: "MultiPolygon", coordinates: SQUARE })])),
    {
      name: "TypeError",
      message:
        /feature 0: MultiPolygon "coordinates" must be an array of polygons.*found the coordinates of a single Polygon/,
    },
  );
});

Deno.test("parseAnnotations() warns about a feature with an empty geometry", () => {
  const a = parse(fc([tissue, feature("exclude", { type: "MultiPolygon", coordinates: [] })]));
  assert.equal(a.exclude.length, 0);
  assert.deepEqual(a.warnings, [
    "QVT-24-001.geojson: 1 feature(s) have an empty geometry and were ignored (features 1)",
  ]);
});

Deno.test("parseAnnotations() warns about region features reaching beyond the slide", () => {
  const a = parse(fc([tissue], { mpp: 0.25, width: 50, height: 50 }));
  assert.deepEqual(a.warnings, [
    "QVT-24-001.geojson: 1 region feature(s) reach beyond the slide's 50 × 50 px (features 0)",
  ]);
});

Deno.test("parseAnnotations() rejects properties, labels and readers of the wrong type", () => {
  const pt = { type: "Point", coordinates: [1, 2] };
  assert.throws(
    () => parse(fc([tissue, { type: "Feature", properties: "figure", geometry: pt }])),
    {
      name: "TypeError",
      message: /feature 1 has "properties" that are not an object: found "figure"/,
    },
  );
  assert.throws(() => parse(fc([tissue, feature("figure", pt, { label: 3 })])), {
    name: "TypeError",
    message: /feature 1 \(role "figure"\) has a "label" that is not a string: found 3/,
  });
  assert.throws(() => parse(fc([tissue, feature("field", pt, { reader: ["a"] })])), {
    name: "TypeError",
    message: /feature 1 \(role "field"\) has a "reader" that is not a string: found \["a"\]/,
  });
});

Deno.test("parseAnnotations() says when a CSV was given as the annotation file", () => {
  assert.throws(() => parseAnnotations("x,y\n1,2\n", { fileName: "QVT-24-001.figures.csv" }), {
    name: "SyntaxError",
    message:
      /not valid JSON: line 1, column 1: expected a value, found "x" \(this looks like a CSV: figure points in a CSV go with --figures FILE\.csv/,
  });
});

Deno.test("parseAnnotations() points to a slide member nested in the collection's properties", () => {
  const text = JSON.stringify({
    type: "FeatureCollection",
    properties: { slide: { mpp: 0.25 } },
    features: [tissue],
  });
  assert.throws(() => parse(text), {
    name: "TypeError",
    message:
      /the "slide" member is inside the collection's "properties"; hotfield reads it at the top level/,
  });
});

Deno.test("parseAnnotations() reads several fields as one reading (MultiPolygon, MultiPoint with a diameter)", () => {
  const a = [[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]];
  const b = [[30, 0], [40, 0], [40, 30], [30, 30], [30, 0]];
  const parsed = parse(fc([
    tissue,
    feature("field", { type: "MultiPolygon", coordinates: [[a], [b]] }, {
      reader: "trainee-1",
      date: "2024-03-05",
      label: "two areas",
    }),
    feature("field", { type: "MultiPoint", coordinates: [[20, 20], [60, 20], [40, 80]] }, {
      reader: "trainee-1",
      field_diameter_mm: 0.55,
    }),
    feature("field", { type: "Point", coordinates: [5, 5] }, {
      reader: "reader-a",
      field_diameter_mm: 0.55,
      date: "2024-03-05T14:30:00Z",
    }),
  ]));
  const [poly, circles, one] = parsed.fields;
  assert.equal(poly.kind, "polygons");
  assert.equal(poly.parts!.length, 2);
  assert.equal(poly.date, "2024-03-05");
  assert.deepEqual(poly.properties, { label: "two areas" });
  // Area-weighted centroid (hand calculation): areas 100 and 300, centroids
  // (5, 5) and (35, 15) → ((500 + 10500) / 400, (500 + 4500) / 400) = (27.5, 12.5).
  assert.deepEqual(poly.centerPx, [27.5, 12.5]);
  assert.equal(circles.kind, "circles");
  assert.equal(circles.diameterMm, 0.55);
  assert.equal(circles.pointsPx!.length, 3);
  // Mean of the centres: (120 / 3, 120 / 3) = (40, 40).
  assert.deepEqual(circles.centerPx, [40, 40]);
  assert.equal(one.kind, "circles");
  assert.equal(one.pointsPx!.length, 1);
  assert.equal(one.date, "2024-03-05T14:30:00Z");
});

Deno.test("parseAnnotations() names the field feature without a reader, diameter or valid date", () => {
  const pt = { type: "Point", coordinates: [5, 5] };
  const mp = { type: "MultiPoint", coordinates: [[5, 5], [50, 50]] };
  const cases: [unknown, RegExp, string][] = [
    [feature("field", pt), /feature 1 \(role "field"\) has no "reader"/, "TypeError"],
    [
      feature("field", pt, { reader: "  " }),
      /feature 1 \(role "field"\) has an empty "reader"/,
      "TypeError",
    ],
    [
      feature("field", mp, { reader: "trainee-1" }),
      /feature 1 \(role "field", reader "trainee-1"\) is a MultiPoint without "field_diameter_mm"/,
      "TypeError",
    ],
    [
      feature("field", mp, { reader: "trainee-1", field_diameter_mm: 550 }),
      /"field_diameter_mm" 550; .* at most 2 mm \(micrometres\? give millimetres, e\.g\. 0\.55\)/,
      "RangeError",
    ],
    [
      feature("field", { type: "Polygon", coordinates: SQUARE }, {
        reader: "a",
        field_diameter_mm: 0.5,
      }),
      /is a Polygon with "field_diameter_mm"/,
      "TypeError",
    ],
    [
      feature("field", pt, { reader: "a", date: "2024-02-30" }),
      /feature 1 \(role "field", reader "a"\) has a "date" that is not an ISO 8601 date .*"2024-02-30"/,
      "TypeError",
    ],
    [
      feature("field", pt, { reader: "a", date: "05/03/2024" }),
      /not an ISO 8601 date/,
      "TypeError",
    ],
    [
      feature("field", { type: "MultiPoint", coordinates: [] }, {
        reader: "a",
        field_diameter_mm: 0.5,
      }),
      /is an empty MultiPoint/,
      "TypeError",
    ],
  ];
  for (const [f, message, name] of cases) {
    assert.throws(() => parse(fc([tissue, f])), { name, message });
  }
});
