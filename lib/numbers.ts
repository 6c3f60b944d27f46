/**
 * Rounding for stable text (the one rounding helper of hotfield), and reading
 * plain decimal numbers from text.
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

/** A plain decimal number: optional sign, digits with an optional point, optional exponent. */
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * Reads a decimal number, or returns `undefined` when `text` is not one.
 *
 * Only plain decimals are numbers here (`12`, `-0.5`, `2.37`, `1e-3`):
 * hexadecimal, octal and binary literals (`0x10`, `0o7`, `0b1`),
 * `Infinity`, `NaN`, empty text and values too large for a double (`1e400`)
 * are not, although JavaScript's `Number()` reads most of them.
 *
 * @param text The text, surrounding white space allowed.
 * @returns The finite number, or `undefined`.
 *
 * @example Decimals only
 * ```ts
 * import { parseDecimal } from "./numbers.ts";
 * if (parseDecimal(" 2.37 ") !== 2.37) throw new Error("a decimal with spaces around it is read");
 * for (const bad of ["0x10", "1e400", "Infinity", "NaN", ""]) {
 *   if (parseDecimal(bad) !== undefined) throw new Error(`"${bad}" must not be read as a number`);
 * }
 * ```
 */
export function parseDecimal(text: string): number | undefined {
  const t = text.trim();
  if (!DECIMAL.test(t)) return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : undefined;
}

/**
 * Whether `text` (white space around allowed) is written as a plain decimal
 * number, whatever its size (`1e400` is, `0x10` is not).
 *
 * @param text The text.
 * @returns True for a plain decimal.
 *
 * @example
 * ```ts
 * import { isDecimalText } from "./numbers.ts";
 * if (!isDecimalText("1e400") || isDecimalText("0x10")) throw new Error("1e400 is written as a decimal, 0x10 is not");
 * ```
 */
export function isDecimalText(text: string): boolean {
  return DECIMAL.test(text.trim());
}
