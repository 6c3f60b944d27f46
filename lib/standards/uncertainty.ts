/**
 * Counting uncertainty of a hotspot count: exact Poisson limits, the per-mm²
 * interval and the chance a recount falls on the other side of a cut-off.
 *
 * @module
 */

import { garwoodInterval, pOtherSide } from "../stats/garwood.ts";

/** Counting uncertainty of a window count (the `uncertainty` block of report.json). */
export interface CountUncertainty {
  /** Exact two-sided Poisson 95% interval of the count (Garwood 1936), not rounded. */
  count_ci95: [number, number];
  /** `count_ci95` divided by the window area, figures per mm², not rounded. */
  per_mm2_ci95: [number, number];
  /**
   * Chance that a recount (Poisson with the observed count as mean) falls on
   * the other side of the cut-off; null without a cut-off.
   */
  p_other_side: number | null;
  /** p-value of the Monte Carlo scan test; null when it was not run (0 simulations). */
  scan_p: number | null;
  /** Simulations behind `scan_p` (0 when the test was not run). */
  simulations: number;
  /** The window count these limits are for. */
  count?: number;
  /** `count` divided by the window area, figures per mm², not rounded. */
  per_mm2?: number;
  /** How each value was computed, in words. */
  method?: Record<string, string>;
  /** Seed of the scan test, when one was given. */
  seed?: number;
  /** Room for keys added later. */
  [extra: string]: unknown;
}

/** Options of {@linkcode countUncertainty}. */
export interface CountUncertaintyOptions {
  /** Least whole window count meeting the cut-off; omit for no cut-off (`p_other_side` null). */
  minCount?: number;
  /** Scan-test p-value, when one was computed. @default null */
  scanP?: number | null;
  /** Simulations behind `scanP`. @default 0 */
  simulations?: number;
  /** Seed of the simulations. */
  seed?: number;
}

/**
 * Builds the report's `uncertainty` block for a window count.
 *
 * `count_ci95` is the exact Poisson 95% interval (Garwood 1936);
 * `per_mm2_ci95` is that interval divided by the window area; `p_other_side`
 * is {@linkcode pOtherSide} against `minCount`.
 *
 * @param count Observed window count (whole, ≥ 0).
 * @param windowAreaMm2 Window area, mm² (> 0).
 * @param options Cut-off and scan-test results.
 * @returns The `uncertainty` block.
 *
 * @example 7 figures in 2.37 mm²
 * ```ts
 * import { countUncertainty } from "hotfield";
 * const u = countUncertainty(7, 2.37);
 * // Garwood's lower limit for 7 is 2.8144; over 2.37 mm² that is 1.1875 per mm².
 * if (Math.abs(u.per_mm2_ci95[0] - 1.1875) > 1e-4) throw new Error(`lower limit ${u.per_mm2_ci95[0]} per mm²`);
 * ```
 */
export function countUncertainty(
  count: number,
  windowAreaMm2: number,
  options: CountUncertaintyOptions = {},
): CountUncertainty {
  if (!(windowAreaMm2 > 0) || !Number.isFinite(windowAreaMm2)) {
    throw new RangeError(`Window area must be a number > 0 mm²: got ${windowAreaMm2}`);
  }
  const [lo, hi] = garwoodInterval(count, 0.95);
  const u: CountUncertainty = {
    count_ci95: [lo, hi],
    per_mm2_ci95: [lo / windowAreaMm2, hi / windowAreaMm2],
    p_other_side: options.minCount === undefined ? null : pOtherSide(count, options.minCount),
    scan_p: options.scanP ?? null,
    simulations: options.simulations ?? 0,
    count,
    per_mm2: count / windowAreaMm2,
    method: {
      count_ci95: "exact two-sided Poisson interval (Garwood 1936): lo = χ²(0.025; 2x)/2, " +
        "hi = χ²(0.975; 2x+2)/2, lo = 0 for x = 0",
      per_mm2_ci95: "count_ci95 divided by the window area",
      p_other_side: "Y ~ Poisson(mean = observed count), k = least whole window count meeting " +
        "the cut-off: P(Y < k) when the count meets it, else P(Y ≥ k)",
      scan_p: "Monte Carlo test of the maximum admissible window count on the fixed-size " +
        "window grid, under a uniform rate over the valid region with the same total " +
        "(a form of the spatial scan statistic, Kulldorff 1997): p = (1 + #sims ≥ observed) / " +
        "(1 + sims)",
    },
  };
  if (options.seed !== undefined) u.seed = options.seed;
  return u;
}
