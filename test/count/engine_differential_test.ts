// The engine against its own results from before the speed work, on sixty
// seeded random cases (test/count/_engine_cases.ts): every number of the
// report, the unrounded hotspot, top-k, best field set and field checks, and
// digests of the count map and the valid region must stay identical. This is
// a regression check of speed changes, not an outside check: the outside
// checks of the same numbers are in hotspot_test.ts, count_map_test.ts and
// the geometry tests.
import { strict as assert } from "node:assert";
import { ENGINE_CASES, ENGINE_RESULTS_PATH, engineCaseResult } from "./_engine_cases.ts";

const stored = JSON.parse(Deno.readTextFileSync(ENGINE_RESULTS_PATH)) as unknown[];

Deno.test("engine differential: sixty stored cases are all present", () => {
  assert.equal(stored.length, ENGINE_CASES);
});

for (let c = 0; c < ENGINE_CASES; c++) {
  Deno.test(`engine differential: case ${c} gives the stored report, placements and map`, () => {
    // Through JSON, as stored (no NaN or -0 survives either way).
    const now = JSON.parse(JSON.stringify(engineCaseResult(c)));
    assert.deepStrictEqual(now, stored[c]);
  });
}
