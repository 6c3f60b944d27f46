/**
 * Option parsing helpers shared by the commands (node:util parseArgs).
 * Every problem throws UsageError naming the option.
 */

import { parseArgs } from "node:util";
import { UsageError } from "../errors.ts";

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

/** Reads a finite number option; `undefined` when absent. */
export function numberOption(
  values: Record<string, unknown>,
  name: string,
  check?: (v: number) => string | undefined,
): number | undefined {
  const raw = values[name];
  if (raw === undefined) return undefined;
  const text = String(raw).trim();
  const v = text === "" ? NaN : Number(text);
  if (!Number.isFinite(v)) throw new UsageError(`Option --${name} needs a number: got "${raw}"`);
  const problem = check?.(v);
  if (problem) throw new UsageError(`Option --${name} ${problem}: got ${raw}`);
  return v;
}
