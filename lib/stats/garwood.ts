/**
 * Exact (Garwood) Poisson confidence limits for a count, and the chance that
 * a recount falls on the other side of a cut-off.
 *
 * @module
 */

import { chiSquareQuantile } from "./chi_square.ts";

/**
 * Exact two-sided Poisson confidence interval for an observed count (Garwood 1936).
 *
 * lo = χ²(α/2; 2x) / 2 and hi = χ²(1 − α/2; 2x + 2) / 2 with α = 1 − level;
 * lo = 0 for x = 0 (so the 95% upper limit for 0 is 3.689, not the one-sided 2.996).
 *
 * @param count Observed count, a whole number ≥ 0.
 * @param level Confidence level in (0, 1).
 * @default level 0.95
 * @returns `[lo, hi]` limits for the Poisson mean.
 * @throws {RangeError} When count is not a whole number ≥ 0 or level is outside (0, 1).
 * @see Garwood F. Fiducial limits for the Poisson distribution. Biometrika 1936;28(3/4):437-442.
 *
 * @example 7 figures
 * ```ts
 * import { garwoodInterval } from "hotfield";
 * const [lo, hi] = garwoodInterval(7);
 * if (Math.abs(lo - 2.8144) > 1e-4 || Math.abs(hi - 14.4227) > 1e-4) throw new Error(`95% limits for 7: ${lo}, ${hi}`);
 * ```
 */
export function garwoodInterval(count: number, level = 0.95): [number, number] {
  if (!Number.isInteger(count) || count < 0) {
    throw new RangeError(`Count must be a whole number ≥ 0: got ${count}`);
  }
  if (!(level > 0 && level < 1)) {
    throw new RangeError(`Confidence level must be in (0, 1): got ${level}`);
  }
  const alpha = 1 - level;
  const lo = count === 0 ? 0 : chiSquareQuantile(alpha / 2, 2 * count) / 2;
  const hi = chiSquareQuantile(1 - alpha / 2, 2 * count + 2) / 2;
  return [lo, hi];
}

/**
 * Poisson distribution function P(Y ≤ k) for mean `mean`, summed directly.
 *
 * @example P(Y ≤ 0 | 2) = e^−2
 * ```ts
 * import { poissonCdf } from "./garwood.ts";
 * const p0 = poissonCdf(0, 2);
 * if (Math.abs(p0 - Math.exp(-2)) > 1e-15) throw new Error(`P(Y ≤ 0 | mean 2) = ${p0}, expected e^−2`);
 * ```
 */
export function poissonCdf(k: number, mean: number): number {
  if (k < 0) return 0;
  if (mean === 0) return 1;
  // Sum in log space from the start; fine for the counts of one window.
  let logTerm = -mean;
  let sum = Math.exp(logTerm);
  for (let i = 1; i <= Math.floor(k); i++) {
    logTerm += Math.log(mean) - Math.log(i);
    sum += Math.exp(logTerm);
  }
  return Math.min(1, sum);
}

/**
 * Probability that a recount lands on the other side of a cut-off.
 *
 * Definition: Y ~ Poisson(mean = `observed`). With `minCount` the least whole
 * count that meets the cut-off, an observed count that meets it (observed ≥
 * minCount) gives P(Y < minCount); one that does not gives P(Y ≥ minCount).
 * An observed 0 below the cut-off gives 0 (a Poisson of mean 0 is always 0).
 *
 * @param observed Observed count (≥ 0).
 * @param minCount Least whole count that meets the cut-off (≥ 0).
 * @returns The probability in [0, 1].
 *
 * @example 7 observed against "≥ 7": a recount below 7 has probability P(Y ≤ 6 | 7)
 * ```ts
 * import { pOtherSide, poissonCdf } from "./garwood.ts";
 * // 7 meets "≥ 7"; a recount falls below it with P(Y ≤ 6 | mean 7).
 * const p = pOtherSide(7, 7);
 * if (p !== poissonCdf(6, 7)) throw new Error(`p ${p}, expected P(Y ≤ 6) = ${poissonCdf(6, 7)}`);
 * ```
 */
export function pOtherSide(observed: number, minCount: number): number {
  if (!(observed >= 0) || !(minCount >= 0)) {
    throw new RangeError(`Counts must be ≥ 0: got ${observed} and ${minCount}`);
  }
  return observed >= minCount
    ? poissonCdf(minCount - 1, observed)
    : 1 - poissonCdf(minCount - 1, observed);
}
