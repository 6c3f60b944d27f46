/**
 * `hotfield tissue` on generated slide files (pyramidal tiled TIFFs read
 * through OpenSlide) and on their thumbnails, checked against the true tissue
 * the generator drew. IoU is computed from exact polygon areas.
 */

import { strict as assert } from "node:assert";
import { join } from "node:path";
import { encode as encodePng } from "fast-png";
import { encode as encodeJpeg } from "jpeg-js";
import { multiPolygonAreaPx2 } from "../../lib/geometry/planar_area.ts";
import { readSlideImage } from "../../lib/annotations/read_slide_file.ts";
import { cli, iou, needsOpenSlide, overlapArea, slideFile, tempDir, tissueOf } from "./_fixture.ts";

/** The main test slide: 4000 × 3000 px at 2 µm/px, three levels. */
const main = () => slideFile("QVT-24-S01.tiff", 1);
/** A second scene with unequal mpp: 1600 × 3200 px at 2 × 1 µm/px. */
const tall = () => slideFile("QVT-24-S02.tiff", 2, { widthPx: 1600, heightPx: 3200, mpp: [2, 1] });

Deno.test({
  name: "readSlideImage() takes the mpp from the TIFF resolution tags exactly",
  ...needsOpenSlide,
  async fn() {
    const { path } = tall();
    const s = await readSlideImage(path);
    // the generator writes 5000 and 10000 pixels per centimetre: 2 and 1 µm exactly
    assert.equal(s.slide.mppX, 2);
    assert.equal(s.slide.mppY, 1);
    assert.equal(s.slide.widthPx, 1600);
    assert.equal(s.slide.heightPx, 3200);
    assert.match(s.mppFrom, /tiff\.XResolution/);
    assert.equal(s.kind, "slide");
    assert.equal(s.format, "generic-tiff");
    // the coarsest level with pixels of at most 16 µm: level 1, 400 × 800 px at 8 × 4 µm
    assert.equal(s.level, 1);
    assert.deepEqual([s.image.width, s.image.height], [400, 800]);
    assert.deepEqual([s.imageMppX, s.imageMppY], [8, 4]);
  },
});

for (const [name, get] of [["square pixels", main], ["unequal mpp", tall]] as const) {
  Deno.test({
    name:
      `hotfield tissue on a generated slide (${name}): IoU ≥ 0.95, glass hole kept, specks and pen dropped`,
    ...needsOpenSlide,
    async fn() {
      const { path, slide } = get();
      const out = join(tempDir(), `${slide.id}-${name.replace(" ", "-")}.geojson`);
      const r = await cli(["tissue", path, "--out", out]);
      assert.equal(r.code, 0, r.err);
      const { fc, polygons } = tissueOf(out);
      assert.deepEqual(fc.slide.mpp, [slide.mppX, slide.mppY]);
      assert.deepEqual([fc.slide.width, fc.slide.height], [slide.widthPx, slide.heightPx]);
      assert.equal(fc.features[0].properties.role, "tissue");
      assert.deepEqual(
        fc.features[0].properties.method.steps.map((s) => s.step),
        [
          "background",
          "tissue channel",
          "threshold",
          "pen marks",
          "closing",
          "opening",
          "fill holes",
          "drop specks",
          "contours",
        ],
      );
      const score = iou(polygons, slide.tissue);
      assert.ok(score >= 0.95, `IoU ${score}`);
      // the glass hole stays a hole: at most a rim of it is covered
      const hole = multiPolygonAreaPx2([slide.glassHole]);
      assert.ok(overlapArea(polygons, [slide.glassHole]) < 0.1 * hole, "glass hole kept");
      assert.equal(overlapArea(polygons, slide.specks), 0, "specks dropped");
      assert.equal(overlapArea(polygons, slide.penStroke), 0, "pen stroke dropped");
      // the pale piece is found
      const pale = multiPolygonAreaPx2([slide.palePiece]);
      assert.ok(overlapArea(polygons, [slide.palePiece]) > 0.9 * pale, "pale piece kept");
      assert.match(r.err, /Likely pen marks/);
    },
  });
}

