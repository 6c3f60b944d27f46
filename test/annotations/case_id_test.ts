import { strict as assert } from "node:assert";
import { MAX_CASE_ID_LENGTH, safeCaseId } from "../../lib/annotations/case_id.ts";

Deno.test("safeCaseId() keeps safe ids unchanged", () => {
  for (const id of ["QVT-24-001", "a.b_c-d", "X"]) assert.equal(safeCaseId(id), id);
});

Deno.test("safeCaseId() replaces unsafe characters, one _ per code point", () => {
  assert.equal(safeCaseId("QVT 24/003"), "QVT_24_003");
  assert.equal(safeCaseId("Fall ö:1"), "Fall___1");
  assert.equal(safeCaseId("a😀b"), "a_b");
  assert.equal(safeCaseId("a\\b"), "a_b");
});

Deno.test("safeCaseId() allows no leading or trailing dot and no empty id", () => {
  assert.equal(safeCaseId(".hidden"), "_hidden");
  assert.equal(safeCaseId(".."), "__");
  assert.equal(safeCaseId("case."), "case_");
  assert.equal(safeCaseId(""), "case");
  assert.equal(safeCaseId("   "), "case");
});

Deno.test("safeCaseId() avoids reserved device names", () => {
  assert.equal(safeCaseId("CON"), "_CON");
  assert.equal(safeCaseId("nul.txt"), "_nul.txt");
  assert.equal(safeCaseId("CONSOLE"), "CONSOLE");
});

Deno.test("safeCaseId() bounds the length and keeps long ids distinct", () => {
  const a = safeCaseId("Q".repeat(300) + "1");
  const b = safeCaseId("Q".repeat(300) + "2");
  assert.equal(a.length, MAX_CASE_ID_LENGTH);
  assert.notEqual(a, b);
  assert.match(a, /^Q+-[0-9a-f]{8}$/);
});

Deno.test("safeCaseId() is idempotent", () => {
  for (const raw of ["QVT 24/003", ".x.", "Q".repeat(300), "CON", "", "a😀b"]) {
    const once = safeCaseId(raw);
    assert.equal(safeCaseId(once), once);
    assert.match(once, /^[A-Za-z0-9._-]{1,100}$/);
    assert.ok(!once.startsWith("."));
  }
});
