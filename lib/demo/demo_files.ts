/**
 * Turning the generated demo cohort into the bytes of data/demo/: one
 * GeoJSON per case, a PNG tissue mask, a figures CSV, case files and a
 * README. Pure: returns `{ path, bytes }` pairs and writes nothing.
 *
 * @module
 */

import { encode } from "fast-png";
import {
  DEMO_SEED,
  type DemoCase,
  type DemoFeatureCollection,
  type DemoFigureRow,
  type DemoMask,
} from "./demo_cohort.ts";

/** One file of the demo folder, path relative to the folder. */
export interface DemoFile {
  path: string;
  bytes: Uint8Array;
}

const enc = new TextEncoder();

/**
 * Writes a FeatureCollection as JSON text with one feature per line, so a
 * diff of regenerated data shows which feature changed.
 *
 * @example One feature per line
 * ```ts
 * import { featureCollectionText } from "./demo_files.ts";
 * const t = featureCollectionText({
 *   type: "FeatureCollection",
 *   slide: { id: "QVT-24-001", mpp: 0.25, width: 100, height: 100 },
 *   features: [{ type: "Feature", properties: { role: "figure" }, geometry: { type: "Point", coordinates: [1, 2] } }],
 * });
 * if (JSON.parse(t).features.length !== 1 || t.split("\n").length !== 7) throw new Error(t);
 * ```
 */
export function featureCollectionText(fc: DemoFeatureCollection): string {
  const lines = [
    "{",
    `"type": "FeatureCollection",`,
    `"slide": ${JSON.stringify(fc.slide)},`,
    `"features": [`,
  ];
  fc.features.forEach((f, i) => {
    lines.push(JSON.stringify(f) + (i < fc.features.length - 1 ? "," : ""));
  });
  lines.push("]}");
  return lines.join("\n") + "\n";
}

/**
 * Writes figure rows as an RFC 4180 CSV with header `x,y,label,score`.
 *
 * @example Header and one row
 * ```ts
 * import { figuresCsvText } from "./demo_files.ts";
 * const t = figuresCsvText([{ xPx: 1.5, yPx: 2, label: "mitotic figure", score: 0.9 }]);
 * if (t !== "x,y,label,score\r\n1.5,2,mitotic figure,0.9\r\n") throw new Error(t);
 * ```
 */