Deno.test({
  name: "hotfield tissue on PNG and JPEG thumbnails gives the slide route's tissue (IoU ≥ 0.93)",
  ...needsOpenSlide,
  async fn() {
    const { path, slide } = main();
    const dir = tempDir();
    const fromSlide = join(dir, "thumb-route-slide.geojson");
    assert.equal((await cli(["tissue", path, "--out", fromSlide])).code, 0);
    const t = slide.thumbnail; // the coarsest level: 250 × 188 px
    const thumbMpp = slide.mppX * slide.widthPx / t.width; // 32 µm/px
    const rgba = new Uint8Array(t.width * t.height * 4);
    for (let k = 0; k < t.width * t.height; k++) {
      rgba.set(t.data.subarray(3 * k, 3 * k + 3), 4 * k);
      rgba[4 * k + 3] = 255;
    }
    const png = join(dir, "QVT-24-S01-thumb.png");
    Deno.writeFileSync(png, encodePng({ ...t, channels: 3, depth: 8 }));
    const jpg = join(dir, "QVT-24-S01-thumb.jpg");
    Deno.writeFileSync(jpg, encodeJpeg({ width: t.width, height: t.height, data: rgba }, 90).data);
    const reference = tissueOf(fromSlide).polygons;
    for (const thumb of [png, jpg]) {
      const out = `${thumb}.geojson`;
      const r = await cli([
        "tissue",
        thumb,
        "--out",
        out,
        "--mpp",
        String(thumbMpp),
        "--slide-mpp",
        String(slide.mppX),
      ]);
      assert.equal(r.code, 0, r.err);
      const { fc, polygons } = tissueOf(out);
      assert.deepEqual([fc.slide.width, fc.slide.height], [4000, 3008]); // 188 px × 32 µm ÷ 2
      const score = iou(polygons, reference);
      assert.ok(score >= 0.93, `${thumb}: IoU ${score} with the slide route`);
      assert.ok(iou(polygons, slide.tissue) >= 0.93, `${thumb}: IoU with the true tissue`);
    }
  },
});

Deno.test({
  name: "hotfield tissue --mask-out writes the mask and prints its mpp",
  ...needsOpenSlide,
  async fn() {
    const { path } = main();
    const dir = tempDir();
    const r = await cli([
      "tissue",
      path,
      "--out",
      join(dir, "m.geojson"),
      "--mask-out",
      join(dir, "m.png"),
    ]);
    assert.equal(r.code, 0, r.err);
    assert.match(r.out, /mask .*m\.png: 1000 × 750 px, --mask-mpp 8\n/);
    assert.match(r.out, /^QVT-24-S01\ttissue [0-9.]+ mm² in 2 pieces\tlevel 1 at 8 µm\/px\t/);
  },
});

Deno.test({
  name: "hotfield tissue gives byte-identical output for the same slide",
  ...needsOpenSlide,
  async fn() {
    const { path } = main();
    const dir = tempDir();
    const a = join(dir, "same-a.geojson"), b = join(dir, "same-b.geojson");
    await cli(["tissue", path, "--out", a]);
    await cli(["tissue", path, "--out", b]);
    assert.equal(Deno.readTextFileSync(a), Deno.readTextFileSync(b));
  },
});

// ---- bad input ----

