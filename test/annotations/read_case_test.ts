// Tests of readCaseFile() and loadCase(): case files, relative paths, and a
// GeoJSON combined with a figures CSV and a PNG tissue mask.

import { strict as assert } from "node:assert";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { encode } from "fast-png";
import { loadCase, parseCaseFile, readCaseFile } from "../../lib/annotations/read_case.ts";

const FIXTURES = new URL("../fixtures/annotations/", import.meta.url).pathname;

function rect(x0: number, y0: number, x1: number, y1: number): number[][] {
  return [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
}

function geojson(features: unknown[], slide: unknown = { id: "QVT-24-020", mpp: 0.25 }): string {
  return JSON.stringify({ type: "FeatureCollection", slide, features });
}

function feature(role: string, geometry: unknown, props: Record<string, unknown> = {}) {
  return { type: "Feature", properties: { role, ...props }, geometry };
}

function withDir(fn: (dir: string) => Promise<void>): () => Promise<void> {
  return async () => {
    const dir = mkdtempSync(join(tmpdir(), "hotfield-case-"));
    try {
      await fn(dir);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  };
}

async function sha256Hex(bytes: Uint8Array): Promise<string> {
  // WebCrypto, a second implementation beside node:crypto used by loadCase
  const d = new Uint8Array(await crypto.subtle.digest("SHA-256", new Uint8Array(bytes)));
  return Array.from(d, (b) => b.toString(16).padStart(2, "0")).join("");
}

/** A PNG mask, 1 byte per pixel grey (0 = background, 255 = tissue). */
function maskPng(width: number, height: number, on: (x: number, y: number) => boolean): Uint8Array {
  const data = new Uint8Array(width * height);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      data[y * width + x] = on(x, y) ? 255 : 0;
    }
  }
  return encode({ width, height, data, channels: 1, depth: 8 });
}

Deno.test(
  "loadCase() reads a GeoJSON case with sources and the file-stem id",
  withDir(async (dir) => {
    const path = join(dir, "QVT-24-021.geojson");
    const text = geojson([
      feature("tumour", { type: "Polygon", coordinates: [rect(0, 0, 10, 10)] }),
    ], { mpp: 0.5 });
    writeFileSync(path, text);
    const c = await loadCase({ annotationsPath: path });
    assert.equal(c.caseId, "QVT-24-021", "no slide id: the file stem");
    assert.equal(c.slide.mppX, 0.5);
    assert.equal(c.sources.length, 1);
    assert.deepEqual(c.sources[0], {
      kind: "annotations",
      path,
      sha256: await sha256Hex(new TextEncoder().encode(text)),
    });
    assert.deepEqual(c.warnings, [
      "The case has no figure points: a count of 0 is only as good as the annotations' completeness",
    ]);
  }),
);

Deno.test(
  "loadCase() takes the id from the override, the case file, the slide, then the stem",
  withDir(async (dir) => {
    const path = join(dir, "stem.geojson");
    writeFileSync(
      path,
      geojson([feature("tissue", { type: "Polygon", coordinates: [rect(0, 0, 9, 9)] })], {
        id: "QVT 24/022",
        mpp: 0.25,
      }),
    );
    const c = await loadCase({ annotationsPath: path });
    assert.equal(c.caseId, "QVT_24_022");
    assert.match(c.warnings.join("\n"), /Case id "QVT 24\/022" is written "QVT_24_022"/);
    const named = await loadCase({ annotationsPath: path, caseFileId: "from-case-file" });
    assert.equal(named.caseId, "from-case-file");
    assert.ok(
      named.warnings.includes(
        `Case id "from-case-file" (from the case file's id) replaces "QVT 24/022" (the slide id)`,
      ),
      named.warnings.join("\n"),
    );
    assert.equal(
      (await loadCase({ annotationsPath: path, idOverride: "QVT-24-099" })).caseId,
      "QVT-24-099",
    );
  }),
);

