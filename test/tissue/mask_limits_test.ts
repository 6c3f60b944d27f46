// Resource limits of PNG masks and thumbnails: the size is read from the
// header (IHDR, W3C PNG Specification 2nd ed. §11.2.2; key PNG-2003 in
// test/reference/README.md) and an image over the limit is refused before
// decoding; image data that inflates past what its size needs is refused
// after inflating no more than that; a noisy mask that traces into millions
// of vertices is refused. Every refusal names the file and gives the size and
// the limit. The expected inflated sizes are hand calculations (§7.2: one
// filter byte per scanline).

import { strict as assert } from "node:assert";
import { encode } from "fast-png";
import { deflateSync } from "node:zlib";
import { join } from "node:path";
import { writeFileSync } from "node:fs";
import { checkPngBounds, readPngHeader } from "../../lib/io/png_bounds.ts";
import { loadCase } from "../../lib/annotations/read_case.ts";
import { readSlideImage } from "../../lib/annotations/read_slide_file.ts";
import { MaskOutlineTooLargeError, maskToPolygons } from "../../lib/tissue/read_mask.ts";

function crc32(buf: Uint8Array): number {
  let crc = 0xffffffff;
  for (let n = 0; n < buf.length; n++) {
    let c = (crc ^ buf[n]) & 0xff;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    crc = (crc >>> 8) ^ c;
  }
  return (crc ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const dv = new DataView(out.buffer);
  dv.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  dv.setUint32(8 + data.length, crc32(out.subarray(4, 8 + data.length)));
  return out;
}

/** A valid PNG file: IHDR as given, the IDAT data as given. */
function png(
  width: number,
  height: number,
  depth: number,
  colorType: number,
  raw: Uint8Array,
): Uint8Array {
  const ihdr = new Uint8Array(13);
  const dv = new DataView(ihdr.buffer);
  dv.setUint32(0, width);
  dv.setUint32(4, height);
  ihdr[8] = depth;
  ihdr[9] = colorType;
  const parts = [
    new Uint8Array([137, 80, 78, 71, 13, 10, 26, 10]),
    chunk("IHDR", ihdr),
    chunk("IDAT", deflateSync(raw)),
    chunk("IEND", new Uint8Array(0)),
  ];
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let o = 0;
  for (const p of parts) out.set(p, o), o += p.length;
  return out;
}

function caseWithMask(dir: string, mask: Uint8Array, maskMpp: number) {
  const annotations = join(dir, "QVT-24-072.geojson");
  writeFileSync(
    annotations,
    JSON.stringify({
      type: "FeatureCollection",
      slide: { id: "QVT-24-072", mpp: 0.25, width: 120000, height: 80000 },
      features: [{
        type: "Feature",
        properties: { role: "figure" },
        geometry: { type: "Point", coordinates: [5, 5] },
      }],
    }),
  );
  const maskPath = join(dir, "QVT-24-072.tissue.png");
  writeFileSync(maskPath, mask);
  return loadCase({ annotationsPath: annotations, tissueMaskPath: maskPath, maskMpp });
}

Deno.test("readPngHeader() gives the inflated size of the image data", () => {
  // hand calculation: rows of 1 filter byte + ceil(width·channels·depth / 8) bytes
  const cases: [number, number, number, number, number][] = [
    [3, 2, 8, 0, 2 * (1 + 3)],
    [10, 1, 1, 0, 1 * (1 + 2)],
    [5, 4, 16, 6, 4 * (1 + 40)],
    [7, 3, 8, 2, 3 * (1 + 21)],
  ];
  for (const [w, h, depth, colorType, raw] of cases) {
    const header = readPngHeader(png(w, h, depth, colorType, new Uint8Array(raw)));
    assert.equal(header?.rawBytes, raw, `${w}×${h} depth ${depth} type ${colorType}`);
  }
  // fast-png's own files agree
  const p = encode({ width: 9, height: 4, data: new Uint8Array(9 * 4 * 3), channels: 3, depth: 8 });
  assert.equal(readPngHeader(p)?.rawBytes, 4 * (1 + 27));
  assert.equal(readPngHeader(new Uint8Array([1, 2, 3])), null);
});

Deno.test("loadCase() refuses a 40,000 × 30,000 mask from its header, before decoding", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    // 1-bit, 150 MB decoded; the data is empty rows, about 150 kB compressed
    const w = 40000, h = 30000, row = 1 + w / 8;
    const raw = new Uint8Array(row * h);
    const bomb = png(w, h, 1, 0, raw);
    await assert.rejects(
      () => caseWithMask(dir, bomb, 0.75),
      (e: Error) => {
        assert.ok(e instanceof RangeError, String(e));
        assert.equal(
          e.message,
          `Cannot read tissue mask "${
            join(dir, "QVT-24-072.tissue.png")
          }": the image is 40000 × 30000 pixels (1200 megapixels), more than the limit of 100 megapixels (see "Input limits" in the README); give a coarser image`,
        );
        return true;
      },
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("checkPngBounds() refuses image data that inflates past what the size needs", async () => {
  // a 16 × 16 greyscale image needs 16 · (1 + 16) = 272 bytes; this one inflates to 20 MB
  const bomb = png(16, 16, 8, 0, new Uint8Array(20_000_000));
  await assert.rejects(
    () => checkPngBounds(bomb, { what: "tissue mask", fileName: "m.png", maxPixels: 1e8 }),
    /Cannot read tissue mask "m\.png": the image data inflates to more than the 272 bytes a 16 × 16 image needs/,
  );
  // exactly the size needed is fine
  const fine = png(16, 16, 8, 0, new Uint8Array(272));
  assert.equal(
    (await checkPngBounds(fine, { what: "tissue mask", fileName: "m.png", maxPixels: 1e8 }))?.width,
    16,
  );
  // the same through a slide thumbnail
  const dir = Deno.makeTempDirSync();
  try {
    const path = join(dir, "QVT-24-072.thumb.png");
    writeFileSync(path, bomb);
    await assert.rejects(
      () => readSlideImage(path, { mpp: 16, slideMpp: 0.5 }),
      /inflates to more than the 272 bytes/,
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("loadCase() refuses a noisy mask that traces into too many vertices, and an absurd mask extent", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    // a checkerboard: every tissue pixel its own polygon of 4 vertices; 2000² / 2 · 4 = 8 M vertices
    const n = 2000;
    const data = new Uint8Array(n * n);
    for (let y = 0; y < n; y++) {
      for (let x = 0; x < n; x++) {
        data[y * n + x] = (x + y) % 2 === 0 ? 255 : 0;
      }
    }
    const noisy = encode({ width: n, height: n, data, channels: 1, depth: 8 });
    // 2000 px at 60 µm cover 120 × 120 mm: refused as no slide's size first
    await assert.rejects(() => caseWithMask(dir, noisy, 60), /the mask covers 120 × 120 mm/);
    // at 15 µm/px the mask is 30 × 30 mm; the slide 30 × 20 mm does not fit, so use an unsized slide
    await assert.rejects(
      async () => {
        const annotations = join(dir, "u.geojson");
        writeFileSync(
          annotations,
          JSON.stringify({
            type: "FeatureCollection",
            slide: { mpp: 0.25 },
            features: [{
              type: "Feature",
              properties: { role: "figure" },
              geometry: { type: "Point", coordinates: [5, 5] },
            }],
          }),
        );
        writeFileSync(join(dir, "noisy.png"), noisy);
        await loadCase({
          annotationsPath: annotations,
          tissueMaskPath: join(dir, "noisy.png"),
          maskMpp: 15,
        });
      },
      (e: Error) =>
        e instanceof RangeError &&
        e.message.startsWith(
          `Cannot read tissue mask "${
            join(dir, "noisy.png")
          }": its outline traces into more vertices than the limit of 3,000,000`,
        ),
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
  assert.throws(
    () =>
      maskToPolygons({
        width: 4,
        height: 4,
        data: new Uint8Array([1, 0, 1, 0, 0, 1, 0, 1, 1, 0, 1, 0, 0, 1, 0, 1]),
      }, { scaleX: 1, scaleY: 1, maxVertices: 20 }),
    MaskOutlineTooLargeError,
  );
});
