/**
 * From a case as read to a case ready for counting.
 *
 * @module
 */

import type { CaseData } from "../types.ts";
import type { PreparedCase } from "./engine_types.ts";
import { pointsPxToUm, px2ToMm2, regionPxToUm } from "../units.ts";
import { buildValidRegion, createRegionIndex } from "./_geometry.ts";
import { tallyFigures } from "./tally_figures.ts";
import { DEFAULT_COUNT_LABELS } from "../defaults.ts";

/** Options of {@linkcode prepareCase}. */
export interface PrepareCaseOptions {
  /** Figures with a score below this are not counted (figures without a score pass). @default 0 */
  minScore?: number;
  /** Figure labels that are counted. @default ["mitotic figure"] */
  countLabels?: string[];
}

/** Label given to figures without one (as the annotation reader does). */

/**
 * Prepares a case for counting.
 *
 * Builds the valid region V = (tissue ∩ tumour, when given) − exclusions,
 * tallies the figures (counted label, score ≥ `minScore`, inside V — a
 * figure on V's boundary is inside) and converts V and the counted figures to
 * the micrometre plane (x·mppX, y·mppY), where windows are defined and
 * circles stay circles when mpp x ≠ mpp y.
 *
 * @param caseData The case as read.
 * @param options Score threshold and counted labels.
 * @returns The prepared case.
 *
 * @example One counted figure in a 1 × 1 mm tissue square at 0.5 µm/px
 * ```ts
 * import { prepareCase } from "hotfield";
 * import type { CaseData, PolygonPx } from "../types.ts";
 * const square: PolygonPx = [[[0, 0], [2000, 0], [2000, 2000], [0, 2000], [0, 0]]];
 * const caseData: CaseData = {
 *   caseId: "QVT-24-001", slide: { id: "QVT-24-001", mppX: 0.5, mppY: 0.5 },
 *   tissue: [{ polygons: [square], source: "example" }], tumour: [], exclude: [],
 *   figures: {
 *     xPx: new Float64Array([1000, 3000]), yPx: new Float64Array([1000, 10]),
 *     labelIndex: new Uint32Array([0, 0]), labels: ["mitotic figure"],
 *     score: new Float64Array([NaN, NaN]), origin: new Int32Array([1, 2]),
 *   },
 *   fields: [], sources: [], warnings: [],
 * };
 * const p = prepareCase(caseData);
 * // 2000 px at 0.5 µm/px is 1 mm: one figure inside (at 500 µm), one outside.
 * if (p.xUm.length !== 1 || p.xUm[0] !== 500) throw new Error(`counted figures at ${p.xUm.join()} µm`);
 * if (Math.abs(p.validAreaMm2 - 1) > 1e-12) throw new Error(`valid area ${p.validAreaMm2} mm²`);
 * if (p.tally.outside_valid !== 1) throw new Error(`${p.tally.outside_valid} outside, expected 1`);
 * ```
 */
export function prepareCase(caseData: CaseData, options: PrepareCaseOptions = {}): PreparedCase {
  const minScore = options.minScore ?? 0;
  const countLabels = options.countLabels && options.countLabels.length > 0
    ? [...options.countLabels]
    : [...DEFAULT_COUNT_LABELS];
  const { slide, figures } = caseData;
  const mpp = { mppX: slide.mppX, mppY: slide.mppY };
  const valid = buildValidRegion({
    tissue: caseData.tissue,
    tumour: caseData.tumour,
    exclude: caseData.exclude,
  });
  const index = createRegionIndex(valid.region);
  const inside = index.containsPoints(figures.xPx, figures.yPx);
  const { tally, counted } = tallyFigures(figures, inside, { minScore, countLabels });
  const { xUm, yUm } = pointsPxToUm(figures.xPx, figures.yPx, mpp, counted);
  const validAreaMm2 = px2ToMm2(valid.validAreaPx2, mpp);
  return {
    caseId: caseData.caseId,
    slide,
    validUm: regionPxToUm(valid.region, mpp),
    validPx: valid.region,
    validAreaMm2,
    areasMm2: {
      tissue: px2ToMm2(valid.tissueAreaPx2, mpp),
      tumour: px2ToMm2(valid.tumourAreaPx2, mpp),
      excluded: px2ToMm2(valid.excludedAreaPx2, mpp),
      valid: validAreaMm2,
    },
    xUm,
    yUm,
    tally,
    fields: caseData.fields,
    excludePx: caseData.exclude.map((p) => ({ polygons: p.polygons, reason: p.reason })),
    minScore,
    countLabels,
    warnings: [...caseData.warnings, ...valid.warnings],
  };
}
