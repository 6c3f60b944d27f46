// Nottingham mitotic score cut-offs by field diameter against the published
// table: CAP Invasive Breast protocol (Feb 2019 posting), Table 1 "Score
// Categories According to Field Diameter and Mitotic Count", after Ellis &
// Elston in O'Malley & Pinder, Breast Pathology, 2006. Mark V2: all 30 rows
// were read in a public transcription of the protocol, not in the CAP PDF
// (REFERENCES.md §2c).

import { strict as assert } from "node:assert";
import {
  nottinghamCutoffs,
  nottinghamScore,
  nottinghamTable,
} from "../../lib/standards/nottingham.ts";
import { getScheme } from "../../lib/standards/list_schemes.ts";
import { classifyCounts, tierForRate } from "../../lib/standards/classify.ts";

// [field diameter mm, printed area mm², score 1 max, score 2 from, score 2 max, score 3 from]
const CAP_2019_TABLE_1: [number, number, number, number, number, number][] = [
  [0.40, 0.125, 4, 5, 9, 10],
  [0.41, 0.132, 4, 5, 9, 10],
  [0.42, 0.139, 5, 6, 10, 11],
  [0.43, 0.145, 5, 6, 10, 11],
  [0.44, 0.152, 5, 6, 11, 12],
  [0.45, 0.159, 5, 6, 11, 12],
  [0.46, 0.166, 6, 7, 12, 13],
  [0.47, 0.173, 6, 7, 12, 13],
  [0.48, 0.181, 6, 7, 13, 14],
  [0.49, 0.189, 6, 7, 13, 14],
  [0.50, 0.196, 7, 8, 14, 15],
  [0.51, 0.204, 7, 8, 14, 15],
  [0.52, 0.212, 7, 8, 15, 16],
  [0.53, 0.221, 8, 9, 16, 17],
  [0.54, 0.229, 8, 9, 16, 17],
  [0.55, 0.238, 8, 9, 17, 18],
  [0.56, 0.246, 8, 9, 17, 18],
  [0.57, 0.255, 9, 10, 18, 19],
  [0.58, 0.264, 9, 10, 19, 20],
  [0.59, 0.273, 9, 10, 19, 20],
  [0.60, 0.283, 10, 11, 20, 21],
  [0.61, 0.292, 10, 11, 21, 22],
  [0.62, 0.302, 11, 12, 22, 23],
  [0.63, 0.312, 11, 12, 22, 23],
  [0.64, 0.322, 11, 12, 23, 24],
  [0.65, 0.332, 12, 13, 24, 25],
  [0.66, 0.342, 12, 13, 24, 25],
  [0.67, 0.353, 12, 13, 25, 26],
  [0.68, 0.363, 13, 14, 26, 27],
  [0.69, 0.374, 13, 14, 27, 28],
];

Deno.test("nottinghamCutoffs() reproduces all 30 rows of CAP 2019 Table 1", () => {
  assert.equal(CAP_2019_TABLE_1.length, 30);
  for (const [d, area, s1max, s2from, s2max, s3from] of CAP_2019_TABLE_1) {
    const c = nottinghamCutoffs(d);
    assert.deepEqual(
      [c.score1Max, c.score2From, c.score2Max, c.score3From],
      [s1max, s2from, s2max, s3from],
      `row ${d} mm`,
    );
    // The printed area is π(d/2)² to 3 d.p. in every row except 0.40 mm, where the
    // table prints 0.125 and π·0.2² = 0.12566 (REFERENCES.md, discrepancy 4).
    const tol = d === 0.40 ? 0.0007 : 0.0005;
    assert.ok(Math.abs(c.fieldAreaMm2 - area) <= tol, `area ${d}: ${c.fieldAreaMm2} vs ${area}`);
  }
});

