// Positions of absurd magnitude, or regions far outside the slide, are refused
// as bad input naming the file and the feature (or line) before any count grid
// is sized. The bound, 100 mm from the slide origin, is common practice (CP):
// a glass slide is 75 × 25 mm (also large-format 75 × 50 mm).

import { strict as assert } from "node:assert";
import { join } from "node:path";
import { writeFileSync } from "node:fs";
import { parseAnnotations } from "../../lib/annotations/read_annotations.ts";
import { parseFiguresCsv } from "../../lib/annotations/read_figures_csv.ts";
import { main } from "../../lib/cli.ts";

const FILE = "QVT-24-067.geojson";
const SQUARE = [[0, 0], [1000, 0], [1000, 1000], [0, 1000], [0, 0]];
const feature = (role: string, geometry: unknown, props: Record<string, unknown> = {}) => ({
  type: "Feature",
  properties: { role, ...props },
  geometry,
});
const tissue = feature("tissue", { type: "Polygon", coordinates: [SQUARE] });
const fc = (
  features: unknown[],
  slide: Record<string, unknown> = { id: "QVT-24-067", mpp: 0.25 },
) => JSON.stringify({ type: "FeatureCollection", slide, features });

function refusal(text: string): Error {
  try {
    parseAnnotations(text, { fileName: FILE });
  } catch (e) {
    return e as Error;
  }
  throw new Error("expected a refusal");
}

Deno.test("parseAnnotations() refuses positions of absurd magnitude, naming the feature", () => {
  const cases: [unknown, RegExp][] = [
    [
      feature("tissue", {
        type: "Polygon",
        coordinates: [[[0, 0], [1e15, 0], [1e15, 1e15], [0, 0]]],
      }),
      /feature 1 has position \(1000000000000000, 0\) px, 2\.50e\+11 mm from the slide origin/,
    ],
    [
      feature("figure", { type: "Point", coordinates: [5, -1e15] }),
      /feature 1 \(a figure\) has position \(5, -1000000000000000\) px/,
    ],
    [
      feature("figure", { type: "MultiPoint", coordinates: [[5, 5], [400_001, 5]] }),
      /feature 1 \(a figure\) has position \(400001, 5\) px, 100 mm from the slide origin at 0\.25 × 0\.25 µm\/px; no slide reaches beyond 100 mm/,
    ],
    [
      feature("field", { type: "Point", coordinates: [1e12, 5] }, { reader: "reader-a" }),
      /feature 1 has position \(1000000000000, 5\) px/,
    ],
  ];
  for (const [f, message] of cases) {
    const e = refusal(fc([tissue, f]));
    assert.ok(e instanceof RangeError, String(e));
    assert.ok(e.message.startsWith(`Cannot read annotations "${FILE}": `), e.message);
    assert.match(e.message, message);
  }
  // 400,000 px at 0.25 µm/px is exactly 100 mm: still accepted (a warning names it beyond the slide)
  const ok = parseAnnotations(
    fc([tissue, feature("figure", { type: "Point", coordinates: [400_000, 5] })]),
    { fileName: FILE },
  );
  assert.equal(ok.figures.xPx[0], 400_000);
});

Deno.test("parseAnnotations() refuses a region far outside a slide of known size, and an absurd slide size", () => {
  const slide = { id: "QVT-24-067", mpp: 0.5, width: 10000, height: 8000 };
  const far = feature("exclude", {
    type: "Polygon",
    coordinates: [[[0, 0], [100, 0], [100, 16_001], [0, 0]]],
  });
  const e = refusal(fc([tissue, far], slide));
  assert.match(
    e.message,
    /feature 1 reaches \(100, 16001\) px, far outside the slide's 10000 × 8000 px/,
  );
  // a little beyond the edge only warns
  const near = feature("exclude", {
    type: "Polygon",
    coordinates: [[[0, 0], [100, 0], [100, 9000], [0, 0]]],
  });
  const a = parseAnnotations(fc([tissue, near], slide), { fileName: FILE });
  assert.match(a.warnings.join("\n"), /reach beyond the slide/);
  const big = refusal(fc([tissue], { id: "QVT-24-067", mpp: 0.25, width: 1e15 }));
  assert.match(
    big.message,
    /"slide\.width" 1000000000000000 px is 250000000000 mm at the slide's mpp/,
  );
});

Deno.test("parseFiguresCsv() refuses a row of absurd magnitude, naming its line", () => {
  assert.throws(
    () => parseFiguresCsv("x,y\n10,10\n1e15,5\n", { fileName: "f.csv", mppX: 0.25, mppY: 0.25 }),
    (e: Error) =>
      e instanceof RangeError &&
      /^Cannot read figures CSV "f\.csv": line 3 \(a figure\) has position \(1000000000000000, 5\) px/
        .test(e.message),
  );
  // in micrometres, 1e9 µm is a kilometre
  assert.throws(
    () =>
      parseFiguresCsv("x,y\n1e9,5\n", { fileName: "f.csv", units: "um", mppX: 0.25, mppY: 0.25 }),
    /line 2 \(a figure\) has position \(4000000000, 20\) px/,
  );
});

Deno.test("hotfield report refuses 1e15 coordinates with exit 1 naming the file, not the stride", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const file = join(dir, FILE);
    writeFileSync(
      file,
      fc([
        feature("tissue", {
          type: "Polygon",
          coordinates: [[[0, 0], [1e15, 0], [1e15, 1e15], [0, 1e15], [0, 0]]],
        }),
      ]),
    );
    const err: string[] = [];
    const code = await main(["report", file, "--out", join(dir, "out")], {
      stdout: () => {},
      stderr: (s) => err.push(s),
    });
    assert.equal(code, 1);
    assert.match(
      err.join(""),
      new RegExp(`Cannot read annotations ".*${FILE}": feature 0 has position`),
    );
    assert.doesNotMatch(err.join(""), /stride/);
    assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name), [FILE]);
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("parseFiguresCsv() reads decimals only: hexadecimal, Infinity and 1e400 are refused", () => {
  for (
    const [cell, why] of [["0x10", "is not a number"], ["Infinity", "is not a number"], [
      "1e400",
      "is too large",
    ]]
  ) {
    assert.throws(
      () => parseFiguresCsv(`x,y\n${cell},5\n`, { fileName: "f.csv", mppX: 0.25, mppY: 0.25 }),
      new RegExp(`line 2: x "${cell}" ${why}`),
    );
  }
});

Deno.test("parseFiguresCsv() refuses more lines than the figure limit before parsing them", () => {
  const text = "x,y\n" + "1,1\n".repeat(5_000_001);
  assert.throws(
    () => parseFiguresCsv(text, { fileName: "f.csv", mppX: 0.25, mppY: 0.25 }),
    (e: Error) =>
      e instanceof RangeError &&
      e.message ===
        'Cannot read figures CSV "f.csv": the file holds 5,000,002 lines, more than the limit of 5,000,000 figure points (see "Input limits" in the README)',
  );
});
