/**
 * Figure tallies: which figure points are counted, and why the others are not.
 *
 * @module
 */

import type { FigureSet } from "../types.ts";
import type { FigureTally } from "./engine_types.ts";
import { DEFAULT_COUNT_LABELS } from "../defaults.ts";

/** The label counted when none is chosen. */

/** Options of {@linkcode tallyFigures}. */
export interface TallyFiguresOptions {
  /**
   * Figures whose score is below this are not counted; a figure without a
   * score passes.
   * @default 0
   */
  minScore?: number;
  /**
   * Labels that are counted (exact, case-sensitive match).
   * @default ["mitotic figure"]
   */
  countLabels?: string[];
}

/**
 * Tallies figure points in a cascade: `total` is every point of any label; of
 * the points whose label is counted, `below_score` have a score below the
 * minimum, `outside_valid` pass the score but lie outside the valid region,
 * and `counted` is the rest. So `below_score + outside_valid + counted` is the
 * number of points with a counted label. `by_label` counts all points per
 * label, in the order of `figures.labels` (labels with no point are left out).
 *
 * @param figures The points (pixels).
 * @param inside 1 where the point lies in the valid region (a point on the
 *   region's boundary counts as inside), one entry per point.
 * @param options Minimum score and counted labels.
 * @returns The tally and a 0/1 flag per point, 1 where it is counted.
 * @throws {RangeError} When `inside` has the wrong length or `minScore` is not a number.
 *
 * @example A cascade over four points
 * ```ts
 * import { tallyFigures } from "./tally_figures.ts";
 * const figures = {
 *   xPx: Float64Array.of(1, 2, 3, 4), yPx: Float64Array.of(1, 2, 3, 4),
 *   labelIndex: Uint32Array.of(0, 0, 0, 1), labels: ["mitotic figure", "mimic"],
 *   score: Float64Array.of(0.9, 0.2, NaN, 0.9), origin: Int32Array.of(0, 1, 2, 3),
 * };
 * const { tally, counted } = tallyFigures(figures, Uint8Array.of(1, 1, 0, 1), { minScore: 0.5 });
 * // point 0 counted; point 1 below score; point 2 (no score passes) outside; point 3 other label
 * if (tally.total !== 4 || tally.counted !== 1 || tally.below_score !== 1 || tally.outside_valid !== 1) {
 *   throw new Error(`tally ${JSON.stringify(tally)}`);
 * }
 * if (tally.by_label["mimic"] !== 1 || counted.join() !== "1,0,0,0") throw new Error(`counted ${counted}`);
 * ```
 */
export function tallyFigures(
  figures: FigureSet,
  inside: Uint8Array,
  options: TallyFiguresOptions = {},
): { tally: FigureTally; counted: Uint8Array } {
  const n = figures.xPx.length;
  if (inside.length !== n) {
    throw new RangeError(
      `Cannot tally figures: the inside flags have ${inside.length} entries for ${n} points`,
    );
  }
  const minScore = options.minScore ?? 0;
  if (Number.isNaN(minScore)) throw new RangeError("Cannot tally figures: minScore is NaN");
  const countSet = new Set(options.countLabels ?? DEFAULT_COUNT_LABELS);
  const isCounted = figures.labels.map((l) => countSet.has(l));
  const perLabel = new Array<number>(figures.labels.length).fill(0);
  const counted = new Uint8Array(n);
  let belowScore = 0;
  let outsideValid = 0;
  let countedN = 0;
  for (let i = 0; i < n; i++) {
    const li = figures.labelIndex[i];
    perLabel[li]++;
    if (!isCounted[li]) continue;
    // NaN (no score) compares false, so it passes
    if (figures.score[i] < minScore) belowScore++;
    else if (inside[i] === 0) outsideValid++;
    else {
      countedN++;
      counted[i] = 1;
    }
  }
  const byLabel: Record<string, number> = {};
  figures.labels.forEach((l, k) => {
    if (perLabel[k] > 0) byLabel[l] = perLabel[k];
  });
  return {
    tally: {
      total: n,
      counted: countedN,
      outside_valid: outsideValid,
      below_score: belowScore,
      by_label: byLabel,
    },
    counted,
  };
}
