import { strict as assert } from "node:assert";
import { mkdirSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { parseManifest, readManifest } from "../../lib/batch/read_manifest.ts";

const M = "cases.csv";

function problem(text: string): string {
  try {
    parseManifest(text, M);
  } catch (e) {
    return (e as Error).message;
  }
  throw new Error("no problem found");
}

Deno.test("parseManifest() reads RFC 4180 rows: quoted cells, CRLF, empty cells", () => {
  // RFC 4180 §2.1 CRLF line ends, §2.6 a field with a comma in double quotes (RFC4180).
  const rows = parseManifest(
    'annotations,id,mask_mpp,tissue_mask\r\n"a b.geojson",,"8,16",m.png\r\nc.geojson,QVT-24-003,,\r\n',
    M,
  );
  assert.deepEqual(rows, [
    { row: 2, cells: { annotations: "a b.geojson", mask_mpp: "8,16", tissue_mask: "m.png" } },
    { row: 3, cells: { annotations: "c.geojson", id: "QVT-24-003" } },
  ]);
});

Deno.test("parseManifest() names the unknown column and the closest known one", () => {
  assert.equal(
    problem("annotations,sheme\na.geojson,gist\n"),
    'Cannot read manifest "cases.csv": row 1, column 2: unknown column "sheme"; did you mean ' +
      '"scheme"? Known columns: annotations, case_file, id, figures, figures_units, tissue_mask, ' +
      "mask_mpp, mpp, scheme, min_score, slide",
  );
  assert.match(problem("Annotation\na.geojson\n"), /did you mean "annotations"\?/);
});

Deno.test("readManifest() passes a row's slide file to the case, relative to the manifest", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    writeFileSync(join(dir, "m.csv"), "annotations,slide\na.geojson,slides/a.tiff\n");
    const cases = await readManifest(join(dir, "m.csv"), {});
    assert.equal(cases[0].input?.slidePath, "slides/a.tiff");
    assert.equal(cases[0].input?.baseDir, dir);
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("parseManifest() wants exactly one of annotations and case_file per row", () => {
  assert.equal(
    problem("annotations,case_file\na.geojson,a.case.json\n"),
    'Cannot read manifest "cases.csv": row 2: both "annotations" and "case_file" are given; give one of them',
  );
  assert.equal(
    problem("annotations,case_file,id\n,,QVT-24-001\n"),
    'Cannot read manifest "cases.csv": row 2: neither "annotations" nor "case_file" is given; give one of them',
  );
  assert.equal(
    problem("id\nQVT-24-001\n"),
    'Cannot read manifest "cases.csv": row 1: the header needs a column "annotations" or "case_file": found "id"',
  );
});

Deno.test("parseManifest() refuses repeated case ids and ids that leave the output folder", () => {
  assert.equal(
    problem("annotations,id\na.geojson,QVT-24-001\nb.geojson,QVT-24-001\n"),
    'Cannot read manifest "cases.csv": row 3, column "id": case id "QVT-24-001" is also the id of row 2',
  );
  assert.equal(
    problem("annotations\na.geojson\na.geojson\n"),
    'Cannot read manifest "cases.csv": row 3: "a.geojson" is also the case of row 2, so both would ' +
      'get one case id; give each row an "id"',
  );
  for (const id of ["../x", "a/b", "..", "a\\b"]) {
    assert.equal(
      problem(`annotations,id\na.geojson,"${id}"\n`),
      `Cannot read manifest "cases.csv": row 2, column "id": case id "${id}" would lead outside ` +
        'the output folder; use letters, digits, "-", "_" and "."',
    );
  }
});

Deno.test("parseManifest() checks values and lists every problem at once", () => {
  const message = problem(
    "annotations,figures_units,min_score,scheme,mpp,tissue_mask,mask_mpp\n" +
      "a.geojson,mm,1.5,no-such,0,,\n" +
      "b.geojson,,,,,t.png,\n",
  );
  const lines = message.split("\n");
  assert.deepEqual(lines, [
    'Cannot read manifest "cases.csv": row 2, column "figures_units": must be px or um: found "mm"',
    'Cannot read manifest "cases.csv": row 2, column "mpp": needs a positive number N, or "N,M" ' +
    'for x and y (micrometres per level-0 pixel): found "0"',
    'Cannot read manifest "cases.csv": row 2, column "scheme": ' + lines[2].split('"scheme": ')[1],
    'Cannot read manifest "cases.csv": row 2, column "min_score": needs a number from 0 to 1: found "1.5"',
    'Cannot read manifest "cases.csv": row 3, column "mask_mpp": is needed with "tissue_mask" ' +
    "(micrometres per mask pixel)",
  ]);
  assert.match(lines[2], /Unknown scheme "no-such"; known: /);
});

Deno.test("parseManifest() reports CSV syntax with its row", () => {
  // RFC 4180 §2.5/§2.7: a quoted field must be closed (RFC4180).
  assert.match(
    problem('annotations\n"a.geojson\n'),
    /^Cannot read manifest "cases\.csv": (row \d+: )?not valid CSV \(RFC 4180\): /,
  );
  assert.equal(
    problem("annotations\na.geojson,extra\n"),
    'Cannot read manifest "cases.csv": row 2: 2 cells but the header has 1 columns',
  );
});

Deno.test("readManifest() resolves rows against the manifest's folder and fails only bad case files", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    mkdirSync(join(dir, "sub"));
    writeFileSync(
      join(dir, "sub", "ok.case.json"),
      '{"hotfield_case": 1, "annotations": "x.geojson"}',
    );
    writeFileSync(join(dir, "sub", "bad.case.json"), "{ nope");
    writeFileSync(
      join(dir, "m.csv"),
      "case_file,annotations,scheme,min_score,mpp\n" +
        "sub/ok.case.json,,gist,,\n" +
        "sub/bad.case.json,,,,\n" +
        "sub/missing.case.json,,,,\n" +
        ',sub/a.geojson,,0.5,"0.25,0.5"\n',
    );
    const cases = await readManifest(join(dir, "m.csv"), {
      scheme: "canine-mct-2tier",
      minScore: 0.1,
    });
    assert.equal(cases.length, 4);
    assert.equal(cases[0].input?.annotationsPath, "sub/x.geojson", "case file paths stay relative");
    assert.equal(cases[0].input?.baseDir, dir);
    assert.equal(cases[0].options.scheme, "gist", "the row's scheme wins");
    assert.equal(cases[0].options.minScore, 0.1);
    assert.equal(cases[1].input, null);
    assert.match(
      cases[1].problem!,
      /^Cannot read case file "sub\/bad\.case\.json": not valid JSON/,
    );
    assert.equal(cases[2].problem, 'Cannot read case file "sub/missing.case.json": file not found');
    assert.equal(cases[2].label, "row 4 (sub/missing.case.json)");
    assert.deepEqual(cases[3].input, {
      annotationsPath: "sub/a.geojson",
      baseDir: dir,
      mpp: [0.25, 0.5],
    });
    assert.equal(cases[3].options.minScore, 0.5);
    await assert.rejects(
      () => readManifest(join(dir, "none.csv"), {}),
      { message: `Cannot read manifest "${join(dir, "none.csv")}": file not found` },
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
