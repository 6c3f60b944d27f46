/**
 * Invented detector outputs for the demo cohort, to try `hotfield compare`:
 * a simulated mitotic-figure detector (seeded) that finds most reference
 * figures with a score and a small position error, misses some, and adds
 * false positives on lookalikes and background; one version misses a whole
 * focus. Written to `data/demo/compare/` with a manifest and a README:
 * `deno task demo:data`, or
 * `deno run --allow-read --allow-write lib/demo/detector_demo.ts [--out DIR]`.
 *
 * @module
 */

import { join } from "node:path";
import { parseArgs } from "node:util";
import { parseAnnotations } from "../annotations/read_annotations.ts";
import { prepareCase } from "../count/prepare_case.ts";
import { computeCountMap } from "../count/compute_count_map.ts";
import { findHotspot } from "../count/find_hotspot.ts";
import { makeWindow } from "../count/make_window.ts";
import { writeFileAtomic } from "../io/write_atomic.ts";
import { normal, type Random, seededRandom } from "../random.ts";
import type { CaseData, FigureSet } from "../types.ts";
import { DEMO_SEED, generateDemoCohort } from "./demo_cohort.ts";
import { demoCohortFiles } from "./demo_files.ts";

/** Options of {@linkcode simulateDetector}. */
export interface SimulateDetectorOptions {
  /** Seed of the simulation. */
  seed: number;
  /** Share of reference mitotic figures found. @default 0.85 */
  sensitivity?: number;
  /** Standard deviation of the position error along each axis, µm. @default 2 */
  jitterUm?: number;
  /** Share of lookalikes (other labels) reported as mitotic figures. @default 0.3 */
  lookalikeRate?: number;
  /** False positives on background, per reference mitotic figure. @default 0.3 */
  backgroundRate?: number;
  /** Reference figures within this circle (centre px, radius µm) are all missed. */
  missedFocus?: { centerPx: [number, number]; radiusUm: number };
}

/** One simulated detection, level-0 px, score in [0, 1] (0.001 steps). */
export interface Detection {
  /** x, level-0 px. */
  xPx: number;
  /** y, level-0 px. */
  yPx: number;
  /** Score in [0, 1]. */
  score: number;
}

/**
 * Simulates a detector on a case's figures: each reference figure labelled
 * "mitotic figure" is found with probability `sensitivity` (never inside
 * `missedFocus`), moved by a normal error of `jitterUm` per axis, and scored
 * high (0.35–1, mostly above 0.6); each figure with another label
 * (lookalikes) is reported with probability `lookalikeRate` with a lower
 * score (0–0.75); and `backgroundRate` false positives per mitotic figure
 * are put beside random figures, 15–80 µm away, with low scores (0–0.55).
 *
 * @param figures The case's figure points (pixels) with labels.
 * @param mpp Micrometres per pixel, x and y.
 * @param options Seed, rates, position error, a missed focus.
 * @returns Detections in a seeded, deterministic order (positions to 0.1 px).
 *
 * @example Equal seeds give equal detections
 * ```ts
 * import { simulateDetector } from "./detector_demo.ts";
 * const figures = {
 *   xPx: Float64Array.of(100, 200, 300), yPx: Float64Array.of(100, 100, 100),
 *   labelIndex: Uint32Array.of(0, 0, 1), labels: ["mitotic figure", "apoptotic body"],
 *   score: new Float64Array(3).fill(NaN), origin: Int32Array.of(0, 1, 2),
 * };
 * const a = simulateDetector(figures, [0.25, 0.25], { seed: 3 });
 * const b = simulateDetector(figures, [0.25, 0.25], { seed: 3 });
 * if (JSON.stringify(a) !== JSON.stringify(b)) throw new Error("equal seeds gave different detections");
 * ```
 */
