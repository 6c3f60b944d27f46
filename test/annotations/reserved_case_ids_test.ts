// Case ids that are the cohort's own file and folder names, in any case, are
// made safe by safeCaseId(); ids differing only by case are found by
// caseIdClash(). Case-insensitive matching follows common practice (CP) for
// the default file systems of two widespread desktop systems.

import { strict as assert } from "node:assert";
import {
  caseIdClash,
  isReservedCaseId,
  RESERVED_CASE_IDS,
  safeCaseId,
} from "../../lib/annotations/case_id.ts";

Deno.test("safeCaseId() prefixes the cohort's own names, in any case, and stays idempotent", () => {
  for (const name of RESERVED_CASE_IDS) {
    for (const id of [name, name.toUpperCase(), name[0].toUpperCase() + name.slice(1)]) {
      const safe = safeCaseId(id);
      assert.equal(safe, "_" + id);
      assert.ok(!isReservedCaseId(safe));
      assert.equal(safeCaseId(safe), safe, "idempotent");
    }
  }
  assert.equal(safeCaseId("assets-2"), "assets-2");
  assert.equal(
    safeCaseId(".tmp-QVT-24-001-4242"),
    "_tmp-QVT-24-001-4242",
    "no hidden or temporary names",
  );
});

Deno.test("caseIdClash() finds ids equal but for case, in the order given", () => {
  assert.deepEqual(caseIdClash(["QVT-24-001", "QVT-24-002", "qvt-24-001"]), [
    "QVT-24-001",
    "qvt-24-001",
  ]);
  assert.equal(caseIdClash(["QVT-24-001", "QVT-24-001", "QVT-24-002"]), undefined);
  assert.equal(caseIdClash([]), undefined);
});
