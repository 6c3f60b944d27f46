/**
 * The cohort summary against hand computations, manifests, and a failing
 * pair that does not stop the others.
 */

import { join } from "node:path";
import {
  compareCohort,
  parseComparisonManifest,
  summarizeComparisons,
} from "../../lib/compare/compare_cohort.ts";
import type { ComparisonJson } from "../../lib/compare/comparison_types.ts";
import { MINI, WRIGHT } from "../stats/bland_altman_test.ts";
import { assertAlmostEquals, assertEquals, assertThrows } from "./_assert.ts";

function fake(
  i: number,
  d: [number, number, number],
  hot: [number, number] | null,
  classes: [string, string] | null,
): ComparisonJson {
  const [tp, fp, fn] = d;
  return {
    case: `QVT-24-${String(i).padStart(3, "0")}`,
    detection: { tp, fp, fn, f1: tp + fp + fn === 0 ? null : (2 * tp) / (2 * tp + fp + fn) },
    hotspot: hot
      ? {
        reference: { count: hot[0], center_px: [0, 0] },
        candidate: { count: hot[1], center_px: [0, 0] },
      }
      : { reference: null, candidate: null },
    grade: classes ? { reference_class: classes[0], candidate_class: classes[1] } : null,
  } as unknown as ComparisonJson;
}

Deno.test("summarizeComparisons() pooled and mean F1 by hand", () => {
  // Hand calculation: (tp, fp, fn) = (8, 2, 2), (1, 1, 3), (0, 0, 5).
  // Pooled: tp 9, fp 3, fn 10 → P 9/12 = 0.75, R 9/19, F1 18/31.
  // Case F1: 16/20 = 0.8, 2/6 = 0.3333, 0 → mean 0.3778.
  const s = summarizeComparisons([
    fake(1, [8, 2, 2], null, null),
    fake(2, [1, 1, 3], null, null),
    fake(3, [0, 0, 5], null, null),
  ]);
  assertEquals([s.pooled.tp, s.pooled.fp, s.pooled.fn], [9, 3, 10]);
  assertEquals(s.pooled.precision, 0.75);
  assertAlmostEquals(s.pooled.recall!, 9 / 19, 1e-6);
  assertAlmostEquals(s.pooled.f1!, 18 / 31, 1e-6);
  assertAlmostEquals(s.mean_case_f1!, (0.8 + 1 / 3 + 0) / 3, 1e-6);
  assertEquals([s.bland_altman.n, s.class_agreement, s.kappa], [0, null, null]);
});

Deno.test("summarizeComparisons(): Bland–Altman on the Lancet 1986 worked example", () => {
  // Bland & Altman 1986, Lancet, Table 1 (see test/stats/bland_altman_test.ts):
  // reference = Wright meter, candidate = mini Wright meter, as hotspot counts.
  const cases = WRIGHT.map((w, i) => fake(i, [0, 0, 1], [w, MINI[i]], null));
  const s = summarizeComparisons(cases);
  assertEquals(s.bland_altman.n, 17);
  assertAlmostEquals(s.bland_altman.bias!, 36 / 17, 1e-4);
  assertAlmostEquals(s.bland_altman.sd!, 38.8, 0.05, "paper: SD 38.8");
  assertAlmostEquals(s.bland_altman.lower!, 36 / 17 - 1.96 * s.bland_altman.sd!, 2e-4);
  assertAlmostEquals(s.bland_altman.upper!, 36 / 17 + 1.96 * s.bland_altman.sd!, 2e-4);
});

Deno.test("summarizeComparisons(): class agreement and kappa on a textbook-style table", () => {
  // The two-rater example of Wikipedia's "Cohen's kappa" article (V2): 50 items,
  // both "yes" 20, A yes / B no 5, A no / B yes 10, both "no" 15: p_o = 0.7,
  // p_e = 0.5·0.6 + 0.5·0.4 = 0.5, κ = 0.4. Here "yes" = above, "no" = below.
  const cases: ComparisonJson[] = [];
  const add = (n: number, a: string, b: string) => {
    for (let k = 0; k < n; k++) cases.push(fake(cases.length, [1, 0, 0], [1, 1], [a, b]));
  };
  add(20, "above", "above");
  add(5, "above", "below");
  add(10, "below", "above");
  add(15, "below", "below");
  const s = summarizeComparisons(cases);
  assertEquals(s.class_agreement, 0.7);
  assertAlmostEquals(s.kappa!, 0.4, 1e-9);
  assertEquals(s.class_table, { classes: ["below", "above"], counts: [[15, 10], [5, 20]] });
  assertEquals(s.graded_cases, 50);
});

Deno.test("parseComparisonManifest() names the file and the problem", () => {
  assertThrows(
    () => parseComparisonManifest("", "m.csv"),
    SyntaxError,
    'Cannot read comparison manifest "m.csv": the file is empty',
  );
  assertThrows(
    () => parseComparisonManifest("reference,cand\na,b\n", "m.csv"),
    TypeError,
    'unknown column "cand"',
  );
  assertThrows(
    () => parseComparisonManifest("reference\na\n", "m.csv"),
    TypeError,
    'no "candidate" column',
  );
  assertThrows(
    () => parseComparisonManifest("reference,candidate\na,\n", "m.csv"),
    TypeError,
    "line 2: the candidate cell is empty",
  );
  // RFC 4180 quoting: a path holding a comma.
  const rows = parseComparisonManifest(
    'reference,candidate\r\n"a,b.geojson",c.csv\r\n',
    "/x/m.csv",
  );
  assertEquals(rows[0].reference, "/x/a,b.geojson");
});

Deno.test("compareCohort() records a failing pair and goes on", async () => {
  const demo = join(import.meta.dirname!, "..", "..", "data", "demo");
  const rows = parseComparisonManifest(
    "reference,candidate,id\n" +
      "../QVT-24-003.geojson,QVT-24-003.detector.csv,\n" +
      "../QVT-24-003.geojson,missing.csv,second\n" +
      "../QVT-24-001.geojson,QVT-24-001.detector.csv,\n" +
      "../QVT-24-001.geojson,QVT-24-001.detector.csv,\n",
    join(demo, "compare", "manifest.csv"),
  );
  const seen: string[] = [];
  const r = await compareCohort(rows, { strideUm: 50 }, (res) => {
    seen.push(res.json.case);
  });
  assertEquals(seen, ["QVT-24-003", "QVT-24-001"]);
  assertEquals(r.failed.map((f) => [f.id, f.line]), [["second", 3], ["QVT-24-001", 5]]);
  assertEquals(r.failed[0].error.includes("file not found"), true);
  assertEquals(r.failed[1].error.includes("used by an earlier pair"), true);
});
