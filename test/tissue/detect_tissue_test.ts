/**
 * detectTissue() on small drawn images (no slide file, no OpenSlide needed).
 * Colours follow the Beer–Lambert law with the haematoxylin and eosin
 * optical-density vectors of Ruifrok and Johnston (2001, Anal Quant Cytol
 * Histol 23:291–299; values from memory, M).
 */

import { strict as assert } from "node:assert";
import { detectTissue } from "../../lib/tissue/detect_tissue.ts";
import { generateSyntheticSlide } from "../../lib/demo/synthetic_slide.ts";
import { buildValidRegion } from "../../lib/geometry/valid_region.ts";
import { multiPolygonAreaPx2 } from "../../lib/geometry/planar_area.ts";
import { polygonOverlapArea } from "../../lib/geometry/window_overlap.ts";
import type { MultiPolygonPx, RgbImage } from "../../lib/types.ts";

const GLASS = [236, 236, 240];
const H = [0.65, 0.704, 0.286], E = [0.072, 0.99, 0.105];

/** Glass colour times 10^(−OD) of `e` units of eosin and `h` of haematoxylin. */
function stained(e: number, h: number): number[] {
  return GLASS.map((g, c) => Math.round(g * Math.pow(10, -(e * E[c] + h * H[c]))));
}

function canvas(width: number, height: number): RgbImage {
  const data = new Uint8Array(width * height * 3);
  for (let k = 0; k < width * height; k++) data.set(GLASS, 3 * k);
  return { width, height, data };
}

function fill(img: RgbImage, x0: number, y0: number, x1: number, y1: number, rgb: number[]) {
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) img.data.set(rgb, 3 * (y * img.width + x));
  }
}

function disc(img: RgbImage, cx: number, cy: number, r: number, rgb: number[]) {
  for (let y = Math.floor(cy - r); y <= cy + r; y++) {
    for (let x = Math.floor(cx - r); x <= cx + r; x++) {
      if ((x - cx) ** 2 + (y - cy) ** 2 <= r * r) img.data.set(rgb, 3 * (y * img.width + x));
    }
  }
}

const rect = (x0: number, y0: number, x1: number, y1: number): [number, number][] => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
  [x0, y0],
];

function overlap(a: MultiPolygonPx, x0: number, y0: number, x1: number, y1: number): number {
  return polygonOverlapArea(a, [rect(x0, y0, x1, y1)]);
}

Deno.test("detectTissue() keeps pale tissue and drops a dark grey shadow", () => {
  // 10 µm/px; a strongly stained block, a pale block (eosin 0.05), a neutral shadow band
  const img = canvas(200, 120);
  fill(img, 20, 20, 80, 100, stained(0.3, 0.1));
  fill(img, 110, 30, 160, 90, stained(0.05, 0.012));
  fill(img, 0, 0, 8, 120, [150, 150, 153]); // shadow along the left edge
  fill(img, 180, 0, 200, 120, [40, 40, 41]); // a dark, neutral edge of the slide
  const t = detectTissue(img, { mppX: 10, mppY: 10 });
  assert.equal(t.polygons.length, 2);
  assert.ok(overlap(t.polygons, 110, 30, 160, 90) > 0.95 * 3000, "the pale block is tissue");
  assert.equal(overlap(t.polygons, 0, 0, 8, 120), 0, "the shadow is not");
  assert.equal(overlap(t.polygons, 180, 0, 200, 120), 0, "the dark edge is not");
  assert.deepEqual(t.warnings, []);
});

Deno.test("detectTissue() on glass alone finds nothing and warns", () => {
  const img = canvas(80, 60);
  // faint noise: ±2 levels, the same in all channels or not
  for (let k = 0; k < img.data.length; k++) img.data[k] += (k * 7919) % 5 - 2;
  const t = detectTissue(img, { mppX: 16, mppY: 16, source: "QVT-24-S10.png" });
  assert.deepEqual(t.polygons, []);
  assert.equal(t.areaMm2, 0);
  assert.equal(t.warnings.length, 1);
  assert.match(t.warnings[0], /^No tissue was found on QVT-24-S10\.png/);
});

Deno.test("detectTissue() fills holes below the area and keeps larger ones", () => {
  // 10 µm/px: a 0.04 mm² hole (20 × 20 px) is filled; a 0.36 mm² hole (60 × 60 px) stays
  const img = canvas(260, 160);
  fill(img, 10, 10, 250, 150, stained(0.3, 0.1));
  fill(img, 30, 60, 50, 80, GLASS);
  fill(img, 150, 50, 210, 110, GLASS);
  const t = detectTissue(img, { mppX: 10, mppY: 10 });
  assert.equal(t.polygons.length, 1);
  assert.equal(t.polygons[0].length, 2, "outer ring and one hole");
  assert.ok(overlap(t.polygons, 30, 60, 50, 80) === 400, "the small hole is filled");
  assert.ok(overlap(t.polygons, 155, 55, 205, 105) === 0, "the large hole stays glass");
  const fillStep = (t.method.steps as { step: string; filled?: number }[])
    .find((s) => s.step === "fill holes");
  assert.deepEqual(fillStep, { step: "fill holes", below_mm2: 0.1, filled: 1, kept_as_holes: 1 });
});

