/**
 * The invented demo cohort of the fictional Quillmoor Veterinary Teaching
 * Laboratory: eight cases generated from one seed, as plain objects.
 *
 * Every case is a GeoJSON FeatureCollection in level-0 pixels (x right,
 * y down) with a `slide` foreign member and features whose
 * `properties.role` is `tissue`, `tumour`, `exclude`, `figure` or `field`.
 * One case takes its tissue from a PNG mask and one its figures from a CSV
 * file; those two also get a case file tying the pieces together.
 *
 * All numbers are invented. Coordinates are rounded to 0.1 px and scores to
 * 0.001, so the same seed always gives the same bytes.
 *
 * @module
 */

import type { PolygonPx, Ring, Vec2 } from "../types.ts";
import { type Random, seededRandom } from "../random.ts";
import {
  blobRing,
  type Frame,
  gaussianPoint,
  inAny,
  inPolygon,
  inRing,
  polygonArea,
  randomProfile,
  rasterize,
  reversed,
  toSlide,
} from "./_shapes.ts";
import { type CaseRecipe, DEMO_RECIPES, LOOKALIKES } from "./demo_recipes.ts";
import { roundTo } from "../numbers.ts";
import { px2ToMm2, pxToUm, umToPx } from "../units.ts";
import { regionBBox } from "../geometry/region_bbox.ts";

/** The seed `deno task demo:data` uses for data/demo/. */
export const DEMO_SEED = 24;

/** A GeoJSON geometry as written by the generators (pixels). */
export type DemoGeometry =
  | { type: "Point"; coordinates: Vec2 }
  | { type: "MultiPoint"; coordinates: Vec2[] }
  | { type: "Polygon"; coordinates: PolygonPx }
  | { type: "MultiPolygon"; coordinates: PolygonPx[] };

/** A GeoJSON feature with hotfield's roles. */
export interface DemoFeature {
  type: "Feature";
  properties: Record<string, string | number>;
  geometry: DemoGeometry;
}

/** The `slide` foreign member. */
export interface DemoSlide {
  id: string;
  mpp: number | [number, number];
  width: number;
  height: number;
}

/** A GeoJSON FeatureCollection with the `slide` foreign member. */
export interface DemoFeatureCollection {
  type: "FeatureCollection";
  slide: DemoSlide;
  features: DemoFeature[];
}

/** One row of a figures CSV (header `x,y,label,score`). */
export interface DemoFigureRow {
  xPx: number;
  yPx: number;
  label: string;
  score: number;
}

/** A tissue mask: 8-bit greyscale, nonzero = tissue, square pixels of `umPerPx`. */
export interface DemoMask {
  width: number;
  height: number;
  /** Micrometres per mask pixel (the mask's own scale, not the slide's). */
  umPerPx: number;
  /** Row-major pixels, 0 or 255. */
  data: Uint8Array;
}

/** One invented case. */
export interface DemoCase {
  caseId: string;
  /** Tumour type, e.g. "canine cutaneous mast cell tumour". */
  tumourType: string;
  /** One sentence: what the case is there to show. */
  shows: string;
  /** Id of the grading scheme that fits the tumour type (lib/standards/schemes). */
  scheme: string;
  /** The annotation file. */
  annotations: DemoFeatureCollection;
  /** Figures given in a CSV instead of the annotation file. */
  figuresCsv?: DemoFigureRow[];
  /** Tissue given as a PNG mask instead of polygons. */
  tissueMask?: DemoMask;
  /** For a mask case: the tissue polygons the mask was rasterized from (px). */
  maskDrawnFrom?: PolygonPx[];
}

/**
 * Generates the demo cohort from a seed.
 *
 * Each case draws from its own generator (`seed·1000 + case number`), so a
 * change to one recipe leaves the other cases' bytes as they were.
 *
 * @param seed Any integer. @default DEMO_SEED
 * @returns Eight cases, `QVT-24-001` … `QVT-24-008`, as plain objects.
 *
 * @example Eight cases with the slide member
 * ```ts
 * import { generateDemoCohort } from "./demo_cohort.ts";
 * const cohort = generateDemoCohort();
 * if (cohort.length !== 8 || cohort[0].annotations.slide.id !== "QVT-24-001") {
 *   throw new Error(`${cohort.length} cases, first ${cohort[0]?.annotations.slide.id}`);
 * }
 * ```
 */
export function generateDemoCohort(seed: number = DEMO_SEED): DemoCase[] {
  return DEMO_RECIPES.map((recipe, i) => generateCase(recipe, seededRandom(seed * 1000 + i + 1)));
}

