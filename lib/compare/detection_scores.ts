/**
 * Detection scores from true positives, false positives and false
 * negatives: precision, recall, F1 and average precision.
 *
 * @module
 */

/** Precision, recall and F1 of one set of predictions. */
export interface DetectionScores {
  /** tp / (tp + fp); null when there are no predictions (0/0). */
  precision: number | null;
  /** tp / (tp + fn); null when there are no reference figures (0/0). */
  recall: number | null;
  /** 2·tp / (2·tp + fp + fn); null only when both sets are empty. */
  f1: number | null;
}

/**
 * Precision, recall and F1.
 *
 * Conventions: a ratio whose denominator is 0 is undefined and given as
 * null (never a made-up 0 or 1), so JSON numbers stay finite and honest.
 * F1 is written 2·tp / (2·tp + fp + fn), equal to the harmonic mean of
 * precision and recall whenever both exist, and defined (0) also when there
 * are no predictions but there are reference figures.
 *
 * @param tp True positives (paired candidates).
 * @param fp False positives (unpaired candidates).
 * @param fn False negatives (unpaired reference figures).
 * @returns The three scores.
 * @throws {RangeError} When a count is not a whole number ≥ 0.
 *
 * @example 8 pairs, 2 false positives, 4 misses
 * ```ts
 * import { detectionScores } from "hotfield";
 * const s = detectionScores(8, 2, 4);
 * // precision 8/10, recall 8/12, F1 16/22
 * if (s.precision !== 0.8 || Math.abs(s.recall! - 2 / 3) > 1e-15 || Math.abs(s.f1! - 16 / 22) > 1e-15) {
 *   throw new Error(JSON.stringify(s));
 * }
 * if (detectionScores(0, 0, 5).precision !== null || detectionScores(0, 0, 5).f1 !== 0) {
 *   throw new Error("no predictions: precision null, F1 0");
 * }
 * ```
 */
export function detectionScores(tp: number, fp: number, fn: number): DetectionScores {
  for (const [name, v] of [["tp", tp], ["fp", fp], ["fn", fn]] as const) {
    if (!Number.isInteger(v) || v < 0) {
      throw new RangeError(`Detection counts must be whole numbers ≥ 0: ${name} is ${v}`);
    }
  }
  return {
    precision: tp + fp === 0 ? null : tp / (tp + fp),
    recall: tp + fn === 0 ? null : tp / (tp + fn),
    f1: tp + fp + fn === 0 ? null : (2 * tp) / (2 * tp + fp + fn),
  };
}

/** One operating point of a ranked list: predictions kept and how many of them are paired. */
export interface RankedPoint {
  /** Candidates at or above the threshold. */
  predictions: number;
  /** True positives among them. */
  tp: number;
}

/**
 * Average precision with all-point interpolation, as the PASCAL VOC
 * challenge defines it from 2010 on (Everingham et al. 2010, IJCV 88:303-338):
 * the precision at each recall is replaced by the highest precision at
 * that or any higher recall (made non-increasing from the right), and AP is
 * the area under that step curve, Σ (R_k − R_{k−1}) · max_{j ≥ k} P_j with
 * R_0 = 0.
 *
 * The points are the operating points at every distinct score, in order of
 * decreasing threshold (so `predictions` increasing): candidates with equal
 * scores enter together, as a threshold cannot separate them (the VOC
 * development kit instead takes tied detections one by one in sort order).
 *
 * @param points Operating points, predictions strictly increasing.
 * @param references Number of reference figures.
 * @returns AP in [0, 1]; null when there are no reference figures (recall
 *   undefined); 0 when there are no points.
 * @throws {RangeError} When the points are not increasing or hold impossible counts.
 *
 * @example Three ranked detections: hit, miss, hit, with 2 references
 * ```ts
 * import { averagePrecision } from "hotfield";
 * // P = 1, 1/2, 2/3 at R = 1/2, 1/2, 1; interpolated 1 and 2/3: AP = ½·1 + ½·⅔ = 5/6
 * const ap = averagePrecision([{ predictions: 1, tp: 1 }, { predictions: 2, tp: 1 }, { predictions: 3, tp: 2 }], 2);
 * if (ap === null || Math.abs(ap - 5 / 6) > 1e-15) throw new Error(`AP ${ap}`);
 * ```
 */
export function averagePrecision(
  points: readonly RankedPoint[],
  references: number,
): number | null {
  if (!Number.isInteger(references) || references < 0) {
    throw new RangeError(`Reference count must be a whole number ≥ 0: got ${references}`);
  }
  for (let k = 0; k < points.length; k++) {
    const p = points[k];
    if (
      !(p.predictions > (k === 0 ? 0 : points[k - 1].predictions)) || p.tp < 0 ||
      p.tp > p.predictions || p.tp > references
    ) {
      throw new RangeError(
        `Operating point ${k} is not a valid step (predictions increasing, 0 ≤ tp ≤ predictions and references): ` +
          `predictions ${p.predictions}, tp ${p.tp}`,
      );
    }
  }
  if (references === 0) return null;
  let ap = 0;
  let best = 0;
  // From the right: running maximum of precision, times each recall step.
  for (let k = points.length - 1; k >= 0; k--) {
    const p = points[k];
    best = Math.max(best, p.tp / p.predictions);
    const prevTp = k === 0 ? 0 : points[k - 1].tp;
    ap += ((p.tp - prevTp) / references) * best;
  }
  return ap;
}