export function figuresCsvText(rows: DemoFigureRow[]): string {
  const cell = (s: string) => /[",\r\n]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
  const out = ["x,y,label,score"];
  for (const r of rows) out.push(`${r.xPx},${r.yPx},${cell(r.label)},${r.score}`);
  return out.join("\r\n") + "\r\n";
}

/**
 * Encodes a tissue mask as an 8-bit greyscale PNG (nonzero = tissue).
 *
 * @example A 2 × 1 mask
 * ```ts
 * import { maskPngBytes } from "./demo_files.ts";
 * const png = maskPngBytes({ width: 2, height: 1, umPerPx: 16, data: new Uint8Array([0, 255]) });
 * if (png[1] !== 0x50 || png[2] !== 0x4e || png[3] !== 0x47) throw new Error("not a PNG");
 * ```
 */
export function maskPngBytes(mask: DemoMask): Uint8Array {
  return encode({ width: mask.width, height: mask.height, data: mask.data, channels: 1, depth: 8 });
}

/**
 * File names of a case's pieces inside the demo folder.
 *
 * @example
 * ```ts
 * import { demoFileNames } from "./demo_files.ts";
 * const mask = demoFileNames("QVT-24-007").tissueMask;
 * if (mask !== "QVT-24-007.tissue.png") throw new Error(`mask file ${mask}`);
 * ```
 */
export function demoFileNames(caseId: string): {
  annotations: string;
  figuresCsv: string;
  tissueMask: string;
  caseFile: string;
} {
  return {
    annotations: `${caseId}.geojson`,
    figuresCsv: `${caseId}.figures.csv`,
    tissueMask: `${caseId}.tissue.png`,
    caseFile: `${caseId}.case.json`,
  };
}

/**
 * The case file (`*.case.json`, version 1 of the format read by
 * lib/annotations/read_case.ts) of a case with a mask or a figures CSV.
 * Paths are relative to the case file's folder.
 *
 * @example A mask case names the mask's own scale
 * ```ts
 * import { parseCaseFile } from "hotfield";
 * import { generateDemoCohort } from "./demo_cohort.ts";
 * import { caseFileObject } from "./demo_files.ts";
 * const c = generateDemoCohort().find((c) => c.tissueMask)!;
 * // Read back as hotfield reads case files.
 * const input = parseCaseFile(JSON.stringify(caseFileObject(c)), `${c.caseId}.case.json`);
 * if (input.maskMpp !== 16) throw new Error(`mask mpp ${input.maskMpp}, expected 16 µm per mask pixel`);
 * ```
 */
export function caseFileObject(c: DemoCase): Record<string, unknown> {
  const names = demoFileNames(c.caseId);
  const out: Record<string, unknown> = {
    hotfield_case: 1,
    id: c.caseId,
    annotations: names.annotations,
  };
  if (c.figuresCsv) out.figures = { path: names.figuresCsv, units: "px" };
  if (c.tissueMask) out.tissue_mask = { path: names.tissueMask, mpp: c.tissueMask.umPerPx };
  out.notes = `Invented case of the Quillmoor Veterinary Teaching Laboratory: ${c.tumourType}`;
  return out;
}

/**
 * Lists every file of the demo folder for a generated cohort, README last.
 *
 * @param cohort From `generateDemoCohort(seed)`.
 * @param seed The seed it came from (named in the README). @default DEMO_SEED
 * @returns Relative paths and bytes, in a fixed order.
 *
 * @example Every case has its GeoJSON
 * ```ts
 * import { generateDemoCohort } from "./demo_cohort.ts";
 * import { demoCohortFiles } from "./demo_files.ts";
 * const files = demoCohortFiles(generateDemoCohort());
 * if (!files.some((f) => f.path === "QVT-24-008.geojson")) throw new Error("QVT-24-008.geojson is missing");
 * ```
 */
export function demoCohortFiles(cohort: DemoCase[], seed: number = DEMO_SEED): DemoFile[] {
  const files: DemoFile[] = [];
  for (const c of cohort) {
    const names = demoFileNames(c.caseId);
    files.push({
      path: names.annotations,
      bytes: enc.encode(featureCollectionText(c.annotations)),
    });
    if (c.figuresCsv) {
      files.push({ path: names.figuresCsv, bytes: enc.encode(figuresCsvText(c.figuresCsv)) });
    }
    if (c.tissueMask) files.push({ path: names.tissueMask, bytes: maskPngBytes(c.tissueMask) });
    if (c.figuresCsv || c.tissueMask) {
      files.push({
        path: names.caseFile,
        bytes: enc.encode(JSON.stringify(caseFileObject(c), null, 2) + "\n"),
      });
    }
  }
  files.push({ path: "README.md", bytes: enc.encode(demoReadme(cohort, seed)) });
  return files;
}

function mppText(mpp: number | [number, number]): string {
  return typeof mpp === "number" ? `${mpp}` : `${mpp[0]} × ${mpp[1]}`;
}

/**
 * The README of the demo folder: source, licence, mpp, what each case shows.
 *
 * @example It names the seed
 * ```ts
 * import { generateDemoCohort } from "./demo_cohort.ts";
 * import { demoReadme } from "./demo_files.ts";
 * if (!demoReadme(generateDemoCohort(3), 3).includes("seed 3")) throw new Error("the README must name its seed");
 * ```
 */
export function demoReadme(cohort: DemoCase[], seed: number = DEMO_SEED): string {
  const rows = cohort.map((c) => {
    const s = c.annotations.slide;
    const names = demoFileNames(c.caseId);
    const files = [names.annotations];
    if (c.tissueMask) files.push(names.tissueMask);
    if (c.figuresCsv) files.push(names.figuresCsv);
    if (c.figuresCsv || c.tissueMask) files.push(names.caseFile);
    return `| ${c.caseId} | ${c.tumourType} | ${mppText(s.mpp)} | ${s.width} × ${s.height} | ${
      files.map((f) => `\`${f}\``).join(", ")
    } | ${c.shows} |`;
  });
  return `# Demo cohort: Quillmoor Veterinary Teaching Laboratory (invented)

Eight invented cases of the fictional Quillmoor Veterinary Teaching Laboratory,
for trying hotfield end to end (\`deno task demo\`) and for the notebooks.

- **Source:** synthetic. Every outline, figure, field and mask here was generated by
  \`lib/demo/write_demo_data.ts\` (recipes in \`lib/demo/demo_recipes.ts\`) with seed ${seed}.
  No slide was scanned, no animal and no reader is real; the reader names are made up.
- **Licence:** CC0 1.0 (public domain dedication). The data are invented; use them freely.
- **Coordinates:** level-0 slide pixels, x right, y down, rounded to 0.1 px. Each
  GeoJSON carries a \`slide\` member with \`id\`, \`mpp\` (µm per level-0 pixel, one
  value or \`[x, y]\`), \`width\` and \`height\` (px). Feature roles: \`tissue\`, \`tumour\`,
  \`exclude\` (with \`reason\`), \`figure\` (\`label\`, default "mitotic figure"; \`score\`
  in [0, 1]) and \`field\` (a reader's chosen area, with \`reader\`).
- **Readers:** reader-a, reader-b and reader-c are experienced readers; trainee-1 and
  trainee-2 are in training. trainee-1's fields carry a \`date\` (January to June 2024) so
  the readers page shows their field choice over time; two of them are ten circular
  microscope fields of FN 22 at 40× (a MultiPoint with \`field_diameter_mm\` 0.55) and
  one is two separate areas counted together (a MultiPolygon).
- **Mask:** \`QVT-24-007.tissue.png\` is 8-bit greyscale, nonzero = tissue, 16 µm
  per mask pixel with its top-left corner at the slide origin; its case file gives
  that scale.
- **Figures CSV:** \`QVT-24-008.figures.csv\` has the header \`x,y,label,score\`,
  positions in level-0 pixels.

| case | tumour type | mpp (µm/px) | slide (px) | files | what it shows |
| --- | --- | --- | --- | --- | --- |
${rows.join("\n")}

The figures are drawn from a few Gaussian foci of varying strength over a
uniform background, plus lookalikes (apoptotic bodies, pyknotic and
hyperchromatic nuclei), some candidates inside excluded zones and some in
tissue outside the tumour outline. The recipes were tuned so that each case
shows what the table says; the exact counts are whatever hotfield computes.

"7 figures in 2.37 mm²" is the mitotic-count criterion of the two-tier grade
of canine cutaneous mast cell tumours (Kiupel et al., *Vet Pathol*
2011;48(1):147-155: ≥ 7 mitotic figures in 10 high-power fields), with ten
fields taken as the standard 2.37 mm² (Meuten, Moore & George, *Vet Pathol*
2016;53(1):7-9). \`deno task demo\` classifies the mast cell tumours with
\`canine-mct-2tier\`, QVT-24-007 with \`canine-sts\` and QVT-24-008 with
\`canine-mammary\`. hotfield supports, never replaces, a pathologist's grade.

## Regenerate

\`\`\`sh
deno task demo:data            # rewrites data/demo/ from seed ${seed}
\`\`\`

The output is byte-for-byte the same on every run; \`test/demo/demo_data_test.ts\`
regenerates into a temporary folder and compares.
`;
}