Deno.test("nottinghamTable() is the generating rule for every row (0.40–0.69 mm)", () => {
  // Generating rule (C, REFERENCES.md §2c): score 2 from ⌈10·A/0.274⌉, score 3
  // from ⌈20·A/0.274⌉, A = π(d/2)²; checked against the literal table above.
  const rows = nottinghamTable();
  assert.equal(rows.length, 30);
  rows.forEach((r, i) => {
    const [d, , , s2from, , s3from] = CAP_2019_TABLE_1[i];
    assert.equal(r.fieldDiameterMm, d);
    const a = Math.PI * (d / 2) ** 2;
    assert.equal(r.score2From, Math.ceil((10 * a) / 0.274));
    assert.equal(r.score3From, Math.ceil((20 * a) / 0.274));
    assert.equal(r.score2From, s2from);
    assert.equal(r.score3From, s3from);
  });
});

Deno.test("nottinghamScore() at the named rows 0.40, 0.50, 0.55, 0.59, 0.69 mm", () => {
  // CAP 2019 Table 1 (V2), rows named in the task.
  const cases: [number, number, 1 | 2 | 3][] = [
    [0.40, 4, 1],
    [0.40, 5, 2],
    [0.40, 9, 2],
    [0.40, 10, 3],
    [0.50, 7, 1],
    [0.50, 8, 2],
    [0.50, 14, 2],
    [0.50, 15, 3],
    [0.55, 8, 1],
    [0.55, 9, 2],
    [0.55, 17, 2],
    [0.55, 18, 3],
    [0.59, 9, 1],
    [0.59, 10, 2],
    [0.59, 19, 2],
    [0.59, 20, 3],
    [0.69, 13, 1],
    [0.69, 14, 2],
    [0.69, 27, 2],
    [0.69, 28, 3],
  ];
  for (const [d, count, score] of cases) {
    assert.equal(nottinghamScore(count, d), score, `${count} at ${d} mm`);
  }
});

Deno.test("breast-nottingham: 20 per 10 reference fields is score 3 (Elston & Ellis)", () => {
  // Elston CW, Ellis IO, Histopathology 1991;19(5):403-410 (V2 via PathologyOutlines
  // 2012 and the older CAP text), HL7 FHIR Breast Cancer IG draft Sep 2018 (V):
  // 0–9 / 10–19 / ≥ 20 per 10 HPF of 0.274 mm². The older CAP protocol text reads
  // "less than 10 / 10 to 20 / greater than 20", putting 20 in score 2 — a
  // discrepancy; hotfield follows Elston & Ellis.
  const s = getScheme("breast-nottingham");
  assert.equal(tierForRate(s, 19), "score 2");
  assert.equal(tierForRate(s, 20), "score 3");
  assert.equal(tierForRate(s, 9), "score 1");
  assert.equal(tierForRate(s, 10), "score 2");
  assert.ok(s.notes.some((n) => n.includes("20 in score 2") && n.includes("follows Elston")));
  // In a window of exactly 10 reference fields (2.74 mm²) a count of 20 meets score 3.
  const { classification } = classifyCounts({
    hotspotCount: 20,
    q1: 12,
    windowAreaMm2: 2.74,
    counts: [20, 12],
    admissible: [1, 1],
  }, s);
  assert.equal(classification.tier, "score 3");
  assert.equal(classification.min_count_for_window, 20);
});

Deno.test("breast-nottingham in a 2.37 mm² window uses the area-scaled cut-off (the 0.55 mm row)", () => {
  // 10 fields of 0.55 mm are 2.3758 mm²; the table's 0.55 mm row says score 3
  // from 18 (CAP 2019, V2). A 2.37 mm² window scales 20 by 2.37/2.74 = 17.30 → 18.
  const { classification, warnings } = classifyCounts({
    hotspotCount: 18,
    q1: 3,
    windowAreaMm2: 2.37,
    counts: [18, 3, 17],
    admissible: [1, 1, 1],
  }, getScheme("breast-nottingham"));
  assert.equal(classification.min_count_for_window, 18);
  assert.equal(classification.tier, "score 3");
  assert.ok(warnings.some((w) => w.includes("converted by area")));
});

Deno.test("nottinghamCutoffs() rejects a diameter outside (0, 2] mm", () => {
  assert.throws(() => nottinghamCutoffs(0), {
    name: "RangeError",
    message: "Field diameter must be a number in (0, 2] mm: got 0",
  });
  assert.throws(() => nottinghamCutoffs(2.5), RangeError);
});
