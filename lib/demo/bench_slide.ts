/**
 * A seeded, invented benchmark slide at whole-slide scale: 30 × 20 mm at
 * 0.25 µm/px (120,000 × 80,000 level-0 px), a tissue outline of about 20,000
 * vertices with 40 holes, a tumour outline, four exclusions and 250,000
 * figure candidates (clustered foci over a background, mixed labels and
 * scores). Level-0 pixels, x right, y down.
 *
 * @module
 */

import type { PolygonPx } from "../types.ts";
import { normal, seededRandom } from "../random.ts";
import { blobRing, type Frame, profileAt, randomProfile, reversed, toSlide } from "./_shapes.ts";
import { roundTo } from "../numbers.ts";
import { umToPx } from "../units.ts";

/** Options of {@linkcode generateBenchSlide}. */
export interface BenchSlideOptions {
  /** Number of figure candidates. @default 250000 */
  figures?: number;
  /** Vertices of the tissue outline. @default 20000 */
  tissueVertices?: number;
  /** Holes in the tissue. @default 40 */
  holes?: number;
}

/** The benchmark slide as plain data. */
export interface BenchSlide {
  slide: { id: string; mpp: number; width: number; height: number };
  /** The tissue polygon (outer ring, then holes). */
  tissue: PolygonPx;
  tumour: PolygonPx;
  exclude: { reason: string; polygon: PolygonPx }[];
  /** Figure candidates, columnar. */
  figures: {
    xPx: Float64Array;
    yPx: Float64Array;
    /** Index into `labels`. */
    labelIndex: Uint8Array;
    labels: string[];
    /** Score in [0, 1], rounded to 0.001. */
    score: Float64Array;
  };
}

const LABELS = ["mitotic figure", "apoptotic body", "pyknotic nucleus", "hyperchromatic nucleus"];

/**
 * Generates the benchmark slide.
 *
 * @param seed Any integer; equal seeds give equal slides.
 * @param options Sizes (defaults give the full benchmark).
 * @returns The slide, its outlines and its figure candidates.
 *
 * @example A small version
 * ```ts
 * import { generateBenchSlide } from "./bench_slide.ts";
 * const s = generateBenchSlide(1, { figures: 1000, tissueVertices: 500, holes: 3 });
 * if (s.figures.xPx.length !== 1000) throw new Error(`${s.figures.xPx.length} figures, expected 1000`);
 * if (s.tissue.length !== 4) throw new Error(`${s.tissue.length} tissue rings, expected the outline and 3 holes`);
 * if (s.slide.width !== 120000 || s.slide.height !== 80000) throw new Error(`slide ${s.slide.width} × ${s.slide.height} px`);
 * ```
 */
