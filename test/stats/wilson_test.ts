// Wilson score interval (Wilson 1927) against a published table and a
// general-purpose statistics library.
//
// Published values: Newcombe RG, Stat Med 1998;17(8):857-872, Table I, method 3
// (score interval without continuity correction), examples 81/263, 15/148,
// 0/20 and 1/29, given to 4 decimals; read in a secondary transcription of the
// table (V2). Tolerance 5e-5 + 1e-9: half a unit of the 4th decimal.
//
// Library check: npm jstat 1.9.6, jStat.normal.inv for z and the score test
// statistic |p̂ − p| / √(p(1 − p)/n), which equals z at both limits (the
// interval is the inversion of that test). Tolerance 1e-9 (root of a smooth
// function, both sides in double precision).

import { strict as assert } from "node:assert";
import jStat from "jstat";
import { wilsonInterval } from "../../lib/stats/wilson.ts";

const NEWCOMBE_1998_TABLE_I: [number, number, number, number][] = [
  [81, 263, 0.2553, 0.3662],
  [15, 148, 0.0624, 0.1605],
  [0, 20, 0.0000, 0.1611],
  [1, 29, 0.0061, 0.1718],
];

Deno.test("wilsonInterval() matches Newcombe (1998) Table I, method 3, to 4 decimals", () => {
  for (const [k, n, lo, hi] of NEWCOMBE_1998_TABLE_I) {
    const [l, h] = wilsonInterval(k, n)!;
    assert.ok(Math.abs(l - lo) <= 5e-5 + 1e-9, `${k}/${n} lower ${l} vs ${lo}`);
    assert.ok(Math.abs(h - hi) <= 5e-5 + 1e-9, `${k}/${n} upper ${h} vs ${hi}`);
  }
});

Deno.test("wilsonInterval() limits invert the score test with jstat's normal quantile", () => {
  for (const level of [0.9, 0.95, 0.99]) {
    const z = jStat.normal.inv(1 - (1 - level) / 2, 0, 1);
    for (const n of [1, 2, 5, 12, 40, 263]) {
      for (let k = 0; k <= n; k += Math.max(1, Math.floor(n / 7))) {
        const [lo, hi] = wilsonInterval(k, n, level)!;
        const ph = k / n;
        const score = (p: number) => Math.abs(ph - p) / Math.sqrt((p * (1 - p)) / n);
        if (k > 0) assert.ok(Math.abs(score(lo) - z) < 1e-9, `${k}/${n} lower at ${level}`);
        if (k < n) assert.ok(Math.abs(score(hi) - z) < 1e-9, `${k}/${n} upper at ${level}`);
        assert.ok(lo <= ph && ph <= hi, `${k}/${n} contains p̂`);
      }
    }
  }
});

Deno.test("wilsonInterval() is exactly 0 or 1 at the ends, null without trials", () => {
  assert.equal(wilsonInterval(0, 20)![0], 0);
  assert.equal(wilsonInterval(20, 20)![1], 1);
  assert.equal(wilsonInterval(0, 0), null);
  // Symmetry: k of n mirrors n − k of n (hand reasoning from the formula).
  const [a, b] = wilsonInterval(3, 11)!;
  const [c, d] = wilsonInterval(8, 11)!;
  assert.ok(Math.abs(a - (1 - d)) < 1e-12 && Math.abs(b - (1 - c)) < 1e-12);
});

Deno.test("wilsonInterval() rejects impossible counts and levels", () => {
  assert.throws(
    () => wilsonInterval(5, 4),
    RangeError,
    "Successes must be a whole number from 0 to the trials (4): got 5",
  );
  assert.throws(() => wilsonInterval(1, 2.5), RangeError, "Trials must be a whole number ≥ 0");
  assert.throws(() => wilsonInterval(1, 2, 1), RangeError, "Confidence level must be in (0, 1)");
});
