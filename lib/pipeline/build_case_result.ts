/**
 * The report pipeline for one case.
 *
 * @module
 */

import { checkCountedFigures, explainSearchStop } from "./count_limits.ts";
import type { CaseData } from "../types.ts";
import type {
  CountMap,
  Placement,
  PreparedCase,
  SearchBudget,
  WindowShape,
} from "../count/engine_types.ts";
import type { CaseResult, ReportOptions } from "./case_result.ts";
import {
  REPORT_SCHEMA,
  type ReportJson,
  type ReportPlacement,
  type ReportWindow,
} from "./report_types.ts";
import { HOTFIELD_VERSION } from "../version.ts";
import { makeWindow } from "../count/make_window.ts";
import { prepareCase } from "../count/prepare_case.ts";
import { computeCountMap } from "../count/compute_count_map.ts";
import {
  type AreaIndex,
  createSearch,
  newSearchBudget,
  searchBest,
} from "../count/placement_search.ts";
import {
  type BestFieldSet,
  findBestFieldSet,
  type FindBestFieldSetOptions,
} from "../count/find_best_field_set.ts";
import { summarizeDistribution } from "../count/summarize_distribution.ts";
import { checkFields } from "../count/check_fields.ts";
import { createOverlapIndex } from "../geometry/window_overlap.ts";
import { applyStandards } from "./apply_standards.ts";
import { checkCounting } from "./count_checks.ts";
import { caseVerdict } from "./verdict.ts";
import { settlePlacement } from "../count/settle_placement.ts";
import { countInWindow } from "../count/window_contains.ts";
import { getScheme } from "../standards/list_schemes.ts";
import {
  DEFAULT_BEST_N,
  DEFAULT_MIN_COVERAGE,
  DEFAULT_STRIDE_UM,
  DEFAULT_TOP,
} from "../defaults.ts";
import { roundTo } from "../numbers.ts";
import { pxToUm, umToPx } from "../units.ts";
import { gradeCount } from "../standards/grade_count.ts";

/** A window as report.json gives it (µm to 0.01). */
export function reportWindow(w: WindowShape): ReportWindow {
  return w.shape === "rect"
    ? {
      shape: "rect",
      area_mm2: w.areaMm2,
      width_um: roundTo(w.widthUm, 2),
      height_um: roundTo(w.heightUm, 2),
      aspect: w.aspect,
    }
    : { shape: "circle", area_mm2: w.areaMm2, diameter_um: roundTo(w.diameterUm, 2) };
}

/** A placement as report.json gives it: centres to 0.01, coverage to 6 decimals, per mm² to 4. */
export function reportPlacement(p: Placement, rank?: number): ReportPlacement {
  // (The centre's printed precision is settled by the caller when it matters.)
  const out: ReportPlacement = {
    center_px: [roundTo(p.centerPx[0], 2), roundTo(p.centerPx[1], 2)],
    count: p.count,
    coverage: roundTo(p.coverage, 6),
    per_mm2: roundTo(p.perMm2, 4),
    center_um: [roundTo(p.centerUm[0], 2), roundTo(p.centerUm[1], 2)],
  };
  if (rank !== undefined) out.rank = rank;
  return out;
}

/**
 * Runs the whole engine on one case: prepare, count map, exact hotspot,
 * top-k, best field set, distribution, field check and (with `scheme`) the
 * classification, producing `report.json` (schema `hotfield.report/1`) and
 * everything the outputs draw.
 *
 * When no placement is admissible the hotspot is null and a warning says why
 * (valid area smaller than the window, or the best coverage on the grid
 * below the minimum). Numbers in the report are rounded for stable text:
 * coverage to 6 decimals, µm and px to 0.01, per mm² and means to 4.
 *
 * @param caseData The case as read.
 * @param options Window, grid, figure and report options.
 * @returns The result.
 * @throws RangeError for options out of range (window, stride, coverage,
 *   grid size) or an unknown scheme id.
 *
 * @example A 3 × 3 mm tissue square with a few figures
 * ```ts
 * import { buildCaseResult } from "hotfield";
 * const sq = [[[0, 0], [6000, 0], [6000, 6000], [0, 6000], [0, 0]]] as [number, number][][];
 * const r = buildCaseResult({
 *   caseId: "QVT-24-001", slide: { id: "QVT-24-001", mppX: 0.5, mppY: 0.5 },
 *   tissue: [{ polygons: [sq], source: "example" }], tumour: [], exclude: [],
 *   figures: {
 *     xPx: new Float64Array([3000, 3100, 500]), yPx: new Float64Array([3000, 3050, 500]),
 *     labelIndex: new Uint32Array(3), labels: ["mitotic figure"],
 *     score: new Float64Array(3).fill(NaN), origin: new Int32Array([0, 1, 2]),
 *   },
 *   fields: [], sources: [], warnings: [],
 * }, { strideUm: 50, bestN: 2 });
 * if (r.report.hotspot?.count !== 3 || r.report.schema !== "hotfield.report/1") {
 *   throw new Error(JSON.stringify(r.report.hotspot));
 * }
 * ```
 */