function mppPair(mpp: number | [number, number]): [number, number] {
  return typeof mpp === "number" ? [mpp, mpp] : mpp;
}

function generateCase(r: CaseRecipe, random: Random): DemoCase {
  const [mppX, mppY] = mppPair(r.mpp);
  const mpp = { mppX, mppY };
  const mmX = (mm: number) => umToPx([mm * 1000, 0], mpp)[0];
  const mmY = (mm: number) => umToPx([0, mm * 1000], mpp)[1];
  const slide: DemoSlide = {
    id: r.caseId,
    mpp: r.mpp,
    width: Math.round(mmX(r.slideMm[0])),
    height: Math.round(mmY(r.slideMm[1])),
  };
  // The frame is set in µm and converted per axis, so shapes keep their
  // physical form when the pixel is not square.
  const frame: Frame = {
    cx: mmX(r.tissue.cxMm),
    cy: mmY(r.tissue.cyMm),
    rx: mmX(r.tissue.rxMm),
    ry: mmY(r.tissue.ryMm),
    rotation: r.tissue.rotation,
  };
  // Rotation mixes axes; with mppX ≈ mppY the shear this introduces is tiny.

  // Tissue: one irregular main piece with holes, plus fragments.
  const mainOuter = blobRing(frame, randomProfile(random, 0.25), r.tissue.vertices, {
    jitter: 0.012,
    random,
  });
  const holes: Ring[] = [];
  const placed: [number, number, number][] = [];
  const keepClear = [...r.foci, ...r.fields.filter((f) => !f.date)].map((p) => [p.u, p.v]);
  for (let tries = 0; holes.length < r.tissue.holes && tries < 500; tries++) {
    const rad = 0.5 * Math.sqrt(random());
    const ang = 2 * Math.PI * random();
    const u = rad * Math.cos(ang), v = rad * Math.sin(ang);
    const size = 0.03 + 0.04 * random();
    if (placed.some(([pu, pv, ps]) => Math.hypot(pu - u, pv - v) < 1.4 * (ps + size))) continue;
    // Keep holes off the foci and the readers' fields, so that a field lies
    // in tumour unless a recipe means otherwise.
    if (keepClear.some(([ku, kv]) => Math.hypot(ku - u, kv - v) < 0.2 + size)) continue;
    placed.push([u, v, size]);
    const ring = blobRing(frame, randomProfile(random, 0.3, 4), 28 + Math.floor(12 * random()), {
      u0: u,
      v0: v,
      scale: size,
    });
    holes.push(r.sameWinding ? ring : reversed(ring));
  }
  const tissue: PolygonPx[] = [[mainOuter, ...holes]];
  const mainBox = regionBBox([[mainOuter]])!;
  for (const frag of r.fragments) {
    const reach = Math.max(mainBox[2] - frame.cx, frame.cx - mainBox[0]);
    const dist = reach + mmX(frag.rMm) * 1.5 + mmX(0.3);
    const f: Frame = {
      cx: frame.cx + dist * Math.cos(frag.angle),
      cy: frame.cy + dist * Math.sin(frag.angle) * 0.6,
      rx: mmX(frag.rMm),
      ry: mmY(frag.rMm * 0.75),
      rotation: random() * Math.PI,
    };
    tissue.push([blobRing(f, randomProfile(random, 0.25), 90, { jitter: 0.02, random })]);
  }
  for (const p of tissue) {
    const [x0, y0, x1, y1] = regionBBox([[p[0]]])!;
    if (x0 < 0 || y0 < 0 || x1 > slide.width || y1 > slide.height) {
      throw new Error(`Demo recipe ${r.caseId}: tissue leaves the slide`);
    }
  }

  // Tumour: inside the main tissue piece (radius ≤ 0.67 of the frame).
  const tumourRing = blobRing(frame, randomProfile(random, 0.12), 360, {
    scale: r.tumourScale,
    u0: 0.02,
    v0: -0.02,
    jitter: 0.01,
    random,
  });
  const tumour: PolygonPx = [tumourRing];

  // Exclusions.
  const excludes: { reason: string; polygons: PolygonPx[]; figures: number }[] = r.excludes.map(
    (e) => {
      const [cx, cy] = toSlide(frame, e.u, e.v);
      const f: Frame = { cx, cy, rx: mmX(e.rxMm), ry: mmY(e.ryMm), rotation: e.rotation };
      const ring = blobRing(f, randomProfile(random, 0.2, 4), 48, { jitter: 0.03, random });
      return { reason: e.reason, polygons: [[ring]], figures: e.figures };
    },
  );

  // Figures.
  const figures: DemoFigureRow[] = [];
  const score = (lo: number, hi: number) => roundTo(lo + (hi - lo) * random(), 3);
  const mitotic = (x: number, y: number) =>
    figures.push({
      xPx: roundTo(x, 1),
      yPx: roundTo(y, 1),
      label: "mitotic figure",
      score: score(0.55, 1),
    });
  for (const focus of r.foci) {
    const [cx, cy] = toSlide(frame, focus.u, focus.v);
    for (let k = 0; k < focus.n; k++) {
      const [sx, sy] = umToPx([focus.sigmaUm, focus.sigmaUm], mpp);
      const [x, y] = gaussianPoint(random, cx, cy, sx, sy);
      if (inAny(tissue, x, y)) mitotic(x, y);
    }
  }
  const tumourBox = regionBBox([[tumourRing]])!;
  const tumourMm2 = px2ToMm2(polygonArea(tumour), mpp);
  const uniformIn = (accept: (x: number, y: number) => boolean, box: number[]): Vec2 => {
    for (;;) {
      const x = box[0] + (box[2] - box[0]) * random();
      const y = box[1] + (box[3] - box[1]) * random();
      if (accept(x, y)) return [x, y];
    }
  };
  const nBackground = Math.round(r.backgroundPerMm2 * tumourMm2);
  for (let k = 0; k < nBackground; k++) {
    mitotic(
      ...uniformIn((x, y) => inPolygon(tissue[0], x, y) && inRing(tumourRing, x, y), tumourBox),
    );
  }
  const tissueMm2 = px2ToMm2(tissue.reduce((a, p) => a + polygonArea(p), 0), mpp);
  const nOutside = Math.round(r.outsidePerMm2 * Math.max(0, tissueMm2 - tumourMm2));
  for (let k = 0; k < nOutside; k++) {
    mitotic(
      ...uniformIn((x, y) => inPolygon(tissue[0], x, y) && !inRing(tumourRing, x, y), mainBox),
    );
  }
  const lookalike = (x: number, y: number) => {
    let t = random(), label = LOOKALIKES[0][0];
    for (const [l, p] of LOOKALIKES) {
      label = l;
      if ((t -= p) < 0) break;
    }
    figures.push({ xPx: roundTo(x, 1), yPx: roundTo(y, 1), label, score: score(0.05, 0.6) });
  };
  for (let k = 0; k < r.lookalikes; k++) {
    lookalike(...uniformIn((x, y) => inPolygon(tissue[0], x, y), tumourBox));
  }
  for (const e of excludes) {
    const ring = e.polygons[0][0];
    const box = regionBBox([[ring]])!;
    for (let k = 0; k < e.figures; k++) {
      const [x, y] = uniformIn((x, y) => inRing(ring, x, y), box);
      // In necrosis and artefact most candidates are lookalikes, some look mitotic.
      if (k % 3 === 0) mitotic(x, y);
      else lookalike(x, y);
    }
  }
  if (r.figureStyle === "csv") {
    // A detector also reports weak mitotic candidates.
    const nWeak = Math.round(figures.length * 0.25);
    for (let k = 0; k < nWeak; k++) {
      const [x, y] = uniformIn((x, y) => inPolygon(tissue[0], x, y), tumourBox);
      figures.push({
        xPx: roundTo(x, 1),
        yPx: roundTo(y, 1),
        label: "mitotic figure",
        score: score(0.1, 0.5),
      });
    }
  }

  // Fields.
  const fieldFeatures: DemoFeature[] = r.fields.map((fr) => {
    const [cx, cy] = toSlide(frame, fr.u, fr.v);
    const properties: Record<string, string | number> = { role: "field", reader: fr.reader };
    if (fr.label) properties.label = fr.label;
    if (fr.date) properties.date = fr.date;
    if (fr.circles) {
      // Rows of five microscope fields, 10% apart, centred at (u, v).
      const { n, diameterMm } = fr.circles;
      properties.field_diameter_mm = diameterMm;
      const stepUm = diameterMm * 1000 * 1.1;
      const rows = Math.ceil(n / 5);
      const centres: Vec2[] = [];
      for (let k = 0; k < n; k++) {
        const col = k % 5, row = Math.floor(k / 5);
        const [ox, oy] = umToPx([(col - 2) * stepUm, (row - (rows - 1) / 2) * stepUm], mpp);
        centres.push([roundTo(cx + ox, 1), roundTo(cy + oy, 1)]);
      }
      return {
        type: "Feature",
        properties,
        geometry: { type: "MultiPoint", coordinates: centres },
      };
    }
    if (fr.squares) {
      const half = (fr.squares.sideMm * 1000) / 2;
      const squares: PolygonPx[] = [[fr.u, fr.v], ...fr.squares.more].map(([u, v]) => {
        const [sx, sy] = toSlide(frame, u, v);
        const ring: Vec2[] = [[-half, -half], [half, -half], [half, half], [-half, half]].map((
          [dx, dy],
        ) => {
          const [ox, oy] = umToPx([dx, dy], mpp);
          return [roundTo(sx + ox, 1), roundTo(sy + oy, 1)];
        });
        return [[...ring, ring[0]]];
      });
      return {
        type: "Feature",
        properties,
        geometry: { type: "MultiPolygon", coordinates: squares },
      };
    }
    if (!fr.polygon) {
      return {
        type: "Feature",
        properties,
        geometry: { type: "Point", coordinates: [roundTo(cx, 1), roundTo(cy, 1)] },
      };
    }
    // A hand-drawn quadrilateral of about 2.37 mm² (1777.6 × 1333.2 µm).
    const hw = 1777.6 / 2, hh = 1333.2 / 2;
    const corners: Vec2[] = [[-hw, -hh], [hw, -hh], [hw, hh], [-hw, hh]].map(([dx, dy]) => {
      const [ox, oy] = umToPx([dx + 40 * (random() - 0.5), dy + 40 * (random() - 0.5)], mpp);
      return [roundTo(cx + ox, 1), roundTo(cy + oy, 1)];
    });
    return {
      type: "Feature",
      properties,
      geometry: { type: "Polygon", coordinates: [[...corners, corners[0]]] },
    };
  });

  // Assemble the annotation file.
  const features: DemoFeature[] = [];
  let tissueMask: DemoMask | undefined;
  if (r.maskUmPerPx) {
    const cellPxX = umToPx([r.maskUmPerPx, 0], mpp)[0];
    const width = Math.ceil(slide.width / cellPxX);
    const height = Math.ceil(pxToUm([0, slide.height], mpp)[1] / r.maskUmPerPx);
    tissueMask = {
      width,
      height,
      umPerPx: r.maskUmPerPx,
      data: rasterize(tissue, width, height, cellPxX),
    };
  } else if (tissue.length === 1) {
    features.push({
      type: "Feature",
      properties: { role: "tissue" },
      geometry: { type: "Polygon", coordinates: tissue[0] },
    });
  } else {
    features.push({
      type: "Feature",
      properties: { role: "tissue" },
      geometry: { type: "MultiPolygon", coordinates: tissue },
    });
  }
  features.push({
    type: "Feature",
    properties: { role: "tumour" },
    geometry: { type: "Polygon", coordinates: tumour },
  });
  for (const e of excludes) {
    features.push({
      type: "Feature",
      properties: { role: "exclude", reason: e.reason },
      geometry: { type: "Polygon", coordinates: e.polygons[0] },
    });
  }
  let figuresCsv: DemoFigureRow[] | undefined;
  if (r.figureStyle === "csv") {
    figuresCsv = figures;
  } else if (r.figureStyle === "annotator") {
    // An annotator marks figures in one batch (MultiPoint, no label: the
    // default "mitotic figure") and lookalikes one by one with a confidence.
    const batch = figures.filter((f) => f.label === "mitotic figure");
    features.push({
      type: "Feature",
      properties: { role: "figure" },
      geometry: { type: "MultiPoint", coordinates: batch.map((f) => [f.xPx, f.yPx]) },
    });
    for (const f of figures) {
      if (f.label === "mitotic figure") continue;
      features.push({
        type: "Feature",
        properties: { role: "figure", label: f.label, score: f.score },
        geometry: { type: "Point", coordinates: [f.xPx, f.yPx] },
      });
    }
  } else {
    for (const f of figures) {
      features.push({
        type: "Feature",
        properties: { role: "figure", label: f.label, score: f.score },
        geometry: { type: "Point", coordinates: [f.xPx, f.yPx] },
      });
    }
  }
  features.push(...fieldFeatures);
  return {
    caseId: r.caseId,
    tumourType: r.tumourType,
    shows: r.shows,
    scheme: r.scheme,
    annotations: { type: "FeatureCollection", slide, features },
    ...(figuresCsv ? { figuresCsv } : {}),
    ...(tissueMask ? { tissueMask, maskDrawnFrom: tissue } : {}),
  };
}
