import { strict as assert } from "node:assert";
import fc from "fast-check";
import { encode } from "fast-png";
import {
  checkMaskSize,
  decodeMaskPng,
  maskToPolygons,
  maskToRegionPart,
} from "../../lib/tissue/read_mask.ts";
import { rasterizeArea, uniformEdges } from "../../lib/geometry/raster_coverage.ts";
import { multiPolygonAreaPx2, ringAreaPx2 } from "../../lib/geometry/planar_area.ts";
import { buildValidRegion } from "../../lib/geometry/valid_region.ts";
import type { Mask } from "../../lib/tissue/read_mask.ts";
import type { SlideInfo } from "../../lib/types.ts";

/** A mask drawn as a picture: "#" tissue, "." background. */
function picture(rows: string[]): Mask {
  const height = rows.length, width = rows[0].length;
  const data = new Uint8Array(width * height);
  rows.forEach((r, y) => [...r].forEach((ch, x) => (data[y * width + x] = ch === "#" ? 1 : 0)));
  return { width, height, data };
}

Deno.test("decodeMaskPng() reads 8-bit and 1-bit greyscale, nonzero is tissue", () => {
  const grey = encode({
    width: 3,
    height: 2,
    data: new Uint8Array([0, 1, 255, 0, 0, 128]),
    channels: 1,
    depth: 8,
  });
  assert.deepEqual([...decodeMaskPng(grey, { fileName: "g.png" }).data], [0, 1, 1, 0, 0, 1]);
  // 1-bit rows are packed MSB first and padded to whole bytes (PNG spec, W3C 2003, §7.2)
  const width = 10, height = 2;
  const bits = [1, 0, 1, 1, 0, 0, 0, 0, 1, 1, 0, 1, 0, 0, 0, 0, 0, 0, 0, 1];
  const packed = new Uint8Array(4);
  bits.forEach((b, i) => {
    const x = i % width, y = Math.floor(i / width);
    if (b) packed[y * 2 + (x >> 3)] |= 0x80 >> (x & 7);
  });
  const png1 = encode({ width, height, data: packed, channels: 1, depth: 1 });
  const m = decodeMaskPng(png1, { fileName: "b.png" });
  assert.equal(m.width, 10);
  assert.deepEqual([...m.data], bits);
});

Deno.test("decodeMaskPng() reads 16-bit greyscale", () => {
  const png = encode({
    width: 3,
    height: 1,
    data: new Uint16Array([0, 1, 65535]),
    channels: 1,
    depth: 16,
  });
  assert.deepEqual([...decodeMaskPng(png, { fileName: "g16.png" }).data], [0, 1, 1]);
});

Deno.test("decodeMaskPng() reads RGB(A) by any colour channel, alpha 0 as background", () => {
  const rgba = encode({
    width: 4,
    height: 1,
    channels: 4,
    depth: 8,
    data: new Uint8Array([0, 0, 0, 255, 0, 9, 0, 255, 200, 200, 200, 0, 0, 0, 1, 1]),
  });
  assert.deepEqual([...decodeMaskPng(rgba, { fileName: "c.png" }).data], [0, 1, 0, 1]);
  const rgb = encode({
    width: 2,
    height: 1,
    channels: 3,
    depth: 8,
    data: new Uint8Array([0, 0, 0, 0, 0, 7]),
  });
  assert.deepEqual([...decodeMaskPng(rgb, { fileName: "d.png" }).data], [0, 1]);
  const ga = encode({
    width: 2,
    height: 1,
    channels: 2,
    depth: 8,
    data: new Uint8Array([255, 0, 255, 255]),
  });
  assert.deepEqual([...decodeMaskPng(ga, { fileName: "e.png" }).data], [0, 1]);
});