export function simulateDetector(
  figures: FigureSet,
  mpp: [number, number],
  options: SimulateDetectorOptions,
): Detection[] {
  const random: Random = seededRandom(options.seed);
  const sens = options.sensitivity ?? 0.85;
  const jit = options.jitterUm ?? 2;
  const look = options.lookalikeRate ?? 0.3;
  const bg = options.backgroundRate ?? 0.3;
  const [mx, my] = mpp;
  const out: Detection[] = [];
  const push = (xPx: number, yPx: number, score: number) =>
    out.push({
      xPx: Math.round(xPx * 10) / 10,
      yPx: Math.round(yPx * 10) / 10,
      score: Math.round(Math.min(1, Math.max(0, score)) * 1000) / 1000,
    });
  const mitotic = figures.labels.indexOf("mitotic figure");
  let nMitotic = 0;
  const n = figures.xPx.length;
  for (let k = 0; k < n; k++) {
    const x = figures.xPx[k], y = figures.yPx[k];
    const u = random(), s = random(), dx = normal(random), dy = normal(random);
    if (figures.labelIndex[k] === mitotic) {
      nMitotic++;
      const f = options.missedFocus;
      if (f && Math.hypot((x - f.centerPx[0]) * mx, (y - f.centerPx[1]) * my) <= f.radiusUm) {
        continue;
      }
      if (u < sens) push(x + (dx * jit) / mx, y + (dy * jit) / my, 1 - 0.65 * s * s);
    } else if (u < look) {
      push(x + (dx * jit) / mx, y + (dy * jit) / my, 0.75 * s);
    }
  }
  const nBg = Math.round(bg * nMitotic);
  for (let b = 0; b < nBg && n > 0; b++) {
    const k = Math.floor(random() * n);
    const angle = 2 * Math.PI * random(), distUm = 15 + 65 * random();
    push(
      figures.xPx[k] + (Math.cos(angle) * distUm) / mx,
      figures.yPx[k] + (Math.sin(angle) * distUm) / my,
      0.55 * random(),
    );
  }
  return out;
}

/** One file of `data/demo/compare/`. */
export interface DetectorDemoFile {
  /** Path relative to `data/demo/compare/`. */
  path: string;
  /** The file's bytes. */
  bytes: Uint8Array;
}

/** The demo pairs: reference case, detector file, what it shows, simulation options. */
const PAIRS: {
  caseId: string;
  file: string;
  shows: string;
  options: Omit<SimulateDetectorOptions, "seed" | "missedFocus">;
  missFocus?: boolean;
}[] = [
  {
    caseId: "QVT-24-001",
    file: "QVT-24-001.detector.csv",
    shows: "A good detector on a clearly high case: the grade holds at every reasonable threshold.",
    options: { sensitivity: 0.9 },
  },
  {
    caseId: "QVT-24-003",
    file: "QVT-24-003.detector.csv",
    shows:
      "A borderline case: a fair detector whose class leaves the reference's above a threshold.",
    options: { sensitivity: 0.8 },
  },
  {
    caseId: "QVT-24-004",
    file: "QVT-24-004.detector.csv",
    shows: "Unequal pixel sides (0.2485 × 0.2512 µm) and many lookalikes reported as figures.",
    options: { sensitivity: 0.85, lookalikeRate: 0.6 },
  },
  {
    caseId: "QVT-24-006",
    file: "QVT-24-006.detector-missed-focus.csv",
    shows: "A detector that misses the strongest focus entirely: the hotspot moves to a " +
      "weaker focus and its count drops, though F1 stays fair.",
    options: { sensitivity: 0.9 },
    missFocus: true,
  },
];

const SCHEME = "canine-mct-2tier";

function csvText(rows: Detection[]): string {
  const out = ["x,y,score"];
  for (const r of rows) out.push(`${r.xPx},${r.yPx},${r.score}`);
  return out.join("\r\n") + "\r\n";
}

/**
 * The files of `data/demo/compare/`: one detector CSV per pair
 * (`x,y,score`, level-0 px), `manifest.csv` (paths relative to the folder)
 * and `README.md`. Pure: nothing is written.
 *
 * @param seed The demo seed (the reference cases are the demo cohort of that seed).
 * @returns The files, paths relative to `data/demo/compare/`.
 *
 * @example
 * ```ts
 * import { detectorDemoFiles } from "./detector_demo.ts";
 * const files = detectorDemoFiles();
 * if (!files.some((f) => f.path === "manifest.csv")) throw new Error("no manifest.csv");
 * ```
 */