Deno.test(
  "readCaseFile() resolves paths against the case file's folder",
  withDir(async (dir) => {
    mkdirSync(join(dir, "cases", "data"), { recursive: true });
    const casePath = join(dir, "cases", "QVT-24-023.case.json");
    writeFileSync(
      casePath,
      JSON.stringify({
        hotfield_case: 1,
        id: "QVT-24-023",
        annotations: "data/a.geojson",
        figures: { path: "data/f.csv", units: "um" },
        tissue_mask: { path: "data/m.png", mpp: [8, 8] },
        slide: { width: 128 },
        notes: "invented case",
      }),
    );
    const input = await readCaseFile(casePath);
    assert.deepEqual(input, {
      caseFilePath: casePath,
      caseFileId: "QVT-24-023",
      annotationsPath: join(dir, "cases", "data", "a.geojson"),
      figuresPath: join(dir, "cases", "data", "f.csv"),
      figureUnits: "um",
      figureUnitsStated: true,
      tissueMaskPath: join(dir, "cases", "data", "m.png"),
      maskMpp: [8, 8],
      slide: { width: 128 },
    });
  }),
);

Deno.test("parseCaseFile() rejects unknown members, a missing version and a mask without mpp", () => {
  assert.throws(
    () =>
      parseCaseFile(
        '{"hotfield_case": 1, "annotations": "a.geojson", "tissue-mask": "m.png"}',
        "x.case.json",
      ),
    {
      name: "TypeError",
      message:
        /^Cannot read case file "x\.case\.json": unknown member "tissue-mask"; known members: hotfield_case, id, annotations, figures, tissue_mask, slide, slide_file, notes, scheme, min_score, count_labels, area_mm2, shape, stride_um, min_coverage$/,
    },
  );
  assert.throws(() => parseCaseFile('{"annotations": "a.geojson"}', "x.case.json"), {
    name: "TypeError",
    message: /not a hotfield case file: no "hotfield_case": 1 member/,
  });
  assert.throws(
    () => parseCaseFile('{"hotfield_case": 2, "annotations": "a.geojson"}', "x.case.json"),
    {
      name: "RangeError",
      message: /"hotfield_case" 2 is not a version this hotfield reads \(1\)/,
    },
  );
  assert.throws(
    () =>
      parseCaseFile(
        '{"hotfield_case": 1, "annotations": "a.geojson", "tissue_mask": {"path": "m.png"}}',
        "x.case.json",
      ),
    { name: "TypeError", message: /"tissue_mask\.mpp" is missing/ },
  );
  assert.throws(
    () => parseCaseFile('{"hotfield_case": 1, "annotations": "a.geojson",}', "x.case.json"),
    {
      name: "SyntaxError",
      message:
        /^Cannot read case file "x\.case\.json": not valid JSON: line 1, column 49: expected a property name/,
    },
  );
  assert.throws(() => parseCaseFile('{"hotfield_case": 1, "id": "x"}', "x.case.json"), {
    name: "TypeError",
    message: /names no "annotations" file, no "slide" and no "slide_file"/,
  });
});

