/**
 * Slide facts and images without OpenSlide: mpp from properties, thumbnail
 * decoding, and overview reading from a stand-in slide.
 */

import { strict as assert } from "node:assert";
import { encode as encodePng } from "fast-png";
import { encode as encodeJpeg } from "jpeg-js";
import { mppFromProperties, type SlideFile } from "../../lib/slide/open_slide.ts";
import { decodeRgbImage, sniffImageFormat } from "../../lib/slide/decode_image.ts";
import { readOverview } from "../../lib/slide/read_overview.ts";

Deno.test("mppFromProperties() prefers OpenSlide's mpp, then resolution tags with their unit", () => {
  assert.deepEqual(
    mppFromProperties({
      "openslide.mpp-x": "0.2527",
      "openslide.mpp-y": "0.2531",
      "tiff.XResolution": "1",
    }),
    { mppX: 0.2527, mppY: 0.2531, from: "openslide.mpp-x, openslide.mpp-y" },
  );
  // TIFF 6.0 ResolutionUnit 3 (centimetre): 40000 px/cm is 0.25 µm/px
  assert.deepEqual(
    mppFromProperties({
      "tiff.XResolution": "40000",
      "tiff.YResolution": "40000",
      "tiff.ResolutionUnit": "centimeter",
    }),
    { mppX: 0.25, mppY: 0.25, from: "tiff.XResolution, tiff.YResolution (pixels per centimeter)" },
  );
  // ResolutionUnit 2 (inch): 101600 px/inch is 25400/101600 = 0.25 µm/px
  const inch = mppFromProperties({
    "tiff.XResolution": "101600",
    "tiff.YResolution": "50800",
    "tiff.ResolutionUnit": "inch",
  });
  assert.equal(inch?.mppX, 0.25);
  assert.equal(inch?.mppY, 0.5);
  // no unit, or "none": no mpp
  assert.equal(
    mppFromProperties({ "tiff.XResolution": "72", "tiff.ResolutionUnit": "none" }),
    null,
  );
  assert.equal(mppFromProperties({ "tiff.XResolution": "72" }), null);
  assert.equal(mppFromProperties({}), null);
  assert.equal(mppFromProperties({ "openslide.mpp-x": "0" }), null);
});

Deno.test("sniffImageFormat() and decodeRgbImage() read PNG and JPEG, refusing anything else", () => {
  const rgb = new Uint8Array([255, 0, 0, 0, 255, 0, 0, 0, 255, 236, 236, 240]);
  const png = encodePng({ width: 2, height: 2, data: rgb, channels: 3, depth: 8 });
  assert.equal(sniffImageFormat(png), "png");
  assert.deepEqual(decodeRgbImage(png, { fileName: "a.png" }), { width: 2, height: 2, data: rgb });
  const grey = encodePng({
    width: 2,
    height: 1,
    data: new Uint16Array([0, 65535]),
    channels: 1,
    depth: 16,
  });
  assert.deepEqual([...decodeRgbImage(grey, { fileName: "g.png" }).data], [0, 0, 0, 255, 255, 255]);
  const rgba = new Uint8Array(8 * 8 * 4).fill(200);
  const jpg = encodeJpeg({ width: 8, height: 8, data: rgba }, 95).data;
  assert.equal(sniffImageFormat(jpg), "jpeg");
  const j = decodeRgbImage(jpg, { fileName: "a.jpg" });
  assert.equal(j.width, 8);
  assert.ok(j.data.every((v) => Math.abs(v - 200) <= 2), "uniform grey survives JPEG");
  assert.throws(
    () => decodeRgbImage(new TextEncoder().encode("x,y\n"), { fileName: "f.csv" }),
    SyntaxError,
    'Cannot read image "f.csv": not a PNG or JPEG image',
  );
  assert.throws(
    () => decodeRgbImage(png.subarray(0, 40), { fileName: "cut.png" }),
    SyntaxError,
    'Cannot read image "cut.png": not a readable PNG image',
  );
  assert.throws(
    () => decodeRgbImage(jpg.subarray(0, 30), { fileName: "cut.jpg" }),
    SyntaxError,
    'Cannot read image "cut.jpg": not a readable JPEG image',
  );
});

/** A stand-in slide whose level pixels hold their own coordinates. */
function fakeSlide(levels: [number, number][], calls: number[][]): SlideFile {
  return {
    path: "QVT-24-S12.tiff",
    vendor: "test",
    widthPx: levels[0][0],
    heightPx: levels[0][1],
    levels: levels.map(([w, h]) => ({ widthPx: w, heightPx: h, downsample: levels[0][0] / w })),
    mpp: null,
    properties: {},
    close() {},
    readRegion(level, x0, y0, w, h) {
      calls.push([level, x0, y0, w, h]);
      const ds = levels[0][0] / levels[level][0];
      const data = new Uint8Array(w * h * 3);
      for (let y = 0; y < h; y++) {
        for (let x = 0; x < w; x++) {
          const lx = x0 / ds + x, ly = y0 / ds + y;
          data.set([lx % 256, ly % 256, (lx + ly) % 7], 3 * (y * w + x));
        }
      }
      return { width: w, height: h, data };
    },
  };
}

Deno.test("readOverview() picks the level and averages blocks; pieces give the same image", () => {
  // level 0 at 0.5 µm/px; levels at 2 and 4 µm/px; none at 8-16, so level 2 is read
  // and 2 × 2 blocks are averaged (factor ⌊8 / 4⌋ = 2) into 8 µm/px
  const levels: [number, number][] = [[1600, 1200], [400, 300], [200, 150]];
  const whole: number[][] = [], pieces: number[][] = [];
  const a = readOverview(fakeSlide(levels, whole), { mppX: 0.5, mppY: 0.5 });
  const b = readOverview(fakeSlide(levels, pieces), { mppX: 0.5, mppY: 0.5, pieceMaxPx: 1000 });
  assert.equal(a.level, 2);
  assert.equal(a.factor, 2);
  assert.deepEqual([a.image.width, a.image.height, a.mppX, a.scaleX], [100, 75, 8, 16]);
  assert.equal(whole.length, 1);
  assert.ok(pieces.length > 10, `${pieces.length} pieces`);
  assert.deepEqual(a.image, b.image);
  // block (0, 0) averages level pixels x 0-1, y 0-1: red (0+1+0+1)/4 = 0.5 → 1 (rounded half up)
  assert.deepEqual([...a.image.data.subarray(0, 3)], [1, 1, 1]);
  assert.throws(() => readOverview(fakeSlide(levels, []), { mppX: 0, mppY: 0.5 }), RangeError);
});
