// A report refuses to count more figures than MAX_COUNTED_FIGURES, before any
// count grid is sized, naming the case and the file the figures came from; a
// placement search past MAX_SEARCH_WORK stops the same way.

import { strict as assert } from "node:assert";
import { buildCaseResult, startCaseResult } from "../../lib/pipeline/build_case_result.ts";
import { MAX_COUNTED_FIGURES, MAX_SEARCH_WORK } from "../../lib/defaults.ts";
import { SearchWorkError } from "../../lib/errors.ts";
import type { CaseData } from "../../lib/types.ts";
import { seededRandom } from "../../lib/random.ts";

/** `n` figures spread evenly over a 5 × 5 mm square of tissue (no window stands out). */
function evenCase(
  n: number,
  caseId: string,
  seed: number,
  from: { kind: "annotations" | "figures"; path: string },
): CaseData {
  const rnd = seededRandom(seed);
  const xPx = new Float64Array(n), yPx = new Float64Array(n);
  for (let i = 0; i < n; i++) xPx[i] = 100 + 9800 * rnd(), yPx[i] = 100 + 9800 * rnd();
  return {
    caseId,
    slide: { id: caseId, mppX: 0.5, mppY: 0.5 },
    tissue: [{
      polygons: [[[[0, 0], [10000, 0], [10000, 10000], [0, 10000], [0, 0]]]],
      source: "t",
    }],
    tumour: [],
    exclude: [],
    figures: {
      xPx,
      yPx,
      labelIndex: new Uint32Array(n),
      labels: ["mitotic figure"],
      score: new Float64Array(n).fill(NaN),
      origin: new Int32Array(n),
    },
    fields: [],
    sources: [{ ...from, sha256: "0".repeat(64) }],
    warnings: [],
  };
}

Deno.test("buildCaseResult() refuses a case with more counted figures than the limit", () => {
  const caseData = evenCase(MAX_COUNTED_FIGURES + 1, "QVT-24-073", 72, {
    kind: "annotations",
    path: "QVT-24-073.geojson",
  });
  assert.throws(
    () => buildCaseResult(caseData, {}),
    (e: Error) =>
      e instanceof RangeError &&
      e.message ===
        'Cannot count case "QVT-24-073" (figures from "QVT-24-073.geojson"): 1,000,001 figures are counted, more than the limit of 1,000,000 (see "Input limits" in the README); count fewer, e.g. with a higher minimum score or fewer labels',
  );
});

Deno.test("a placement search past its work limit stops with a message naming the case, file and step", () => {
  const caseData = evenCase(4000, "QVT-24-074", 74, { kind: "figures", path: "QVT-24-074.csv" });
  assert.throws(
    () => buildCaseResult(caseData, { maxSearchWork: 1000, simulations: 0 }),
    (e: Error) =>
      e instanceof SearchWorkError && e instanceof RangeError &&
      e.message.startsWith(
        'Cannot count case "QVT-24-074" (figures from "QVT-24-074.csv"): the hotspot: the exact ' +
          "search for the best placement of a 1,778 × 1,333 µm window stopped at its work limit " +
          "(1,000 figure tests): the 4,000 counted figures are spread so evenly",
      ),
  );
  // The best field set draws on what the hotspot and top windows left.
  const parts = startCaseResult(caseData, { simulations: 0 });
  assert.ok(parts.budget.spent > 0 && parts.budget.spent < MAX_SEARCH_WORK);
  assert.throws(
    () => buildCaseResult(caseData, { maxSearchWork: parts.budget.spent + 1, simulations: 0 }),
    (e: Error) => e instanceof SearchWorkError && e.message.includes(": the best field set: "),
  );
  // With the default limit the same case reports.
  assert.equal(buildCaseResult(caseData, { simulations: 0 }).report.best_fields?.fields.length, 10);
});