Deno.test({
  name: "hotfield tissue refuses a file that is neither a slide nor an image (exit 1)",
  ...needsOpenSlide,
  async fn() {
    const bad = join(tempDir(), "QVT-24-S09.slide");
    Deno.writeTextFileSync(bad, "x,y\n1,2\n");
    const r = await cli(["tissue", bad, "--out", join(tempDir(), "bad.geojson")]);
    assert.equal(r.code, 1);
    assert.match(r.err, /Cannot read slide ".*QVT-24-S09\.slide": OpenSlide does not recognise it/);
    const missing = await cli(["tissue", join(tempDir(), "nope.tiff"), "--out", "x.geojson"]);
    assert.equal(missing.code, 1);
    assert.match(missing.err, /nope\.tiff": file not found/);
  },
});

Deno.test({
  name: "hotfield tissue on a TIFF without resolution asks for --mpp (exit 1), then works with it",
  ...needsOpenSlide,
  async fn() {
    const { path } = slideFile("QVT-24-S03.tiff", 3, {
      widthPx: 1200,
      heightPx: 900,
      mpp: 4,
      resolutionTags: false,
    });
    const out = join(tempDir(), "nores.geojson");
    const r = await cli(["tissue", path, "--out", out]);
    assert.equal(r.code, 1);
    assert.match(r.err, /QVT-24-S03\.tiff": it does not say its micrometres per pixel/);
    assert.match(r.err, /give them with --mpp N/);
    const ok = await cli(["tissue", path, "--out", out, "--mpp", "4"]);
    assert.equal(ok.code, 0, ok.err);
    assert.deepEqual(tissueOf(out).fc.slide.mpp, [4, 4]);
  },
});

Deno.test({
  name: "hotfield tissue wraps OpenSlide's error for a truncated slide, naming the file (exit 1)",
  ...needsOpenSlide,
  async fn() {
    const { slide } = main();
    const cut = join(tempDir(), "QVT-24-S01-truncated.tiff");
    // keep the directories and the first tiles, lose the rest of the tile data
    Deno.writeFileSync(cut, slide.bytes.subarray(0, Math.floor(slide.bytes.length / 3)));
    const r = await cli(["tissue", cut, "--out", join(tempDir(), "cut.geojson")]);
    assert.equal(r.code, 1);
    assert.match(r.err, /Cannot read slide ".*QVT-24-S01-truncated\.tiff": OpenSlide reports: /);
    const header = join(tempDir(), "QVT-24-S01-header.tiff");
    Deno.writeFileSync(header, slide.bytes.subarray(0, 200));
    const h = await cli(["tissue", header, "--out", join(tempDir(), "cut.geojson")]);
    assert.equal(h.code, 1);
    assert.match(h.err, /QVT-24-S01-header\.tiff": OpenSlide does not recognise it/);
  },
});

Deno.test({
  name:
    "hotfield tissue refuses an implausible level-0 mpp (> 5 µm/px), from the file or the option",
  ...needsOpenSlide,
  async fn() {
    const { path } = slideFile("QVT-24-S04.tiff", 4, { widthPx: 600, heightPx: 400, mpp: 10 });
    const out = join(tempDir(), "coarse.geojson");
    const r = await cli(["tissue", path, "--out", out]);
    assert.equal(r.code, 1);
    assert.match(r.err, /its mpp from tiff\.XResolution.* 10 µm\/px is implausible/);
    assert.match(r.err, /give the level-0 mpp with --mpp N/);
    const opt = await cli(["tissue", main().path, "--out", out, "--mpp", "7"]);
    assert.equal(opt.code, 1);
    assert.match(opt.err, /the given mpp 7 µm\/px is implausible/);
  },
});

Deno.test("hotfield tissue: thumbnails need --mpp and --slide-mpp; options are checked (exit 2)", async () => {
  const dir = tempDir();
  const png = join(dir, "QVT-24-S05-thumb.png");
  Deno.writeFileSync(
    png,
    encodePng({
      width: 20,
      height: 10,
      data: new Uint8Array(600).fill(236),
      channels: 3,
      depth: 8,
    }),
  );
  const out = join(dir, "t.geojson");
  const noSlideMpp = await cli(["tissue", png, "--out", out, "--mpp", "16"]);
  assert.equal(noSlideMpp.code, 1);
  assert.match(noSlideMpp.err, /give them with --slide-mpp N/);
  const noMpp = await cli(["tissue", png, "--out", out, "--slide-mpp", "0.5"]);
  assert.equal(noMpp.code, 1);
  assert.match(noMpp.err, /does not say its own micrometres per pixel; give them with --mpp N/);
  const glass = await cli(["tissue", png, "--out", out, "--mpp", "16", "--slide-mpp", "0.5"]);
  assert.equal(glass.code, 0, glass.err);
  assert.match(glass.err, /No tissue was found/);
  assert.equal(tissueOf(out).fc.features.length, 0);
  assert.equal((await cli(["tissue", png])).code, 2);
  assert.equal((await cli(["tissue", png, "--out", out, "--mpp", "-1"])).code, 2);
  assert.equal((await cli(["tissue", "--out", out])).code, 2);
});