Deno.test(
  "loadCase() combines a GeoJSON, a figures CSV and a PNG mask from a case file",
  withDir(async (dir) => {
    // Slide 0.25 µm/px, 128 × 96 px; mask 8 µm/px, so one mask pixel = 32 × 32 level-0 px
    // and the mask is 4 × 3 pixels (hand calculation: 128 · 0.25 / 8 = 4, 96 · 0.25 / 8 = 3).
    writeFileSync(
      join(dir, "a.geojson"),
      geojson([
        feature("tissue", { type: "Polygon", coordinates: [rect(0, 0, 16, 16)] }),
        feature("figure", { type: "Point", coordinates: [1, 1] }),
      ], { id: "QVT-24-024", mpp: 0.25, width: 128, height: 96 }),
    );
    writeFileSync(join(dir, "f.csv"), "x,y,label\n2.5,2.5,mitotic figure\n12.5,7.5,mimic\n");
    const png = maskPng(4, 3, (x, y) => x >= 1 && x <= 2 && y <= 1);
    writeFileSync(join(dir, "m.png"), png);
    writeFileSync(
      join(dir, "QVT-24-024.case.json"),
      JSON.stringify({
        hotfield_case: 1,
        annotations: "a.geojson",
        figures: { path: "f.csv", units: "um" },
        tissue_mask: { path: "m.png", mpp: 8 },
      }),
    );
    const c = await loadCase(await readCaseFile(join(dir, "QVT-24-024.case.json")));
    assert.equal(c.caseId, "QVT-24-024");
    assert.deepEqual(c.sources.map((s) => s.kind), [
      "case",
      "annotations",
      "figures",
      "tissue-mask",
    ]);
    assert.equal(c.sources[3].sha256, await sha256Hex(png));
    // CSV in µm: 2.5 µm / 0.25 = 10 px; 12.5 / 0.25 = 50, 7.5 / 0.25 = 30
    assert.deepEqual(Array.from(c.figures.xPx), [10, 50]);
    assert.deepEqual(Array.from(c.figures.yPx), [10, 30]);
    assert.deepEqual(Array.from(c.figures.origin), [2, 3]);
    // tissue: the GeoJSON square plus the mask part
    assert.equal(c.tissue.length, 2);
    assert.equal(c.tissue[1].source, join(dir, "m.png"));
    // mask pixels x 1..2, y 0..1 → level-0 x 32..96, y 0..64 (scale 8 / 0.25 = 32)
    const xs = c.tissue[1].polygons.flatMap((p) => p[0].map((q) => q[0]));
    const ys = c.tissue[1].polygons.flatMap((p) => p[0].map((q) => q[1]));
    assert.deepEqual([Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)], [
      32,
      96,
      0,
      64,
    ]);
    const w = c.warnings.join("\n");
    assert.match(
      w,
      /Figures are read from .*f\.csv \(2 points\); the 1 figure points in .*a\.geojson are ignored/,
    );
    assert.match(
      w,
      /Tissue is the union of .*m\.png and the 1 tissue polygon feature\(s\) of .*a\.geojson/,
    );
  }),
);

Deno.test(
  "loadCase() works from a case file with a slide and a mask and no GeoJSON",
  withDir(async (dir) => {
    writeFileSync(join(dir, "m.png"), maskPng(4, 4, () => true));
    writeFileSync(join(dir, "f.csv"), "x,y\n10,10\n");
    writeFileSync(
      join(dir, "QVT-24-025.case.json"),
      JSON.stringify({
        hotfield_case: 1,
        figures: "f.csv",
        tissue_mask: { path: "m.png", mpp: 4 },
        slide: { mpp: 0.5, width: 32, height: 32 },
      }),
    );
    const c = await loadCase(await readCaseFile(join(dir, "QVT-24-025.case.json")));
    assert.equal(c.caseId, "QVT-24-025");
    assert.equal(c.figures.xPx.length, 1);
    assert.equal(c.tissue.length, 1);
  }),
);

Deno.test(
  "loadCase() rejects a mask whose size disagrees with its mpp and the slide",
  withDir(async (dir) => {
    writeFileSync(
      join(dir, "a.geojson"),
      geojson([feature("tumour", { type: "Polygon", coordinates: [rect(0, 0, 9, 9)] })], {
        mpp: 0.25,
        width: 128,
        height: 96,
      }),
    );
    // expected 4 × 3 mask pixels at 8 µm/px; a 40 × 30 mask is 10× too large (probably 0.8 µm/px)
    writeFileSync(join(dir, "m.png"), maskPng(40, 30, () => true));
    await assert.rejects(
      loadCase({
        annotationsPath: join(dir, "a.geojson"),
        tissueMaskPath: join(dir, "m.png"),
        maskMpp: 8,
      }),
      (e: Error) => {
        assert.equal(e.name, "RangeError");
        assert.match(e.message, /^Cannot read tissue mask ".*m\.png": /);
        assert.match(e.message, /width/);
        return true;
      },
    );
  }),
);

