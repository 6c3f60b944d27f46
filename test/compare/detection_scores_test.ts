/**
 * Precision, recall, F1 and average precision on small cases computed by
 * hand, and AP against the PASCAL VOC all-point definition written out in
 * the test (Everingham M, Van Gool L, Williams CKI, Winn J, Zisserman A. The
 * PASCAL Visual Object Classes (VOC) Challenge. IJCV 2010;88(2):303-338,
 * doi:10.1007/s11263-009-0275-4; the all-point interpolation of the 2010
 * development kit — M for the kit's code layout).
 */

import { averagePrecision, detectionScores } from "../../lib/compare/detection_scores.ts";
import { seededRandom } from "../../lib/random.ts";
import { assertAlmostEquals, assertEquals, assertThrows } from "./_assert.ts";

Deno.test("detectionScores() on hand-computed cases", () => {
  // Hand calculation: tp 6, fp 2, fn 4 → P = 6/8 = 0.75, R = 6/10 = 0.6,
  // F1 = 2·0.75·0.6 / 1.35 = 0.6667 = 12/18.
  const s = detectionScores(6, 2, 4);
  assertEquals(s.precision, 0.75);
  assertEquals(s.recall, 0.6);
  assertAlmostEquals(s.f1!, 12 / 18, 1e-15);
  assertAlmostEquals(
    s.f1!,
    (2 * s.precision! * s.recall!) / (s.precision! + s.recall!),
    1e-15,
    "harmonic mean",
  );
  // Conventions: no predictions → precision null, F1 0 (references exist).
  assertEquals(detectionScores(0, 0, 7), { precision: null, recall: 0, f1: 0 });
  // No references → recall null; F1 0 when there are predictions.
  assertEquals(detectionScores(0, 3, 0), { precision: 0, recall: null, f1: 0 });
  assertEquals(detectionScores(0, 0, 0), { precision: null, recall: null, f1: null });
  assertThrows(() => detectionScores(-1, 0, 0), RangeError, "tp is -1");
});

Deno.test("averagePrecision() on a hand-worked ranked list (all-point interpolation)", () => {
  // Hand calculation: 4 references; ranked hits T F T F T.
  // P = 1, 1/2, 2/3, 1/2, 3/5 at R = 1/4, 1/4, 1/2, 1/2, 3/4;
  // made non-increasing from the right: 1, 2/3, 2/3, 3/5, 3/5;
  // AP = 1/4·1 + 1/4·2/3 + 1/4·3/5 = 17/30 = 0.5667.
  const pts = [1, 2, 3, 4, 5].map((k) => ({ predictions: k, tp: [1, 1, 2, 2, 3][k - 1] }));
  assertAlmostEquals(averagePrecision(pts, 4)!, 17 / 30, 1e-15);
  // Without interpolation (plain sum of P·ΔR) it would be 1/4 + 1/6 + 3/20 = the same here;
  // a case where interpolation matters: hits F T (2 references).
  // P = 0, 1/2 at R = 0, 1/2 → interpolated 1/2, 1/2 → AP = 1/2 · 1/2 = 1/4.
  assertAlmostEquals(
    averagePrecision([{ predictions: 1, tp: 0 }, { predictions: 2, tp: 1 }], 2)!,
    0.25,
    1e-15,
  );
  // Ties enter together: two tied detections, one hit, 1 reference: P = 1/2 at R = 1 → AP 1/2.
  assertEquals(averagePrecision([{ predictions: 2, tp: 1 }], 1), 0.5);
  assertEquals(averagePrecision([], 3), 0);
  assertEquals(averagePrecision([{ predictions: 1, tp: 0 }], 0), null);
  assertThrows(
    () => averagePrecision([{ predictions: 2, tp: 1 }, { predictions: 2, tp: 1 }], 3),
    RangeError,
    "not a valid step",
  );
});

/** The all-point AP as the VOC 2010 development kit computes it (mrec/mpre sentinels). */
function vocAp(hits: boolean[], nRef: number): number {
  let tp = 0;
  const rec: number[] = [], prec: number[] = [];
  hits.forEach((h, i) => {
    if (h) tp++;
    rec.push(tp / nRef);
    prec.push(tp / (i + 1));
  });
  const mrec = [0, ...rec, 1], mpre = [0, ...prec, 0];
  for (let i = mpre.length - 2; i >= 0; i--) mpre[i] = Math.max(mpre[i], mpre[i + 1]);
  let ap = 0;
  for (let i = 1; i < mrec.length; i++) {
    if (mrec[i] !== mrec[i - 1]) ap += (mrec[i] - mrec[i - 1]) * mpre[i];
  }
  return ap;
}

Deno.test("averagePrecision() equals the VOC development kit's all-point AP on 300 random ranked lists", () => {
  for (let seed = 1; seed <= 300; seed++) {
    const rnd = seededRandom(seed);
    const n = 1 + Math.floor(rnd() * 30), nRef = 1 + Math.floor(rnd() * 20);
    const hits: boolean[] = [];
    let tp = 0;
    for (let i = 0; i < n; i++) {
      const h = tp < nRef && rnd() < 0.5;
      if (h) tp++;
      hits.push(h);
    }
    let c = 0;
    const pts = hits.map((h, i) => ({ predictions: i + 1, tp: c += h ? 1 : 0 }));
    assertAlmostEquals(averagePrecision(pts, nRef)!, vocAp(hits, nRef), 1e-12, `seed ${seed}`);
  }
});
