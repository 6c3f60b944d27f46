/**
 * What hotfield read from a case, in numbers: areas, figure tallies, fields.
 * This is `hotfield inspect`.
 *
 * @module
 */

import type { FigureTally } from "../count/engine_types.ts";
import { tallyFigures } from "../count/tally_figures.ts";
import { multiPolygonAreaPx2 } from "../geometry/planar_area.ts";
import { createRegionIndex } from "../geometry/region_index.ts";
import { buildValidRegion } from "../geometry/valid_region.ts";
import type { CaseData } from "../types.ts";
import { px2ToMm2 } from "../units.ts";
import { DEFAULT_COUNT_LABELS } from "../defaults.ts";
import { checkCounting } from "./count_checks.ts";

/** Options of {@linkcode inspectCase}. */
export interface InspectOptions {
  /** Figures with a score below this are not counted. @default 0 */
  minScore?: number;
  /** Labels that are counted. @default ["mitotic figure"] */
  countLabels?: string[];
}

/** The JSON of `hotfield inspect` (keys are a public contract: extend, never rename). */
export interface InspectResult {
  /** Case id (safe as a folder name). */
  case: string;
  /** Micrometres per pixel `[x, y]`. */
  mpp: [number, number];
  /**
   * Areas in mm²: union(tissue), union(tumour), union(exclude) (the whole
   * exclusion area, also where it lies outside tissue), and the valid region
   * V; 0 for a role with no polygons.
   */
  areas_mm2: { tissue: number; tumour: number; excluded: number; valid: number };
  /** Figure tallies (cascade: score, then region, over counted labels). */
  figures: FigureTally;
  /** Number of reader fields (`role: "field"`). */
  fields: number;
  /** Everything odd but readable, one sentence each. */
  warnings: string[];
  /** Slide id and level-0 size in pixels (null when unknown). */
  slide: { id: string; width_px: number | null; height_px: number | null };
  /** What was counted. */
  counting: { count_labels: string[]; min_score: number };
  /** The files read, with their sha256. */
  inputs: { kind: string; path: string; sha256: string }[];
}

/**
 * Summarizes a case: builds the valid region V = union(tissue) ∩
 * union(tumour) − union(exclude), measures areas in mm² (planar, with mpp x
 * and y applied separately), and tallies the figures (a figure on V's
 * boundary is inside).
 *
 * @param caseData The case as read by `loadCase`.
 * @param options Minimum score and counted labels.
 * @returns The inspect result.
 * @throws {TypeError} When neither tissue nor tumour has any area.
 *
 * @example A 1 mm × 1 mm tumour square with one figure inside and one outside
 * ```ts
 * import { inspectCase } from "hotfield";
 * const sq: [number, number][] = [[0, 0], [4000, 0], [4000, 2000], [0, 2000], [0, 0]];
 * const r = inspectCase({
 *   caseId: "QVT-24-001", slide: { id: "QVT-24-001", mppX: 0.25, mppY: 0.5 },
 *   tissue: [], tumour: [{ polygons: [[sq]], source: "example" }], exclude: [],
 *   figures: {
 *     xPx: Float64Array.of(10, 5000), yPx: Float64Array.of(10, 10), labelIndex: Uint32Array.of(0, 0),
 *     labels: ["mitotic figure"], score: Float64Array.of(NaN, NaN), origin: Int32Array.of(1, 2),
 *   },
 *   fields: [], sources: [], warnings: [],
 * });
 * // 4000 px × 0.25 µm = 1 mm; 2000 px × 0.5 µm = 1 mm
 * if (Math.abs(r.areas_mm2.valid - 1) > 1e-12) throw new Error(`valid area ${r.areas_mm2.valid} mm²`);
 * if (r.figures.counted !== 1 || r.figures.outside_valid !== 1) {
 *   throw new Error(`${r.figures.counted} counted, ${r.figures.outside_valid} outside, expected 1 and 1`);
 * }
 * ```
 */