Deno.test("decodeMaskPng() reads palette images through their colours", () => {
  const png = encode({
    width: 3,
    height: 1,
    channels: 1,
    depth: 8,
    data: new Uint8Array([0, 1, 2]),
    palette: [[0, 0, 0], [255, 255, 255], [0, 40, 0]],
  });
  assert.deepEqual([...decodeMaskPng(png, { fileName: "p.png" }).data], [0, 1, 1]);
});

Deno.test("decodeMaskPng() refuses bytes that are not a PNG, naming the file", () => {
  assert.throws(
    () => decodeMaskPng(new TextEncoder().encode("not a png"), { fileName: "QVT-24-002-mask.png" }),
    (e: unknown) =>
      e instanceof SyntaxError &&
      e.message.startsWith(
        'Cannot read tissue mask "QVT-24-002-mask.png": not a readable PNG image',
      ),
  );
  const good = encode({ width: 2, height: 2, data: new Uint8Array(4), channels: 1, depth: 8 });
  assert.throws(() => decodeMaskPng(good.slice(0, 30), { fileName: "cut.png" }), SyntaxError);
});

Deno.test("maskToPolygons() traces outer boundaries and holes with merged collinear steps", () => {
  const m = picture([
    "#####",
    "#...#",
    "#.#.#",
    "#...#",
    "#####",
  ]);
  const mp = maskToPolygons(m, { scaleX: 1, scaleY: 1 });
  // the frame with one hole, and the island inside the hole
  assert.equal(mp.length, 2);
  assert.equal(mp[0].length, 2);
  assert.deepEqual(mp[0][0], [[0, 0], [5, 0], [5, 5], [0, 5], [0, 0]]);
  assert.equal(mp[0][1].length, 5); // 4 corners + closing point
  assert.ok(ringAreaPx2(mp[0][0]) === 25 && ringAreaPx2(mp[0][1]) === -9);
  assert.deepEqual(mp[1], [[[2, 2], [3, 2], [3, 3], [2, 3], [2, 2]]]);
  // hand calculation: 16 frame pixels + 1 island pixel
  assert.equal(multiPolygonAreaPx2(mp), 17);
});

Deno.test("maskToPolygons() keeps diagonal neighbours apart (4-connected tissue)", () => {
  const mp = maskToPolygons(picture(["#.", ".#"]), {
    scaleX: 2,
    scaleY: 3,
    originX: 10,
    originY: 20,
  });
  assert.equal(mp.length, 2);
  assert.deepEqual(mp[0][0], [[10, 20], [12, 20], [12, 23], [10, 23], [10, 20]]);
  assert.deepEqual(mp[1][0], [[12, 23], [14, 23], [14, 26], [12, 26], [12, 23]]);
  // background pixels touching diagonally inside tissue: the dual of 4-connected tissue is
  // 8-connected background, so they form one hole, pinched at the shared corner
  const ring = picture([
    "####",
    "#.##",
    "##.#",
    "####",
  ]);
  const r = maskToPolygons(ring, { scaleX: 1, scaleY: 1 });
  assert.equal(r.length, 1);
  assert.equal(r[0].length, 2);
  assert.equal(r[0][1].filter(([x, y]) => x === 2 && y === 2).length, 2); // passes the corner twice
  assert.equal(multiPolygonAreaPx2(r), 14);
});

