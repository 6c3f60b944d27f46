/**
 * Matching of candidate figures to reference figures, checked against
 * brute force on small random sets (every matching enumerated; greedy
 * written from its definition) and a hand-worked example with ties.
 */

import { assertAlmostEquals, assertEquals, assertThrows } from "./_assert.ts";
import { matchFigures } from "../../lib/compare/match_figures.ts";
import { seededRandom } from "../../lib/random.ts";
import { bruteGreedy, bruteOptimal } from "./_brute.ts";

function randomCase(seed: number, nRef: number, nCand: number, spanUm: number, grid = false) {
  const rnd = seededRandom(seed);
  // On a coarse lattice many distances tie, which is where tie-breaks matter.
  const v = () => grid ? Math.floor(rnd() * (spanUm / 2.5)) * 2.5 : rnd() * spanUm;
  const ref = { x: Array.from({ length: nRef }, v), y: [] as number[] };
  ref.y = ref.x.map(v);
  const cand = { x: Array.from({ length: nCand }, v), y: [] as number[], score: [] as number[] };
  cand.y = cand.x.map(v);
  cand.score = cand.x.map(() => Math.round(rnd() * 4) / 4);
  return { ref, cand };
}

const asUm = (p: { x: number[]; y: number[] }) => ({
  xUm: Float64Array.from(p.x),
  yUm: Float64Array.from(p.y),
});

Deno.test("matchFigures() optimal agrees with enumerating every matching on 400 small random sets", () => {
  // Outside check: exhaustive enumeration (test/compare/_brute.ts) of every
  // one-to-one matching, most pairs first, then least total distance.
  for (let seed = 1; seed <= 400; seed++) {
    const { ref, cand } = randomCase(
      seed,
      1 + (seed % 6),
      1 + ((seed * 7) % 7),
      30,
      seed % 2 === 0,
    );
    const m = matchFigures(asUm(ref), { ...asUm(cand), score: Float64Array.from(cand.score) }, {
      radiusUm: 7.5,
    });
    const b = bruteOptimal(ref, cand, 7.5);
    assertEquals(m.tp, b.tp, `seed ${seed}: pairs`);
    // Sums of up to 7 square roots: 1e-9 µm covers rounding.
    assertAlmostEquals(m.totalDistanceUm, b.total, 1e-9, `seed ${seed}: total distance`);
    assertEquals(m.fp, cand.x.length - b.tp);
    assertEquals(m.fn, ref.x.length - b.tp);
  }
});

Deno.test("matchFigures() optimal: tpAt of every rank prefix is that prefix's maximum matching", () => {
  for (let seed = 1; seed <= 150; seed++) {
    const { ref, cand } = randomCase(seed + 1000, 2 + (seed % 5), 2 + (seed % 6), 25, true);
    const m = matchFigures(asUm(ref), { ...asUm(cand), score: Float64Array.from(cand.score) });
    for (let k = 0; k <= cand.x.length; k++) {
      const idx = Array.from(m.order.slice(0, k));
      const sub = { x: idx.map((i) => cand.x[i]), y: idx.map((i) => cand.y[i]) };
      assertEquals(m.tpAt[k], bruteOptimal(ref, sub, 7.5).tp, `seed ${seed} prefix ${k}`);
    }
  }
});

Deno.test("matchFigures() greedy pairs exactly as greedy written from its definition", () => {
  for (let seed = 1; seed <= 400; seed++) {
    const { ref, cand } = randomCase(seed + 5000, 1 + (seed % 7), 1 + ((seed * 3) % 8), 30, true);
    const m = matchFigures(asUm(ref), { ...asUm(cand), score: Float64Array.from(cand.score) }, {
      mode: "greedy",
    });
    const b = bruteGreedy(ref, cand, 7.5);
    assertEquals(Array.from(m.refOfCandidate), b, `seed ${seed}`);
    assertEquals(m.tp, b.filter((r) => r !== -1).length);
    // Greedy is a maximal matching: never more pairs than optimal, never fewer than half.
    const opt = bruteOptimal(ref, cand, 7.5).tp;
    assertEquals(m.tp <= opt && 2 * m.tp >= opt, true, `seed ${seed}`);
  }
});

