/**
 * The seeded slide generator: same seed, same bytes; the TIFF it writes is
 * what the TIFF 6.0 layout requires (checked field by field here, and read
 * back through OpenSlide in test/slide/).
 */

import { strict as assert } from "node:assert";
import { generateSyntheticSlide } from "../../lib/demo/synthetic_slide.ts";
import { multiPolygonAreaPx2 } from "../../lib/geometry/planar_area.ts";

const small = { widthPx: 900, heightPx: 700, mpp: 8 } as const;

Deno.test("generateSyntheticSlide() gives byte-identical files for a seed and others for another", () => {
  const a = generateSyntheticSlide(11, small), b = generateSyntheticSlide(11, small);
  assert.deepEqual(a.bytes, b.bytes);
  assert.notDeepEqual(generateSyntheticSlide(12, small).bytes, a.bytes);
});

/** The tags of every image file directory, little-endian classic TIFF (TIFF 6.0 §2). */
function readIfds(bytes: Uint8Array): Map<number, number[]>[] {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  assert.equal(String.fromCharCode(bytes[0], bytes[1]), "II");
  assert.equal(dv.getUint16(2, true), 42);
  const sizes: Record<number, number> = { 3: 2, 4: 4, 5: 8 };
  const out: Map<number, number[]>[] = [];
  for (
    let at = dv.getUint32(4, true);
    at !== 0;
    at = dv.getUint32(at + 2 + 12 * dv.getUint16(at, true), true)
  ) {
    const tags = new Map<number, number[]>();
    let last = 0;
    for (let i = 0; i < dv.getUint16(at, true); i++) {
      const e = at + 2 + 12 * i;
      const tag = dv.getUint16(e, true),
        type = dv.getUint16(e + 2, true),
        count = dv.getUint32(e + 4, true);
      assert.ok(tag > last, "tags in ascending order (TIFF 6.0 §2)");
      last = tag;
      const n = sizes[type] * count;
      const p = n > 4 ? dv.getUint32(e + 8, true) : e + 8;
      const values: number[] = [];
      for (let k = 0; k < (type === 5 ? 2 * count : count); k++) {
        values.push(type === 3 ? dv.getUint16(p + 2 * k, true) : dv.getUint32(p + 4 * k, true));
      }
      tags.set(tag, values);
    }
    out.push(tags);
  }
  return out;
}

Deno.test("generateSyntheticSlide() writes a tiled pyramid with resolution in pixels per centimetre", () => {
  const s = generateSyntheticSlide(11, {
    widthPx: 2400,
    heightPx: 1000,
    mpp: [2, 1],
    tileSize: 256,
  });
  const ifds = readIfds(s.bytes);
  assert.equal(ifds.length, 3); // 2400 × 1000, 600 × 250, 150 × 63
  ifds.forEach((t, l) => {
    assert.deepEqual(t.get(254), [l === 0 ? 0 : 1], "reduced-resolution images after the first");
    assert.deepEqual(t.get(258), [8, 8, 8]);
    assert.deepEqual(t.get(262), [2], "RGB");
    assert.deepEqual(t.get(322), [256]);
    assert.deepEqual(t.get(296), [3], "centimetre");
    const [w, h] = [t.get(256)![0], t.get(257)![0]];
    assert.equal(t.get(324)!.length, Math.ceil(w / 256) * Math.ceil(h / 256));
    // 10,000 µm per cm ÷ (level-0 mpp × downsample)
    const [xn, xd] = t.get(282)!, [yn, yd] = t.get(283)!;
    assert.equal(xn / xd, 10_000 / (2 * 2400 / w));
    assert.equal(yn / yd, 10_000 / (1 * 1000 / h));
  });
  assert.deepEqual(ifds.map((t) => [t.get(256)![0], t.get(257)![0]]), [[2400, 1000], [600, 250], [
    150,
    63,
  ]]);
  // the true tissue: the main piece less its glass hole, plus the pale piece
  const area = multiPolygonAreaPx2(s.tissue);
  const parts = multiPolygonAreaPx2([s.tissue[0]]) + multiPolygonAreaPx2([s.palePiece]);
  assert.ok(Math.abs(area - parts) < 1e-6 * area);
  assert.equal(s.tissue[0].length, 2, "the main piece has its glass hole");
  const none = generateSyntheticSlide(11, { ...small, resolutionTags: false });
  assert.ok(!readIfds(none.bytes)[0].has(282), "no XResolution when asked");
});
