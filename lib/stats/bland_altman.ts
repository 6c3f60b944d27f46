/**
 * Agreement of two methods measuring the same items: Bland–Altman bias and
 * limits of agreement.
 *
 * @module
 */

/** Bias and 95% limits of agreement of paired measurements. */
export interface BlandAltman {
  /** Number of pairs. */
  n: number;
  /** Mean of the differences (method B − method A); null when n = 0. */
  bias: number | null;
  /** Sample standard deviation of the differences (divisor n − 1); null when n < 2. */
  sd: number | null;
  /** bias − 1.96·sd; null when n < 2. */
  lower: number | null;
  /** bias + 1.96·sd; null when n < 2. */
  upper: number | null;
}

/**
 * Bland–Altman agreement: the differences d = b − a of paired measurements,
 * their mean (the bias) and the limits bias ± 1.96 × the sample standard
 * deviation of d (divisor n − 1), within which about 95% of differences are
 * expected to fall if they are roughly normal.
 *
 * The variance is accumulated with Welford's update (stable for large
 * values with small differences). With one pair there is a bias but no
 * spread (sd and limits null); with none, everything is null.
 *
 * @param a Method A (e.g. the reference) per item.
 * @param b Method B (e.g. the candidate) for the same items, same order.
 * @returns n, bias, sd and limits.
 * @throws {RangeError} When the lists differ in length or hold a non-finite value.
 * @see Bland JM, Altman DG. Statistical methods for assessing agreement between two methods of clinical measurement. Lancet 1986;327(8476):307-310. doi:10.1016/S0140-6736(86)90837-8
 *
 * @example Three pairs
 * ```ts
 * import { blandAltman } from "hotfield";
 * // differences 1, 2, 3: bias 2, sd 1, limits 2 ± 1.96
 * const r = blandAltman([10, 20, 30], [11, 22, 33]);
 * if (r.bias !== 2 || r.sd !== 1 || Math.abs(r.lower! - 0.04) > 1e-12 || Math.abs(r.upper! - 3.96) > 1e-12) {
 *   throw new Error(JSON.stringify(r));
 * }
 * ```
 */
export function blandAltman(a: readonly number[], b: readonly number[]): BlandAltman {
  if (a.length !== b.length) {
    throw new RangeError(
      `Paired measurements must have equal lengths: got ${a.length} and ${b.length}`,
    );
  }
  let mean = 0, m2 = 0;
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i]) || !Number.isFinite(b[i])) {
      throw new RangeError(
        `Paired measurements must be finite numbers: pair ${i} is ${a[i]}, ${b[i]}`,
      );
    }
    const d = b[i] - a[i];
    const delta = d - mean;
    mean += delta / (i + 1);
    m2 += delta * (d - mean);
  }
  const n = a.length;
  if (n === 0) return { n, bias: null, sd: null, lower: null, upper: null };
  if (n === 1) return { n, bias: mean, sd: null, lower: null, upper: null };
  const sd = Math.sqrt(m2 / (n - 1));
  return { n, bias: mean, sd, lower: mean - 1.96 * sd, upper: mean + 1.96 * sd };
}
