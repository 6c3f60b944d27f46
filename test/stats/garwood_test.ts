// Exact Poisson (Garwood) limits against the project's reference list
// (REFERENCES.md §9, mark C: computed with scipy chi2.ppf and independently by
// root-finding on Poisson tail sums at 30 digits; both agree to 4 d.p.). The
// published tables (Garwood F, Biometrika 1936; Gehrels N, ApJ 1986;303:336)
// were not read, so these are computed values, not published ones. A second
// check uses npm jstat 1.9.6 (jStat.chisquare.inv), a general-purpose library.
// Tolerance 1e-4: the reference values are given to 4 d.p. (half a unit is 5e-5,
// plus rounding of the reference itself).

import { strict as assert } from "node:assert";
import jStat from "jstat";
import { garwoodInterval, poissonCdf, pOtherSide } from "../../lib/stats/garwood.ts";
import { countUncertainty } from "../../lib/standards/uncertainty.ts";

// x, lower, upper (REFERENCES.md §9, two-sided 95%, C)
const TABLE_95: [number, number, number][] = [
  [0, 0.0000, 3.6889],
  [1, 0.0253, 5.5716],
  [2, 0.2422, 7.2247],
  [3, 0.6187, 8.7673],
  [4, 1.0899, 10.2416],
  [5, 1.6235, 11.6683],
  [6, 2.2019, 13.0595],
  [7, 2.8144, 14.4227],
  [8, 3.4538, 15.7632],
  [9, 4.1154, 17.0848],
  [10, 4.7954, 18.3904],
  [11, 5.4912, 19.6820],
  [12, 6.2006, 20.9616],
  [13, 6.9220, 22.2304],
  [14, 7.6539, 23.4896],
  [15, 8.3954, 24.7402],
  [16, 9.1454, 25.9830],
  [17, 9.9031, 27.2186],
  [18, 10.6679, 28.4478],
  [19, 11.4392, 29.6709],
  [20, 12.2165, 30.8884],
  [25, 16.1787, 36.9049],
  [30, 20.2409, 42.8269],
  [40, 28.5766, 54.4686],
  [50, 37.1110, 65.9188],
  [100, 81.3640, 121.6268],
];

Deno.test("garwoodInterval() matches the reference table for x = 0…20, 25, 30, 40, 50, 100", () => {
  for (const [x, lo, hi] of TABLE_95) {
    const [l, h] = garwoodInterval(x);
    assert.ok(Math.abs(l - lo) <= 1e-4, `x=${x} lower ${l} vs ${lo}`);
    assert.ok(Math.abs(h - hi) <= 1e-4, `x=${x} upper ${h} vs ${hi}`);
  }
});

Deno.test("garwoodInterval() agrees with jstat's chi-square quantiles to 1e-8", () => {
  // lo = χ²(α/2; 2x)/2, hi = χ²(1 − α/2; 2x + 2)/2 with jStat.chisquare.inv.
  for (const level of [0.9, 0.95, 0.99]) {
    const a = 1 - level;
    for (let x = 0; x <= 60; x++) {
      const [l, h] = garwoodInterval(x, level);
      const jl = x === 0 ? 0 : jStat.chisquare.inv(a / 2, 2 * x) / 2;
      const jh = jStat.chisquare.inv(1 - a / 2, 2 * x + 2) / 2;
      assert.ok(
        Math.abs(l - jl) <= 1e-8 * Math.max(1, jl),
        `x=${x} level ${level} lo ${l} vs ${jl}`,
      );
      assert.ok(
        Math.abs(h - jh) <= 1e-8 * Math.max(1, jh),
        `x=${x} level ${level} hi ${h} vs ${jh}`,
      );
    }
  }
});

Deno.test("garwoodInterval(0) upper is the two-sided 3.689, not the one-sided 2.996", () => {
  // REFERENCES.md consolidated discrepancy 12 (C): −ln(0.025) = 3.6889 two-sided;
  // −ln(0.05) = 2.9957 is a one-sided 95% bound. Hand calculation: for x = 0 the
  // upper limit solves e^−μ = α/2.
  const [lo, hi] = garwoodInterval(0);
  assert.equal(lo, 0);
  assert.ok(Math.abs(hi - -Math.log(0.025)) < 1e-10);
});

Deno.test("countUncertainty() gives the per-mm² worked values in 2.37 mm²", () => {
  // REFERENCES.md §9 (C): 7 → 2.954 (1.1875–6.0855); 0 → 0 (0–1.5565);
  // 20 → 8.4388 (5.1546–13.0331) per mm². Tolerance 1e-4 (4 d.p.).
  const cases: [number, number, number, number][] = [
    [7, 2.954, 1.1875, 6.0855],
    [0, 0, 0, 1.5565],
    [20, 8.4388, 5.1546, 13.0331],
  ];
  for (const [x, rate, lo, hi] of cases) {
    const u = countUncertainty(x, 2.37);
    assert.ok(Math.abs((u.per_mm2 as number) - rate) <= 1e-3, `rate ${x}`);
    assert.ok(Math.abs(u.per_mm2_ci95[0] - lo) <= 1e-4, `lo ${x}: ${u.per_mm2_ci95[0]}`);
    assert.ok(Math.abs(u.per_mm2_ci95[1] - hi) <= 1e-4, `hi ${x}: ${u.per_mm2_ci95[1]}`);
  }
});

Deno.test("garwoodInterval() rejects a negative or fractional count and a bad level", () => {
  assert.throws(() => garwoodInterval(-1), {
    name: "RangeError",
    message: "Count must be a whole number ≥ 0: got -1",
  });
  assert.throws(() => garwoodInterval(2.5), RangeError);
  assert.throws(() => garwoodInterval(3, 1), {
    name: "RangeError",
    message: "Confidence level must be in (0, 1): got 1",
  });
});

Deno.test("poissonCdf() agrees with jstat's Poisson distribution function", () => {
  for (const mean of [0.5, 3, 7, 20, 60]) {
    for (let k = 0; k <= 80; k += 3) {
      const j = jStat.poisson.cdf(k, mean);
      assert.ok(Math.abs(poissonCdf(k, mean) - j) <= 1e-10, `k=${k} mean=${mean}`);
    }
  }
});

Deno.test("pOtherSide() is the Poisson chance of a recount across the cut-off", () => {
  // Definition (documented in lib/stats/garwood.ts): Y ~ Poisson(observed);
  // k = least count meeting the cut-off; P(Y < k) when the count meets it, else
  // P(Y ≥ k). Checked against jstat 1.9.6 Poisson cdf.
  // 7 observed, Kiupel cut-off ≥ 7: P(Y ≤ 6 | 7).
  assert.ok(Math.abs(pOtherSide(7, 7) - jStat.poisson.cdf(6, 7)) < 1e-12);
  // 6 observed: P(Y ≥ 7 | 6) = 1 − P(Y ≤ 6 | 6).
  assert.ok(Math.abs(pOtherSide(6, 7) - (1 - jStat.poisson.cdf(6, 6))) < 1e-12);
  // 0 observed can never cross: a Poisson of mean 0 is always 0.
  assert.equal(pOtherSide(0, 7), 0);
  // Far from the cut-off the chance is tiny.
  assert.ok(pOtherSide(40, 7) < 1e-9);
});
