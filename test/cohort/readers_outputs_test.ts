// The cohort outputs end to end: three invented cases read from GeoJSON
// (point fields, separate areas as one MultiPolygon field, circular
// microscope fields at MultiPoint positions, dated fields), reported with the
// canine two-tier scheme (Kiupel et al., Vet Pathol 2011: ≥ 7 in 10 HPF, V),
// written with writeOutputs. readers.csv is read back with npm csv-parse 7.0.3
// (an outside RFC 4180 reader) and checked against a computation from each
// case's report.json done here, following the definitions in README:
// upper half c ≥ median, upper quarter c ≥ q3 with c the count scaled to the
// window when report.json gives one; shortfall = hotspot count − c.

import { strict as assert } from "node:assert";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { parseAnnotations } from "../../lib/annotations/read_annotations.ts";
import { buildCaseResult } from "../../lib/pipeline/build_case_result.ts";
import { writeOutputs } from "../../lib/report/write_outputs.ts";
import { READER_COLUMNS } from "../../lib/report/readers_csv.ts";
import { seededRandom } from "../../lib/random.ts";
import type { ReportJson } from "../../lib/pipeline/report_types.ts";

const MPP = 0.5;
// A 6 × 4 mm tissue rectangle (12000 × 8000 px at 0.5 µm/px).
const TISSUE = [[[0, 0], [12000, 0], [12000, 8000], [0, 8000], [0, 0]]];

function square(cx: number, cy: number, halfPx: number) {
  return [[[cx - halfPx, cy - halfPx], [cx + halfPx, cy - halfPx], [cx + halfPx, cy + halfPx], [
    cx - halfPx,
    cy + halfPx,
  ], [cx - halfPx, cy - halfPx]]];
}

function caseText(id: string, seed: number, focus: [number, number, number], fields: unknown[]) {
  const rnd = seededRandom(seed);
  const pts: [number, number][] = [];
  for (let k = 0; k < 60; k++) pts.push([rnd() * 12000, rnd() * 8000]);
  const [fx, fy, n] = focus;
  for (let k = 0; k < n; k++) pts.push([fx + (rnd() - 0.5) * 2000, fy + (rnd() - 0.5) * 2000]);
  return JSON.stringify({
    type: "FeatureCollection",
    slide: { id, mpp: MPP },
    features: [
      {
        type: "Feature",
        properties: { role: "tissue" },
        geometry: { type: "Polygon", coordinates: TISSUE },
      },
      {
        type: "Feature",
        properties: { role: "figure" },
        geometry: {
          type: "MultiPoint",
          coordinates: pts.map(([x, y]) => [Math.round(x), Math.round(y)]),
        },
      },
      ...fields,
    ],
  });
}

const field = (properties: Record<string, unknown>, geometry: unknown) => ({
  type: "Feature",
  properties: { role: "field", ...properties },
  geometry,
});

const CASES = [
  caseText("QVT-24-201", 11, [3000, 3000, 14], [
    field({ reader: "reader-a" }, { type: "Point", coordinates: [3000, 3000] }),
    field({ reader: "trainee-1", date: "2024-01-10" }, {
      type: "Point",
      coordinates: [9500, 6000],
    }),
  ]),
  caseText("QVT-24-202", 12, [8000, 4000, 9], [
    field({ reader: "reader-a" }, { type: "Point", coordinates: [8000, 4000] }),
    // Two separate squares of 1 × 1 mm (2000 px) counted together.
    field({ reader: "trainee-1", date: "2024-02-12" }, {
      type: "MultiPolygon",
      coordinates: [square(7500, 4000, 1000), square(2000, 6500, 1000)],
    }),
  ]),
  caseText("QVT-24-203", 13, [6000, 4000, 11], [
    // Ten circular fields of 0.55 mm (FN 22 at 40×) along a row.
    field({ reader: "trainee-1", date: "2024-03-15", field_diameter_mm: 0.55 }, {
      type: "MultiPoint",
      coordinates: Array.from({ length: 10 }, (_, k) => [1500 + k * 1100, 2000]),
    }),
    field({ reader: "reader-b" }, { type: "Point", coordinates: [6000, 4000] }),
  ]),
];

