/**
 * compareCase(): a planted disagreement (a detector that misses a focus
 * moves the hotspot and changes the class), the curve's conventions,
 * candidates without scores, an empty candidate set, and determinism.
 * Expected values are hand calculations on invented lattices of figures.
 */

import { compareCase } from "../../lib/compare/compare_case.ts";
import { figureSet, lattice, squareCase } from "./_cases.ts";
import { assertAlmostEquals, assertEquals } from "./_assert.ts";

// Focus A: 20 figures, 5 × 4 at 100 µm (400 px), from (8000, 8000) px = (2, 2) mm.
// Focus B: 5 figures in a row at 100 µm, from (28000, 28000) px = (7, 7) mm.
const [ax, ay] = lattice(8000, 8000, 5, 4, 400);
const [bx, by] = lattice(28000, 28000, 5, 1, 400);
const reference = squareCase(figureSet([...ax, ...bx], [...ay, ...by]));

function plantedCandidates() {
  // The detector finds all of focus B (score 0.9), only 10 of focus A and
  // with a low score (0.3), and adds 3 false positives at (5, 2) mm (score 0.95).
  const x = [...bx, ...ax.slice(0, 10), 20000, 20400, 20800];
  const y = [...by, ...ay.slice(0, 10), 8000, 8000, 8000];
  const s = [...bx.map(() => 0.9), ...ax.slice(0, 10).map(() => 0.3), 0.95, 0.95, 0.95];
  return figureSet(x, y, s);
}

Deno.test("compareCase(): a detector missing a focus moves the hotspot; the output shows the reference count there", () => {
  const r = compareCase(reference, { figures: plantedCandidates() }, {
    minScore: 0.5,
    scheme: "canine-mct-2tier",
    strideUm: 50,
  });
  const j = r.json;
  // At 0.5: candidates = B (5) + 3 false positives; pairs = the 5 of B.
  assertEquals([j.detection.reference, j.detection.candidate], [25, 8]);
  assertEquals([j.detection.tp, j.detection.fp, j.detection.fn], [5, 3, 20]);
  // The reference's hotspot holds all of focus A (400 × 300 µm fits a 1777.6 × 1333.2 µm window).
  assertEquals(j.hotspot.reference?.count, 20);
  // The candidate's hotspot is focus B, about 7071 µm away (5 mm along each axis).
  assertEquals(j.hotspot.candidate?.count, 5);
  assertAlmostEquals(
    j.hotspot.distance_um!,
    Math.hypot(5000, 5000),
    1777.6,
    "B is 5 mm right and down of A",
  );
  // Is the candidate's hotspot a real one? Its window holds the 5 reference figures of B.
  assertEquals(j.hotspot.reference_count_at_candidate, 5);
  // The candidate's figures in the reference's hotspot window: none at 0.5.
  assertEquals(j.hotspot.candidate_count_at_reference, 0);
  // Kiupel 2011 (≥ 7 in 10 HPF = 2.37 mm²; canine-mct-2tier): 20 meets it, 5 does not.
  // Most windows of the 10 × 10 mm square are empty, so the lower quartile is 0: field-dependent.
  assertEquals(j.grade?.reference_class, "field-dependent");
  assertEquals(j.grade?.candidate_class, "below");
  // At t ≤ 0.3 the 10 low-score figures of A take part: hotspot 10 ≥ 7, the classes agree.
  assertEquals(j.grade?.agreeing_thresholds, [[0, 0.3]]);
  assertEquals(j.curve[30].hotspot_count, 10);
  assertEquals(j.curve[31].hotspot_count, 5);
  assertEquals(j.curve[100].hotspot_count, 0, "no candidate above 0.95");
});

Deno.test("compareCase(): the curve has 101 thresholds i/100 with counts that add up", () => {
  const r = compareCase(reference, { figures: plantedCandidates() }, { strideUm: 50 });
  const c = r.json.curve;
  assertEquals(c.length, 101);
  c.forEach((p, i) => {
    assertEquals(p.threshold, i / 100);
    assertEquals(p.tp + p.fn, 25);
    assertEquals(p.tp + p.fp, p.candidate);
  });
  // Hand calculation at t = 0: 18 candidates, 15 pairs: P = 15/18, R = 15/25, F1 = 30/43.
  assertEquals([c[0].tp, c[0].fp, c[0].fn], [15, 3, 10]);
  assertAlmostEquals(c[0].f1!, 30 / 43, 1e-6);
  // Above 0.95 nothing is left: precision undefined (null), F1 0.
  assertEquals([c[100].precision, c[100].recall, c[100].f1], [null, 0, 0]);
  // Hotspot counts never rise with the threshold.
  for (let i = 1; i < c.length; i++) {
    assertEquals(c[i].hotspot_count! <= c[i - 1].hotspot_count!, true);
  }
  // best F1: t ≤ 0.3 gives 30/43 = 0.698; 0.31–0.9 gives 10/33 = 0.303; ties go to the lowest threshold.
  assertEquals(r.json.best_f1.threshold, 0);
  // AP, hand calculation over the distinct scores 0.95, 0.9, 0.3 (25 references):
  // P = 0/3, 5/8, 15/18 at R = 0, 5/25, 15/25; interpolated 15/18, 15/18, 15/18;
  // AP = 0.2 · 15/18 + 0.4 · 15/18 = 0.5.
  assertAlmostEquals(r.json.average_precision!, 0.5, 1e-6);
});

