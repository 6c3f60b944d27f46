// Grading schemes held as data: boundaries exactly as each source states them.
// Sources and marks as in the project's reference list (REFERENCES.md §3–§7).

import { strict as assert } from "node:assert";
import { getScheme, listSchemes } from "../../lib/standards/list_schemes.ts";
import {
  basisAreaMm2,
  classifyCounts,
  rateForBasis,
  tierForRate,
} from "../../lib/standards/classify.ts";

Deno.test("listSchemes() holds the required schemes with sources and marks", () => {
  const ids = listSchemes().map((s) => s.id);
  for (
    const id of [
      "canine-mct-2tier",
      "breast-nottingham",
      "nen-who",
      "gist",
      "meningioma-who",
      "melanoma",
      "canine-sts",
      "canine-mammary",
    ]
  ) assert.ok(ids.includes(id), id);
  for (const s of listSchemes()) {
    assert.ok(s.sources.length > 0, `${s.id} cites a source`);
    assert.ok(["V", "V2", "C", "M", "CP"].includes(s.mark), `${s.id} mark`);
    assert.equal(Object.hasOwn(s.tiers[0].from, "atLeast"), true, `${s.id} starts at 0`);
    assert.ok(s.primaryTier >= 1 && s.primaryTier < s.tiers.length, `${s.id} primary tier`);
  }
});

Deno.test("getScheme() names the known ids for an unknown one", () => {
  const known = listSchemes().map((s) => s.id).join(", ");
  assert.throws(() => getScheme("canine-mct-3tier"), {
    name: "RangeError",
    message: `Unknown scheme "canine-mct-3tier"; known: ${known}`,
  });
});

Deno.test("getScheme() returns a copy", () => {
  const s = getScheme("gist");
  s.tiers[1].label = "changed";
  assert.equal(getScheme("gist").tiers[1].label, "> 5 per 5 mm²");
});

Deno.test("canine-mct-2tier: 6 → low, 7 → high per 10 HPF (Kiupel 2011)", () => {
  // Kiupel M et al., Vet Pathol 2011;48(1):147-155 (V, abstract): high grade at
  // ≥ 7 mitotic figures in 10 HPF. Area 2.37 mm² per Meuten et al. 2016 (V).
  const s = getScheme("canine-mct-2tier");
  assert.equal(basisAreaMm2(s), 10 * 0.237);
  assert.equal(tierForRate(s, 6), "low");
  assert.equal(tierForRate(s, 7), "high");
  const at = (hotspot: number) =>
    classifyCounts({
      hotspotCount: hotspot,
      q1: 0,
      windowAreaMm2: 2.37,
      counts: [hotspot, 0],
      admissible: [1, 1],
    }, s).classification;
  assert.equal(at(6).class, "below");
  assert.equal(at(6).tier, "low");
  assert.equal(at(7).class, "field-dependent");
  assert.equal(at(7).tier, "high");
  assert.equal(at(7).cutoff, 7);
  assert.equal(at(7).cutoff_rule, "≥");
});

Deno.test("canine-mct-2tier: the exact 10-field area 2.3758 mm² keeps the cut-off at 7", () => {
  // 2.37 mm² truncates 10 × π·0.275² = 2.3758 mm² (C); within 0.5% the cut-off
  // is not rescaled (it would become ⌈7.017⌉ = 8).
  const { classification, warnings } = classifyCounts({
    hotspotCount: 7,
    q1: 7,
    windowAreaMm2: 10 * Math.PI * 0.275 ** 2,
    counts: [7],
    admissible: [1],
  }, getScheme("canine-mct-2tier"));
  assert.equal(classification.min_count_for_window, 7);
  assert.equal(classification.class, "above");
  assert.deepEqual(warnings, []);
});

Deno.test("nen-who: 1.9 → G1, 2 → G2, 20 → G2, 20.2 → G3 per 2 mm²", () => {
  // WHO Digestive System Tumours 5th ed. 2019 (V2, two reproductions): G1 < 2,
  // G2 2–20, G3 > 20 per 2 mm². Fractional rates per REFERENCES.md §3.
  const s = getScheme("nen-who");
  assert.equal(tierForRate(s, 0), "G1");
  assert.equal(tierForRate(s, 1.9), "G1");
  assert.equal(tierForRate(s, 2), "G2");
  assert.equal(tierForRate(s, 20), "G2");
  assert.equal(tierForRate(s, 20.2), "G3");
});

Deno.test("nen-who: 11 in 10 mm² is 2.2 per 2 mm², G2", () => {
  // REFERENCES.md §3 example check (C); counting over 10 mm² per WHO 2019 (V2).
  const s = getScheme("nen-who");
  const rate = rateForBasis(s, 11, 10);
  assert.ok(Math.abs(rate - 2.2) < 1e-12);
  assert.equal(tierForRate(s, rate), "G2");
  assert.equal(s.counting.areaMm2, 10);
  // Same through classification of a 10 mm² window.
  const { classification, warnings } = classifyCounts({
    hotspotCount: 11,
    q1: 4,
    windowAreaMm2: 10,
    counts: [11, 4],
    admissible: [1, 1],
  }, s);
  assert.equal(classification.tier, "G2");
  assert.equal(classification.hotspot_rate_per_basis, 2.2);
  // G3 needs > 20 per 2 mm² = > 100 in 10 mm²: at least 101.
  assert.equal(classification.min_count_for_window, 101);
  assert.ok(warnings[0].includes("converted by area") && warnings[0].includes("× 5"));
});

