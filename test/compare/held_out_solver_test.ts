/**
 * Integer tp/fp/fn of both matching modes against an independent
 * assignment solver on cases held back from every other test (seeds
 * 70001–70300, not used while developing): the Hungarian method of npm
 * `munkres-js` 1.2.2 (pinned in deno.json, used in tests only; Munkres J.
 * Algorithms for the assignment and transportation problems. J SIAM
 * 1957;5(1):32-38). A pair beyond the radius costs more than every pair
 * within it together, so the cheapest assignment has the most pairs within
 * the radius first and the least total distance among those.
 * Greedy is checked against the plain greedy of test/compare/_brute.ts and
 * against the solver's bounds (a maximal matching has at least half the
 * pairs of a maximum one).
 */

import munkres from "munkres-js";
import { matchFigures } from "../../lib/compare/match_figures.ts";
import { seededRandom } from "../../lib/random.ts";
import { bruteGreedy } from "./_brute.ts";
import { assertAlmostEquals, assertEquals } from "./_assert.ts";

const R = 7.5;

function solverMatching(
  ref: { x: number[]; y: number[] },
  cand: { x: number[]; y: number[] },
): { tp: number; total: number } {
  if (ref.x.length === 0 || cand.x.length === 0) return { tp: 0, total: 0 };
  const big = 1e6; // > (number of pairs) × radius
  const cost = cand.x.map((_, c) =>
    ref.x.map((_, r) => {
      const d = Math.hypot(ref.x[r] - cand.x[c], ref.y[r] - cand.y[c]);
      return d <= R ? d : big;
    })
  );
  const pairs = (munkres as unknown as (m: number[][]) => [number, number][])(cost);
  let tp = 0, total = 0;
  for (const [c, r] of pairs) {
    if (cost[c][r] < big) {
      tp++;
      total += cost[c][r];
    }
  }
  return { tp, total };
}

Deno.test("matchFigures() tp/fp/fn agree with munkres-js on 300 held-out random cases", () => {
  for (let seed = 70001; seed <= 70300; seed++) {
    const rnd = seededRandom(seed);
    const nr = Math.floor(rnd() * 14), nc = Math.floor(rnd() * 14);
    const span = 10 + rnd() * 50;
    const ref = {
      x: Array.from({ length: nr }, () => rnd() * span),
      y: Array.from({ length: nr }, () => rnd() * span),
    };
    const cand = {
      x: Array.from({ length: nc }, () => rnd() * span),
      y: Array.from({ length: nc }, () => rnd() * span),
      score: Array.from({ length: nc }, () => Math.round(rnd() * 10) / 10),
    };
    const refUm = { xUm: Float64Array.from(ref.x), yUm: Float64Array.from(ref.y) };
    const candUm = {
      xUm: Float64Array.from(cand.x),
      yUm: Float64Array.from(cand.y),
      score: Float64Array.from(cand.score),
    };
    const s = solverMatching(ref, cand);
    const o = matchFigures(refUm, candUm, { radiusUm: R, mode: "optimal" });
    assertEquals([o.tp, o.fp, o.fn], [s.tp, nc - s.tp, nr - s.tp], `seed ${seed} optimal`);
    assertAlmostEquals(o.totalDistanceUm, s.total, 1e-6, `seed ${seed} total distance`);
    const g = matchFigures(refUm, candUm, { radiusUm: R, mode: "greedy" });
    const plain = bruteGreedy(ref, cand, R).filter((r) => r !== -1).length;
    assertEquals([g.tp, g.fp, g.fn], [plain, nc - plain, nr - plain], `seed ${seed} greedy`);
    assertEquals(
      g.tp <= s.tp && 2 * g.tp >= s.tp,
      true,
      `seed ${seed} greedy within the solver's bounds`,
    );
  }
});
