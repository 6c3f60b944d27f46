/**
 * Error conventions.
 *
 * Bad input is reported by throwing the built-in class that fits
 * (`SyntaxError` for a file that cannot be parsed, `TypeError` for the wrong
 * shape, `RangeError` for a value out of range) with a message that names the
 * file, the place in it and the problem:
 * `Cannot read annotations "case12.geojson": feature 7 has role "tumour" but geometry "Point"`.
 * Messages start with a capital and have no full stop.
 *
 * Command-line option problems throw {@linkcode UsageError}; the CLI exits 2
 * for those and 1 for every other error, printing only the message.
 *
 * @module
 */

/** A command-line option is missing, malformed or out of range (CLI exit code 2). */
export class UsageError extends Error {
  /** Always "UsageError". */
  override name = "UsageError";
}

/**
 * A count grid would hold more cells than its limit: the stride is too small
 * for the region. A `RangeError`, so callers that catch range problems still
 * see it; the CLI turns it into a usage error about `--stride-um`.
 */
export class GridSizeError extends RangeError {
  /** Always "GridSizeError". */
  override name = "GridSizeError";
}

/**
 * The exact placement search for a case stopped at its work limit: the
 * counted figures are spread so evenly and densely that no window stands
 * out. A `RangeError` (the input is out of the range the search handles in
 * bounded time); the message says what to change.
 */
export class SearchWorkError extends RangeError {
  /** Always "SearchWorkError". */
  override name = "SearchWorkError";
}

/** The error classes used for bad input. */
export type InputErrorClass =
  | typeof SyntaxError
  | typeof TypeError
  | typeof RangeError;

/**
 * Builds an input error whose message names the file, the place and the problem.
 *
 * @param ErrorClass The built-in class that fits the problem.
 * @param what What was being read, e.g. `annotations`, `figures CSV`, `tissue mask`.
 * @param file The file's path as the user gave it.
 * @param detail The place and the problem, e.g. `feature 7 has no "role"`.
 * @param cause The lower-level error this one explains, kept as `cause`.
 * @returns The error, ready to throw.
 *
 * @example Naming the file and the feature
 * ```ts
 * import { inputError } from "./errors.ts";
 * const e = inputError(TypeError, "annotations", "case12.geojson", 'feature 7 has no "role"');
 * if (e.message !== 'Cannot read annotations "case12.geojson": feature 7 has no "role"') {
 *   throw new Error(e.message);
 * }
 * ```
 */
export function inputError(
  ErrorClass: InputErrorClass,
  what: string,
  file: string,
  detail: string,
  cause?: unknown,
): Error {
  const message = `Cannot read ${what} "${file}": ${detail}`;
  return cause === undefined ? new ErrorClass(message) : new ErrorClass(message, { cause });
}