export function buildCaseResult(caseData: CaseData, options: ReportOptions = {}): CaseResult {
  const parts = startCaseResult(caseData, options);
  const best = parts.bestN > 0
    ? explainSearchStop(caseData, "the best field set", () =>
      findBestFieldSet(parts.prepared, {
        ...bestFieldSetOptions(parts),
        overlap: parts.overlap,
        budget: parts.budget,
      }))
    : null;
  return finishCaseResult(parts, best);
}

/**
 * Everything of a case result but the best field set: see
 * {@linkcode buildCaseResult}, which is `finishCaseResult(startCaseResult(…),
 * findBestFieldSet(…))`. Split so a caller can compute the best field set
 * elsewhere, or reuse a prepared case.
 */
export interface CaseResultParts {
  caseData: CaseData;
  options: ReportOptions;
  prepared: PreparedCase;
  window: WindowShape;
  strideUm: number;
  minCoverage: number;
  topK: number;
  bestN: number;
  map: CountMap;
  overlap: AreaIndex;
  /** The work left to the case's placement searches (the best field set draws on it too). */
  budget: SearchBudget;
  hotspot: Placement | null;
  top: Placement[];
  /** Warnings so far, in report order (case, placement, top-k). */
  warnings: string[];
}

/**
 * The first part of {@linkcode buildCaseResult}: prepare (unless `prepared`
 * is given), count map, hotspot and top-k.
 *
 * @example
 * ```ts
 * import { findBestFieldSet } from "hotfield";
 * import type { CaseData, PolygonPx } from "../types.ts";
 * import { bestFieldSetOptions, finishCaseResult, startCaseResult } from "./build_case_result.ts";
 * const square: PolygonPx = [[[0, 0], [6000, 0], [6000, 6000], [0, 6000], [0, 0]]];
 * const caseData: CaseData = {
 *   caseId: "QVT-24-001", slide: { id: "QVT-24-001", mppX: 0.5, mppY: 0.5 },
 *   tissue: [{ polygons: [square], source: "example" }], tumour: [], exclude: [],
 *   figures: {
 *     xPx: new Float64Array([3000]), yPx: new Float64Array([3000]),
 *     labelIndex: new Uint32Array(1), labels: ["mitotic figure"],
 *     score: new Float64Array(1).fill(NaN), origin: new Int32Array([0]),
 *   },
 *   fields: [], sources: [], warnings: [],
 * };
 * const parts = startCaseResult(caseData, { strideUm: 50, bestN: 1 });
 * const r = finishCaseResult(parts, findBestFieldSet(parts.prepared, bestFieldSetOptions(parts)));
 * if (r.report.best_fields?.total !== 1) throw new Error(`best field total ${r.report.best_fields?.total}`);
 * ```
 */
