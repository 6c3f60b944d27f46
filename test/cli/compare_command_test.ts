/**
 * `hotfield compare`: outputs with the contract keys, exit codes and
 * messages for bad input, a cohort with a failing pair, and byte-identical
 * reruns.
 */

import { strict as assert } from "node:assert";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { main } from "../../lib/cli.ts";

const DEMO = join(import.meta.dirname!, "..", "..", "data", "demo");
const REF = join(DEMO, "QVT-24-003.geojson");
const DET = join(DEMO, "compare", "QVT-24-003.detector.csv");

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  const out: string[] = [], err: string[] = [];
  const code = await main(["compare", ...args], {
    stdout: (s) => out.push(s),
    stderr: (s) => err.push(s),
  });
  return { code, out: out.join(""), err: err.join("") };
}

const CONTRACT = [
  "schema",
  "case",
  "radius_um",
  "matching",
  "min_score",
  "detection",
  "curve",
  "average_precision",
  "best_f1",
  "hotspot",
  "grade",
  "warnings",
];

Deno.test("hotfield compare REFERENCE CANDIDATE writes comparison.json with the contract keys", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const r = await run([
      REF,
      DET,
      "--out",
      dir,
      "--scheme",
      "canine-mct-2tier",
      "--min-score",
      "0.5",
    ]);
    assert.equal(r.code, 0, r.err);
    const j = JSON.parse(readFileSync(join(dir, "QVT-24-003", "comparison.json"), "utf8"));
    for (const k of CONTRACT) assert.ok(k in j, `missing ${k}`);
    assert.equal(j.schema, "hotfield.comparison/1");
    assert.equal(j.radius_um, 7.5);
    assert.equal(j.matching, "optimal");
    assert.deepEqual(Object.keys(j.detection), [
      "reference",
      "candidate",
      "tp",
      "fp",
      "fn",
      "precision",
      "recall",
      "f1",
    ]);
    assert.equal(j.curve.length, 101);
    for (const k of ["threshold", "tp", "fp", "fn", "precision", "recall", "f1", "hotspot_count"]) {
      assert.ok(k in j.curve[0], `curve point lacks ${k}`);
    }
    assert.deepEqual(Object.keys(j.best_f1), ["threshold", "f1"]);
    for (const k of ["reference", "candidate", "distance_um", "reference_count_at_candidate"]) {
      assert.ok(k in j.hotspot, `hotspot lacks ${k}`);
    }
    assert.ok("center_px" in j.hotspot.reference && "count" in j.hotspot.reference);
    for (
      const k of ["scheme", "cutoff", "reference_class", "candidate_class", "agreeing_thresholds"]
    ) {
      assert.ok(k in j.grade, `grade lacks ${k}`);
    }
    assert.ok(j.scope.includes("inside the reference's valid region"));
    assert.ok(existsSync(join(dir, "QVT-24-003", "comparison.html")));
    assert.ok(existsSync(join(dir, "assets", "plotly.min.js")));
    assert.match(r.out, /^QVT-24-003\tF1 /);
    // Without a scheme the grade is null.
    const n = await run([REF, DET, "--out", join(dir, "n")]);
    assert.equal(n.code, 0);
    assert.equal(
      JSON.parse(readFileSync(join(dir, "n", "QVT-24-003", "comparison.json"), "utf8")).grade,
      null,
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield compare: a radius ≤ 0 or > 50 µm and other bad options exit 2", async () => {
  for (
    const [args, msg] of [
      [["--radius-um", "0"], "Option --radius-um must lie in (0, 50] µm: got 0"],
      [["--radius-um", "50.5"], "Option --radius-um must lie in (0, 50] µm"],
      [["--match", "best"], 'Option --match must be optimal or greedy: got "best"'],
      [["--scheme", "nope"], "Option --scheme"],
      [["--min-score", "2"], "Option --min-score must lie in [0, 1]"],
    ] as [string[], string][]
  ) {
    const r = await run([REF, DET, "--out", "/nonexistent/never", ...args]);
    assert.equal(r.code, 2, `${args}: ${r.err}`);
    assert.ok(r.err.includes(msg), r.err);
    assert.ok(!r.err.includes("    at "), "no stack trace");
  }
  assert.equal((await run([REF, "--out", "x", "a", "b"])).code, 2);
  assert.equal((await run([REF, DET])).code, 2, "no --out");
});

