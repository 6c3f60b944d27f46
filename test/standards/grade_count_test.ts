// gradeCount(): a count made at the microscope graded against a scheme.
// Field of view: Renne SL, Pathologica 2023;115(6):302-307 (V): FN 22 at 40×
// gives d = 0.55 mm, area π·0.275² = 0.237583 mm² (C), ten fields 2.3758 mm²
// (C); the standard area 2.37 mm² (Meuten et al., Vet Pathol 2016, V).
// Cut-off: Kiupel M et al., Vet Pathol 2011;48(1):147-155 (V): high grade at
// ≥ 7 mitotic figures in 10 HPF. Exact Poisson interval of 8: REFERENCES.md §9
// (Garwood 1936; computed two ways, C): 3.4538–15.7632, tolerance 1e-4 (the
// table's 4 decimals). Recount chance: npm jstat 1.9.6 jStat.poisson.cdf, a
// general-purpose library, tolerance 1e-12.

import { strict as assert } from "node:assert";
import jStat from "jstat";
import { gradeCount } from "../../lib/standards/grade_count.ts";
import { fieldOfView } from "../../lib/standards/field_of_view.ts";

const TEN_FN22_40X = 10 * fieldOfView({ fieldNumberMm: 22, objective: 40 }).areaMm2;

Deno.test("gradeCount() grades 8 in 10 fields of FN 22 at 40× as at/above the two-tier cut-off", () => {
  // Renne 2023 (V) + hand calculation: 10 · π · 0.275² = 2.37583 mm².
  assert.ok(Math.abs(TEN_FN22_40X - 2.3758) < 5e-5);
  const g = gradeCount(8, { areaMm2: TEN_FN22_40X, scheme: "canine-mct-2tier" });
  assert.equal(g.count, 8);
  assert.equal(g.area_mm2, TEN_FN22_40X);
  // 8 / 2.37583 = 3.3672 per mm² (hand calculation).
  assert.ok(Math.abs(g.per_mm2 - 3.3672) < 1e-4);
  // 2.3758 is within 0.5% of the 2.37 mm² basis, so the count is unchanged.
  assert.equal(g.count_per_scheme_basis, 8);
  assert.equal(g.scheme, "canine-mct-2tier");
  // Kiupel 2011 (V): ≥ 7 in 10 HPF.
  assert.equal(g.cutoff, 7);
  assert.equal(g.cutoff_rule, "≥");
  assert.equal(g.class, "above");
  assert.equal(g.tier, "high");
  // Garwood 1936, REFERENCES.md §9 (C): 3.4538–15.7632.
  assert.ok(Math.abs(g.interval_95[0] - 3.4538) <= 1e-4, `lower ${g.interval_95[0]}`);
  assert.ok(Math.abs(g.interval_95[1] - 15.7632) <= 1e-4, `upper ${g.interval_95[1]}`);
  // A recount of mean 8 below 7: P(Y ≤ 6 | 8), jstat.
  assert.ok(Math.abs(g.p_other_side - jStat.poisson.cdf(6, 8)) < 1e-12);
  assert.match(g.caution, /never replaces, a pathologist/);
  assert.match(g.caution, /local grading guidelines/);
});

Deno.test("gradeCount() puts 6 in 10 fields below the cut-off and 7 exactly at it", () => {
  // Kiupel 2011 (V): "≥ 7" includes 7.
  assert.equal(gradeCount(6, { areaMm2: TEN_FN22_40X, scheme: "canine-mct-2tier" }).class, "below");
  const seven = gradeCount(7, { areaMm2: 2.37, scheme: "canine-mct-2tier" });
  assert.equal(seven.class, "above");
  assert.equal(seven.tier, "high");
  // A recount of mean 7 below 7: P(Y ≤ 6 | 7), jstat.
  assert.ok(Math.abs(seven.p_other_side - jStat.poisson.cdf(6, 7)) < 1e-12);
});

Deno.test("gradeCount() converts a count over another area to the scheme's basis", () => {
  // WHO 2019 (V2): G3 at > 20 per 2 mm²; 11 in 10 mm² is 2.2 per 2 mm² (hand
  // calculation: 11 × 2 / 10), tier G2 (2–20), below the G3 cut-off.
  const g = gradeCount(11, { areaMm2: 10, scheme: "nen-who" });
  assert.ok(Math.abs(g.count_per_scheme_basis - 2.2) < 1e-12);
  assert.equal(g.tier, "G2");
  assert.equal(g.class, "below");
  assert.equal(g.cutoff_rule, ">");
  // > 20 per 2 mm² over 10 mm² needs > 100, so 101 (hand calculation).
  assert.equal(g.min_count_for_area, 101);
  assert.equal(g.notes.length, 1);
  // Half the standard area: 4 in 1.185 mm² is 8 per 2.37 mm² (hand calculation).
  const half = gradeCount(4, { areaMm2: 1.185, scheme: "canine-mct-2tier" });
  assert.ok(Math.abs(half.count_per_scheme_basis - 8) < 1e-12);
  assert.equal(half.class, "above");
  // Least whole count meeting ≥ 7 per 2.37 mm² in 1.185 mm²: ⌈3.5⌉ = 4.
  assert.equal(half.min_count_for_area, 4);
});

Deno.test("gradeCount() rejects a negative or fractional count, a bad area and an unknown scheme", () => {
  assert.throws(
    () => gradeCount(-1, { areaMm2: 2.37, scheme: "canine-mct-2tier" }),
    RangeError,
    "Count must be a whole number ≥ 0: got -1",
  );
  assert.throws(
    () => gradeCount(2.5, { areaMm2: 2.37, scheme: "canine-mct-2tier" }),
    RangeError,
    "Count must be a whole number ≥ 0: got 2.5",
  );
  assert.throws(
    () => gradeCount(3, { areaMm2: 0, scheme: "canine-mct-2tier" }),
    RangeError,
    "Area must be a number > 0 mm²: got 0",
  );
  assert.throws(
    () => gradeCount(3, { areaMm2: 2.37, scheme: "no-such" }),
    RangeError,
    'Unknown scheme "no-such"',
  );
});