export function generateBenchSlide(seed: number, options: BenchSlideOptions = {}): BenchSlide {
  const { figures: nFigures = 250_000, tissueVertices = 20_000, holes: nHoles = 40 } = options;
  const random = seededRandom(seed);
  const mpp = 0.25;
  const slide = { id: "QVT-24-B01", mpp, width: 120_000, height: 80_000 };
  const frame: Frame = { cx: 60_000, cy: 40_000, rx: 46_000, ry: 29_000, rotation: 0.12 };
  const profile = randomProfile(random, 0.22, 10);
  const outer = blobRing(frame, profile, tissueVertices, { jitter: 0.004, random });
  const holes = [];
  const placed: [number, number, number][] = [];
  for (let tries = 0; holes.length < nHoles && tries < 20_000; tries++) {
    const rad = 0.62 * Math.sqrt(random());
    const ang = 2 * Math.PI * random();
    const u = rad * Math.cos(ang), v = rad * Math.sin(ang);
    const size = 0.01 + 0.02 * random();
    if (placed.some(([pu, pv, ps]) => Math.hypot(pu - u, pv - v) < 1.5 * (ps + size))) continue;
    placed.push([u, v, size]);
    holes.push(
      reversed(blobRing(frame, randomProfile(random, 0.3, 4), 40, { u0: u, v0: v, scale: size })),
    );
  }
  const tissue: PolygonPx = [outer, ...holes];
  const tumour: PolygonPx = [
    blobRing(frame, randomProfile(random, 0.1), 2000, { scale: 0.62, jitter: 0.004, random }),
  ];
  const reasons = ["necrosis", "fold artefact", "out of focus", "haemorrhage"];
  const exclude = reasons.map((reason, k) => {
    const ang = k * Math.PI / 2 + 0.5;
    const [cx, cy] = toSlide(frame, 0.35 * Math.cos(ang), 0.35 * Math.sin(ang));
    const f: Frame = {
      cx,
      cy,
      rx: 3000 + 3000 * random(),
      ry: 2000 + 2000 * random(),
      rotation: random() * 3,
    };
    return {
      reason,
      polygon: [blobRing(f, randomProfile(random, 0.2, 4), 120, { jitter: 0.02, random })],
    };
  });

  // Figures: 40 % in foci, the rest spread over the tissue blob (uniform in
  // the normalized frame, tested against the smooth outline).
  const xPx = new Float64Array(nFigures), yPx = new Float64Array(nFigures);
  const labelIndex = new Uint8Array(nFigures), score = new Float64Array(nFigures);
  const foci = Array.from({ length: 30 }, () => {
    const rad = 0.55 * Math.sqrt(random()), ang = 2 * Math.PI * random();
    return {
      at: toSlide(frame, rad * Math.cos(ang), rad * Math.sin(ang)),
      sigmaPx: umToPx([300 + 1200 * random(), 0], { mppX: mpp, mppY: mpp })[0],
      weight: 0.2 + random(),
    };
  });
  const totalWeight = foci.reduce((a, f) => a + f.weight, 0);
  const nFocus = Math.round(nFigures * 0.4);
  let i = 0;
  for (const f of foci) {
    const n = Math.round(nFocus * f.weight / totalWeight);
    for (let k = 0; k < n && i < nFocus; k++, i++) {
      xPx[i] = roundTo(f.at[0] + f.sigmaPx * normal(random), 1);
      yPx[i] = roundTo(f.at[1] + f.sigmaPx * normal(random), 1);
    }
  }
  while (i < nFigures) {
    const u = 2 * random() - 1, v = 2 * random() - 1;
    if (Math.hypot(u, v) > profileAt(profile, Math.atan2(v, u))) continue;
    const [x, y] = toSlide(frame, u, v);
    xPx[i] = roundTo(x, 1);
    yPx[i] = roundTo(y, 1);
    i++;
  }
  for (let k = 0; k < nFigures; k++) {
    const t = random();
    const label = t < 0.6 ? 0 : t < 0.8 ? 1 : t < 0.93 ? 2 : 3;
    labelIndex[k] = label;
    const s = label === 0 ? 0.3 + 0.7 * random() : 0.6 * random();
    score[k] = roundTo(s, 3);
  }
  return {
    slide,
    tissue,
    tumour,
    exclude,
    figures: { xPx, yPx, labelIndex, labels: LABELS, score },
  };
}

/**
 * Writes the benchmark slide as GeoJSON text (one Point feature per figure
 * candidate, each with `label` and `score`).
 *
 * @param s From {@linkcode generateBenchSlide}.
 * @param options `tissueOnly`: leave out the tumour and exclusions. @default false
 * @returns The FeatureCollection text.
 *
 * @example Tissue-only variant has no tumour
 * ```ts
 * import { benchSlideGeoJson, generateBenchSlide } from "./bench_slide.ts";
 * const s = generateBenchSlide(1, { figures: 10, tissueVertices: 100, holes: 1 });
 * const fc = JSON.parse(benchSlideGeoJson(s, { tissueOnly: true }));
 * if (fc.features.some((f: { properties: { role: string } }) => f.properties.role === "tumour")) {
 *   throw new Error("the tissue-only variant must have no tumour feature");
 * }
 * ```
 */
export function benchSlideGeoJson(s: BenchSlide, options: { tissueOnly?: boolean } = {}): string {
  const lines: string[] = [];
  const feature = (properties: Record<string, unknown>, geometry: unknown) =>
    lines.push(JSON.stringify({ type: "Feature", properties, geometry }));
  feature({ role: "tissue" }, { type: "Polygon", coordinates: s.tissue });
  if (!options.tissueOnly) {
    feature({ role: "tumour" }, { type: "Polygon", coordinates: s.tumour });
    for (const e of s.exclude) {
      feature({ role: "exclude", reason: e.reason }, { type: "Polygon", coordinates: e.polygon });
    }
  }
  const { xPx, yPx, labelIndex, labels, score } = s.figures;
  const labelJson = labels.map((l) => JSON.stringify(l));
  for (let k = 0; k < xPx.length; k++) {
    // Built by hand: JSON.stringify per point would dominate writing time.
    lines.push(
      `{"type":"Feature","properties":{"role":"figure","label":${
        labelJson[labelIndex[k]]
      },"score":${score[k]}},"geometry":{"type":"Point","coordinates":[${xPx[k]},${yPx[k]}]}}`,
    );
  }
  return `{"type":"FeatureCollection","slide":${JSON.stringify(s.slide)},"features":[\n${
    lines.join(",\n")
  }\n]}\n`;
}
