/**
 * Agreement between two ratings of the same items: Cohen's kappa.
 *
 * @module
 */

/** Agreement of two ratings over the same items. */
export interface Agreement {
  /** Number of items rated by both. */
  n: number;
  /** Observed share of items on which both ratings agree, in [0, 1]; null when n = 0. */
  observed: number | null;
  /** Share expected by chance from the two sets of marginals; null when n = 0. */
  expected: number | null;
  /** Cohen's kappa; null when n = 0 or when chance agreement is 1 (both raters used one class only). */
  kappa: number | null;
}

/**
 * Cohen's kappa from a square table of counts.
 *
 * `table[i][j]` counts the items rater A put in class i and rater B in class j.
 * κ = (p_o − p_e) / (1 − p_e), with p_o the diagonal share and p_e the sum of
 * products of the marginal shares. Undefined (null) when the table is empty or
 * p_e = 1.
 *
 * @param table A k × k table of whole counts ≥ 0 (k ≥ 1).
 * @returns Observed and chance agreement and kappa.
 * @throws {RangeError} When the table is not square or holds a negative or non-finite count.
 * @see Cohen J. A coefficient of agreement for nominal scales. Educ Psychol Meas 1960;20(1):37-46. doi:10.1177/001316446002000104
 *
 * @example Two classes, 50 items
 * ```ts
 * import { cohenKappa } from "hotfield";
 * // p_o = (20 + 15) / 50 = 0.7; p_e = (25·30 + 25·20) / 50² = 0.5; κ = 0.4
 * const { kappa } = cohenKappa([[20, 5], [10, 15]]);
 * if (kappa === null || Math.abs(kappa - 0.4) > 1e-12) throw new Error(`kappa ${kappa}`);
 * ```
 */
export function cohenKappa(table: readonly (readonly number[])[]): Agreement {
  const k = table.length;
  for (const row of table) {
    if (row.length !== k) {
      throw new RangeError(
        `Agreement table must be square: got ${k} rows and a row of ${row.length}`,
      );
    }
    for (const v of row) {
      if (!Number.isFinite(v) || v < 0) {
        throw new RangeError(`Agreement table counts must be finite and ≥ 0: got ${v}`);
      }
    }
  }
  let n = 0;
  let diagonal = 0;
  const rowSums = new Array<number>(k).fill(0);
  const colSums = new Array<number>(k).fill(0);
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      const v = table[i][j];
      n += v;
      rowSums[i] += v;
      colSums[j] += v;
      if (i === j) diagonal += v;
    }
  }
  if (n === 0) return { n: 0, observed: null, expected: null, kappa: null };
  const observed = diagonal / n;
  let expected = 0;
  for (let i = 0; i < k; i++) expected += (rowSums[i] / n) * (colSums[i] / n);
  const kappa = expected >= 1 ? null : (observed - expected) / (1 - expected);
  return { n, observed, expected, kappa };
}

/**
 * Cohen's kappa for two binary ratings given as paired booleans.
 *
 * @param a Rater A's rating of each item (true = the positive class).
 * @param b Rater B's rating of the same items, in the same order.
 * @returns Agreement over the pairs (see {@linkcode cohenKappa}).
 * @throws {RangeError} When the two lists differ in length.
 *
 * @example Identical ratings with both classes used give κ = 1
 * ```ts
 * import { binaryKappa } from "hotfield";
 * const { kappa } = binaryKappa([true, false, true], [true, false, true]);
 * if (kappa !== 1) throw new Error(`kappa ${kappa}`);
 * ```
 */
export function binaryKappa(a: readonly boolean[], b: readonly boolean[]): Agreement {
  if (a.length !== b.length) {
    throw new RangeError(`Paired ratings must have equal lengths: got ${a.length} and ${b.length}`);
  }
  const table = [[0, 0], [0, 0]];
  for (let i = 0; i < a.length; i++) table[a[i] ? 0 : 1][b[i] ? 0 : 1]++;
  return cohenKappa(table);
}