Deno.test(
  "loadCase() names a missing file, a 0-byte file and a binary file",
  withDir(async (dir) => {
    await assert.rejects(loadCase({ annotationsPath: join(dir, "none.geojson") }), {
      message: `Cannot read annotations "${join(dir, "none.geojson")}": file not found`,
    });
    writeFileSync(join(dir, "empty.geojson"), "");
    await assert.rejects(loadCase({ annotationsPath: join(dir, "empty.geojson") }), {
      name: "SyntaxError",
      message: `Cannot read annotations "${
        join(dir, "empty.geojson")
      }": the file is empty (0 bytes)`,
    });
    writeFileSync(join(dir, "img.geojson"), maskPng(2, 2, () => true));
    await assert.rejects(loadCase({ annotationsPath: join(dir, "img.geojson") }), {
      name: "SyntaxError",
      message: /not UTF-8 text \(is it a binary file, such as an image\?\)|not valid JSON/,
    });
    writeFileSync(
      join(dir, "a.geojson"),
      geojson([feature("tumour", { type: "Polygon", coordinates: [rect(0, 0, 9, 9)] })]),
    );
    await assert.rejects(
      loadCase({ annotationsPath: join(dir, "a.geojson"), figuresPath: join(dir, "f.csv") }),
      {
        message: `Cannot read figures CSV "${join(dir, "f.csv")}": file not found`,
      },
    );
    await assert.rejects(
      loadCase({ annotationsPath: join(dir, "a.geojson"), tissueMaskPath: join(dir, "m.png") }),
      {
        name: "TypeError",
        message: /Cannot read tissue mask ".*m\.png": its micrometres per mask pixel are not given/,
      },
    );
  }),
);

Deno.test(
  "loadCase() requires tissue or tumour polygons",
  withDir(async (dir) => {
    const path = join(dir, "QVT-24-026.geojson");
    writeFileSync(path, geojson([feature("figure", { type: "Point", coordinates: [1, 1] })]));
    await assert.rejects(loadCase({ annotationsPath: path }), {
      name: "TypeError",
      message:
        `Cannot read annotations "${path}": no tissue or tumour polygons: at least one feature with role "tissue" or "tumour" (or a tissue mask) is needed to define where figures are counted`,
    });
  }),
);

Deno.test(
  "loadCase() warns about CSV figures beyond the slide",
  withDir(async (dir) => {
    writeFileSync(
      join(dir, "a.geojson"),
      geojson([feature("tumour", { type: "Polygon", coordinates: [rect(0, 0, 9, 9)] })], {
        mpp: 0.25,
        width: 100,
        height: 100,
      }),
    );
    writeFileSync(join(dir, "f.csv"), "x,y\n5,5\n500,5\n5,-2\n");
    const c = await loadCase({
      annotationsPath: join(dir, "a.geojson"),
      figuresPath: join(dir, "f.csv"),
    });
    const w = c.warnings.join("\n");
    assert.match(
      w,
      /1 figure point has negative coordinates, left of or above the slide \(lines 4\)/,
    );
    assert.match(w, /1 figure point lies beyond the slide's 100 × 100 px \(lines 3\)/);
  }),
);

Deno.test("loadCase() reads the fixture case file", async () => {
  const c = await loadCase(await readCaseFile(join(FIXTURES, "QVT-24-011.case.json")));
  assert.equal(c.caseId, "QVT-24-011");
  assert.equal(c.figures.xPx.length, 4);
  assert.equal(c.tissue.length, 2);
});

Deno.test(
  "loadCase() tells a bad UTF-8 byte from a genuine U+FFFD in a label",
  withDir(async (dir) => {
    // UTF-8 (RFC 3629 §3): 0xC3 must be followed by a continuation byte 0x80–0xBF.
    const text = geojson([
      feature("tumour", { type: "Polygon", coordinates: [rect(0, 0, 99, 99)] }),
      feature("figure", { type: "Point", coordinates: [5, 5] }, { label: "mitosis \uFFFD" }),
    ]);
    writeFileSync(join(dir, "ok.geojson"), text);
    const c = await loadCase({ annotationsPath: join(dir, "ok.geojson") });
    assert.deepEqual(c.figures.labels, ["mitosis \uFFFD"]);
    const bad = new TextEncoder().encode(text.replace("mitosis \uFFFD", "mitosis XX"));
    bad[bad.indexOf(0x58)] = 0xc3; // "X" becomes a lead byte followed by "X"
    writeFileSync(join(dir, "bad.geojson"), bad);
    await assert.rejects(loadCase({ annotationsPath: join(dir, "bad.geojson") }), {
      name: "SyntaxError",
      message: /bad\.geojson.*not UTF-8 text/,
    });
  }),
);