export function inspectCase(caseData: CaseData, options: InspectOptions = {}): InspectResult {
  const minScore = options.minScore ?? 0;
  const countLabels = options.countLabels && options.countLabels.length > 0
    ? [...options.countLabels]
    : [...DEFAULT_COUNT_LABELS];
  const { slide, figures } = caseData;
  const mpp = { mppX: slide.mppX, mppY: slide.mppY };
  const v = buildValidRegion({
    tissue: caseData.tissue,
    tumour: caseData.tumour,
    exclude: caseData.exclude,
  });
  const inside = createRegionIndex(v.region).containsPoints(figures.xPx, figures.yPx);
  const { tally } = tallyFigures(figures, inside, { minScore, countLabels });
  const warnings = [
    ...caseData.warnings,
    ...v.warnings,
  ];
  const check = checkCounting(caseData, tally, { countLabels, minScore });
  warnings.push(...check.warnings, ...check.problems.filter((p) => !warnings.includes(p)));
  const mm2 = (px2: number) => tidy(px2ToMm2(px2, mpp));
  return {
    case: caseData.caseId,
    mpp: [slide.mppX, slide.mppY],
    areas_mm2: {
      tissue: mm2(v.tissueAreaPx2),
      tumour: mm2(v.tumourAreaPx2),
      excluded: mm2(multiPolygonAreaPx2(v.exclude)),
      valid: mm2(v.validAreaPx2),
    },
    figures: tally,
    fields: caseData.fields.length,
    warnings,
    slide: { id: slide.id, width_px: slide.widthPx ?? null, height_px: slide.heightPx ?? null },
    counting: { count_labels: countLabels, min_score: minScore },
    inputs: caseData.sources.map((s) => ({ kind: s.kind, path: s.path, sha256: s.sha256 })),
  };
}

/** Twelve significant digits: hides floating-point dust, keeps far more than any measurement. */
function tidy(v: number): number {
  return v === 0 ? 0 : Number(v.toPrecision(12));
}

/**
 * Formats an inspect result as a plain-text table for people.
 *
 * @param result From {@linkcode inspectCase}.
 * @returns Lines of text ending in a newline.
 *
 * @example
 * ```ts
 * import { formatInspectTable } from "hotfield";
 * const text = formatInspectTable({
 *   case: "QVT-24-001", mpp: [0.25, 0.25],
 *   areas_mm2: { tissue: 12, tumour: 6, excluded: 0.5, valid: 5.5 },
 *   figures: { total: 3, counted: 2, outside_valid: 1, below_score: 0, by_label: { "mitotic figure": 3 } },
 *   fields: 0, warnings: [], slide: { id: "QVT-24-001", width_px: null, height_px: null },
 *   counting: { count_labels: ["mitotic figure"], min_score: 0 }, inputs: [],
 * });
 * if (!text.includes("valid") || !text.includes("5.5000")) throw new Error(text);
 * ```
 */
export function formatInspectTable(result: InspectResult): string {
  const lines: string[] = [];
  const [mx, my] = result.mpp;
  const size = result.slide.width_px !== null && result.slide.height_px !== null
    ? `${result.slide.width_px} × ${result.slide.height_px} px`
    : "size not given";
  lines.push(`Case ${result.case}`);
  if (result.slide.id !== "" && result.slide.id !== result.case) {
    lines.push(`  slide id   ${result.slide.id}`);
  }
  lines.push(`  mpp        ${mx === my ? mx : `${mx} × ${my}`} µm/px`);
  lines.push(`  slide      ${size}`);
  lines.push("");
  lines.push("Areas (mm², planar)");
  const a = result.areas_mm2;
  const areaRows: [string, number][] = [
    ["tissue", a.tissue],
    ["tumour", a.tumour],
    ["excluded", a.excluded],
    ["valid region", a.valid],
  ];
  const aw = Math.max(...areaRows.map(([, v]) => v.toFixed(4).length));
  for (const [k, v] of areaRows) lines.push(`  ${k.padEnd(14)} ${v.toFixed(4).padStart(aw)}`);
  lines.push("");
  const labels = result.counting.count_labels.map((l) => `"${l}"`).join(", ");
  lines.push(`Figures (counted labels ${labels}; minimum score ${result.counting.min_score})`);
  const f = result.figures;
  const rows: [string, number][] = [
    ["total", f.total],
    ["counted", f.counted],
    ["outside valid", f.outside_valid],
    ["below score", f.below_score],
  ];
  const byLabel = Object.entries(f.by_label);
  const nw = Math.max(...[...rows, ...byLabel].map(([, v]) => String(v).length));
  for (const [k, v] of rows) lines.push(`  ${k.padEnd(14)} ${String(v).padStart(nw)}`);
  if (byLabel.length > 0) {
    lines.push("  by label");
    const lw = Math.max(12, ...byLabel.map(([k]) => k.length));
    for (const [k, v] of byLabel) lines.push(`    ${k.padEnd(lw)} ${String(v).padStart(nw)}`);
  }
  lines.push("");
  lines.push(`Reader fields  ${result.fields}`);
  if (result.inputs.length > 0) {
    lines.push("");
    lines.push("Inputs (sha256)");
    const kw = Math.max(...result.inputs.map((i) => i.kind.length));
    for (const i of result.inputs) {
      lines.push(`  ${i.kind.padEnd(kw)}  ${i.sha256.slice(0, 12)}  ${i.path}`);
    }
  }
  lines.push("");
  if (result.warnings.length === 0) lines.push("Warnings: none");
  else {
    lines.push(`Warnings (${result.warnings.length})`);
    for (const w of result.warnings) lines.push(`  - ${w}`);
  }
  return lines.join("\n") + "\n";
}
