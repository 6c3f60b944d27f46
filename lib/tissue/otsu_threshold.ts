/**
 * Otsu's threshold of a histogram.
 *
 * @module
 */

/**
 * Chooses the threshold that best splits a histogram into two classes
 * (Otsu's method).
 *
 * For each split after bin k the between-class variance
 * w₀(k)·w₁(k)·(μ₀(k) − μ₁(k))² is computed, with w the class counts and μ the
 * class means of the bin indices (equally spaced bins, so any bin centres
 * give the same choice); the first k with the largest value wins. Class 0
 * is bins 0..k, class 1 the bins above: values in bins > k are "above the
 * threshold". This is the computation of scikit-image's `threshold_otsu`
 * (which returns the centre of bin k), which the tests compare with. Splits
 * that leave a class empty are never chosen; a histogram with a single
 * non-empty bin gives that bin.
 *
 * @see Otsu N (1979). A threshold selection method from gray-level
 *   histograms. IEEE Trans Syst Man Cybern 9(1):62–66. doi:10.1109/TSMC.1979.4310076
 *
 * @param counts Counts per bin (non-negative).
 * @returns The index k of the last bin of the lower class.
 * @throws {RangeError} When the histogram is empty (no positive count).
 *
 * @example Two clusters
 * ```ts
 * import { otsuThreshold } from "hotfield";
 * // bins 0..5: three values at 1, three at 4
 * const k = otsuThreshold([0, 3, 0, 0, 3, 0]);
 * if (k !== 1) throw new Error(`expected the split after bin 1, got ${k}`);
 * ```
 */
export function otsuThreshold(counts: ArrayLike<number>): number {
  const n = counts.length;
  let total = 0, sum = 0, first = -1;
  for (let i = 0; i < n; i++) {
    const c = counts[i];
    if (!(c >= 0)) {
      throw new RangeError(`Cannot compute Otsu's threshold: bin ${i} has the count ${c}`);
    }
    if (c > 0 && first < 0) first = i;
    total += c;
    sum += c * i;
  }
  if (first < 0) {
    throw new RangeError("Cannot compute Otsu's threshold: the histogram is empty");
  }
  let best = -1, bestK = first;
  let w0 = 0, s0 = 0;
  for (let k = 0; k < n - 1; k++) {
    w0 += counts[k];
    s0 += counts[k] * k;
    const w1 = total - w0;
    if (w0 === 0 || w1 === 0) continue;
    const d = s0 / w0 - (sum - s0) / w1;
    const v = w0 * w1 * d * d;
    if (v > best) {
      best = v;
      bestK = k;
    }
  }
  return bestK;
}
