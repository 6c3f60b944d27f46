// Case classes against a cut-off for the report's window, on hand-made count
// maps (plain data). The class definitions are hotfield's own (documented in
// lib/standards/classify.ts); the cut-offs come from the schemes' sources.

import { strict as assert } from "node:assert";
import { classifyCounts, minCountFor } from "../../lib/standards/classify.ts";
import { classifyReport } from "../../lib/pipeline/classify_report.ts";
import { getScheme } from "../../lib/standards/list_schemes.ts";
import type { ReportJson } from "../../lib/pipeline/report_types.ts";

const MCT = getScheme("canine-mct-2tier");

function map(counts: number[], admissible?: number[]) {
  return {
    counts: new Int32Array(counts),
    admissible: new Uint8Array(admissible ?? counts.map(() => 1)),
  };
}

Deno.test("classifyCounts() is below when the hotspot does not meet the cut-off", () => {
  // Kiupel 2011 (V): high grade at ≥ 7 in 10 HPF; a hotspot of 6 cannot reach it.
  const m = map([1, 3, 6, 2]);
  const { classification } = classifyCounts(
    { hotspotCount: 6, q1: 1.75, windowAreaMm2: 2.37, ...m },
    MCT,
  );
  assert.equal(classification.class, "below");
  assert.equal(classification.fraction_at_or_above, 0);
  assert.equal(classification.tier, "low");
  assert.equal(classification.scheme, "canine-mct-2tier");
  assert.equal(classification.cutoff, 7);
});

Deno.test("classifyCounts() is above when the lower quartile meets the cut-off", () => {
  const m = map([7, 8, 9, 12]);
  const { classification } = classifyCounts(
    { hotspotCount: 12, q1: 7.75, windowAreaMm2: 2.37, ...m },
    MCT,
  );
  assert.equal(classification.class, "above");
  assert.equal(classification.fraction_at_or_above, 1);
  assert.equal(classification.tier, "high");
});

Deno.test("classifyCounts() is field-dependent in between", () => {
  const m = map([2, 5, 7, 9, 30], [1, 1, 1, 1, 0]);
  const { classification } = classifyCounts(
    { hotspotCount: 9, q1: 4.25, windowAreaMm2: 2.37, ...m },
    MCT,
  );
  assert.equal(classification.class, "field-dependent");
  // Only admissible positions count: 2 of 4 (the 30 is not admissible).
  assert.equal(classification.fraction_at_or_above, 0.5);
});

Deno.test("classifyCounts() converts the cut-off by area and says so", () => {
  // NEN G3: > 20 per 2 mm² (WHO 2019, V2). In a 2.37 mm² window: > 23.7, so 24.
  const nen = getScheme("nen-who");
  const m = map([10, 24, 23]);
  const { classification, warnings } = classifyCounts(
    { hotspotCount: 24, q1: 16.5, windowAreaMm2: 2.37, ...m },
    nen,
  );
  assert.equal(classification.cutoff, 20);
  assert.equal(classification.cutoff_rule, ">");
  assert.equal(classification.cutoff_for_window, 23.7);
  assert.equal(classification.min_count_for_window, 24);
  assert.equal(classification.cutoff_basis, "per 2 mm²");
  assert.equal(classification.tier, "G3");
  assert.ok(String(classification.note).includes("converted by area"));
  assert.equal(
    warnings[0],
    'Scheme "nen-who" counts per 2 mm²; its cut-offs were converted by area to the 2.37 mm² ' +
      "window (× 1.185)",
  );
  // Hand calculation: 23 in 2.37 mm² is 19.41 per 2 mm², G2.
  const low = classifyCounts({ hotspotCount: 23, q1: 16.5, windowAreaMm2: 2.37, ...m }, nen);
  assert.equal(low.classification.tier, "G2");
  assert.equal(low.classification.class, "below");
});

Deno.test("classifyCounts() classifies every tier boundary in tiers", () => {
  const s = getScheme("breast-nottingham");
  const m = map([5, 12, 25, 30]);
  const { classification } = classifyCounts(
    { hotspotCount: 30, q1: 10.25, windowAreaMm2: 2.74, ...m },
    s,
  );
  const tiers = classification.tiers as {
    label: string;
    min_count_for_window: number;
    class: string;
    fraction_at_or_above: number;
  }[];
  assert.deepEqual(tiers.map((t) => [t.label, t.min_count_for_window, t.class]), [
    ["score 2", 10, "above"],
    ["score 3", 20, "field-dependent"],
  ]);
  assert.equal(tiers[0].fraction_at_or_above, 0.75);
  // class follows the primary tier (score 3).
  assert.equal(classification.class, "field-dependent");
  // Another tier can be chosen for class.
  const t1 = classifyCounts({ hotspotCount: 30, q1: 10.25, windowAreaMm2: 2.74, ...m }, s, {
    tier: 1,
  });
  assert.equal(t1.classification.class, "above");
  assert.throws(
    () => classifyCounts({ hotspotCount: 1, q1: 1, windowAreaMm2: 2.74, ...m }, s, { tier: 0 }),
    RangeError,
  );
});

Deno.test("classifyCounts() with no admissible position warns and gives nulls", () => {
  const { classification, warnings } = classifyCounts(
    { hotspotCount: null, q1: null, windowAreaMm2: 2.37, ...map([0, 0], [0, 0]) },
    MCT,
  );
  assert.equal(classification.fraction_at_or_above, null);
  assert.equal(classification.tier, null);
  assert.equal(classification.class, "field-dependent");
  assert.ok(warnings.some((w) => w.startsWith("No admissible window position")));
});

Deno.test("minCountFor() copies ≥ and > exactly", () => {
  // Hand calculation: ≥ 7 → 7; > 5 → 6; ≥ 7 × 1.2 = 8.4 → 9; > 5 × 1.2 = 6 → 7.
  assert.equal(minCountFor({ atLeast: 7 }, 1), 7);
  assert.equal(minCountFor({ above: 5 }, 1), 6);
  assert.equal(minCountFor({ atLeast: 7 }, 1.2), 9);
  assert.equal(minCountFor({ above: 5 }, 1.2), 7);
  // 20 × 2.37 / 2.37 rounding noise stays 20.
  assert.equal(minCountFor({ atLeast: 20 }, (2.37 / 2.37) * (1 + 1e-15)), 20);
});

Deno.test("classifyReport() reads the hotspot and quartile from a report", () => {
  const report = {
    window: { shape: "circle", area_mm2: 5, diameter_um: 2523.1 },
    hotspot: { center_px: [0, 0], count: 6, coverage: 1, per_mm2: 1.2 },
    distribution: { positions: 3, min: 1, q1: 2, median: 3, q3: 4.5, max: 6, mean: 3.3 },
  } as unknown as ReportJson;
  const { classification } = classifyReport(report, getScheme("gist"), map([1, 3, 6]));
  assert.equal(classification.tier, "> 5 per 5 mm²");
  assert.equal(classification.class, "field-dependent");
  assert.equal(classification.fraction_at_or_above, 1 / 3);
});