Deno.test("hotfield compare: a candidate of another slide is an error unless --same-slide", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const cand = join(dir, "other.geojson");
    writeFileSync(
      cand,
      JSON.stringify({
        type: "FeatureCollection",
        slide: { id: "QVT-24-999", mpp: 0.5 },
        features: [{
          type: "Feature",
          properties: { role: "figure", score: 0.9 },
          geometry: { type: "Point", coordinates: [40000, 30000] },
        }],
      }),
    );
    const r = await run([REF, cand, "--out", join(dir, "out")]);
    assert.equal(r.code, 1);
    assert.ok(
      r.err.includes(
        `Cannot read candidates "${cand}": slide id "QVT-24-999" differs from the reference's "QVT-24-003"`,
      ),
      r.err,
    );
    assert.ok(r.err.includes("mpp 0.5 differs"), r.err);
    assert.ok(!existsSync(join(dir, "out")), "nothing written");
    const ok = await run([REF, cand, "--out", join(dir, "out"), "--same-slide"]);
    assert.equal(ok.code, 0, ok.err);
    const j = JSON.parse(readFileSync(join(dir, "out", "QVT-24-003", "comparison.json"), "utf8"));
    assert.ok(j.warnings.some((w: string) => w.includes("taken as the same slide")));
    assert.equal(j.settings.same_slide, true);
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield compare: candidates without scores warn; an empty set gives F1 0", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const noScore = join(dir, "plain.csv");
    writeFileSync(noScore, "x,y\n43394,28963\n43500,29000\n");
    const r = await run([REF, noScore, "--out", join(dir, "a")]);
    assert.equal(r.code, 0, r.err);
    const a = JSON.parse(readFileSync(join(dir, "a", "QVT-24-003", "comparison.json"), "utf8"));
    assert.equal(a.curve.length, 1);
    assert.ok(a.warnings.some((w: string) => w.includes("no scores")));
    const empty = join(dir, "empty.geojson");
    writeFileSync(empty, '{"type": "FeatureCollection", "features": []}');
    const e = await run([REF, empty, "--out", join(dir, "b")]);
    assert.equal(e.code, 0, e.err);
    const b = JSON.parse(readFileSync(join(dir, "b", "QVT-24-003", "comparison.json"), "utf8"));
    assert.equal(b.detection.f1, 0);
    assert.equal(b.detection.tp, 0);
    assert.ok(b.warnings.some((w: string) => w.includes("empty")));
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield compare MANIFEST: per-case folders, comparison.csv, the summary; a failing pair exits 1", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const manifest = join(dir, "pairs.csv");
    writeFileSync(
      manifest,
      "reference,candidate,id,scheme\r\n" +
        `${join(DEMO, "QVT-24-001.geojson")},${
          join(DEMO, "compare", "QVT-24-001.detector.csv")
        },,canine-mct-2tier\r\n` +
        `${REF},${join(dir, "missing.csv")},broken,\r\n` +
        `${REF},${DET},,canine-mct-2tier\r\n`,
    );
    const out = join(dir, "out");
    const r = await run([manifest, "--out", out, "--stride-um", "50"]);
    assert.equal(r.code, 1);
    assert.ok(
      r.err.includes('pair "broken" (manifest line 3) failed: Cannot read candidates'),
      r.err,
    );
    for (const id of ["QVT-24-001", "QVT-24-003"]) {
      assert.ok(existsSync(join(out, id, "comparison.json")), id);
    }
    assert.ok(!existsSync(join(out, "broken")));
    const rows = parse(readFileSync(join(out, "comparison.csv"), "utf8"), {
      columns: true,
    }) as Record<string, string>[];
    assert.deepEqual(rows.map((x) => x.case), ["QVT-24-001", "QVT-24-003"]);
    const s = JSON.parse(readFileSync(join(out, "comparison-summary.json"), "utf8"));
    for (const k of ["pooled", "mean_case_f1", "bland_altman", "class_agreement", "kappa"]) {
      assert.ok(k in s, k);
    }
    assert.deepEqual(Object.keys(s.bland_altman).slice(0, 4), ["n", "bias", "lower", "upper"]);
    // Pooled counts are the sums of the rows (hand check of the summary).
    const sum = (k: string) => rows.reduce((a, x) => a + Number(x[k]), 0);
    assert.deepEqual([s.pooled.tp, s.pooled.fp, s.pooled.fn], [sum("tp"), sum("fp"), sum("fn")]);
    assert.equal(s.failed.length, 1);
    assert.ok(existsSync(join(out, "index.html")));
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield compare gives byte-identical outputs on a rerun", async () => {
  const dir = Deno.makeTempDirSync();
  const env = Deno.env.get("SOURCE_DATE_EPOCH");
  Deno.env.set("SOURCE_DATE_EPOCH", "1767225600");
  try {
    await run([REF, DET, "--out", join(dir, "a"), "--match", "greedy"]);
    await run([REF, DET, "--out", join(dir, "b"), "--match", "greedy"]);
    for (const f of ["comparison.json", "comparison.html"]) {
      assert.equal(
        readFileSync(join(dir, "a", "QVT-24-003", f), "utf8"),
        readFileSync(join(dir, "b", "QVT-24-003", f), "utf8"),
        f,
      );
    }
  } finally {
    if (env === undefined) Deno.env.delete("SOURCE_DATE_EPOCH");
    else Deno.env.set("SOURCE_DATE_EPOCH", env);
    Deno.removeSync(dir, { recursive: true });
  }
});