Deno.test("maskToPolygons() → rasterizeArea() reproduces random masks exactly (fast-check)", () => {
  // error bound: zero for every cell up to float rounding of the vertex coordinates; we allow
  // 1e-9 of a mask pixel's area
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 24 }),
      fc.integer({ min: 1, max: 24 }),
      fc.double({ min: 0.05, max: 0.95, noNaN: true }),
      fc.integer({ min: 0, max: 1e6 }),
      fc.double({ min: 0.3, max: 40, noNaN: true }),
      fc.double({ min: 0.3, max: 40, noNaN: true }),
      fc.double({ min: -1000, max: 1000, noNaN: true }),
      (width, height, p, seed, scaleX, scaleY, origin) => {
        let s = seed >>> 0;
        const data = new Uint8Array(width * height).map(() => {
          s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
          return s / 2 ** 32 < p ? 1 : 0;
        });
        const mask = { width, height, data };
        const mp = maskToPolygons(mask, { scaleX, scaleY, originX: origin, originY: -origin });
        const cells = rasterizeArea(
          mp,
          uniformEdges(origin, scaleX, width + 1),
          uniformEdges(-origin, scaleY, height + 1),
        );
        const px = scaleX * scaleY;
        for (let i = 0; i < data.length; i++) {
          assert.ok(
            Math.abs(cells[i] / px - data[i]) < 1e-9,
            `cell ${i}: ${cells[i] / px} vs ${data[i]}`,
          );
        }
        const count = data.reduce((a, b) => a + b, 0);
        assert.ok(Math.abs(multiPolygonAreaPx2(mp) - count * px) <= 1e-9 * Math.max(1, count * px));
        for (const poly of mp) {
          assert.ok(ringAreaPx2(poly[0]) > 0);
          for (const h of poly.slice(1)) assert.ok(ringAreaPx2(h) < 0);
        }
        // traced masks are valid regions as they are: no repair, same area
        if (mp.length > 0) {
          const v = buildValidRegion({
            tissue: [
              maskToRegionPart(mask, {
                scaleX,
                scaleY,
                originX: origin,
                originY: -origin,
                source: "m.png",
              }),
            ],
            tumour: [],
            exclude: [],
          });
          assert.deepEqual(v.warnings, []);
          assert.ok(Math.abs(v.validAreaPx2 - count * px) <= 1e-9 * Math.max(1, count * px));
        }
      },
    ),
    { seed: 2718, numRuns: 300 },
  );
});

Deno.test("maskToPolygons() returns [] for an empty mask and refuses bad scales", () => {
  assert.deepEqual(maskToPolygons(picture(["...", "..."]), { scaleX: 1, scaleY: 1 }), []);
  assert.throws(() => maskToPolygons(picture(["#"]), { scaleX: 0, scaleY: 1 }), RangeError);
});

const slide: SlideInfo = {
  id: "QVT-24-001",
  mppX: 0.25,
  mppY: 0.5,
  widthPx: 40000,
  heightPx: 20000,
};

Deno.test("checkMaskSize() accepts a matching mask and tolerates max(1 mask pixel, 2 %)", () => {
  // slide: 40000 × 0.25 = 10000 µm wide, 20000 × 0.5 = 10000 µm tall; mask at 10 µm/px = 1000 px
  const mask = { width: 1000, height: 1000, data: new Uint8Array(0) };
  assert.deepEqual(checkMaskSize(mask, 10, slide, "m.png"), []);
  assert.deepEqual(checkMaskSize(mask, [10, 10], slide, "m.png"), []);
  // 1.5 % too wide: accepted with a warning
  const w = checkMaskSize({ ...mask, width: 1015 }, 10, slide, "m.png");
  assert.equal(w.length, 1);
  assert.match(w[0], /10150 µm/);
  // unknown slide size: a warning per axis, no check
  const u = checkMaskSize(mask, 10, { id: "x", mppX: 0.25, mppY: 0.25 }, "m.png");
  assert.equal(u.length, 2);
});

Deno.test("checkMaskSize() refuses a mask whose extent differs, giving both sizes and a likely mpp", () => {
  const mask = { width: 500, height: 1000, data: new Uint8Array(0) };
  assert.throws(() => checkMaskSize(mask, 10, slide, "QVT-24-001-mask.png"), {
    name: "RangeError",
    message:
      'Cannot read tissue mask "QVT-24-001-mask.png": the mask width is 5000 µm (500 px at 10 µm/px) but the slide width is 10000 µm (40000 px at 0.25 µm/px); a mask mpp of about 20 µm/px would fit',
  });
  assert.throws(() => checkMaskSize(mask, -1, slide, "m.png"), RangeError);
});
