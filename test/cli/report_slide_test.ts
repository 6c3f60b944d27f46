/**
 * `hotfield report --slide`: mpp, size and (when no outline is given) the
 * tissue from a slide file; disagreements refused naming both values.
 */

import { strict as assert } from "node:assert";
import { join } from "node:path";
import { encode as encodePng } from "fast-png";
import { cli, needsOpenSlide, slideFile, tempDir } from "../slide/_fixture.ts";

/** The main generated slide (4000 × 3000 px at 2 µm/px) and a figures CSV inside its tissue. */
function slideCase() {
  const { path, slide } = slideFile("QVT-24-S01.tiff", 1);
  const csv = join(tempDir(), "QVT-24-S01.figures.csv");
  const rows = ["x,y,label"];
  for (let i = 0; i < 12; i++) {
    rows.push(`${1100 + 37 * (i % 4)},${1800 + 41 * Math.floor(i / 4)},`);
  }
  rows.push("3900,2950,mitotic figure"); // on the glass
  Deno.writeTextFileSync(csv, rows.join("\n") + "\n");
  return { path, slide, csv };
}

function annotations(name: string, slideMember: unknown, withTissue: boolean): string {
  const sq = [[800, 1200], [1800, 1200], [1800, 2200], [800, 2200], [800, 1200]];
  const fc = {
    type: "FeatureCollection",
    ...(slideMember === undefined ? {} : { slide: slideMember }),
    features: [
      withTissue
        ? {
          type: "Feature",
          properties: { role: "tissue" },
          geometry: { type: "Polygon", coordinates: [sq] },
        }
        : {
          type: "Feature",
          properties: { role: "figure" },
          geometry: { type: "Point", coordinates: [1200, 1850] },
        },
    ],
  };
  const path = join(tempDir(), name);
  Deno.writeTextFileSync(path, JSON.stringify(fc));
  return path;
}

const readReport = (dir: string, id: string) =>
  JSON.parse(Deno.readTextFileSync(join(dir, id, "report.json")));

Deno.test({
  name:
    "hotfield report --slide S --figures F.csv reports from the slide alone, recording the tissue's source",
  ...needsOpenSlide,
  async fn() {
    const { path, csv } = slideCase();
    const out = join(tempDir(), "report-slide-only");
    const r = await cli([
      "report",
      "--slide",
      path,
      "--figures",
      csv,
      "--out",
      out,
      "--stride-um",
      "100",
      "--format",
      "json",
    ]);
    assert.equal(r.code, 0, r.err);
    const rep = readReport(out, "QVT-24-S01");
    assert.deepEqual(rep.mpp, [2, 2]);
    assert.equal(rep.figures.total, 13);
    assert.equal(rep.figures.outside_valid, 1, "the figure on the glass is outside the tissue");
    assert.equal(rep.hotspot.count, 12);
    assert.ok(rep.areas_mm2.tissue > 14 && rep.areas_mm2.tissue < 16, String(rep.areas_mm2.tissue));
    assert.deepEqual(rep.inputs.map((i: { kind: string }) => i.kind), ["slide", "figures"]);
    assert.equal(rep.inputs[0].sha256.length, 64);
    assert.equal(rep.tissue_source.slide, path);
    assert.equal(rep.tissue_source.method.name, "hotfield tissue detection");
    assert.ok(rep.warnings.some((w: string) => w.startsWith("Likely pen marks")));
  },
});

Deno.test({
  name:
    "hotfield report --slide takes mpp and size for annotations that lack them, and keeps a given outline",
  ...needsOpenSlide,
  async fn() {
    const { path } = slideCase();
    const file = annotations("QVT-24-S01-noslide.geojson", undefined, true);
    const out = join(tempDir(), "report-fill");
    const r = await cli(["report", file, "--slide", path, "--out", out, "--format", "json"]);
    assert.equal(r.code, 0, r.err);
    const rep = readReport(out, "QVT-24-S01");
    assert.deepEqual(rep.mpp, [2, 2]);
    // the given 1000 × 1000 px square at 2 µm/px: 4 mm², no detection
    assert.equal(rep.areas_mm2.tissue, 4);
    assert.equal(rep.tissue_source, undefined);
  },
});

