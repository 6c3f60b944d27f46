/**
 * Where a count stands among the admissible window positions.
 *
 * @module
 */

/**
 * Mid-rank percentile of count c among positions given as a histogram:
 * 100 × (#positions with count < c + ½ × #positions with count = c) / positions.
 * Ties get half weight, so a count equal to every position's gives 50.
 *
 * @param histogram `histogram[v]` = positions with count v.
 * @param count The count to place.
 * @returns The percentile in [0, 100], or null when there are no positions.
 *
 * @example
 * ```ts
 * import { percentileRank } from "hotfield";
 * const tied = percentileRank([0, 4], 1), above = percentileRank([1, 1], 5);
 * if (tied !== 50) throw new Error(`a count equal to every position's ranks ${tied}, expected 50`);
 * if (above !== 100) throw new Error(`a count above every position's ranks ${above}, expected 100`);
 * if (percentileRank([], 3) !== null) throw new Error("no positions must give null");
 * ```
 */
export function percentileRank(histogram: ArrayLike<number>, count: number): number | null {
  let total = 0, below = 0, equal = 0;
  for (let v = 0; v < histogram.length; v++) {
    const h = histogram[v];
    total += h;
    if (v < count) below += h;
    else if (v === count) equal += h;
  }
  if (total === 0) return null;
  return (100 * (below + 0.5 * equal)) / total;
}
