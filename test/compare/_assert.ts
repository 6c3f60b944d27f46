/** Small assertion helpers on node:assert (no registry beyond npm here). */

import { strict as assert } from "node:assert";

/** Deep strict equality. */
export function assertEquals<T>(actual: T, expected: T, message?: string): void {
  assert.deepStrictEqual(actual, expected, message);
}

/** |actual − expected| ≤ tolerance (an absolute tolerance, always given). */
export function assertAlmostEquals(
  actual: number,
  expected: number,
  tolerance: number,
  message = "",
): void {
  assert.ok(
    Math.abs(actual - expected) <= tolerance,
    `${message} expected ${expected} ± ${tolerance}, got ${actual}`,
  );
}

/** `fn` throws an instance of `ErrorClass` whose message includes `includes`. */
export function assertThrows(
  fn: () => unknown,
  ErrorClass: new (...args: never[]) => Error,
  includes: string,
): void {
  assert.throws(fn, (e: unknown) => {
    assert.ok(e instanceof ErrorClass, `expected ${ErrorClass.name}, got ${e}`);
    assert.ok((e as Error).message.includes(includes), `message: ${(e as Error).message}`);
    return true;
  });
}

/** Async version of {@linkcode assertThrows}. */
export async function assertRejects(
  fn: () => Promise<unknown>,
  ErrorClass: new (...args: never[]) => Error,
  includes: string,
): Promise<void> {
  await assert.rejects(fn, (e: unknown) => {
    assert.ok(e instanceof ErrorClass, `expected ${ErrorClass.name}, got ${e}`);
    assert.ok((e as Error).message.includes(includes), `message: ${(e as Error).message}`);
    return true;
  });
}