export function startCaseResult(
  caseData: CaseData,
  given: ReportOptions = {},
  prepared?: PreparedCase,
): CaseResultParts {
  const settingWarnings: string[] = [];
  const options = caseOptions(caseData, given, settingWarnings);
  const window = makeWindow({
    areaMm2: options.areaMm2,
    shape: options.shape,
    aspect: options.aspect,
  });
  const strideUm = options.strideUm ?? DEFAULT_STRIDE_UM;
  const minCoverage = options.minCoverage ?? DEFAULT_MIN_COVERAGE;
  const topK = options.top ?? DEFAULT_TOP;
  const bestN = options.bestN ?? DEFAULT_BEST_N;
  prepared ??= prepareCaseFor(caseData, options);
  checkCountedFigures(prepared, caseData);
  const warnings = [...prepared.warnings, ...settingWarnings];
  const map = computeCountMap(prepared, window, {
    strideUm,
    minCoverage,
    maxGridCells: options.maxGridCells,
  });
  const overlap = createOverlapIndex(prepared.validUm) as AreaIndex;
  const budget = newSearchBudget(options.maxSearchWork);
  const search = createSearch(prepared, map, overlap, budget);
  const top: Placement[] = [];
  const found = explainSearchStop(caseData, "the hotspot", () => searchBest(search, top));
  // Off the knife edge: the same figures, a centre far from every rim.
  const hotspot: Placement | null = found &&
    settlePlacement(prepared, window, found, { overlap, minCoverage });
  if (hotspot) {
    top.push(hotspot);
    while (top.length < topK) {
      const p = explainSearchStop(caseData, "the top windows", () => searchBest(search, top));
      if (!p) break;
      top.push(p);
    }
  } else {
    warnings.push(noPlacementWhy(prepared.validAreaMm2, window, map.coverage, minCoverage));
  }
  if (topK === 0) top.length = 0;
  if (hotspot && topK > 0 && top.length < topK) {
    warnings.push(
      `Only ${top.length} separate admissible window${top.length === 1 ? "" : "s"} fit, ` +
        `fewer than the ${topK} asked for`,
    );
  }
  return {
    caseData,
    options,
    prepared,
    window,
    strideUm,
    minCoverage,
    topK,
    bestN,
    map,
    overlap,
    budget,
    hotspot,
    top,
    warnings,
  };
}

/**
 * The prepared case {@linkcode startCaseResult} would use.
 *
 * @example
 * ```ts
 * import type { CaseData, PolygonPx } from "../types.ts";
 * import { prepareCaseFor } from "./build_case_result.ts";
 * const square: PolygonPx = [[[0, 0], [2000, 0], [2000, 2000], [0, 2000], [0, 0]]];
 * const caseData: CaseData = {
 *   caseId: "QVT-24-001", slide: { id: "QVT-24-001", mppX: 0.5, mppY: 0.5 },
 *   tissue: [{ polygons: [square], source: "example" }], tumour: [], exclude: [],
 *   figures: {
 *     xPx: new Float64Array([1000, 1500]), yPx: new Float64Array([1000, 1500]),
 *     labelIndex: new Uint32Array(2), labels: ["mitotic figure"],
 *     score: new Float64Array([0.9, 0.3]), origin: new Int32Array([0, 1]),
 *   },
 *   fields: [], sources: [], warnings: [],
 * };
 * // The report options that shape the prepared case (here the minimum score) are applied.
 * const prepared = prepareCaseFor(caseData, { minScore: 0.5 });
 * if (prepared.xUm.length !== 1 || prepared.tally.below_score !== 1) {
 *   throw new Error(`${prepared.xUm.length} counted, ${prepared.tally.below_score} below the score`);
 * }
 * ```
 */
export function prepareCaseFor(caseData: CaseData, options: ReportOptions = {}): PreparedCase {
  const o = caseOptions(caseData, options, []);
  return prepareCase(caseData, { minScore: o.minScore, countLabels: o.countLabels });
}

/**
 * The options for one case: `options` with the case file's own settings
 * laid over them (a warning for each that differs from a given option). An
 * unknown scheme named by the case file is an error naming the file.
 */
function caseOptions(
  caseData: CaseData,
  options: ReportOptions,
  warnings: string[],
): ReportOptions {
  const settings = caseData.settings;
  if (settings === undefined) return options;
  const file = caseData.sources.find((s) => s.kind === "case")?.path ?? caseData.caseId;
  if (settings.scheme !== undefined) {
    try {
      getScheme(settings.scheme);
    } catch (e) {
      throw new TypeError(`Cannot read case file "${file}": ${(e as Error).message}`, { cause: e });
    }
  }
  const out: ReportOptions = { ...options };
  const names: Record<string, string> = {
    scheme: "scheme",
    minScore: "min_score",
    countLabels: "count_labels",
    areaMm2: "area_mm2",
    shape: "shape",
    strideUm: "stride_um",
    minCoverage: "min_coverage",
  };
  for (const [key, value] of Object.entries(settings) as [keyof typeof settings, unknown][]) {
    const before = (options as Record<string, unknown>)[key];
    if (before !== undefined && JSON.stringify(before) !== JSON.stringify(value)) {
      warnings.push(
        `The case file "${file}" sets ${names[key]} to ${JSON.stringify(value)}; the option's ` +
          `${JSON.stringify(before)} is not used for this case`,
      );
    }
    (out as Record<string, unknown>)[key] = value;
  }
  return out;
}

