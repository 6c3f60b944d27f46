/**
 * Sample quantiles by linear interpolation.
 *
 * @module
 */

/** Name of the quantile method, as written into reports. */
export const QUANTILE_METHOD = "R-7 (linear interpolation, Hyndman & Fan 1996 type 7)";

/**
 * The p-quantile of ascending values, by linear interpolation between order
 * statistics: h = (n − 1)·p, Q = x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋])
 * (Hyndman & Fan 1996 type 7, the default of R and NumPy).
 *
 * @see Hyndman RJ, Fan Y. Sample quantiles in statistical packages. The
 *   American Statistician 1996;50(4):361-365. doi:10.1080/00031305.1996.10473566
 *
 * @param sorted Values in ascending order (not checked).
 * @param p Probability in [0, 1].
 * @returns The quantile, or null for an empty array.
 * @throws RangeError when p is outside [0, 1].
 *
 * @example The ten-value list of Wikipedia's "Quantile" article
 * ```ts
 * import { quantileSorted } from "./quantiles.ts";
 * const x = [3, 6, 7, 8, 8, 10, 13, 15, 16, 20];
 * const q = [0.25, 0.5, 0.75].map((p) => quantileSorted(x, p)).join();
 * if (q !== "7.25,9,14.5") throw new Error(`R-7 quartiles ${q}, expected 7.25,9,14.5`);
 * if (quantileSorted([], 0.5) !== null) throw new Error("no values must give null");
 * ```
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number | null {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`Probability must be in [0, 1]: got ${p}`);
  const n = sorted.length;
  if (n === 0) return null;
  return interpolate((k) => sorted[k], n, p);
}

/** R-7 quantile of n ordered values read through `at(k)`. */
function interpolate(at: (k: number) => number, n: number, p: number): number {
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  if (lo >= n - 1) return at(n - 1);
  const a = at(lo), f = h - lo;
  return f === 0 ? a : a + f * (at(lo + 1) - a);
}

/** Five-number summary (all null for no values). */
export interface FiveNumberSummary {
  /** Least value. */
  min: number | null;
  /** Lower quartile. */
  q1: number | null;
  /** Median. */
  median: number | null;
  /** Upper quartile. */
  q3: number | null;
  /** Greatest value. */
  max: number | null;
}

/**
 * Minimum, R-7 quartiles and maximum of ascending values; all null when empty.
 *
 * @example
 * ```ts
 * import { fiveNumberSummary } from "./quantiles.ts";
 * const s = fiveNumberSummary([1, 2, 3, 4]);
 * if (s.min !== 1 || s.q1 !== 1.75 || s.median !== 2.5 || s.q3 !== 3.25 || s.max !== 4) {
 *   throw new Error(`summary ${JSON.stringify(s)}`);
 * }
 * ```
 */
export function fiveNumberSummary(sorted: ArrayLike<number>): FiveNumberSummary {
  const n = sorted.length;
  if (n === 0) return { min: null, q1: null, median: null, q3: null, max: null };
  return {
    min: sorted[0],
    q1: quantileSorted(sorted, 0.25),
    median: quantileSorted(sorted, 0.5),
    q3: quantileSorted(sorted, 0.75),
    max: sorted[n - 1],
  };
}

/**
 * R-7 quantile of non-negative integer values given as a histogram
 * (`histogram[v]` = how many values equal v), without expanding it.
 * Gives the same result as {@linkcode quantileSorted} on the sorted values.
 *
 * @example
 * ```ts
 * import { quantileOfHistogram } from "./quantiles.ts";
 * // values 0, 1, 1, 3
 * const q3 = quantileOfHistogram([1, 2, 0, 1], 0.75);
 * if (q3 !== 1.5) throw new Error(`upper quartile ${q3}, expected 1.5`);
 * ```
 */
export function quantileOfHistogram(histogram: ArrayLike<number>, p: number): number | null {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`Probability must be in [0, 1]: got ${p}`);
  let n = 0;
  for (let v = 0; v < histogram.length; v++) n += histogram[v];
  if (n === 0) return null;
  const cum: number[] = [];
  let acc = 0;
  for (let v = 0; v < histogram.length; v++) cum.push(acc += histogram[v]);
  const at = (k: number): number => {
    let lo = 0, hi = cum.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (cum[mid] > k) hi = mid;
      else lo = mid + 1;
    }
    return lo;
  };
  return interpolate(at, n, p);
}
