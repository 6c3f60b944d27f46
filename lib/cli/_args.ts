/**
 * Option parsing helpers shared by the commands (node:util parseArgs).
 * Every problem throws UsageError naming the option.
 */

import { parseArgs } from "node:util";
import { UsageError } from "../errors.ts";
import { isDecimalText, parseDecimal } from "../numbers.ts";

export { parseDecimal };

/** Option spec as node:util parseArgs takes it. */
export type OptionSpec = Record<
  string,
  { type: "string" | "boolean"; multiple?: boolean; short?: string }
>;

/** Parses `args` strictly; unknown options and missing values become UsageError. */
export function parseOptions(
  args: string[],
  options: OptionSpec,
): { values: Record<string, string | boolean | string[] | undefined>; positionals: string[] } {
  try {
    const { values, positionals } = parseArgs({
      args,
      options,
      allowPositionals: true,
      strict: true,
    });
    return {
      values: values as Record<string, string | boolean | string[] | undefined>,
      positionals,
    };
  } catch (e) {
    // node:util appends multi-line advice; keep the first sentence.
    throw new UsageError(
      (e as Error).message.replace(/[.?]?\s*(Did you forget|To specify).*$/s, ""),
      { cause: e },
    );
  }
}

/**
 * Why `raw` is not a decimal number, for a message: `"0x10" is not a decimal
 * number`, `"1e400" is too large`.
 *
 * @param raw The option's value.
 * @returns The reason in words.
 *
 * @example
 * ```ts
 * import { notDecimalWhy } from "./_args.ts";
 * if (notDecimalWhy("1e400") !== '"1e400" is too large') throw new Error(notDecimalWhy("1e400"));
 * ```
 */
export function notDecimalWhy(raw: unknown): string {
  return isDecimalText(String(raw)) ? `"${raw}" is too large` : `"${raw}" is not a decimal number`;
}

/**
 * Reads a finite decimal number option (see {@linkcode parseDecimal});
 * `undefined` when absent.
 *
 * @param values Parsed option values.
 * @param name The option's name without dashes.
 * @param check Returns why a value is out of range, or `undefined` when it is fine.
 * @returns The number, or `undefined` when the option was not given.
 * @throws {UsageError} Naming the option, when the value is not a decimal
 *   number or `check` refuses it.
 *
 * @example Hexadecimal is refused
 * ```ts
 * import { numberOption } from "./_args.ts";
 * if (numberOption({ area: "2.37" }, "area") !== 2.37) throw new Error("a decimal is read");
 * let message = "";
 * try { numberOption({ area: "0x10" }, "area"); } catch (e) { message = (e as Error).message; }
 * if (!message.includes("--area")) throw new Error(`the message names the option: ${message}`);
 * ```
 */
export function numberOption(
  values: Record<string, unknown>,
  name: string,
  check?: (v: number) => string | undefined,
): number | undefined {
  const raw = values[name];
  if (raw === undefined) return undefined;
  const v = parseDecimal(String(raw));
  if (v === undefined) {
    throw new UsageError(`Option --${name} needs a decimal number: ${notDecimalWhy(raw)}`);
  }
  const problem = check?.(v);
  if (problem) throw new UsageError(`Option --${name} ${problem}: got ${raw}`);
  return v;
}
