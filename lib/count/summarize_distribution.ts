/**
 * Distribution of window counts over the admissible grid centres.
 *
 * @module
 */

import type { CountMap } from "./engine_types.ts";
import { QUANTILE_METHOD, quantileOfHistogram } from "../stats/quantiles.ts";

/** Summary of counts over admissible grid positions (nulls when there are none). */
export interface Distribution {
  /** Number of admissible grid positions. */
  positions: number;
  /** Least admissible count. */
  min: number | null;
  /** Lower quartile (R-7, not rounded). */
  q1: number | null;
  /** Median (R-7, not rounded). */
  median: number | null;
  /** Upper quartile (R-7, not rounded). */
  q3: number | null;
  /** Greatest admissible count. */
  max: number | null;
  /** Mean admissible count (not rounded). */
  mean: number | null;
  /** `histogram[c]` = number of admissible positions with count c. */
  histogram: number[];
  /** How the quartiles were computed, in words. */
  quantileMethod: string;
}

/**
 * Summarizes the counts at admissible grid centres: positions, min, R-7
 * quartiles, max, mean and the histogram of counts. Grid positions stand for
 * equal areas of centre space, so this is the distribution of the count of a
 * window placed uniformly at random among admissible places (on the grid).
 *
 * @param map The count map.
 * @returns The summary; all statistics null when no position is admissible.
 *
 * @example
 * ```ts
 * import { summarizeDistribution } from "hotfield";
 * // Five positions; the last (count 9) is not admissible and does not count.
 * const d = summarizeDistribution({
 *   counts: new Int32Array([0, 1, 1, 3, 9]), admissible: new Uint8Array([1, 1, 1, 1, 0]),
 * });
 * if (d.median !== 1 || d.q3 !== 1.5 || d.max !== 3 || d.mean !== 1.25) {
 *   throw new Error(`median ${d.median}, q3 ${d.q3}, max ${d.max}, mean ${d.mean}`);
 * }
 * ```
 */
export function summarizeDistribution(
  map: Pick<CountMap, "counts" | "admissible">,
): Distribution {
  const histogram: number[] = [];
  let positions = 0, sum = 0;
  for (let k = 0; k < map.counts.length; k++) {
    if (!map.admissible[k]) continue;
    const c = map.counts[k];
    while (histogram.length <= c) histogram.push(0);
    histogram[c]++;
    positions++;
    sum += c;
  }
  if (positions === 0) {
    return {
      positions,
      min: null,
      q1: null,
      median: null,
      q3: null,
      max: null,
      mean: null,
      histogram,
      quantileMethod: QUANTILE_METHOD,
    };
  }
  let min = 0;
  while (histogram[min] === 0) min++;
  return {
    positions,
    min,
    q1: quantileOfHistogram(histogram, 0.25),
    median: quantileOfHistogram(histogram, 0.5),
    q3: quantileOfHistogram(histogram, 0.75),
    max: histogram.length - 1,
    mean: sum / positions,
    histogram,
    quantileMethod: QUANTILE_METHOD,
  };
}