Deno.test("compareCase(): candidates without scores give a one-point curve and a warning", () => {
  const f = plantedCandidates();
  f.score.fill(NaN);
  const r = compareCase(reference, { figures: f }, { strideUm: 50, scheme: "canine-mct-2tier" });
  assertEquals(r.json.curve.length, 1);
  assertEquals(r.json.curve[0].threshold, 0);
  assertEquals(r.json.average_precision, null);
  assertEquals(r.json.warnings.some((w) => w.includes("no scores")), true);
  // Hotspot 10 (A's 10) ≥ 7: field-dependent like the reference, at every threshold.
  assertEquals(r.json.grade?.agreeing_thresholds, [[0, 1]]);
});

Deno.test("compareCase(): an empty candidate set is valid, F1 0, with a warning", () => {
  const r = compareCase(reference, { figures: figureSet([], []) }, { strideUm: 50 });
  assertEquals(r.json.detection, {
    reference: 25,
    candidate: 0,
    tp: 0,
    fp: 0,
    fn: 25,
    precision: null,
    recall: 0,
    f1: 0,
  });
  assertEquals(r.json.warnings.some((w) => w.includes("candidate set is empty")), true);
  assertEquals(r.json.hotspot.candidate?.count, 0);
});

Deno.test("compareCase(): only counted labels inside the valid region take part", () => {
  const f = figureSet(
    [28000, 28400, 60000, 28800],
    [28000, 28000, 1000, 28000],
    [0.9, 0.9, 0.9, 0.9],
    ["mitotic figure", "apoptotic body", "mitotic figure", "mitotic figure"],
  );
  const r = compareCase(reference, { figures: f }, { strideUm: 50 });
  // Point 2 lies outside the 40,000 px square; point 1 has another label.
  assertEquals(r.json.detection.candidate, 2);
  assertEquals(r.json.detection.tp, 2);
  assertEquals(r.json.figures?.candidate.outside_valid, 1);
});

Deno.test("compareCase() is deterministic and does not depend on the candidates' order", () => {
  const f = plantedCandidates();
  const a = JSON.stringify(compareCase(reference, { figures: f }, { strideUm: 50 }).json);
  const rev = (v: ArrayLike<number>) => Array.from(v).reverse();
  const g = figureSet(rev(f.xPx), rev(f.yPx), rev(f.score));
  const b = JSON.stringify(compareCase(reference, { figures: g }, { strideUm: 50 }).json);
  assertEquals(a, b);
});

Deno.test("compareCase() with unequal mpp measures distances in µm", () => {
  // mpp 0.25 × 0.5: a candidate 20 px below a reference figure is 10 µm away (unpaired at 7.5 µm),
  // one 20 px to the right is 5 µm away (paired).
  const ref = squareCase(figureSet([20000, 30000], [20000, 20000]));
  ref.slide = { id: ref.caseId, mppX: 0.25, mppY: 0.5 };
  const r = compareCase(ref, { figures: figureSet([20000, 30020], [20020, 20000], [0.9, 0.9]) }, {
    strideUm: 100,
  });
  assertEquals([r.json.detection.tp, r.json.detection.fp, r.json.detection.fn], [1, 1, 1]);
  assertEquals(Array.from(r.matching.refOfCandidate), [-1, 1]);
});

Deno.test("compareCase(): the hotspot searches share one work limit and stop with a message naming the case", () => {
  // A tiny limit stands in for candidates spread too evenly to search (the
  // default limit and what passes it are in test/pipeline/count_limits_test.ts).
  let message = "";
  try {
    compareCase(reference, { figures: plantedCandidates() }, { strideUm: 50, maxSearchWork: 100 });
  } catch (e) {
    assertEquals((e as Error).name, "SearchWorkError");
    message = (e as Error).message;
  }
  assertEquals(
    message.startsWith(
      `Cannot compare case "${reference.caseId}": the reference's hotspot: the exact search for the best placement of`,
    ),
    true,
  );
  // The same comparison within the default limit completes.
  assertEquals(
    compareCase(reference, { figures: plantedCandidates() }, { strideUm: 50 }).json.hotspot
      .reference?.count,
    20,
  );
});
