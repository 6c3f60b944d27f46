/**
 * Rounding for stable text: the one rounding helper of hotfield.
 *
 * @module
 */

/**
 * Rounds to `digits` decimals (`Math.round` of the value times 10^digits,
 * so halves go toward +∞), and maps −0 to 0 so that no output shows "-0".
 *
 * Used wherever a number is written for a reader (report.json, CSV, plots,
 * messages), so the same value always gives the same text.
 *
 * @param value Any finite number (NaN and ±Infinity pass through).
 * @param digits Decimals to keep, a whole number ≥ 0.
 * @returns The rounded value.
 *
 * @example Three decimals, and no negative zero
 * ```ts
 * import { roundTo } from "./numbers.ts";
 * const r = roundTo(1737.12651, 3);
 * if (r !== 1737.127) throw new Error(`roundTo gave ${r}`);
 * if (!Object.is(roundTo(-0.0004, 3), 0)) throw new Error("roundTo kept a negative zero");
 * ```
 */
export function roundTo(value: number, digits: number): number {
  const f = 10 ** digits;
  const r = Math.round(value * f) / f;
  return Object.is(r, -0) ? 0 : r;
}
