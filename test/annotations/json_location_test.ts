// locateJsonProblem() against the built-in JSON.parse (V8, ECMA-404/RFC 8259
// grammar) as the reference for what is valid; key RFC8259 in
// test/reference/README.md.

import { strict as assert } from "node:assert";
import fc from "fast-check";
import { locateJsonProblem } from "../../lib/annotations/_json_location.ts";

function parses(text: string): boolean {
  try {
    JSON.parse(text);
    return true;
  } catch {
    return false;
  }
}

Deno.test("locateJsonProblem() agrees with JSON.parse on valid and truncated or edited texts", () => {
  fc.assert(
    fc.property(
      fc.jsonValue(),
      fc.nat(),
      fc.constantFrom("", "}", ",", "]", '"', "x", " "),
      (v, cut, junk) => {
        const text = JSON.stringify(v, null, 1);
        assert.equal(locateJsonProblem(text), undefined);
        const k = text.length === 0 ? 0 : cut % text.length;
        const edited = text.slice(0, k) + junk + text.slice(k + 1);
        assert.equal(
          locateJsonProblem(edited) === undefined,
          parses(edited),
          JSON.stringify(edited),
        );
      },
    ),
    { seed: 7946, numRuns: 500 },
  );
});

Deno.test("locateJsonProblem() gives 1-based line and column", () => {
  assert.deepEqual(locateJsonProblem('{\n  "a": 1,\n  "b" 2\n}'), {
    line: 3,
    column: 7,
    problem: 'expected ":" after a property name, found "2"',
  });
  assert.deepEqual(locateJsonProblem("[1, 2"), {
    line: 1,
    column: 6,
    problem: 'expected "," or "]" in an array, found the end of the file',
  });
  assert.equal(
    locateJsonProblem('{"a": "x\ny"}')?.problem,
    "unescaped control character (e.g. a line break) in a string",
  );
  assert.equal(
    locateJsonProblem("{} {}")?.problem,
    'unexpected "{" after the end of the JSON value',
  );
  assert.equal(locateJsonProblem("NaN")?.problem, 'expected a value, found "N"');
});