Deno.test("detectTissue() drops specks below the minimum area", () => {
  const img = canvas(200, 100);
  fill(img, 100, 20, 180, 80, stained(0.3, 0.1));
  disc(img, 30, 30, 3, [70, 66, 62]); // dark dust, 0.003 mm²
  disc(img, 40, 70, 6, stained(0.3, 0.3)); // a stained fleck, 0.011 mm²
  const t = detectTissue(img, { mppX: 10, mppY: 10 });
  assert.equal(t.polygons.length, 1);
  assert.equal(overlap(t.polygons, 0, 0, 90, 100), 0);
});

Deno.test("detectTissue() excludes blue, green and black pen marks and warns", () => {
  const img = canvas(300, 160);
  fill(img, 20, 20, 120, 140, stained(0.3, 0.1));
  fill(img, 150, 20, 170, 140, [30, 84, 182]); // blue ink
  fill(img, 200, 20, 220, 140, [40, 140, 90]); // green ink
  fill(img, 250, 20, 270, 140, [20, 20, 22]); // black ink
  const t = detectTissue(img, { mppX: 10, mppY: 10 });
  assert.equal(t.polygons.length, 1);
  assert.equal(overlap(t.polygons, 140, 0, 300, 160), 0);
  assert.ok(
    t.warnings.some((w) => /^Likely pen marks .* covering 0\.72 mm²/.test(w)),
    t.warnings[0],
  );
  // haematoxylin-rich tissue is not taken for ink
  const nuclei = canvas(100, 100);
  fill(nuclei, 20, 20, 80, 80, stained(0.05, 0.9));
  const n = detectTissue(nuclei, { mppX: 10, mppY: 10 });
  assert.equal(n.polygons.length, 1);
  assert.deepEqual(n.warnings, []);
});

Deno.test("detectTissue() warns about tissue at the border and about an unusually large share", () => {
  const img = canvas(100, 100);
  fill(img, 0, 0, 96, 96, stained(0.3, 0.1));
  const t = detectTissue(img, { mppX: 10, mppY: 10, source: "QVT-24-S11.png" });
  assert.ok(
    t.warnings.some((w) => w.startsWith("Tissue on QVT-24-S11.png touches the image border")),
  );
  assert.ok(
    t.warnings.some((w) => /^Tissue covers 9\d % of QVT-24-S11\.png, unusually much/.test(w)),
  );
});

Deno.test("detectTissue() measures disks in µm along each axis (unequal mpp)", () => {
  // mpp 5 × 20 µm: strands 40 µm wide (8 px along x, 2 px along y) are opened away,
  // blocks stay; results in level-0 px with scale 4 × 16
  const img = canvas(200, 70);
  fill(img, 10, 10, 18, 50, stained(0.3, 0.1)); // a vertical strand 40 µm wide
  fill(img, 30, 50, 190, 52, stained(0.3, 0.1)); // a horizontal strand 40 µm tall
  fill(img, 60, 5, 120, 25, stained(0.3, 0.1)); // a 300 × 400 µm block
  const t = detectTissue(img, { mppX: 5, mppY: 20, scaleX: 4, scaleY: 16 });
  assert.equal(t.polygons.length, 1);
  // block: 60 × 20 image px = 240 × 320 level-0 px, less corners rounded off by the
  // 25 µm disk (coarse along y: rows are 20 µm apart)
  const area = multiPolygonAreaPx2(t.polygons);
  assert.ok(area > 0.9 * 240 * 320 && area < 240 * 320, String(area));
  assert.ok(Math.abs(t.areaMm2 - area * 1.25 * 1.25 / 1e6) < 1e-12, "area in mm² at 1.25 µm/px");
});

Deno.test("detectTissue() records its parameters and gives the same result twice", () => {
  const img = canvas(120, 90);
  fill(img, 20, 20, 100, 70, stained(0.3, 0.1));
  const options = { mppX: 8, mppY: 8, closingRadiusUm: 30, minPieceMm2: 0.05, floorOd: 0.03 };
  const a = detectTissue(img, options), b = detectTissue(img, options);
  assert.deepEqual(a, b);
  const steps = a.method.steps as Record<string, unknown>[];
  assert.equal(steps.find((s) => s.step === "closing")!.disk_radius_um, 30);
  assert.equal(steps.find((s) => s.step === "drop specks")!.below_mm2, 0.05);
  assert.equal(steps.find((s) => s.step === "threshold")!.floor_od, 0.03);
  assert.equal(a.method.name, "hotfield tissue detection");
  assert.throws(() => detectTissue(img, { mppX: 0, mppY: 8 }), RangeError, "mppX must be");
});

Deno.test("detectTissue() on a generated thumbnail: IoU ≥ 0.93 and outlines that need no repair", () => {
  // 2000 × 1500 px at 4 µm/px; the coarsest level, 500 × 375 px at 16 µm/px
  const s = generateSyntheticSlide(5, { widthPx: 2000, heightPx: 1500, mpp: 4 });
  const t = detectTissue(s.thumbnail, { mppX: 16, mppY: 16, scaleX: 4, scaleY: 4 });
  const i = s.tissue.reduce((a, p) => a + polygonOverlapArea(t.polygons, p), 0);
  const score = i / (multiPolygonAreaPx2(t.polygons) + multiPolygonAreaPx2(s.tissue) - i);
  assert.ok(score >= 0.93, `IoU ${score}`);
  const v = buildValidRegion({
    tissue: [{ polygons: t.polygons, source: "t" }],
    tumour: [],
    exclude: [],
  });
  assert.deepEqual(v.warnings, [], "simplified outlines neither cross nor touch wrongly");
});
