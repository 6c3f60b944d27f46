// Tests of tallyFigures() (lib/count/tally_figures.ts) on hand-built cases;
// each expected number is a hand count noted beside it.

import { strict as assert } from "node:assert";
import { tallyFigures } from "../../lib/count/tally_figures.ts";
import type { FigureSet } from "../../lib/types.ts";

function figures(points: { label: string; score?: number }[]): FigureSet {
  const labels: string[] = [];
  const idx = points.map((p) => {
    let k = labels.indexOf(p.label);
    if (k < 0) k = labels.push(p.label) - 1;
    return k;
  });
  return {
    xPx: Float64Array.from(points, (_, i) => i),
    yPx: Float64Array.from(points, () => 0),
    labelIndex: Uint32Array.from(idx),
    labels,
    score: Float64Array.from(points, (p) => p.score ?? NaN),
    origin: Int32Array.from(points, (_, i) => i),
  };
}

const MF = "mitotic figure";

Deno.test("tallyFigures() cascades score, then region, over counted labels", () => {
  const f = figures([
    { label: MF, score: 0.9 }, // inside, passes       -> counted
    { label: MF, score: 0.3 }, // inside, below 0.5    -> below_score
    { label: MF, score: 0.2 }, // outside, below 0.5   -> below_score (score is checked first)
    { label: MF, score: 0.8 }, // outside, passes      -> outside_valid
    { label: MF }, // inside, no score passes          -> counted
    { label: MF, score: 0.5 }, // inside, equal to min -> counted (below means < min)
    { label: "mimic", score: 0.99 }, // other label    -> only total and by_label
  ]);
  const inside = Uint8Array.of(1, 1, 0, 0, 1, 1, 1);
  const { tally, counted } = tallyFigures(f, inside, { minScore: 0.5 });
  // hand count: counted 3 (points 0, 4, 5), below_score 2 (1, 2), outside_valid 1 (3), total 7
  assert.deepEqual(tally, {
    total: 7,
    counted: 3,
    outside_valid: 1,
    below_score: 2,
    by_label: { [MF]: 6, mimic: 1 },
  });
  assert.deepEqual(Array.from(counted), [1, 0, 0, 0, 1, 1, 0]);
});

Deno.test("tallyFigures() by default counts 'mitotic figure' with any score", () => {
  const f = figures([{ label: MF, score: 0 }, { label: MF, score: 0.01 }, { label: "atypical" }]);
  const { tally } = tallyFigures(f, Uint8Array.of(1, 0, 1));
  // hand count: min score 0 lets both pass; point 1 is outside; "atypical" is not counted
  assert.equal(tally.counted, 1);
  assert.equal(tally.outside_valid, 1);
  assert.equal(tally.below_score, 0);
  assert.equal(tally.total, 3);
});

Deno.test("tallyFigures() counts several chosen labels", () => {
  const f = figures([{ label: MF }, { label: "atypical" }, { label: "mimic" }, {
    label: "atypical",
  }]);
  const { tally } = tallyFigures(f, Uint8Array.of(1, 1, 1, 0), { countLabels: [MF, "atypical"] });
  // hand count: counted = points 0, 1; outside = point 3; mimic is not counted
  assert.equal(tally.counted, 2);
  assert.equal(tally.outside_valid, 1);
  assert.deepEqual(tally.by_label, { [MF]: 1, atypical: 2, mimic: 1 });
});

Deno.test("tallyFigures() of no figures is all zero", () => {
  const { tally, counted } = tallyFigures(figures([]), new Uint8Array(0));
  assert.deepEqual(tally, { total: 0, counted: 0, outside_valid: 0, below_score: 0, by_label: {} });
  assert.equal(counted.length, 0);
});

Deno.test("tallyFigures() does not depend on the order of the figures", () => {
  const pts = [
    { label: MF, score: 0.9 },
    { label: MF, score: 0.1 },
    { label: "mimic" },
    { label: MF, score: 0.7 },
  ];
  const inside = [1, 1, 1, 0];
  const a = tallyFigures(figures(pts), Uint8Array.from(inside), { minScore: 0.5 }).tally;
  const order = [3, 1, 0, 2];
  const b = tallyFigures(
    figures(order.map((i) => pts[i])),
    Uint8Array.from(order.map((i) => inside[i])),
    { minScore: 0.5 },
  ).tally;
  assert.deepEqual({ ...a, by_label: {} }, { ...b, by_label: {} });
  assert.deepEqual(a.by_label[MF], b.by_label[MF]);
});

Deno.test("tallyFigures() rejects inside flags of the wrong length", () => {
  assert.throws(() => tallyFigures(figures([{ label: MF }]), new Uint8Array(2)), {
    name: "RangeError",
    message: /the inside flags have 2 entries for 1 points/,
  });
});
