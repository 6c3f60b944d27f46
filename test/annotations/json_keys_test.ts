// scanJsonText(): the first member name repeated within one object, and the
// number of objects and arrays. The oracle is the construction: texts are
// serialized from generated values (fast-check, fixed seed), with one member
// written twice on purpose; JSON.parse (V8, RFC 8259 grammar; key RFC8259 in
// test/reference/README.md) confirms every generated text is JSON.

import { strict as assert } from "node:assert";
import fc from "fast-check";
import {
  describeJsonPath,
  duplicateKeyDetail,
  lineColumnAt,
  scanJsonText,
} from "../../lib/annotations/_json_keys.ts";
import { parseAnnotations } from "../../lib/annotations/read_annotations.ts";
import { parseCaseFile } from "../../lib/annotations/read_case.ts";

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** Objects and arrays in a parsed value. */
function containers(v: unknown): number {
  if (Array.isArray(v)) return 1 + v.reduce((s: number, x) => s + containers(x), 0);
  if (v !== null && typeof v === "object") {
    return 1 + Object.values(v).reduce((s: number, x) => s + containers(x), 0);
  }
  return 0;
}

/** Every path to an object with at least one member, in document order. */
function objectPaths(v: Json, path: (string | number)[] = []): (string | number)[][] {
  const out: (string | number)[][] = [];
  if (Array.isArray(v)) v.forEach((x, i) => out.push(...objectPaths(x, [...path, i])));
  else if (v !== null && typeof v === "object") {
    if (Object.keys(v).length > 0) out.push(path);
    for (const [k, x] of Object.entries(v)) out.push(...objectPaths(x, [...path, k]));
  }
  return out;
}

/** Serializes `v`, writing the first member of the object at `target` a second time at its end. */
function withDuplicate(v: Json, target: (string | number)[], space: string): string {
  const walk = (x: Json, path: (string | number)[], indent: string): string => {
    const inner = indent + space;
    const nl = space === "" ? "" : "\n";
    if (Array.isArray(x)) {
      if (x.length === 0) return "[]";
      return "[" + nl + x.map((y, i) => inner + walk(y, [...path, i], inner)).join("," + nl) +
        nl + indent + "]";
    }
    if (x !== null && typeof x === "object") {
      const entries = Object.entries(x);
      if (entries.length === 0) return "{}";
      const parts = entries.map(([k, y]) =>
        inner + JSON.stringify(k) + ":" + (space ? " " : "") + walk(y, [...path, k], inner)
      );
      if (JSON.stringify(path) === JSON.stringify(target)) {
        parts.push(inner + JSON.stringify(entries[0][0]) + ":" + (space ? " " : "") + "0");
      }
      return "{" + nl + parts.join("," + nl) + nl + indent + "}";
    }
    return JSON.stringify(x);
  };
  return walk(v, [], "");
}

Deno.test("scanJsonText() counts objects and arrays and finds no repeat in serialized values", () => {
  fc.assert(
    fc.property(fc.jsonValue(), fc.constantFrom(0, 1, 2, "\t"), (v, space) => {
      const text = JSON.stringify(v, null, space);
      const scan = scanJsonText(text, 1e9);
      assert.equal(scan.duplicate, undefined, text);
      assert.equal(scan.containers, containers(v));
      assert.equal(scan.overLimitAt, -1);
    }),
    { seed: 20241116, numRuns: 400 },
  );
});

Deno.test("scanJsonText() finds a member written twice, with its name, place and path", () => {
  fc.assert(
    fc.property(fc.jsonValue(), fc.nat(), fc.constantFrom("", " ", "\t"), (raw, pick, space) => {
      const v = raw as Json;
      const paths = objectPaths(v);
      fc.pre(paths.length > 0);
      const target = paths[pick % paths.length];
      const text = withDuplicate(v, target, space);
      JSON.parse(text); // still JSON: the grammar allows repeated names
      const scan = scanJsonText(text, 1e9);
      assert.ok(scan.duplicate, text);
      let obj: Json = v;
      for (const p of target) obj = (obj as Record<string, Json>)[p as string];
      const key = Object.keys(obj as object)[0];
      // the first repeat in document order may lie in an earlier object only if we put it there
      assert.equal(scan.duplicate.key, key);
      assert.deepEqual(scan.duplicate.path, target);
      assert.equal(text.slice(scan.duplicate.offset, scan.duplicate.offset + 1), '"');
    }),
    { seed: 20241117, numRuns: 400 },
  );
});

Deno.test("scanJsonText() sees names through escapes, quotes and brackets inside strings", () => {
  const cases: [string, string | undefined][] = [
    ['{"mpp": 1, "m\\u0070p": 2}', "mpp"],
    ['{"a\\"b": 1, "a\\"b": 2}', 'a"b'],
    ['{"a\\\\": "x\\\\", "b": "{[\\"", "a\\\\": 3}', "a\\"],
    ['{"a": "\\"b\\": 1", "b": 2}', undefined],
    ['{"a": {"b": 1}, "c": {"b": 2}}', undefined],
    ['[{"a": 1}, {"a": 2}]', undefined],
    ['{"a": [1, {"a": 1}], "b": 1}', undefined],
    ['{"x": "a,\\"b\\": 1 ,"}', undefined],
  ];
  for (const [text, key] of cases) {
    JSON.parse(text);
    assert.equal(scanJsonText(text, 100).duplicate?.key, key, text);
  }
  // an object with many members switches to a Set, and still finds the repeat
  const many = "{" + Array.from({ length: 200 }, (_, i) => `"k${i}": ${i}`).join(", ") +
    ', "k\\u0031": 0}';
  assert.deepEqual(scanJsonText(many, 100).duplicate?.key, "k1");
});