Deno.test("gist: 5 vs 6 per 5 mm² (> 5 is high)", () => {
  // Miettinen M, Lasota J, Semin Diagn Pathol 2006;23(2):70-83 (V2 via Hindawi
  // ISRN 2012 Table 2 and NCI PDQ Table 1): ≤ 5 vs > 5 per 50 HPF; 50 HPF ≡ 5 mm²
  // (SEER GIST SSF 5/6 notes, V).
  const s = getScheme("gist");
  assert.equal(tierForRate(s, 5), "≤ 5 per 5 mm²");
  assert.equal(tierForRate(s, 6), "> 5 per 5 mm²");
  const { classification } = classifyCounts({
    hotspotCount: 6,
    q1: 2,
    windowAreaMm2: 5,
    counts: [6, 5, 2],
    admissible: [1, 1, 1],
  }, s);
  assert.equal(classification.cutoff, 5);
  assert.equal(classification.cutoff_rule, ">");
  assert.equal(classification.min_count_for_window, 6);
  assert.equal(classification.fraction_at_or_above, 1 / 3);
});

Deno.test("meningioma-who: 3/4/19/20 per 10 HPF (≥ 4 grade 2, ≥ 20 grade 3)", () => {
  // WHO CNS 5th ed. 2021 (V2 via BMJ Best Practice and wiki summaries): "4 or
  // more" and "20 or more" per 10 HPF; some secondary sources write > 4 / > 20.
  // The WHO HPF area 0.16 mm² (10 HPF = 1.6 mm²) is from memory (M).
  const s = getScheme("meningioma-who");
  assert.equal(tierForRate(s, 3), "grade 1 range");
  assert.equal(tierForRate(s, 4), "grade 2 (atypical)");
  assert.equal(tierForRate(s, 19), "grade 2 (atypical)");
  assert.equal(tierForRate(s, 20), "grade 3 (anaplastic)");
  assert.equal(s.mark, "M");
  assert.ok(s.basis.kind === "fields" && s.basis.note.includes("unconfirmed"));
  // Equivalent densities (C from the M area): ≥ 2.5 /mm² and ≥ 12.5 /mm².
  assert.ok(Math.abs(4 / basisAreaMm2(s)! - 2.5) < 1e-12);
  assert.ok(Math.abs(20 / basisAreaMm2(s)! - 12.5) < 1e-12);
  // Classification warns that the area is unconfirmed (check against the local guideline).
  const { warnings, classification } = classifyCounts({
    hotspotCount: 20,
    q1: 5,
    windowAreaMm2: 1.6,
    counts: [20, 5],
    admissible: [1, 1],
  }, s);
  assert.equal(classification.tier, "grade 3 (anaplastic)");
  assert.ok(warnings.some((w) => w.includes("unconfirmed") && w.includes("local guideline")));
  const grade2 = (classification.tiers as { label: string; min_count_for_window: number }[])[0];
  assert.equal(grade2.label, "grade 2 (atypical)");
  assert.equal(grade2.min_count_for_window, 4);
});

Deno.test("melanoma: nonmitogenic below 1 per mm²", () => {
  // SEER EOD "Mitotic Rate Melanoma" / CS SSF 7 (V): per mm², nonmitogenic < 1/mm².
  const s = getScheme("melanoma");
  assert.equal(tierForRate(s, 0), "nonmitogenic");
  assert.equal(tierForRate(s, 0.99), "nonmitogenic");
  assert.equal(tierForRate(s, 1), "mitogenic");
  // One figure in a 2.37 mm² window is 0.42 /mm²: nonmitogenic by rate.
  assert.equal(tierForRate(s, rateForBasis(s, 1, 2.37)), "nonmitogenic");
});

Deno.test("canine-sts: 9/10/19/20 per 10 HPF (from memory, mirrors FNCLCC)", () => {
  // Dennis MM et al., Vet Pathol 2011;48(1):73-84 after Kuntz et al. 1997: the
  // cut-offs 0–9 / 10–19 / ≥ 20 are from memory (M); they mirror FNCLCC (V).
  const s = getScheme("canine-sts");
  assert.equal(s.mark, "M");
  assert.deepEqual([9, 10, 19, 20].map((r) => tierForRate(s, r)), [
    "score 1",
    "score 2",
    "score 2",
    "score 3",
  ]);
  const f = getScheme("sts-fnclcc");
  assert.deepEqual([9, 10, 19, 20].map((r) => tierForRate(f, r)), [
    "score 1",
    "score 2",
    "score 2",
    "score 3",
  ]);
});

Deno.test("canine-mammary: 9/10/19/20 per 10 HPF of 0.237 mm² (> 19 → score 3)", () => {
  // Peña L et al., Vet Pathol 2013;50(1):94-105 (V2 via Withrow & MacEwen 6th ed.
  // Tables 28.3/28.4A): 0–9 → 1; 10–19 → 2; > 19 → 3; 10 HPF = 2.37 mm².
  const s = getScheme("canine-mammary");
  assert.ok(Math.abs(basisAreaMm2(s)! - 2.37) < 1e-12);
  assert.deepEqual([9, 10, 19, 20].map((r) => tierForRate(s, r)), [
    "score 1",
    "score 2",
    "score 2",
    "score 3",
  ]);
  // "> 19" as written: a scaled rate of 19.5 is score 3.
  assert.equal(tierForRate(s, 19.5), "score 3");
});
