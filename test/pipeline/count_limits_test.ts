// A report refuses to count more figures than MAX_COUNTED_FIGURES, before any
// count grid is sized, naming the case and the file the figures came from.

import { strict as assert } from "node:assert";
import { buildCaseResult } from "../../lib/pipeline/build_case_result.ts";
import { MAX_COUNTED_FIGURES } from "../../lib/defaults.ts";
import type { CaseData } from "../../lib/types.ts";
import { seededRandom } from "../../lib/random.ts";

Deno.test("buildCaseResult() refuses a case with more counted figures than the limit", () => {
  const n = MAX_COUNTED_FIGURES + 1;
  const rnd = seededRandom(72);
  const xPx = new Float64Array(n), yPx = new Float64Array(n);
  for (let i = 0; i < n; i++) xPx[i] = 100 + 9800 * rnd(), yPx[i] = 100 + 9800 * rnd();
  const caseData: CaseData = {
    caseId: "QVT-24-073",
    slide: { id: "QVT-24-073", mppX: 0.5, mppY: 0.5 },
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
    sources: [{ kind: "annotations", path: "QVT-24-073.geojson", sha256: "0".repeat(64) }],
    warnings: [],
  };
  assert.throws(
    () => buildCaseResult(caseData, {}),
    (e: Error) =>
      e instanceof RangeError &&
      e.message ===
        'Cannot count case "QVT-24-073" (figures from "QVT-24-073.geojson"): 500,001 figures are counted, more than the limit of 500,000 (see "Input limits" in the README); count fewer, e.g. with a higher minimum score or fewer labels',
  );
});
