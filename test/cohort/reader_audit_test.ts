// readerAudit() on a hand-built cohort of five report.json objects, every
// value worked by hand below. Cut-off: canine-mct-2tier, ≥ 7 mitotic figures
// in 10 HPF = 2.37 mm² (Kiupel et al., Vet Pathol 2011;48(1):147-155, V).
// Kappa: Cohen J, Educ Psychol Meas 1960;20(1):37-46, κ = (p_o − p_e)/(1 − p_e);
// the published worked example is the 50-proposal table of Wikipedia's
// "Cohen's kappa" article (20, 5, 10, 15: p_o = 0.70, p_e = 0.50, κ = 0.40),
// read in a copy of that example (V2). Wilson intervals: Wilson EB, JASA 1927
// (formula; hand arithmetic below). Median of percentiles: R-7 (Hyndman and
// Fan 1996), the mean of the two middle values for an even count.

import { strict as assert } from "node:assert";
import { readerAudit } from "../../lib/cohort/reader_audit.ts";
import { binaryKappa } from "../../lib/stats/kappa.ts";
import type { ReportField, ReportJson } from "../../lib/pipeline/report_types.ts";

const WINDOW = { shape: "circle" as const, area_mm2: 2.37, diameter_um: 1737.1 };

function field(
  reader: string,
  count: number,
  percentile: number,
  extra: Partial<ReportField> = {},
) {
  return { reader, center_px: [0, 0], count, coverage: 1, percentile, ...extra } as ReportField;
}

function report(
  id: string,
  dist: { median: number; q3: number } | null,
  hotspot: number | null,
  scheme: boolean,
  fields: ReportField[],
): ReportJson {
  return {
    case: id,
    window: WINDOW,
    hotspot: hotspot === null
      ? null
      : { center_px: [0, 0], count: hotspot, coverage: 1, per_mm2: 1 },
    distribution: dist
      ? { positions: 400, min: 0, q1: 0, median: dist.median, q3: dist.q3, max: hotspot, mean: 1 }
      : { positions: 0, min: null, q1: null, median: null, q3: null, max: null, mean: null },
    fields,
    classification: scheme
      ? {
        scheme: "canine-mct-2tier",
        cutoff: 7,
        class: "field-dependent",
        fraction_at_or_above: 0.1,
        tier: "high",
      }
      : null,
  } as unknown as ReportJson;
}

const COHORT: ReportJson[] = [
  // A: median 3, q3 6, hotspot 12 (meets ≥ 7: high).
  report("QVT-24-101", { median: 3, q3: 6 }, 12, true, [
    field("reader-a", 10, 95), // half ✓ quarter ✓, shortfall 2, meets ✓ (high)
    field("trainee-1", 4, 60, { date: "2024-02-01" }), // half ✓ (4 ≥ 3) quarter ✗, shortfall 8, meets ✗ (low)
  ]),
  // B: median 2, q3 4, hotspot 6 (does not meet: low).
  report("QVT-24-102", { median: 2, q3: 4 }, 6, true, [
    field("reader-a", 5, 90), // half ✓ quarter ✓, shortfall 1, meets ✗ (low)
    field("trainee-1", 1, 20, { date: "2024-03-01" }), // half ✗ quarter ✗, shortfall 5, meets ✗ (low)
  ]),
  // C: no admissible position: its field is left out.
  report("QVT-24-103", null, null, false, [field("trainee-1", 3, 0)]),
  // D: median 5, q3 8, hotspot 15 (high).
  report("QVT-24-104", { median: 5, q3: 8 }, 15, true, [
    field("reader-a", 8, 80), // 8 ≥ q3 8: quarter ✓ (the bound is ≥), shortfall 7, meets ✓
    // Two areas of 2.37 mm² counted together: 9 in 4.74 mm², 4.5 per window.
    field("trainee-1", 9, 45, {
      kind: "polygons",
      parts: 2,
      area_mm2: 4.74,
      count_scaled_to_window: 4.5,
      date: "2024-04-01",
    }), // 4.5 < 5: half ✗ quarter ✗, shortfall 15 − 4.5 = 10.5, 9 × 2.37 / 4.74 = 4.5 < 7: low
  ]),
  // E: no scheme; median 1, q3 2, hotspot 5.
  report("QVT-24-105", { median: 1, q3: 2 }, 5, false, [
    field("trainee-1", 2, 70, { date: "2024-05-01" }), // half ✓ quarter ✓ (2 ≥ 2), shortfall 3
    field("reader-c", 0, 10), // half ✗ (0 < 1), shortfall 5
  ]),
];

