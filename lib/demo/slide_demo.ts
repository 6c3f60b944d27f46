/**
 * The demo case that starts from a slide file: a generated pyramidal TIFF
 * (see `synthetic_slide.ts`) and a figures CSV, nothing else. Its tissue is
 * found on the slide when the report runs. Both files are made at run time
 * (the slide is 36 MB), never committed.
 *
 * @module
 */

import { join } from "node:path";
import { mkdirSync } from "node:fs";
import type { CaseInput } from "../annotations/read_case.ts";
import { writeFileAtomic } from "../io/write_atomic.ts";
import { normal, seededRandom } from "../random.ts";
import { inAny } from "./_shapes.ts";
import { roundTo } from "../numbers.ts";
import { DEMO_SEED } from "./demo_cohort.ts";
import { type SyntheticSlide, writeSyntheticSlide } from "./synthetic_slide.ts";

/** The case id of the slide demo (a fictional Quillmoor Veterinary Teaching Laboratory case). */
export const SLIDE_DEMO_ID = "QVT-24-009";

/** The written slide demo. */
export interface SlideDemoCase {
  /** The slide file, `<dir>/QVT-24-009.tiff`. */
  slidePath: string;
  /** The figures CSV, `<dir>/QVT-24-009.figures.csv` (x, y in level-0 px, label, score). */
  figuresPath: string;
  /** What `loadCase` reads: the slide and the figures only. */
  input: CaseInput;
  /** The generated slide and its true outlines. */
  slide: SyntheticSlide;
}

/**
 * Writes the slide demo case into `dir`: a 4000 × 3000 px slide at 2 µm/px
 * (8 × 6 mm) and a figures CSV with a dense focus of mitotic figures, a
 * sparse background and some look-alikes, all placed on the true tissue.
 *
 * @param dir The folder (created when missing).
 * @param seed The seed; equal seeds give equal files. @default DEMO_SEED
 * @returns The paths, the case input and the slide.
 *
 * @example Writing the case (needs write permission)
 * ```ts
 * import { writeSlideDemoCase } from "hotfield";
 * if ((await Deno.permissions.query({ name: "write" })).state === "granted") {
 *   const dir = Deno.makeTempDirSync();
 *   const c = writeSlideDemoCase(dir, 24);
 *   if (!c.input.slidePath?.endsWith("QVT-24-009.tiff") || c.input.annotationsPath) throw new Error();
 *   Deno.removeSync(dir, { recursive: true });
 * }
 * ```
 */
export function writeSlideDemoCase(dir: string, seed: number = DEMO_SEED): SlideDemoCase {
  mkdirSync(dir, { recursive: true });
  const slidePath = join(dir, `${SLIDE_DEMO_ID}.tiff`);
  const figuresPath = join(dir, `${SLIDE_DEMO_ID}.figures.csv`);
  const slide = writeSyntheticSlide(slidePath, seed, {
    id: SLIDE_DEMO_ID,
    widthPx: 4000,
    heightPx: 3000,
    mpp: 2,
  });
  writeFileAtomic(figuresPath, slideDemoFiguresCsv(slide, seed));
  return {
    slidePath,
    figuresPath,
    input: { slidePath, figuresPath, figureUnits: "px" },
    slide,
  };
}

/**
 * The figures CSV of the slide demo: `x,y,label,score` rows in level-0 px,
 * every point on the true tissue (outside the glass hole).
 *
 * @param slide The generated slide.
 * @param seed The seed.
 * @returns RFC 4180 CSV text with a header line.
 *
 * @example The CSV header
 * ```ts
 * import { generateSyntheticSlide } from "./synthetic_slide.ts";
 * import { slideDemoFiguresCsv } from "./slide_demo.ts";
 * const s = generateSyntheticSlide(3, { widthPx: 800, heightPx: 600, mpp: 10 });
 * const csv = slideDemoFiguresCsv(s, 3);
 * if (!csv.startsWith("x,y,label,score\n")) throw new Error(csv.slice(0, 40));
 * ```
 */
export function slideDemoFiguresCsv(slide: SyntheticSlide, seed: number): string {
  const random = seededRandom(seed + 9);
  const rows = ["x,y,label,score"];
  const W = slide.widthPx, H = slide.heightPx;
  // a focus in the main piece: its bounding box centre moved towards the lower left
  const ring = slide.tissue[0][0];
  const xs = ring.map((p) => p[0]), ys = ring.map((p) => p[1]);
  const cx = Math.min(...xs) * 0.6 + Math.max(...xs) * 0.4;
  const cy = Math.min(...ys) * 0.3 + Math.max(...ys) * 0.7;
  const add = (x: number, y: number, label: string, score: number) => {
    if (x < 0 || y < 0 || x > W || y > H || !inAny(slide.tissue, x, y)) return false;
    rows.push(`${roundTo(x, 1)},${roundTo(y, 1)},${label},${score.toFixed(3)}`);
    return true;
  };
  for (let n = 0, tries = 0; n < 40 && tries < 4000; tries++) {
    if (
      add(
        cx + 180 * normal(random),
        cy + 140 * normal(random),
        "mitotic figure",
        0.7 + 0.3 * random(),
      )
    ) n++;
  }
  for (let n = 0, tries = 0; n < 30 && tries < 4000; tries++) {
    if (add(random() * W, random() * H, "mitotic figure", 0.5 + 0.5 * random())) n++;
  }
  for (let n = 0, tries = 0; n < 25 && tries < 4000; tries++) {
    if (add(random() * W, random() * H, "apoptotic body", 0.3 + 0.6 * random())) n++;
  }
  return rows.join("\n") + "\n";
}