Deno.test("writeOutputs() writes readers.csv whose values agree with each case's report.json", () => {
  const results = CASES.map((text, i) => {
    const parsed = parseAnnotations(text, { fileName: `case${i}.geojson` });
    return buildCaseResult(
      { caseId: parsed.slide.id, ...parsed, sources: [] },
      { scheme: "canine-mct-2tier", simulations: 0, bestN: 0, strideUm: 50 },
    );
  });
  const dir = mkdtempSync(join(tmpdir(), "hotfield-readers-"));
  try {
    writeOutputs(results, dir, { formats: ["csv", "json"] });
    const reports = results.map((r) =>
      JSON.parse(readFileSync(join(dir, r.report.case, "report.json"), "utf8")) as ReportJson
    );
    // Several fields as one reading: their own grade and the scaled count in report.json.
    const multi = reports[1].fields[1];
    assert.equal(multi.kind, "polygons");
    assert.equal(multi.parts, 2);
    assert.equal(multi.area_mm2, 2); // two 1 mm² squares
    assert.equal(multi.count_scaled_to_window, Math.round((multi.count * 2.37 / 2) * 1e4) / 1e4);
    assert.equal(multi.grade?.scheme, "canine-mct-2tier");
    const circles = reports[2].fields[0];
    assert.equal(circles.kind, "circles");
    assert.equal(circles.parts, 10);
    assert.equal(circles.field_diameter_mm, 0.55);
    // Ten fields of FN 22 at 40×: 10 · π · 0.275² = 2.375829 mm² (Renne 2023, V; arithmetic).
    assert.ok(Math.abs(circles.area_mm2! - 2.375829) < 1e-6);
    assert.equal(circles.date, "2024-03-15");
    assert.equal(circles.grade?.class, circles.count >= 7 ? "above" : "below");

    const rows = parse(readFileSync(join(dir, "readers.csv"), "utf8"), { columns: true }) as Record<
      string,
      string
    >[];
    assert.deepEqual(Object.keys(rows[0]), [...READER_COLUMNS]);
    assert.deepEqual(rows.map((r) => r.reader), ["reader-a", "reader-b", "trainee-1"]);
    for (const row of rows) {
      const mine = reports.flatMap((rep) =>
        rep.fields.filter((f) => f.reader === row.reader).map((f) => ({ rep, f }))
      );
      const c = (f: ReportJson["fields"][number]) => f.count_scaled_to_window ?? f.count;
      const n = mine.length;
      const half = mine.filter(({ rep, f }) => c(f) >= rep.distribution.median!).length;
      const quarter = mine.filter(({ rep, f }) => c(f) >= rep.distribution.q3!).length;
      const short = mine.map(({ rep, f }) => rep.hotspot!.count - c(f));
      // Rate per 2.37 mm² (areas within 0.5% of it count as equal), against ≥ 7.
      const meets = (count: number, area: number) =>
        (Math.abs(area / 2.37 - 1) <= 0.005 ? count : (count * 2.37) / area) >= 7;
      const pairs = mine.map(({ rep, f }) => [
        meets(f.count, f.area_mm2!),
        meets(rep.hotspot!.count, rep.window.area_mm2),
      ]);
      const agree = pairs.filter(([a, b]) => a === b).length;
      const r4 = (v: number) => Math.round(v * 1e4) / 1e4;
      assert.equal(Number(row.fields), n, row.reader);
      assert.equal(Number(row.cases), new Set(mine.map(({ rep }) => rep.case)).size);
      assert.equal(Number(row.upper_half_share), r4(half / n), `${row.reader} half`);
      assert.equal(Number(row.upper_quarter_share), r4(quarter / n), `${row.reader} quarter`);
      assert.equal(
        Number(row.mean_shortfall),
        r4(short.reduce((a, b) => a + b, 0) / n),
        `${row.reader} shortfall`,
      );
      assert.equal(Number(row.class_agreement), r4(agree / n), `${row.reader} agreement`);
      const ps = mine.map(({ f }) => f.percentile!).sort((a, b) => a - b);
      const med = n % 2 ? ps[(n - 1) / 2] : (ps[n / 2 - 1] + ps[n / 2]) / 2;
      assert.equal(Number(row.median_percentile), r4(med), `${row.reader} median percentile`);
    }
    const trainee = rows.find((r) => r.reader === "trainee-1")!;
    assert.equal(trainee.dated_fields, "3");
    assert.equal(trainee.first_date, "2024-01-10");
    assert.equal(trainee.last_date, "2024-03-15");
    // fields.csv carries each field's own grade beside the contract columns.
    const fields = parse(readFileSync(join(dir, "fields.csv"), "utf8"), {
      columns: true,
    }) as Record<
      string,
      string
    >[];
    assert.equal(fields.length, 6);
    assert.ok(fields.every((f) => f.scheme === "canine-mct-2tier" && /^(low|high)$/.test(f.tier)));
    assert.equal(fields[4].parts, "10"); // the third case's first field: ten circles
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
