// Chi-square distribution and quantiles against npm jstat 1.9.6 (a
// general-purpose statistics library) and textbook values.

import { strict as assert } from "node:assert";
import jStat from "jstat";
import { chiSquareCdf, chiSquareQuantile, regularizedGammaP } from "../../lib/stats/chi_square.ts";

Deno.test("chiSquareQuantile() agrees with jStat.chisquare.inv to 1e-9 relative", () => {
  for (const df of [1, 2, 3, 5, 10, 14, 16, 40, 100, 202]) {
    for (const p of [0.001, 0.025, 0.05, 0.5, 0.95, 0.975, 0.999]) {
      const q = chiSquareQuantile(p, df);
      const j = jStat.chisquare.inv(p, df);
      assert.ok(Math.abs(q - j) <= 1e-9 * Math.max(1, j), `df=${df} p=${p}: ${q} vs ${j}`);
    }
  }
});

Deno.test("chiSquareCdf() agrees with jStat.chisquare.cdf to 1e-10", () => {
  // jstat's series is accurate to about 4e-11 here (df 1, x 3), hence 1e-10.
  for (const df of [1, 2, 7, 30]) {
    for (const x of [0.01, 0.5, 1, 3, 10, 25, 60]) {
      assert.ok(Math.abs(chiSquareCdf(x, df) - jStat.chisquare.cdf(x, df)) <= 1e-10);
    }
  }
});

Deno.test("chiSquareCdf() matches the closed forms for 1 and 2 degrees of freedom", () => {
  // P(χ²₁ ≤ x) = erf(√(x/2)); erf(√1.5) = 0.9167354833364496 (CPython 3 math.erf).
  // P(χ²₂ ≤ x) = 1 − e^(−x/2) (hand calculation).
  assert.ok(Math.abs(chiSquareCdf(3, 1) - 0.9167354833364496) <= 1e-14);
  for (const x of [0.1, 1, 5, 20]) {
    assert.ok(Math.abs(chiSquareCdf(x, 2) - (1 - Math.exp(-x / 2))) <= 1e-14);
  }
});

Deno.test("chiSquareQuantile() matches textbook critical values", () => {
  // Common practice (tables in any statistics text): χ²(0.95; 1) = 3.841,
  // χ²(0.95; 2) = 5.991, χ²(0.95; 10) = 18.307. Tolerance 5e-4 (3 d.p.).
  assert.ok(Math.abs(chiSquareQuantile(0.95, 1) - 3.841) < 5e-4);
  assert.ok(Math.abs(chiSquareQuantile(0.95, 2) - 5.991) < 5e-4);
  assert.ok(Math.abs(chiSquareQuantile(0.95, 10) - 18.307) < 5e-4);
});

Deno.test("regularizedGammaP() rejects bad arguments", () => {
  assert.throws(() => regularizedGammaP(0, 1), RangeError);
  assert.throws(() => regularizedGammaP(1, -1), RangeError);
  assert.throws(() => chiSquareQuantile(1.5, 2), RangeError);
  assert.equal(chiSquareQuantile(0, 3), 0);
  assert.equal(chiSquareQuantile(1, 3), Infinity);
});
