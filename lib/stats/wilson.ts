/**
 * Confidence interval of a share (a binomial proportion): the Wilson score
 * interval.
 *
 * @module
 */

import { chiSquareQuantile } from "./chi_square.ts";

/**
 * Wilson score interval for k successes in n trials (Wilson 1927): the set of
 * proportions p the two-sided score test at level `level` does not reject,
 *
 *   (p̂ + z²/2n ± z·√(p̂(1 − p̂)/n + z²/4n²)) / (1 + z²/n),
 *
 * with p̂ = k/n and z the standard normal quantile at 1 − (1 − level)/2
 * (z² = χ²₁ quantile at `level`; 1.959964 for 95%). Without continuity
 * correction. The limits stay inside [0, 1]; k = 0 gives a lower limit of
 * exactly 0 and k = n an upper limit of exactly 1.
 *
 * @param successes Whole number of successes, 0 ≤ k ≤ n.
 * @param trials Whole number of trials n ≥ 0.
 * @param level Confidence level in (0, 1). @default 0.95
 * @returns `[lo, hi]`, or null when n = 0 (no share to bound).
 * @throws {RangeError} When k or n is not a whole number, k > n, or level is outside (0, 1).
 * @see Wilson EB. Probable inference, the law of succession, and statistical inference. J Am Stat Assoc 1927;22(158):209-212. doi:10.1080/01621459.1927.10502953
 * @see Newcombe RG. Two-sided confidence intervals for the single proportion: comparison of seven methods. Stat Med 1998;17(8):857-872 (method 3)
 *
 * @example 81 of 263 (Newcombe 1998, Table I: 0.2553–0.3662)
 * ```ts
 * import { wilsonInterval } from "hotfield";
 * const [lo, hi] = wilsonInterval(81, 263)!;
 * if (Math.abs(lo - 0.2553) > 5e-5 || Math.abs(hi - 0.3662) > 5e-5) throw new Error(`${lo} ${hi}`);
 * ```
 */
export function wilsonInterval(
  successes: number,
  trials: number,
  level = 0.95,
): [number, number] | null {
  if (!Number.isInteger(trials) || trials < 0) {
    throw new RangeError(`Trials must be a whole number ≥ 0: got ${trials}`);
  }
  if (!Number.isInteger(successes) || successes < 0 || successes > trials) {
    throw new RangeError(
      `Successes must be a whole number from 0 to the trials (${trials}): got ${successes}`,
    );
  }
  if (!(level > 0 && level < 1)) {
    throw new RangeError(`Confidence level must be in (0, 1): got ${level}`);
  }
  if (trials === 0) return null;
  const n = trials;
  const p = successes / n;
  const z2 = chiSquareQuantile(level, 1);
  const z = Math.sqrt(z2);
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z / denom) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  const lo = successes === 0 ? 0 : Math.max(0, centre - half);
  const hi = successes === n ? 1 : Math.min(1, centre + half);
  return [lo, hi];
}
