import { strict as assert } from "node:assert";
import { quantileSorted as ssQuantileSorted } from "simple-statistics";
import {
  fiveNumberSummary,
  quantileOfHistogram,
  quantileSorted,
} from "../../lib/stats/quantiles.ts";
import { seededRandom } from "../../lib/random.ts";

Deno.test("quantileSorted() gives R-7 quartiles of the Wikipedia ten-value list", () => {
  // Wikipedia, "Quantile" article, ten-value example (the list d3-array and
  // simple-statistics test); R-7 gives 7.25, 9 and 14.5. Exact decimals.
  const x = [3, 6, 7, 8, 8, 10, 13, 15, 16, 20];
  assert.equal(quantileSorted(x, 0.25), 7.25);
  assert.equal(quantileSorted(x, 0.5), 9);
  assert.equal(quantileSorted(x, 0.75), 14.5);
});

Deno.test("quantileSorted() agrees with simple-statistics 7.12.1 quantileSorted (R-7)", () => {
  // simple-statistics 7.12.1 src/quantile_sorted.js uses index (n − 1)·p with
  // linear interpolation ("type=7" in its source comment). Tolerance 1e-12:
  // the two evaluate the same formula, rounding may differ in the last bits.
  const rnd = seededRandom(3);
  for (let t = 0; t < 200; t++) {
    const n = 1 + Math.floor(rnd() * 40);
    const a = Array.from({ length: n }, () => Math.floor(rnd() * 30)).sort((p, q) => p - q);
    for (const p of [0, 0.1, 0.25, 0.5, 0.75, 0.9, 1, rnd()]) {
      const ours = quantileSorted(a, p)!;
      assert.ok(Math.abs(ours - ssQuantileSorted(a, p)) <= 1e-12, `${a} p=${p}`);
      const hist: number[] = [];
      for (const v of a) {
        while (hist.length <= v) hist.push(0);
        hist[v]++;
      }
      assert.ok(Math.abs(quantileOfHistogram(hist, p)! - ours) <= 1e-12);
    }
  }
});

Deno.test("fiveNumberSummary() of nothing is all null", () => {
  assert.deepEqual(fiveNumberSummary([]), {
    min: null,
    q1: null,
    median: null,
    q3: null,
    max: null,
  });
  assert.equal(quantileOfHistogram([0, 0], 0.5), null);
  assert.throws(() => quantileSorted([1], 1.5), RangeError);
});
