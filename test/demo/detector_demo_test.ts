/**
 * The committed demo detector outputs in data/demo/compare/ are exactly
 * what their generator writes, stay small, and show what their README says.
 */

import { strict as assert } from "node:assert";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { DEMO_SEED } from "../../lib/demo/demo_cohort.ts";
import { writeDetectorDemoData } from "../../lib/demo/detector_demo.ts";
import { compareCohort, parseComparisonManifest } from "../../lib/compare/compare_cohort.ts";

const DIR = join(import.meta.dirname!, "..", "..", "data", "demo", "compare");

Deno.test("writeDetectorDemoData() regenerates data/demo/compare/ byte for byte from the seed", () => {
  const dir = Deno.makeTempDirSync();
  try {
    writeDetectorDemoData(dir, DEMO_SEED);
    const fresh = readdirSync(dir).sort();
    assert.deepEqual(fresh, readdirSync(DIR).sort());
    for (const name of fresh) {
      assert.ok(
        readFileSync(join(dir, name)).equals(readFileSync(join(DIR, name))),
        `${name} differs from the committed file; run deno task demo:data`,
      );
    }
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("data/demo/compare/ is small and its CSVs read back as RFC 4180 with scores in [0, 1]", () => {
  let bytes = 0;
  for (const name of readdirSync(DIR)) {
    bytes += Deno.statSync(join(DIR, name)).size;
    if (!name.endsWith(".detector.csv") && !name.endsWith("focus.csv")) continue;
    // csv-parse 7.0.3 (npm) as an outside RFC 4180 reader.
    const rows = parse(readFileSync(join(DIR, name), "utf8"), { columns: true }) as Record<
      string,
      string
    >[];
    assert.ok(rows.length > 10, name);
    assert.ok(rows.every((r) => Number(r.score) >= 0 && Number(r.score) <= 1), name);
  }
  assert.ok(bytes < 100_000, `data/demo/compare/ is ${bytes} bytes`);
});

Deno.test("the demo detector that misses a focus moves the hotspot to a weaker one", async () => {
  const rows = parseComparisonManifest(
    readFileSync(join(DIR, "manifest.csv"), "utf8"),
    join(DIR, "manifest.csv"),
  );
  const r = await compareCohort(rows, {}, () => {});
  assert.equal(r.failed.length, 0, JSON.stringify(r.failed));
  const missed = r.comparisons.find((c) => c.case === "QVT-24-006")!;
  const h = missed.hotspot;
  assert.ok(h.candidate!.count < h.reference!.count, JSON.stringify(h));
  assert.ok(h.distance_um! > 500, "the hotspot moved");
  assert.ok(h.reference_count_at_candidate! < h.reference!.count);
  const good = r.comparisons.find((c) => c.case === "QVT-24-001")!;
  assert.equal(good.grade?.reference_class, good.grade?.candidate_class);
});
