// Tests of `hotfield inspect` through the real command line (a subprocess),
// and of its option handling in-process.

import { strict as assert } from "node:assert";
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { main } from "../../lib/cli.ts";

const ROOT = new URL("../../", import.meta.url).pathname;
const FIXTURES = join(ROOT, "test/fixtures/annotations");

async function cli(args: string[], cwd = ROOT) {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "-A", join(ROOT, "lib/cli.ts"), "inspect", ...args],
    cwd,
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1" },
  }).output();
  const dec = new TextDecoder();
  return { code: out.code, stdout: dec.decode(out.stdout), stderr: dec.decode(out.stderr) };
}

async function inProcess(args: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const code = await main(["inspect", ...args], {
    stdout: (s) => out.push(s),
    stderr: (s) => err.push(s),
  });
  return { code, stdout: out.join(""), stderr: err.join("") };
}

function assertCleanFailure(r: { code: number; stdout: string; stderr: string }, file: string) {
  assert.equal(r.code, 1, r.stderr);
  assert.equal(r.stdout, "", "nothing on stdout");
  assert.ok(r.stderr.includes(file), `stderr names ${file}: ${r.stderr}`);
  assert.ok(!/^\s+at /m.test(r.stderr), `no stack trace: ${r.stderr}`);
  assert.equal(r.stderr.trim().split("\n").length, 1, "one line");
  assert.match(r.stderr, /^hotfield inspect: Cannot read /);
}

Deno.test("hotfield inspect --json prints the inspect JSON with 2-space indent", async () => {
  const r = await cli([join(FIXTURES, "QVT-24-010.geojson"), "--json", "--min-score", "0.5"]);
  assert.equal(r.code, 0, r.stderr);
  assert.equal(r.stderr, "");
  assert.ok(r.stdout.endsWith("}\n"));
  assert.ok(r.stdout.startsWith('{\n  "case": "QVT-24-010"'));
  const j = JSON.parse(r.stdout);
  // hand counts of the fixture: see test/annotations/inspect_case_test.ts
  assert.deepEqual(j.figures, {
    total: 9,
    counted: 4,
    outside_valid: 3,
    below_score: 1,
    by_label: { "mitotic figure": 8, mimic: 1 },
  });
  assert.equal(j.areas_mm2.valid, 5.5);
  assert.equal(j.fields, 2);
});

Deno.test("hotfield inspect reads a case file and prints a table", async () => {
  const r = await cli([join(FIXTURES, "QVT-24-011.case.json")]);
  assert.equal(r.code, 0, r.stderr);
  assert.match(r.stdout, /^Case QVT-24-011\n/);
  assert.match(r.stdout, /tissue-mask/);
});

Deno.test("hotfield inspect fails cleanly on bad annotation files", async () => {
  const dir = mkdtempSync(join(tmpdir(), "hotfield-inspect-"));
  try {
    const cases: [string, string, RegExp][] = [
      [
        "not-json.geojson",
        '{"type": "FeatureCollection", "features": [}',
        /not valid JSON: line 1, column 44/,
      ],
      ["empty.geojson", "", /the file is empty \(0 bytes\)/],
      [
        "role.geojson",
        JSON.stringify({
          type: "FeatureCollection",
          slide: { mpp: 0.25 },
          features: [{
            type: "Feature",
            properties: { role: "stroma" },
            geometry: { type: "Point", coordinates: [0, 0] },
          }],
        }),
        /feature 0 has unknown role "stroma"; known roles: tissue, tumour, exclude, figure, field/,
      ],
      [
        "mpp.geojson",
        JSON.stringify({
          type: "FeatureCollection",
          slide: { mpp: 16 },
          features: [{ type: "Feature", properties: { role: "tissue" }, geometry: null }],
        }),
        /implausible .* downsampled image/,
      ],
    ];
    for (const [name, text, message] of cases) {
      writeFileSync(join(dir, name), text);
      const r = await cli([join(dir, name)], dir);
      assertCleanFailure(r, name);
      assert.match(r.stderr, message);
    }
    const bad = "x;y\n1;zwei\n";
    writeFileSync(join(dir, "f.csv"), bad);
    const r = await cli(
      [join(FIXTURES, "QVT-24-010.geojson"), "--figures", join(dir, "f.csv")],
      dir,
    );
    assertCleanFailure(r, "f.csv");
    assert.match(r.stderr, /line 2: y "zwei" is not a number/);
    const missing = await cli([join(dir, "absent.geojson")], dir);
    assertCleanFailure(missing, "absent.geojson");
    assert.match(missing.stderr, /file not found/);
    assert.deepEqual(readdirSync(dir).sort(), [
      "empty.geojson",
      "f.csv",
      "mpp.geojson",
      "not-json.geojson",
      "role.geojson",
    ], "nothing written");
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("hotfield inspect reports option problems with exit code 2", async () => {
  const file = join(FIXTURES, "QVT-24-010.geojson");
  for (
    const [args, message] of [
      [[file, "--min-score", "1.5"], /--min-score must lie in \[0, 1\]: got 1\.5/],
      [[file, "--min-score", "high"], /--min-score needs a number/],
      [[file, "--figures", "f.csv", "--units", "mm"], /--units must be px or um: got "mm"/],
      [[file, "--units", "um"], /--units applies to a figures CSV/],
      [[file, "--tissue-mask", "m.png"], /--tissue-mask needs --mask-mpp/],
      [[file, "--tissue-mask", "m.png", "--mask-mpp=-8"], /--mask-mpp must be positive/],
      [
        [file, "--tissue-mask", "m.png", "--mask-mpp", "8,x"],
        /--mask-mpp needs a number N or a pair N,M/,
      ],
      [[], /Give one FILE/],
      [[file, "--colour"], /colour/],
    ] as [string[], RegExp][]
  ) {
    const r = await inProcess(args);
    assert.equal(r.code, 2, `${args.join(" ")}: ${r.stderr}`);
    assert.match(r.stderr, message);
    assert.equal(r.stdout, "");
  }
});

Deno.test("hotfield inspect --help lists the case options", async () => {
  const r = await inProcess(["--help"]);
  assert.equal(r.code, 0);
  for (
    const o of [
      "--json",
      "--figures",
      "--units",
      "--tissue-mask",
      "--mask-mpp",
      "--min-score",
      "--count-label",
      "--id",
    ]
  ) {
    assert.ok(r.stdout.includes(o), o);
  }
});

Deno.test("hotfield inspect counts repeated --count-label options", async () => {
  const r = await inProcess([
    join(FIXTURES, "QVT-24-010.geojson"),
    "--json",
    "--count-label",
    "mitotic figure",
    "--count-label",
    "mimic",
  ]);
  assert.equal(r.code, 0, r.stderr);
  assert.equal(JSON.parse(r.stdout).figures.counted, 6);
});

Deno.test("hotfield inspect fails cleanly on a mask whose size disagrees with its mpp", async () => {
  // QVT-24-011: slide 2048 × 1024 px at 0.5 µm/px = 1024 × 512 µm; its 64 × 32 mask fits 16 µm/px,
  // so 8 µm/px (512 × 256 µm) disagrees.
  const r = await cli([
    join(FIXTURES, "QVT-24-011.geojson"),
    "--tissue-mask",
    join(FIXTURES, "QVT-24-011.tissue.png"),
    "--mask-mpp",
    "8",
  ]);
  assertCleanFailure(r, "QVT-24-011.tissue.png");
  assert.match(r.stderr, /mask mpp of about 16 µm\/px would fit/);
});
