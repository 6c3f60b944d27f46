// The reader repairs invalid outlines and says so: every warning names the
// file, the feature, the ring and a place, and gives the area as repaired and
// the shoelace sum it replaces. Areas by hand calculation (rectangles).

import { strict as assert } from "node:assert";
import { parseAnnotations } from "../../lib/annotations/read_annotations.ts";
import { multiPolygonAreaPx2 } from "../../lib/geometry/planar_area.ts";
import { main } from "../../lib/cli.ts";
import { join } from "node:path";
import { writeFileSync } from "node:fs";

const FILE = "QVT-24-066.geojson";
const sq = (x0: number, y0: number, x1: number, y1: number) => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
  [x0, y0],
];

function fc(features: unknown[]): string {
  return JSON.stringify({
    type: "FeatureCollection",
    slide: { id: "QVT-24-066", mpp: 0.5 },
    features,
  });
}

const feature = (role: string, geometry: unknown, props: Record<string, unknown> = {}) => ({
  type: "Feature",
  properties: { role, ...props },
  geometry,
});

Deno.test("parseAnnotations() repairs a hole outside its outer ring, with a warning naming it", () => {
  // 12000 × 12000 px at 0.5 µm/px = 36 mm²; the stray hole 2000 × 2000 px = 1 mm²
  const a = parseAnnotations(
    fc([
      feature("tissue", {
        type: "Polygon",
        coordinates: [sq(0, 0, 12000, 12000), sq(20000, 0, 22000, 2000)],
      }),
    ]),
    { fileName: FILE },
  );
  assert.equal(multiPolygonAreaPx2(a.tissue[0].polygons), 144e6);
  assert.deepEqual(a.warnings, [
    `${FILE} feature 0: the outline is not valid and was repaired as the area it describes (36 mm²; its rings' shoelace sum would give 35 mm²): ring 1 (a hole) lies outside its outer ring near (20000, 0) px, so it removes nothing and was dropped`,
  ]);
});

Deno.test("parseAnnotations() names polygons of a MultiPolygon, and fields, in outline warnings", () => {
  const a = parseAnnotations(
    fc([
      feature("tumour", {
        type: "MultiPolygon",
        coordinates: [[sq(0, 0, 1000, 1000)], [sq(200, 200, 400, 400)]],
      }),
      feature("exclude", {
        type: "Polygon",
        coordinates: [sq(0, 0, 1000, 1000), sq(100, 100, 500, 500), sq(300, 300, 700, 700)],
      }),
      feature("field", {
        type: "Polygon",
        coordinates: [sq(0, 0, 1000, 1000), sq(900, 400, 1100, 600)],
      }, { reader: "reader-a" }),
    ]),
    { fileName: FILE },
  );
  assert.match(
    a.warnings[0],
    /^QVT-24-066\.geojson feature 0: .*\(0\.25 mm²; its rings' shoelace sum would give 0\.26 mm²\): polygon 1 lies inside polygon 0 near \(200, 200\) px; they were united/,
  );
  assert.match(
    a.warnings[1],
    /feature 1: .*ring 2 \(a hole\) overlaps ring 1 \(a hole\) near \(\d+, \d+\) px; the area they cover is taken out once/,
  );
  assert.match(
    a.warnings[2],
    /feature 2 \(role "field", reader "reader-a"\): .*ring 1 \(a hole\) crosses its outer ring near \(1000, \d+\) px/,
  );
  assert.equal(multiPolygonAreaPx2(a.tumour[0].polygons), 1e6);
  // holes of 400² and 400² overlapping by 200²: 1e6 − (160000 + 160000 − 40000)
  assert.equal(multiPolygonAreaPx2(a.exclude[0].polygons), 1e6 - 280000);
  const field = a.fields[0];
  assert.equal(field.kind, "polygon");
  assert.equal(
    multiPolygonAreaPx2([field.polygon ?? []]),
    1e6 - 100 * 200,
  );
});

Deno.test("hotfield inspect gives the tissue area without the stray hole", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const file = join(dir, FILE);
    writeFileSync(
      file,
      fc([
        feature("tissue", {
          type: "Polygon",
          coordinates: [sq(0, 0, 12000, 12000), sq(20000, 0, 22000, 2000)],
        }),
      ]),
    );
    const out: string[] = [];
    const code = await main(["inspect", file, "--json"], {
      stdout: (s) => out.push(s),
      stderr: () => {},
    });
    assert.equal(code, 0);
    const j = JSON.parse(out.join(""));
    assert.equal(j.areas_mm2.tissue, 36);
    assert.ok(
      j.warnings.some((w: string) => w.includes("ring 1 (a hole) lies outside its outer ring")),
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});
