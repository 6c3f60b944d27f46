/**
 * `deno task demo`: runs the main job on the invented demo cohort in
 * data/demo/ and says where the output is.
 *
 * Every case is read, counted with the grading scheme that fits its tumour
 * type, and written to `out/demo/` (report.json, hotspot GeoJSON, CSV and
 * HTML as the report writer provides them). One summary line per case goes
 * to stdout, then the path of `out/demo/index.html` (or of the folder when no
 * HTML index was written).
 *
 * The reports depend only on the inputs and options; the one date they show
 * (in the HTML) is taken by the report writer from `SOURCE_DATE_EPOCH` when
 * it is set, so a rerun with it set gives the same bytes.
 *
 * @module
 */

import { existsSync } from "node:fs";
import { join, relative, resolve } from "node:path";
import { parseArgs } from "node:util";
import { type CaseInput, loadCase } from "../annotations/read_case.ts";
import { folderCases } from "../batch/case_sources.ts";
import { buildCaseResult } from "../pipeline/build_case_result.ts";
import type { CaseResult } from "../pipeline/case_result.ts";
import { writeOutputs } from "../report/write_outputs.ts";
import { demoSchemes } from "./demo_recipes.ts";
import { DEFAULT_SEED, DEFAULT_SIMULATIONS } from "../defaults.ts";
import { writeSlideDemoCase } from "./slide_demo.ts";
import { isOpenSlideAvailable } from "../slide/open_slide.ts";

/**
 * Lists the cases of a demo folder with the library's folder logic
 * (`folderCases`): each `*.case.json`, and each `*.geojson` that no case file
 * names, in file-name order. Paths are file names read against the folder
 * (`baseDir`).
 *
 * @param dir The folder (e.g. data/demo).
 * @returns One case input per case.
 * @throws {Error} With the reader's message when a case file cannot be read.
 *
 * @example The committed demo folder holds eight cases
 * ```ts
 * import { demoCaseInputs } from "hotfield";
 * import { fileURLToPath } from "node:url";
 * const inputs = await demoCaseInputs(fileURLToPath(new URL("../../data/demo/", import.meta.url)));
 * if (inputs.length !== 8 || !inputs[6].tissueMaskPath?.endsWith("QVT-24-007.tissue.png")) {
 *   throw new Error(`${inputs.length} cases; the seventh's mask: ${inputs[6]?.tissueMaskPath}`);
 * }
 * ```
 */
export async function demoCaseInputs(dir: string): Promise<CaseInput[]> {
  return (await folderCases(dir, {})).map((c) => {
    if (c.input === null) throw new Error(c.problem ?? `Cannot read ${c.label}`);
    return c.input;
  });
}

/** Options of {@linkcode runDemo}. */
export interface RunDemoOptions {
  /** Folder with the demo cases. @default "data/demo" */
  dataDir?: string;
  /** Output folder. @default "out/demo" */
  outDir?: string;
  /** Scan-test simulations per case. @default 999 */
  simulations?: number;
  /** Where the summary lines go. @default console.log */
  print?: (line: string) => void;
  /**
   * Folder to write the slide demo case into (QVT-24-009: a generated slide
   * file and a figures CSV only, see `slide_demo.ts`); the case is added when
   * this is given and the OpenSlide library can be used. @default undefined
   */
  slideDir?: string;
}

/**
 * One case's line of the demo summary: case id, hotspot count, per mm² and
 * class, or why no window fits.
 *
 * @example A case with no admissible window
 * ```ts
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { summaryLine } from "./run_demo.ts";
 * // A 1 × 0.8 mm biopsy at 1 µm/px: smaller than the 2.37 mm² window.
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-005", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [1000, 0], [1000, 800], [0, 800], [0, 0]]] } },
 *   ],
 * }), { fileName: "QVT-24-005.geojson" });
 * const line = summaryLine(buildCaseResult({ caseId: "QVT-24-005", ...parsed, sources: [] }, { bestN: 0 }));
 * if (!line.includes("no admissible 2.37 mm² window (valid area 0.80 mm²)")) throw new Error(`summary: ${line}`);
 * ```
 */