Deno.test("scanJsonText() stops counting at the limit and says where", () => {
  const text = "[" + "{},".repeat(50) + "{}]";
  const scan = scanJsonText(text, 10);
  assert.equal(scan.containers, 11);
  assert.equal(scan.overLimitAt, 1 + 3 * 9);
  assert.equal(scanJsonText(text, 52).overLimitAt, -1);
});

Deno.test("describeJsonPath() and lineColumnAt() name the place in words", () => {
  assert.equal(describeJsonPath([]), "the top-level object");
  assert.equal(describeJsonPath(["slide"]), '"slide"');
  assert.equal(describeJsonPath(["features", 3, "properties"]), 'feature 3 "properties"');
  assert.equal(
    describeJsonPath(["features", 0, "geometry", "coordinates", 2]),
    'feature 0 "geometry"."coordinates"[2]',
  );
  assert.deepEqual(lineColumnAt("ab\ncd\nef", 4), { line: 2, column: 2 });
  assert.deepEqual(lineColumnAt("ab", 0), { line: 1, column: 1 });
  const text = '{\n  "slide": {"mpp": 0.25, "mpp": 0.5}\n}';
  const d = scanJsonText(text, 10).duplicate!;
  assert.equal(
    duplicateKeyDetail(text, d),
    'line 2, column 26: the key "mpp" appears twice in "slide"; member names must be unique (RFC 8259 §4), otherwise one value silently replaces the other',
  );
});

const SQUARE = [[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]];

Deno.test("parseAnnotations() refuses a repeated name in the slide, a feature's properties or anywhere", () => {
  const tissue =
    `{"type": "Feature", "properties": {"role": "tissue"}, "geometry": {"type": "Polygon", "coordinates": [${
      JSON.stringify(SQUARE)
    }]}}`;
  const cases: [string, RegExp][] = [
    [
      `{"type": "FeatureCollection", "slide": {"id": "QVT-24-064", "mpp": 0.25, "mpp": 0.5}, "features": [${tissue}]}`,
      /line 1, column 74: the key "mpp" appears twice in "slide"/,
    ],
    [
      `{"type": "FeatureCollection", "slide": {"mpp": 0.25}, "features": [${tissue}, {"type": "Feature", "properties": {"role": "figure", "score": 0.2, "score": 0.9}, "geometry": {"type": "Point", "coordinates": [5, 5]}}]}`,
      /the key "score" appears twice in feature 1 "properties"/,
    ],
    [
      `{"type": "FeatureCollection", "slide": {"mpp": 0.25}, "features": [${tissue}], "features": []}`,
      /the key "features" appears twice in the top-level object/,
    ],
    [
      `{"type": "FeatureCollection", "slide": {"mpp": 0.25}, "features": [{"type": "Feature", "properties": {"role": "tissue"}, "geometry": {"type": "Polygon", "coordinates": [], "coordinates": [${
        JSON.stringify(SQUARE)
      }]}}]}`,
      /the key "coordinates" appears twice in feature 0 "geometry"/,
    ],
  ];
  for (const [text, message] of cases) {
    assert.throws(
      () => parseAnnotations(text, { fileName: "QVT-24-064.geojson" }),
      (e: Error) => {
        assert.ok(e instanceof SyntaxError, String(e));
        assert.ok(e.message.startsWith('Cannot read annotations "QVT-24-064.geojson": line '));
        assert.match(e.message, message);
        return true;
      },
    );
  }
  // broken JSON is reported as such even when a repeat comes first
  assert.throws(
    () =>
      parseAnnotations('{"slide": {"mpp": 1, "mpp": 2}, "features": [', {
        fileName: "QVT-24-064.geojson",
      }),
    /not valid JSON/,
  );
});

Deno.test("parseCaseFile() refuses a repeated member, naming it and its place", () => {
  assert.throws(
    () =>
      parseCaseFile(
        '{"hotfield_case": 1, "annotations": "a.geojson",\n "annotations": "b.geojson"}',
        "QVT-24-064.case.json",
      ),
    (e: Error) =>
      e instanceof SyntaxError &&
      e.message ===
        'Cannot read case file "QVT-24-064.case.json": line 2, column 2: the key "annotations" appears twice in the top-level object; member names must be unique (RFC 8259 §4), otherwise one value silently replaces the other',
  );
  assert.throws(
    () =>
      parseCaseFile(
        '{"hotfield_case": 1, "slide": {"mpp": 0.25, "mpp": 0.5}}',
        "QVT-24-064.case.json",
      ),
    /the key "mpp" appears twice in "slide"/,
  );
});

Deno.test("parseAnnotations() refuses a file of millions of empty objects before parsing it", () => {
  const text = '{"type": "FeatureCollection", "slide": {"mpp": 0.25}, "features": [' +
    "{},".repeat(12_000_001) + "{}]}";
  const t = performance.now();
  assert.throws(
    () => parseAnnotations(text, { fileName: "QVT-24-064.geojson" }),
    (e: Error) =>
      e instanceof RangeError &&
      /holds more than 12,000,000 JSON objects and arrays \(the limit; passed at line 1, column \d+\)/
        .test(e.message),
  );
  // a record, not a timed check (those live in the benchmark): the refusal comes before parsing
  console.log(`refused in ${Math.round(performance.now() - t)} ms`);
});