Deno.test("readerAudit() shares, median percentile and shortfall match the hand computation", () => {
  const rows = readerAudit(COHORT);
  assert.deepEqual(rows.map((r) => r.reader), ["reader-a", "reader-c", "trainee-1"]);
  const [a, c, t] = rows;

  // reader-a: fields in A, B, D; all three in the upper half and quarter.
  assert.equal(a.cases, 3);
  assert.equal(a.fields, 3);
  assert.equal(a.upperHalfShare, 1);
  assert.equal(a.upperQuarterShare, 1);
  assert.equal(a.medianPercentile, 90); // sorted 80, 90, 95
  assert.equal(a.meanShortfall, 3.3333); // (2 + 1 + 7) / 3
  assert.equal(a.fieldsNotCounted, 0);

  // trainee-1: A, B, D, E counted; C left out (no admissible position).
  assert.equal(t.cases, 4);
  assert.equal(t.fields, 4);
  assert.equal(t.fieldsNotCounted, 1);
  assert.equal(t.upperHalfFields, 2); // A, E
  assert.equal(t.upperQuarterFields, 1); // E
  assert.equal(t.upperHalfShare, 0.5);
  assert.equal(t.upperQuarterShare, 0.25);
  assert.equal(t.medianPercentile, 52.5); // sorted 20, 45, 60, 70 → (45 + 60) / 2
  assert.equal(t.meanShortfall, 6.625); // (8 + 5 + 10.5 + 3) / 4
  assert.equal(t.datedFields, 4);
  assert.equal(t.firstDate, "2024-02-01");
  assert.equal(t.lastDate, "2024-05-01");
  const d = t.entries.find((e) => e.case === "QVT-24-104")!;
  assert.equal(d.comparedCount, 4.5);
  assert.equal(d.upperHalf, false);

  // reader-c: one field, none in the upper half.
  assert.equal(c.upperHalfShare, 0);
  assert.equal(c.meanShortfall, 5);
});

Deno.test("readerAudit() class agreement and kappa against the hotspot's class", () => {
  const [a, c, t] = readerAudit(COHORT);
  // reader-a (A, B, D have a scheme): field/hotspot meets: (✓,✓), (✗,✗), (✓,✓).
  // Agreement 3/3. Table [[2, 0], [0, 1]]: p_o = 1, p_e = (2/3)² + (1/3)² = 5/9,
  // κ = (1 − 5/9) / (1 − 5/9) = 1.
  assert.equal(a.classPairs, 3);
  assert.equal(a.classAgreement, 1);
  assert.equal(a.kappa, 1);
  assert.equal(a.gradeDiffers, 0);
  // trainee-1 (A, B, D; E has no scheme): (✗,✓), (✗,✗), (✗,✓). Agreement 1/3.
  // Table rows field ✓/✗, columns hotspot ✓/✗: [[0, 0], [2, 1]]: p_o = 1/3,
  // p_e = 0 · 2/3 + 1 · 1/3 = 1/3, κ = 0.
  assert.equal(t.classPairs, 3);
  assert.equal(t.classAgreement, 0.3333);
  assert.equal(t.kappa, 0);
  assert.equal(t.gradeDiffers, 2); // A and D: low against high
  const differs = t.entries.filter((e) => e.gradeDiffers).map((e) => e.case);
  assert.deepEqual(differs, ["QVT-24-101", "QVT-24-104"]);
  assert.deepEqual(
    t.entries.map((e) => [e.fieldTier, e.hotspotTier]),
    [["low", "high"], ["low", "low"], ["low", "high"], [null, null]],
  );
  // reader-c: no case with a scheme → empty.
  assert.equal(c.classPairs, 0);
  assert.equal(c.classAgreement, null);
  assert.equal(c.kappa, null);
});

Deno.test("readerAudit() shares carry Wilson score 95% intervals", () => {
  const [a, , t] = readerAudit(COHORT);
  // 3 of 3 (hand calculation, z² = 3.8415): centre (1 + z²/6) / (1 + z²/3) =
  // 1.64024 / 2.28049 = 0.71925; half-width (1.95996 / 2.28049) · √(z²/36) =
  // 0.28075; lower 0.4385, upper exactly 1.
  assert.deepEqual(a.upperHalfCi95, [0.4385, 1]);
  // 2 of 4: centre 0.5; half-width (1.95996 / 1.96037) · √(0.0625 + 0.06002) =
  // 0.34996; 0.1500–0.8500.
  assert.deepEqual(t.upperHalfCi95, [0.15, 0.85]);
  // 1 of 4: centre (0.25 + 0.48019) / 1.96037 = 0.37247; half-width
  // 0.99979 · √(0.046875 + 0.060024) = 0.32687; 0.0456–0.6994.
  assert.deepEqual(t.upperQuarterCi95, [0.0456, 0.6994]);
});

Deno.test("binaryKappa() reproduces the published 50-proposal example (κ = 0.4)", () => {
  // Wikipedia, "Cohen's kappa", worked example (V2): readers A and B, 20 yes/yes,
  // 5 A yes/B no, 10 A no/B yes, 15 no/no: p_o = 0.70, p_e = 0.5·0.6 + 0.5·0.4 = 0.50.
  const a = [...Array(25).fill(true), ...Array(25).fill(false)];
  const b = [
    ...Array(20).fill(true),
    ...Array(5).fill(false),
    ...Array(10).fill(true),
    ...Array(15).fill(false),
  ];
  const k = binaryKappa(a, b);
  assert.ok(Math.abs(k.observed! - 0.7) < 1e-12);
  assert.ok(Math.abs(k.expected! - 0.5) < 1e-12);
  assert.ok(Math.abs(k.kappa! - 0.4) < 1e-12);
});

Deno.test("readerAudit() of no reports, and of a report with an unknown scheme", () => {
  assert.deepEqual(readerAudit([]), []);
  const odd = report("QVT-24-106", { median: 1, q3: 2 }, 3, true, [field("reader-a", 1, 40)]);
  (odd.classification as { scheme: string }).scheme = "no-such-scheme";
  assert.throws(
    () => readerAudit([odd]),
    RangeError,
    'Cannot audit the readers of case "QVT-24-106": Unknown scheme "no-such-scheme"',
  );
});