/**
 * Options of the best field set for a case result (plain data, so they can
 * be posted to a worker along with the prepared case).
 *
 * @example
 * ```ts
 * import { bestFieldSetOptions } from "./build_case_result.ts";
 * const o = bestFieldSetOptions({ bestN: 10, strideUm: 25, minCoverage: 0.95, options: {} });
 * if (o.n !== 10 || o.shape !== "circle") throw new Error(`options ${JSON.stringify(o)}`);
 * ```
 */
export function bestFieldSetOptions(
  parts: Pick<CaseResultParts, "bestN" | "strideUm" | "minCoverage" | "options">,
): FindBestFieldSetOptions {
  return {
    n: parts.bestN,
    fieldAreaMm2: parts.options.fieldAreaMm2,
    shape: "circle",
    strideUm: parts.strideUm,
    minCoverage: parts.minCoverage,
  };
}

/**
 * The last part of {@linkcode buildCaseResult}: distribution, field check,
 * report.json and (with a scheme) the classification.
 *
 * @param parts From {@linkcode startCaseResult}.
 * @param best The best field set (null when `bestN` is 0).
 * @returns The result, the same as {@linkcode buildCaseResult} gives.
 *
 * @example
 * ```ts
 * import type { CaseData, PolygonPx } from "../types.ts";
 * import { finishCaseResult, startCaseResult } from "./build_case_result.ts";
 * const square: PolygonPx = [[[0, 0], [6000, 0], [6000, 6000], [0, 6000], [0, 0]]];
 * const caseData: CaseData = {
 *   caseId: "QVT-24-001", slide: { id: "QVT-24-001", mppX: 0.5, mppY: 0.5 },
 *   tissue: [{ polygons: [square], source: "example" }], tumour: [], exclude: [],
 *   figures: {
 *     xPx: new Float64Array([3000, 3100]), yPx: new Float64Array([3000, 3050]),
 *     labelIndex: new Uint32Array(2), labels: ["mitotic figure"],
 *     score: new Float64Array(2).fill(NaN), origin: new Int32Array([0, 1]),
 *   },
 *   fields: [], sources: [], warnings: [],
 * };
 * // Without a best field set the report says so with null.
 * const r = finishCaseResult(startCaseResult(caseData, { strideUm: 50, bestN: 0 }), null);
 * if (r.report.best_fields !== null || r.report.hotspot?.count !== 2) {
 *   throw new Error(`best_fields ${JSON.stringify(r.report.best_fields)}, hotspot ${r.report.hotspot?.count}`);
 * }
 * ```
 */
