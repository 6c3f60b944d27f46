/**
 * The committed demo cohort in data/demo/ is exactly what its generator
 * writes, and every case in it reads cleanly.
 */

import { strict as assert } from "node:assert";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { decode } from "fast-png";
import { parse } from "csv-parse/sync";
import { DEMO_SEED, generateDemoCohort } from "../../lib/demo/demo_cohort.ts";
import { writeDemoData } from "../../lib/demo/write_demo_data.ts";
import { loadCase, readCaseFile } from "../../lib/mod.ts";
import { demoCaseInputs, runDemo } from "../../lib/demo/run_demo.ts";

const DEMO_DIR = join(import.meta.dirname!, "..", "..", "data", "demo");

Deno.test("writeDemoData() regenerates data/demo/ byte for byte from the seed", () => {
  const dir = Deno.makeTempDirSync();
  try {
    writeDemoData(dir, DEMO_SEED);
    const fresh = readdirSync(dir).sort();
    // data/demo/compare/ is written by lib/demo/detector_demo.ts (test/demo/detector_demo_test.ts).
    const committed = readdirSync(DEMO_DIR).filter((n) => n !== "compare").sort();
    assert.deepEqual(fresh, committed);
    for (const name of fresh) {
      const a = readFileSync(join(dir, name)), b = readFileSync(join(DEMO_DIR, name));
      assert.ok(a.equals(b), `${name} differs from the committed file; run deno task demo:data`);
    }
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("generateDemoCohort() gives equal cases for equal seeds and other cases for others", () => {
  const a = JSON.stringify(generateDemoCohort(5)), b = JSON.stringify(generateDemoCohort(5));
  assert.equal(a, b);
  assert.notEqual(a, JSON.stringify(generateDemoCohort(6)));
});

Deno.test("data/demo/ stays small (under 3 MB)", () => {
  let bytes = 0;
  for (const name of readdirSync(DEMO_DIR)) bytes += Deno.statSync(join(DEMO_DIR, name)).size;
  assert.ok(bytes < 3e6, `data/demo/ is ${bytes} bytes`);
});

Deno.test("generateDemoCohort() covers the cases the README promises", () => {
  const cohort = generateDemoCohort();
  assert.deepEqual(
    cohort.map((c) => c.caseId),
    [
      "QVT-24-001",
      "QVT-24-002",
      "QVT-24-003",
      "QVT-24-004",
      "QVT-24-005",
      "QVT-24-006",
      "QVT-24-007",
      "QVT-24-008",
    ],
  );
  const unequal = cohort.filter((c) => Array.isArray(c.annotations.slide.mpp));
  assert.equal(unequal.length, 1);
  assert.deepEqual(unequal[0].annotations.slide.mpp, [0.2485, 0.2512]);
  for (const c of cohort) {
    const { mpp, width } = c.annotations.slide;
    const mppX = typeof mpp === "number" ? mpp : mpp[0];
    const widthMm = width * mppX / 1000;
    assert.ok(widthMm >= 15 && widthMm <= 30, `${c.caseId} slide is ${widthMm} mm wide`);
    const roles = new Set(c.annotations.features.map((f) => f.properties.role));
    for (const role of ["tumour", "exclude", "field"]) {
      assert.ok(roles.has(role), `${c.caseId} ${role}`);
    }
    assert.ok(roles.has("tissue") || c.tissueMask, `${c.caseId} tissue`);
    assert.ok(roles.has("figure") || c.figuresCsv, `${c.caseId} figures`);
  }
  const geoms = new Set(
    cohort.flatMap((c) =>
      c.annotations.features.map((f) => `${f.properties.role}:${f.geometry.type}`)
    ),
  );
  for (
    const g of [
      "tissue:Polygon",
      "tissue:MultiPolygon",
      "figure:Point",
      "figure:MultiPoint",
      "field:Point",
      "field:Polygon",
    ]
  ) assert.ok(geoms.has(g), g);
});

Deno.test("the demo mask is 8-bit greyscale at 16 µm per mask pixel covering the slide", () => {
  const png = decode(readFileSync(join(DEMO_DIR, "QVT-24-007.tissue.png")));
  assert.equal(png.channels, 1);
  assert.equal(png.depth, 8);
  // hand calculation: 28 mm slide / 16 µm = 1750 mask px; 18 mm / 16 µm = 1125
  assert.equal(png.width, 1750);
  assert.equal(png.height, 1125);
  assert.ok(png.data.some((v) => v !== 0) && png.data.some((v) => v === 0));
});

Deno.test("the demo figures CSV has the header x,y,label,score and parses as RFC 4180", () => {
  const text = readFileSync(join(DEMO_DIR, "QVT-24-008.figures.csv"), "utf8");
  assert.ok(text.startsWith("x,y,label,score\r\n"));
  // csv-parse (npm, version pinned in deno.json) as an outside RFC 4180 reader.
  const rows = parse(text, { columns: true }) as Record<string, string>[];
  assert.ok(rows.length > 100);
  for (const r of rows) {
    const s = Number(r.score);
    assert.ok(Number.isFinite(Number(r.x)) && Number.isFinite(Number(r.y)) && s >= 0 && s <= 1);
  }
});

Deno.test("loadCase() reads every demo case without warnings", async () => {
  const inputs = await demoCaseInputs(DEMO_DIR);
  assert.equal(inputs.length, 8);
  for (const input of inputs) {
    const c = await loadCase(input);
    assert.match(c.caseId, /^QVT-24-00[1-8]$/);
    assert.deepEqual(c.warnings, [], c.caseId);
    assert.ok(c.figures.xPx.length > 0, c.caseId);
    assert.ok(c.tissue.length > 0 && c.tumour.length > 0, c.caseId);
  }
  // The case files tie the mask and the CSV in.
  const mask = await readCaseFile(join(DEMO_DIR, "QVT-24-007.case.json"));
  assert.equal(mask.maskMpp, 16);
  const csv = await readCaseFile(join(DEMO_DIR, "QVT-24-008.case.json"));
  assert.ok(csv.figuresPath?.endsWith("QVT-24-008.figures.csv"));
});

Deno.test("runDemo() writes a report per demo case and names what to open", async () => {
  const outDir = Deno.makeTempDirSync();
  const savedEpoch = Deno.env.get("SOURCE_DATE_EPOCH");
  // A fixed generation time (reproducible-builds.org convention), read by the report writer.
  Deno.env.set("SOURCE_DATE_EPOCH", "1700000000");
  try {
    const lines: string[] = [];
    const { results, open } = await runDemo({
      dataDir: DEMO_DIR,
      outDir,
      simulations: 0,
      print: (l) => lines.push(l),
    });
    assert.equal(results.length, 8);
    assert.equal(lines.length, 8);
    // QVT-24-005 is built so that valid tissue is smaller than 2.37 mm².
    const small = results.find((r) => r.report.case === "QVT-24-005")!;
    assert.ok(small.report.valid_area_mm2 < 2.37);
    assert.equal(small.report.hotspot, null);
    assert.match(lines[4], /no admissible/);
    for (const r of results) {
      assert.ok(Deno.statSync(join(outDir, r.report.case, "report.json")).isFile);
    }
    assert.ok(open === join(outDir, "index.html") || open === outDir);
    if (open.endsWith("index.html")) {
      // hand calculation: 1700000000 s after 1970-01-01 is 2023-11-14T22:13:20Z
      assert.ok(
        readFileSync(open, "utf8").includes("2023-11-14"),
        "index.html shows the fixed date",
      );
    }
  } finally {
    if (savedEpoch === undefined) Deno.env.delete("SOURCE_DATE_EPOCH");
    else Deno.env.set("SOURCE_DATE_EPOCH", savedEpoch);
    Deno.removeSync(outDir, { recursive: true });
  }
});
