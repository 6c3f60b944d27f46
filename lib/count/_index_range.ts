/**
 * Exact index ranges of a monotone predicate, from a floating-point estimate.
 *
 * @module
 */

/**
 * Returns `[lo, hi]` (inclusive; empty when lo > hi) of the indices in
 * [0, n) where `inside(i)` holds, given that the true set is contiguous and
 * `[estLo, estHi]` is an estimate off by at most a few indices. The ends are
 * fixed up with `inside` itself, so the result agrees bit for bit with a
 * direct test.
 */
export function exactRange(
  estLo: number,
  estHi: number,
  n: number,
  inside: (i: number) => boolean,
): [number, number] {
  let lo = Math.max(0, Math.min(n - 1, estLo));
  let hi = Math.max(0, Math.min(n - 1, estHi));
  if (lo > hi) {
    // Estimate empty: look around it for the (at most tiny) true range.
    const mid = lo;
    if (inside(mid)) {
      lo = hi = mid;
    } else if (mid - 1 >= 0 && inside(mid - 1)) {
      lo = hi = mid - 1;
    } else if (mid + 1 < n && inside(mid + 1)) {
      lo = hi = mid + 1;
    } else {
      return [1, 0];
    }
  }
  while (lo > 0 && inside(lo - 1)) lo--;
  while (lo <= hi && !inside(lo)) lo++;
  while (hi < n - 1 && inside(hi + 1)) hi++;
  while (hi >= lo && !inside(hi)) hi--;
  if (lo > hi) {
    // The estimate missed entirely; the true set, if any, lies next to it.
    return [1, 0];
  }
  return [lo, hi];
}