export function finishCaseResult(parts: CaseResultParts, best: BestFieldSet | null): CaseResult {
  const { caseData, options, prepared, window, strideUm, minCoverage, topK, bestN, map, overlap } =
    parts;
  const check = checkCounting(caseData, prepared.tally, {
    countLabels: prepared.countLabels,
    minScore: prepared.minScore,
  });
  const top = parts.top;
  const hotspot = parts.hotspot;
  const warnings = [...parts.warnings];
  if (best && best.fields.length < bestN) {
    warnings.push(
      `Only ${best.fields.length} separate admissible field${
        best.fields.length === 1 ? "" : "s"
      } of ${roundTo(best.window.areaMm2, 4)} mm² fit, fewer than the ${bestN} asked for`,
    );
  }
  const dist = summarizeDistribution(map);
  const checks = checkFields(prepared, map, hotspot, window, {
    overlap,
    histogram: dist.histogram,
  });
  for (const c of checks) warnings.push(...c.warnings);
  warnings.push(...check.warnings, ...check.problems.filter((p) => !warnings.includes(p)));
  const blocked = check.problems.length > 0 && options.allowEmpty !== true;
  if (blocked && options.scheme) {
    warnings.push(
      `Not classified: the count is not meaningful (${check.problems.length} problem` +
        `${check.problems.length === 1 ? "" : "s"} above); fix the input, or give --allow-empty ` +
        `to classify anyway`,
    );
  }
  const { mppX, mppY } = prepared.slide;
  const originPx = umToPx([map.grid.x0Um, map.grid.y0Um], prepared.slide);
  const stridePx = umToPx([map.grid.strideUm, map.grid.strideUm], prepared.slide);
  const g = map.grid;
  const report: ReportJson = {
    schema: REPORT_SCHEMA,
    case: prepared.caseId,
    window: reportWindow(window),
    settings: {
      stride_um: strideUm,
      min_coverage: minCoverage,
      min_score: prepared.minScore,
      count_labels: prepared.countLabels,
      top_k: topK,
      scheme: options.scheme ?? null,
      ...(options.scheme && options.simulations !== undefined
        ? { simulations: options.simulations }
        : {}),
      ...(options.scheme && options.seed !== undefined ? { seed: options.seed } : {}),
    },
    valid_area_mm2: roundTo(prepared.validAreaMm2, 6),
    figures: {
      total: prepared.tally.total,
      counted: prepared.tally.counted,
      outside_valid: prepared.tally.outside_valid,
      below_score: prepared.tally.below_score,
      by_label: prepared.tally.by_label,
    },
    hotspot: hotspot ? settledReport(hotspot, prepared, window) : null,
    distribution: {
      positions: dist.positions,
      min: dist.min,
      q1: dist.q1 === null ? null : roundTo(dist.q1, 4),
      median: dist.median === null ? null : roundTo(dist.median, 4),
      q3: dist.q3 === null ? null : roundTo(dist.q3, 4),
      max: dist.max,
      mean: dist.mean === null ? null : roundTo(dist.mean, 4),
      quantile_method: dist.quantileMethod,
      histogram: dist.histogram,
    },
    fields: checks.map((c) => ({
      reader: c.reader,
      center_px: [roundTo(c.centerPx[0], 2), roundTo(c.centerPx[1], 2)],
      count: c.count,
      coverage: roundTo(c.coverage, 6),
      percentile: c.percentile === null ? null : roundTo(c.percentile, 2),
      kind: c.kind,
      shortfall: c.shortfall === null ? null : roundTo(c.shortfall, 4),
      area_mm2: roundTo(c.areaMm2, 6),
      count_scaled_to_window: c.countScaledToWindow === null
        ? null
        : roundTo(c.countScaledToWindow, 4),
      feature_index: c.featureIndex,
      parts: c.parts,
      ...(c.diameterMm !== undefined ? { field_diameter_mm: c.diameterMm } : {}),
      ...(c.date !== undefined ? { date: c.date } : {}),
    })),
    classification: null,
    uncertainty: null,
    warnings,
    hotfield_version: HOTFIELD_VERSION,
    inputs: caseData.sources.map((s) => ({ kind: s.kind, path: s.path, sha256: s.sha256 })),
    // tissue found on the slide file: which file, and every step of the method
    ...(caseData.tissueSource ? { tissue_source: caseData.tissueSource } : {}),
    mpp: [mppX, mppY],
    areas_mm2: {
      tissue: roundTo(prepared.areasMm2.tissue, 6),
      tumour: roundTo(prepared.areasMm2.tumour, 6),
      excluded: roundTo(prepared.areasMm2.excluded, 6),
      valid: roundTo(prepared.areasMm2.valid, 6),
    },
    top: top.map((p, i) =>
      p === hotspot ? settledReport(p, prepared, window, i + 1) : reportPlacement(p, i + 1)
    ),
    best_fields: best
      ? {
        n: bestN,
        field_area_mm2: best.window.areaMm2,
        shape: best.window.shape,
        total: best.total,
        fields: best.fields.map((p, i) => reportPlacement(p, i + 1)),
        guarantee: best.guarantee,
      }
      : null,
    map: {
      nx: g.nx,
      ny: g.ny,
      origin_px: [roundTo(originPx[0], 2), roundTo(originPx[1], 2)],
      stride_px: [roundTo(stridePx[0], 4), roundTo(stridePx[1], 4)],
      discretization: map.discretization,
    },
  };
  report.count_problems = check.problems;
  report.whole_area = hotspot ? null : wholeArea(prepared, window);
  if (report.whole_area) {
    const w = report.whole_area;
    warnings.push(
      `No standard window fits: the whole valid area (${w.area_mm2} mm²) holds ${w.count} counted ` +
        `figure${w.count === 1 ? "" : "s"} (${w.per_mm2}/mm², ${w.count_per_window_area} per ` +
        `${window.areaMm2} mm²); this is not a hotspot count and the case is not graded`,
    );
  }
  if (options.scheme && !blocked) {
    // The one call into the grading schemes.
    const std = applyStandards({ report, prepared, map, window }, {
      schemeId: options.scheme,
      simulations: options.simulations,
      seed: options.seed,
    });
    report.classification = std.classification;
    report.uncertainty = std.uncertainty;
    report.warnings.push(...std.warnings);
    // Each field graded on its own count and area, as at the microscope.
    checks.forEach((c, k) => {
      const g = gradeCount(c.count, { areaMm2: c.areaMm2, scheme: options.scheme! });
      report.fields[k].grade = {
        scheme: g.scheme,
        count_per_scheme_basis: roundTo(g.count_per_scheme_basis, 4),
        class: g.class,
        tier: g.tier,
      };
    });
  }
  report.verdict = caseVerdict(report);
  return {
    report,
    prepared,
    window,
    map,
    hotspot,
    top,
    bestFields: best?.fields ?? [],
    bestFieldWindow: best?.window ?? null,
    caseData,
  };
}

