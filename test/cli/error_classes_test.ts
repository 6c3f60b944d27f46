import { strict as assert } from "node:assert";
import { join } from "node:path";
import { writeFileSync } from "node:fs";
import { main } from "../../lib/cli.ts";
import { GridSizeError } from "../../lib/errors.ts";
import { parseAnnotations } from "../../lib/annotations/read_annotations.ts";
import { parseFiguresCsv } from "../../lib/annotations/read_figures_csv.ts";
import { computeCountMap } from "../../lib/count/compute_count_map.ts";
import { makeWindow } from "../../lib/count/make_window.ts";
import { prepareCase } from "../../lib/count/prepare_case.ts";
import { loadCase } from "../../lib/annotations/read_case.ts";

const SQUARE = [[0, 0], [12000, 0], [12000, 12000], [0, 12000], [0, 0]];

function caseText(): string {
  return JSON.stringify({
    type: "FeatureCollection",
    slide: { id: "QVT-24-051", mpp: 0.5 },
    features: [
      {
        type: "Feature",
        properties: { role: "tissue" },
        geometry: { type: "Polygon", coordinates: [SQUARE] },
      },
    ],
  });
}

Deno.test("parseAnnotations() keeps the JSON parser's error as cause", () => {
  try {
    parseAnnotations("{", { fileName: "case.geojson" });
    assert.fail("broken JSON must be refused");
  } catch (err) {
    assert.ok(err instanceof SyntaxError);
    assert.ok((err as Error).cause instanceof SyntaxError, "cause is the JSON.parse error");
  }
});

Deno.test("parseFiguresCsv() keeps the CSV parser's error as cause", () => {
  try {
    parseFiguresCsv('x,y\n"1,2\n', { fileName: "figures.csv", mppX: 0.25, mppY: 0.25 });
    assert.fail("a broken quote must be refused");
  } catch (err) {
    assert.ok(err instanceof SyntaxError, String(err));
    assert.ok((err as Error).cause instanceof Error, "cause is the CSV parser's error");
  }
});

Deno.test("computeCountMap() throws GridSizeError, a RangeError, over the cell limit", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const path = join(dir, "QVT-24-051.geojson");
    writeFileSync(path, caseText());
    const prepared = prepareCase(await loadCase({ annotationsPath: path }));
    const window = makeWindow({});
    assert.throws(
      () => computeCountMap(prepared, window, { strideUm: 1, maxGridCells: 100 }),
      (e: unknown) => e instanceof GridSizeError && e instanceof RangeError,
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield report exits 2 naming --stride-um when the grid is too large", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const path = join(dir, "QVT-24-051.geojson");
    writeFileSync(path, caseText());
    const err: string[] = [];
    const code = await main(
      ["report", path, "--out", join(dir, "out"), "--stride-um", "0.01"],
      { stdout: () => {}, stderr: (s) => err.push(s) },
    );
    assert.equal(code, 2, err.join(""));
    assert.match(err.join(""), /Option --stride-um is too small for case "QVT-24-051"/);
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});
