/**
 * The benchmark slide has the sizes `deno task bench` promises, and its
 * outlines are valid planar polygons (JSTS 2.12.1 as the outside reference).
 */

import { strict as assert } from "node:assert";
import GeoJSONReader from "jsts/org/locationtech/jts/io/GeoJSONReader.js";
import IsValidOp from "jsts/org/locationtech/jts/operation/valid/IsValidOp.js";
import "jsts/org/locationtech/jts/monkey.js";
import { benchSlideGeoJson, generateBenchSlide } from "../../lib/demo/bench_slide.ts";

const reader = new GeoJSONReader();

Deno.test("generateBenchSlide() gives 250,000 candidates, ~20,000 vertices and 40 holes", () => {
  const s = generateBenchSlide(2024);
  // hand calculation: 30 mm / 0.25 µm = 120,000 px; 20 mm / 0.25 µm = 80,000 px
  assert.deepEqual([s.slide.width, s.slide.height, s.slide.mpp], [120_000, 80_000, 0.25]);
  assert.equal(s.figures.xPx.length, 250_000);
  assert.equal(s.tissue[0].length - 1, 20_000);
  assert.equal(s.tissue.length - 1, 40);
  assert.equal(s.exclude.length, 4);
  const labels = new Set(s.figures.labelIndex);
  assert.equal(labels.size, s.figures.labels.length);
  for (let k = 0; k < s.figures.xPx.length; k += 97) {
    assert.ok(s.figures.score[k] >= 0 && s.figures.score[k] <= 1);
  }
  const tissue = reader.read({ type: "Polygon", coordinates: s.tissue });
  assert.ok(new IsValidOp(tissue).isValid(), "tissue polygon with holes is valid (JSTS)");
  const shell = reader.read({ type: "Polygon", coordinates: [s.tissue[0]] });
  assert.ok(shell.contains(reader.read({ type: "Polygon", coordinates: s.tumour })));
});

Deno.test("generateBenchSlide() is deterministic in its seed", () => {
  const small = { figures: 2000, tissueVertices: 400, holes: 4 };
  const a = benchSlideGeoJson(generateBenchSlide(9, small));
  assert.equal(a, benchSlideGeoJson(generateBenchSlide(9, small)));
  assert.notEqual(a, benchSlideGeoJson(generateBenchSlide(10, small)));
  const fc = JSON.parse(a);
  assert.equal(
    fc.features.filter((f: { properties: { role: string } }) => f.properties.role === "figure")
      .length,
    2000,
  );
});