/**
 * A settled placement as report.json gives it: the centre printed with the
 * fewest decimals (2 to 9) at which a recount gives the same count, both in
 * level-0 pixels (figures and centre times mpp) and in µm, and `margin_um`.
 */
function settledReport(
  p: Placement,
  prepared: PreparedCase,
  window: WindowShape,
  rank?: number,
): ReportPlacement {
  const out = reportPlacement(p, rank);
  const recount = (cx: number, cy: number) =>
    countInWindow(prepared.xUm, prepared.yUm, window, cx, cy);
  let px: [number, number] = [p.centerPx[0], p.centerPx[1]];
  let um: [number, number] = [p.centerUm[0], p.centerUm[1]];
  for (const d of [2, 3, 4, 6, 9]) {
    const cp: [number, number] = [roundTo(p.centerPx[0], d), roundTo(p.centerPx[1], d)];
    const cu: [number, number] = [roundTo(p.centerUm[0], d), roundTo(p.centerUm[1], d)];
    const cpUm = pxToUm(cp, prepared.slide);
    if (recount(cpUm[0], cpUm[1]) === p.count && recount(cu[0], cu[1]) === p.count) {
      px = cp;
      um = cu;
      break;
    }
  }
  out.center_px = px;
  out.center_um = um;
  out.margin_um = roundTo(p.marginUm ?? 0, 3);
  return out;
}

/** The whole valid area's count when no window fits (a small sample). */
function wholeArea(
  prepared: PreparedCase,
  window: WindowShape,
): { count: number; area_mm2: number; per_mm2: number; count_per_window_area: number } | null {
  const area = prepared.validAreaMm2;
  if (!(area > 0)) return null;
  const count = prepared.tally.counted;
  return {
    count,
    area_mm2: roundTo(area, 6),
    per_mm2: roundTo(count / area, 4),
    count_per_window_area: roundTo((count / area) * window.areaMm2, 2),
  };
}

/** Why no window is admissible, with the numbers. */
function noPlacementWhy(
  validAreaMm2: number,
  window: WindowShape,
  coverage: Float32Array,
  minCoverage: number,
): string {
  const a = roundTo(validAreaMm2, 2), w = roundTo(window.areaMm2, 2);
  if (validAreaMm2 < window.areaMm2 * minCoverage) {
    return `No admissible window: the valid area ${a} mm² is smaller than ` +
      `${minCoverage === 1 ? "" : `${minCoverage} × `}the window's ${w} mm²`;
  }
  let best = 0;
  for (let k = 0; k < coverage.length; k++) if (coverage[k] > best) best = coverage[k];
  return `No admissible window: the best coverage on the grid, ${roundTo(best, 2)}, ` +
    `is below the minimum ${minCoverage} (valid area ${a} mm², window ${w} mm²)`;
}