Deno.test({
  name:
    "hotfield report --slide refuses annotations whose mpp or size disagrees, naming both values",
  ...needsOpenSlide,
  async fn() {
    const { path } = slideCase();
    const out = join(tempDir(), "report-disagree");
    const mpp = annotations("QVT-24-S01-mpp.geojson", { id: "QVT-24-S01", mpp: 0.25 }, true);
    const r = await cli(["report", mpp, "--slide", path, "--out", out]);
    assert.equal(r.code, 1);
    assert.match(
      r.err,
      /Cannot read annotations ".*QVT-24-S01-mpp\.geojson": slide mpp 0\.25 µm\/px disagrees with slide file ".*QVT-24-S01\.tiff" \(2 µm\/px, from tiff\.XResolution/,
    );
    const size = annotations(
      "QVT-24-S01-size.geojson",
      { mpp: 2, width: 4096, height: 3000 },
      true,
    );
    const s = await cli(["report", size, "--slide", path, "--out", out]);
    assert.equal(s.code, 1);
    assert.match(
      s.err,
      /slide width 4096 px disagrees with slide file ".*" \(4000 px at level 0\)/,
    );
    assert.ok(!(await Deno.stat(out).catch(() => null)), "nothing written");
  },
});

Deno.test({
  name: "a case file's slide_file works like --slide",
  ...needsOpenSlide,
  async fn() {
    const { path, csv } = slideCase();
    const caseFile = join(tempDir(), "QVT-24-S01.case.json");
    Deno.writeTextFileSync(
      caseFile,
      JSON.stringify({ hotfield_case: 1, slide_file: path, figures: csv, id: "QVT-24-S01" }),
    );
    const out = join(tempDir(), "report-case-file");
    const r = await cli([
      "report",
      caseFile,
      "--out",
      out,
      "--stride-um",
      "100",
      "--format",
      "json",
    ]);
    assert.equal(r.code, 0, r.err);
    const rep = readReport(out, "QVT-24-S01");
    assert.equal(rep.hotspot.count, 12);
    assert.deepEqual(rep.inputs.map((i: { kind: string }) => i.kind), ["case", "slide", "figures"]);
  },
});

Deno.test("hotfield report --slide with a thumbnail refuses one whose aspect disagrees with the slide", async () => {
  // the annotations say 4000 × 3000 px; the thumbnail is 250 × 250 px
  const png = join(tempDir(), "QVT-24-S06-thumb.png");
  Deno.writeFileSync(
    png,
    encodePng({
      width: 250,
      height: 250,
      data: new Uint8Array(250 * 250 * 3).fill(236),
      channels: 3,
      depth: 8,
    }),
  );
  const file = annotations("QVT-24-S06.geojson", {
    id: "QVT-24-S06",
    mpp: 2,
    width: 4000,
    height: 3000,
  }, false);
  const r = await cli(["report", file, "--slide", png, "--out", join(tempDir(), "report-thumb")]);
  assert.equal(r.code, 1);
  assert.match(
    r.err,
    /Cannot read slide ".*QVT-24-S06-thumb\.png": the thumbnail's aspect \(250 × 250 px, 1:1\) disagrees with the slide's \(4000 × 3000 px at 2 µm\/px, 1\.3333:1\)/,
  );
  // the generated slide's own thumbnail (250 × 188 px) fits, and its tissue is found
  const { slide } = slideFile("QVT-24-S01.tiff", 1);
  const good = join(tempDir(), "QVT-24-S01-thumb-report.png");
  Deno.writeFileSync(good, encodePng({ ...slide.thumbnail, channels: 3, depth: 8 }));
  const ann = annotations("QVT-24-S01-thumb.geojson", { mpp: 2, width: 4000, height: 3000 }, false);
  const out = join(tempDir(), "report-thumb-ok");
  const ok = await cli(["report", ann, "--slide", good, "--out", out, "--format", "json"]);
  assert.equal(ok.code, 0, ok.err);
  const rep = readReport(out, "QVT-24-S01-thumb");
  assert.ok(rep.areas_mm2.tissue > 14 && rep.areas_mm2.tissue < 16, String(rep.areas_mm2.tissue));
  assert.equal(rep.tissue_source.slide, good);
  // without the slide's size a thumbnail cannot be placed
  const nosize = annotations("QVT-24-S07.geojson", { id: "QVT-24-S07", mpp: 2 }, false);
  const n = await cli(["report", nosize, "--slide", png, "--out", join(tempDir(), "report-thumb")]);
  assert.equal(n.code, 1);
  assert.match(n.err, /the slide's level-0 width and height are not known to place it/);
});

Deno.test("hotfield report --slide names one case only (exit 2)", async () => {
  const r = await cli(["report", "a.geojson", "b.geojson", "--slide", "s.tiff", "--out", "x"]);
  assert.equal(r.code, 2);
  assert.match(r.err, /Option --slide names the slide of one case/);
  const none = await cli(["report", "--out", "x"]);
  assert.equal(none.code, 2);
  assert.match(none.err, /or --slide FILE/);
});