export function detectorDemoFiles(seed: number = DEMO_SEED): DetectorDemoFile[] {
  const enc = new TextEncoder();
  const cohortFiles = demoCohortFiles(generateDemoCohort(seed), seed);
  const files: DetectorDemoFile[] = [];
  const manifest = ["reference,candidate,id,scheme"];
  PAIRS.forEach((pair, i) => {
    const name = `${pair.caseId}.geojson`;
    const file = cohortFiles.find((f) => f.path === name);
    if (!file) throw new Error(`The demo cohort has no ${name}`);
    const a = parseAnnotations(new TextDecoder().decode(file.bytes), { fileName: name });
    let missedFocus: SimulateDetectorOptions["missedFocus"];
    if (pair.missFocus) {
      const caseData: CaseData = {
        caseId: pair.caseId,
        slide: a.slide,
        tissue: a.tissue,
        tumour: a.tumour,
        exclude: a.exclude,
        figures: a.figures,
        fields: [],
        sources: [],
        warnings: [],
      };
      const prepared = prepareCase(caseData);
      const window = makeWindow({});
      const h = findHotspot(prepared, computeCountMap(prepared, window));
      if (h) missedFocus = { centerPx: h.centerPx, radiusUm: 700 };
    }
    const rows = simulateDetector(a.figures, [a.slide.mppX, a.slide.mppY], {
      ...pair.options,
      seed: seed * 100 + i + 1,
      missedFocus,
    });
    files.push({ path: pair.file, bytes: enc.encode(csvText(rows)) });
    manifest.push(`../${name},${pair.file},${pair.caseId},${SCHEME}`);
  });
  files.push({ path: "manifest.csv", bytes: enc.encode(manifest.join("\r\n") + "\r\n") });
  files.push({ path: "README.md", bytes: enc.encode(readme(seed)) });
  return files;
}

function readme(seed: number): string {
  const rows = PAIRS.map((p) => `| ${p.caseId} | \`${p.file}\` | ${p.shows} |`).join("\n");
  return `# Demo detector outputs: Quillmoor Veterinary Teaching Laboratory (invented)

Simulated outputs of a mitotic-figure detector on four cases of the demo cohort,
for trying \`hotfield compare\` and notebook 04. The reference of each pair is the
demo case in the folder above (\`../<case>.geojson\`).

- **Source:** synthetic, generated by \`lib/demo/detector_demo.ts\` with seed ${seed}
  (\`deno task demo:data\`). No slide, detector or reader is real.
- **Licence:** CC0 1.0 (public domain dedication).
- **Format:** figures CSV, header \`x,y,score\`, level-0 pixels of the reference slide,
  scores in [0, 1]; every row is a "mitotic figure" candidate.
- **How it was made:** each reference mitotic figure is found with a set probability
  (sensitivity), moved by a normal error of 2 µm per axis and given a mostly high score;
  some lookalikes (apoptotic bodies, pyknotic and hyperchromatic nuclei) are reported
  with lower scores; background false positives are put 15–80 µm from random figures
  with low scores. One detector misses every figure within 700 µm of the reference's
  hotspot centre.
- **manifest.csv** lists the pairs for \`hotfield compare manifest.csv --out DIR\`
  (columns reference, candidate, id, scheme; paths relative to this folder), graded
  with \`${SCHEME}\` (Kiupel et al., *Vet Pathol* 2011;48(1):147-155: ≥ 7 mitotic
  figures in 10 high-power fields).

| case | detector file | what it shows |
| --- | --- | --- |
${rows}

A comparison supports, and does not replace, validating a detector under local
guidelines; hotfield supports, never replaces, a pathologist's grade.
`;
}

/**
 * Writes {@linkcode detectorDemoFiles} under `outDir`.
 *
 * @param outDir Target folder (created as needed), e.g. `data/demo/compare`.
 * @param seed The demo seed.
 * @returns The paths written.
 *
 * @example Writing into a temporary folder (needs write permission)
 * ```ts
 * import { writeDetectorDemoData } from "./detector_demo.ts";
 * if ((await Deno.permissions.query({ name: "write" })).state === "granted") {
 *   const dir = Deno.makeTempDirSync();
 *   if (writeDetectorDemoData(dir).length !== 6) throw new Error("expected 6 files");
 *   Deno.removeSync(dir, { recursive: true });
 * }
 * ```
 */
export function writeDetectorDemoData(outDir: string, seed: number = DEMO_SEED): string[] {
  return detectorDemoFiles(seed).map((f) => {
    const path = join(outDir, f.path);
    writeFileAtomic(path, f.bytes);
    return path;
  });
}

if (import.meta.main) {
  const { values } = parseArgs({ args: Deno.args, options: { out: { type: "string" } } });
  const outDir = values.out ??
    join(import.meta.dirname ?? ".", "..", "..", "data", "demo", "compare");
  const paths = writeDetectorDemoData(outDir);
  console.log(`Wrote ${paths.length} files to ${outDir}`);
}