export function summaryLine(result: CaseResult): string {
  const r = result.report;
  const id = r.case.padEnd(11);
  if (!r.hotspot) {
    return `${id} no admissible ${r.window.area_mm2} mm² window (valid area ${
      r.valid_area_mm2.toFixed(2)
    } mm²)`;
  }
  const c = r.classification;
  const cls = c
    ? `${c.class}${c.tier ? ` (${c.tier})` : ""} [${c.scheme}, cut-off ${c.cutoff}]`
    : "";
  return `${id} hotspot ${String(r.hotspot.count).padStart(3)} in ${r.window.area_mm2} mm²  ${
    r.hotspot.per_mm2.toFixed(2).padStart(6)
  }/mm²  ${cls}`;
}

/**
 * Reads every demo case, builds its result and writes the outputs.
 *
 * @returns The results and the path to open (index.html or the folder).
 *
 * @example Reports of the demo cohort in a temporary folder (needs write and env permission)
 * ```ts
 * import { runDemo } from "./run_demo.ts";
 * import { fileURLToPath } from "node:url";
 * const granted = async (name: "write" | "env") =>
 *   (await Deno.permissions.query({ name })).state === "granted";
 * if (await granted("write") && await granted("env")) {
 *   const outDir = Deno.makeTempDirSync();
 *   const dataDir = fileURLToPath(new URL("../../data/demo/", import.meta.url));
 *   const { results } = await runDemo({ dataDir, outDir, simulations: 0, print: () => {} });
 *   if (results.length !== 8 || results[4].hotspot !== null) {
 *     throw new Error(`${results.length} results; QVT-24-005 (too small) has no hotspot`);
 *   }
 *   Deno.removeSync(outDir, { recursive: true });
 * }
 * ```
 */
export async function runDemo(
  options: RunDemoOptions = {},
): Promise<{ results: CaseResult[]; open: string }> {
  const dataDir = options.dataDir ?? "data/demo";
  const outDir = options.outDir ?? join("out", "demo");
  const print = options.print ?? ((line: string) => console.log(line));
  const schemes = demoSchemes();
  const results: CaseResult[] = [];
  const inputs = await demoCaseInputs(dataDir);
  if (options.slideDir !== undefined) {
    const why = isOpenSlideAvailable();
    if (why === true) inputs.push(writeSlideDemoCase(options.slideDir).input);
    else print(`QVT-24-009  skipped (the case read from a slide file): ${why}`);
  }
  for (const input of inputs) {
    const caseData = await loadCase(input);
    const result = buildCaseResult(caseData, {
      scheme: schemes.get(caseData.caseId) ?? "canine-mct-2tier",
      simulations: options.simulations ?? DEFAULT_SIMULATIONS,
      seed: DEFAULT_SEED,
    });
    results.push(result);
    print(summaryLine(result));
  }
  writeOutputs(results, outDir);
  const index = join(outDir, "index.html");
  return { results, open: existsSync(index) ? index : outDir };
}

if (import.meta.main) {
  const { values } = parseArgs({
    args: Deno.args,
    options: { data: { type: "string" }, out: { type: "string" } },
  });
  try {
    const { open } = await runDemo({
      dataDir: values.data,
      outDir: values.out,
      slideDir: join("out", "demo-slide"),
    });
    const rel = relative(Deno.cwd(), resolve(open)) || ".";
    console.log(`\nReports written. Open ${rel}`);
  } catch (e) {
    console.error(`hotfield demo: ${(e as Error).message}`);
    if (Deno.env.get("HOTFIELD_DEBUG") === "1") console.error((e as Error).stack);
    Deno.exit(1);
  }
}
