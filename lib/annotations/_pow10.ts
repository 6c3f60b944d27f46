/**
 * Exact powers of ten for the byte scanners: a decimal with at most 15
 * significant digits and an exponent within ±22 converts exactly as
 * mantissa × 10^k or mantissa / 10^k.
 *
 * @module
 */

/** 10^0 … 10^22, each exactly representable as a double. */
export const POW10 = [
  1e0,
  1e1,
  1e2,
  1e3,
  1e4,
  1e5,
  1e6,
  1e7,
  1e8,
  1e9,
  1e10,
  1e11,
  1e12,
  1e13,
  1e14,
  1e15,
  1e16,
  1e17,
  1e18,
  1e19,
  1e20,
  1e21,
  1e22,
];