Deno.test("matchFigures() on a hand-worked example with ties", () => {
  // Hand calculation: references A (0, 0) and B (10, 0); candidates
  // c1 (5, 0) score 0.9, equidistant (5 µm) from A and B, and c2 (−4, 0)
  // score 0.5, 4 µm from A and 14 µm from B (beyond 7.5 µm).
  // greedy: c1 first; A and B tie at 5 µm, A has the same y and smaller x,
  //   so c1 takes A; c2 then finds only A (taken): 1 pair, c2 a false positive.
  // optimal: c1–B (5 µm) and c2–A (4 µm): 2 pairs, total 9 µm.
  const ref = { xUm: Float64Array.of(0, 10), yUm: Float64Array.of(0, 0) };
  const cand = {
    xUm: Float64Array.of(5, -4),
    yUm: Float64Array.of(0, 0),
    score: Float64Array.of(0.9, 0.5),
  };
  const g = matchFigures(ref, cand, { mode: "greedy" });
  assertEquals([g.tp, g.fp, g.fn], [1, 1, 1]);
  assertEquals(Array.from(g.refOfCandidate), [0, -1]);
  const o = matchFigures(ref, cand, { mode: "optimal" });
  assertEquals([o.tp, o.fp, o.fn], [2, 0, 0]);
  assertEquals(Array.from(o.refOfCandidate), [1, 0]);
  assertAlmostEquals(o.totalDistanceUm, 9, 1e-12);
  // Equal scores: the tie goes to smaller y, then smaller x. c2 now ranks first (same y, x −4 < 5).
  const tied = matchFigures(ref, { ...cand, score: Float64Array.of(0.5, 0.5) }, { mode: "greedy" });
  assertEquals(Array.from(tied.order), [1, 0]);
  assertEquals(tied.tp, 2, "c2 takes A, then c1 takes B");
  // A pair exactly at the radius is within it (closed disc).
  const edge = matchFigures(ref, {
    xUm: Float64Array.of(7.5),
    yUm: Float64Array.of(0),
    score: Float64Array.of(1),
  }, {
    radiusUm: 7.5,
  });
  assertEquals(edge.tp, 1);
  // The operating threshold leaves lower scores out of the pairs but not out of tpAt.
  const t = matchFigures(ref, cand, { minScore: 0.6 });
  assertEquals([t.candidates, t.tp, t.fp, t.fn], [1, 1, 0, 1]);
  assertEquals(Array.from(t.tpAt), [0, 1, 2]);
});

Deno.test("matchFigures() does not depend on the order of the input figures", () => {
  for (let seed = 1; seed <= 60; seed++) {
    const { ref, cand } = randomCase(seed + 9000, 6, 8, 30);
    const a = matchFigures(asUm(ref), { ...asUm(cand), score: Float64Array.from(cand.score) });
    const perm = cand.x.map((_, i) => i).reverse();
    const shuffled = {
      xUm: Float64Array.from(perm.map((i) => cand.x[i])),
      yUm: Float64Array.from(perm.map((i) => cand.y[i])),
      score: Float64Array.from(perm.map((i) => cand.score[i])),
    };
    for (const mode of ["optimal", "greedy"] as const) {
      const x = matchFigures(asUm(ref), { ...asUm(cand), score: Float64Array.from(cand.score) }, {
        mode,
      });
      const y = matchFigures(asUm(ref), shuffled, { mode });
      assertEquals(x.tp, y.tp);
      assertAlmostEquals(x.totalDistanceUm, y.totalDistanceUm, 1e-9);
      assertEquals(Array.from(x.tpAt), Array.from(y.tpAt));
    }
    assertEquals(a.tp, a.tpAt[cand.x.length]);
  }
});

Deno.test("matchFigures() rejects a radius outside (0, 50] µm and an unknown mode", () => {
  const p = { xUm: Float64Array.of(0), yUm: Float64Array.of(0) };
  const c = { ...p, score: Float64Array.of(1) };
  assertThrows(() => matchFigures(p, c, { radiusUm: 0 }), RangeError, "Matching radius must be");
  assertThrows(() => matchFigures(p, c, { radiusUm: 50.5 }), RangeError, "(0, 50]");
  assertThrows(
    () => matchFigures(p, c, { mode: "best" as never }),
    RangeError,
    'Matching must be "optimal" or "greedy": got "best"',
  );
});

Deno.test("matchFigures() with no candidates or no references", () => {
  const none = { xUm: new Float64Array(0), yUm: new Float64Array(0) };
  const p = { xUm: Float64Array.of(1, 2), yUm: Float64Array.of(0, 0) };
  const a = matchFigures(p, { ...none, score: new Float64Array(0) });
  assertEquals([a.tp, a.fp, a.fn, a.tpAt.length], [0, 0, 2, 1]);
  const b = matchFigures(none, { ...p, score: Float64Array.of(0.5, NaN) });
  assertEquals([b.tp, b.fp, b.fn], [0, 2, 0]);
  assertEquals(Array.from(b.order), [1, 0], "no score ranks first: it passes every threshold");
});
