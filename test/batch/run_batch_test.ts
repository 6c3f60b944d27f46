import { strict as assert } from "node:assert";
import { readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { folderCases } from "../../lib/batch/case_sources.ts";
import { runBatch, type RunBatchOptions } from "../../lib/batch/run_batch.ts";
import type { BatchCase } from "../../lib/batch/batch_types.ts";
import { caseGeoJson, listFiles, writeCases } from "./_cases.ts";

const FAST = { strideUm: 250, bestN: 0 };

function withDirs(fn: (dir: string) => Promise<void>): () => Promise<void> {
  return async () => {
    const dir = Deno.makeTempDirSync({ prefix: "hotfield-batch-" });
    try {
      await fn(dir);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  };
}

async function run(cases: BatchCase[], outDir: string, extra: Partial<RunBatchOptions> = {}) {
  return await runBatch(cases, { outDir, generatedAt: "2026-01-05T02:00:00Z", ...extra });
}

Deno.test(
  "runBatch() gives a case id to the earlier case of the source; the later one fails",
  withDirs(async (dir) => {
    const inDir = join(dir, "in");
    writeCases(inDir, 4);
    // QVT-24-104.geojson claims the slide id of QVT-24-102.
    writeFileSync(join(inDir, "QVT-24-104.geojson"), caseGeoJson("QVT-24-102", 99));
    const cases = await folderCases(inDir, FAST);
    {
      const out = join(dir, "out");
      const r = await run(cases, out, { workers: 1, formats: ["json"] });
      assert.deepEqual(r.outcomes.map((o) => o.status), ["ok", "ok", "ok", "failed"]);
      assert.equal(
        r.outcomes[3].message,
        `Case id "QVT-24-102" is already the id of ${join(inDir, "QVT-24-102.geojson")}: ` +
          "give each case its own id",
      );
      const report = JSON.parse(readFileSync(join(out, "QVT-24-102", "report.json"), "utf8"));
      assert.equal(report.provenance.inputs[0].path, "QVT-24-102.geojson", "the earlier case's");
    }
  }),
);

Deno.test(
  "runBatch() skips a case only when its inputs, settings and hotfield version are unchanged",
  withDirs(async (dir) => {
    const inDir = join(dir, "in"), out = join(dir, "out");
    writeCases(inDir, 3);
    const cases = await folderCases(inDir, FAST);
    const first = await run(cases, out, { workers: 1 });
    assert.deepEqual([first.ok, first.skipped, first.failed], [3, 0, 0]);
    const again = await run(cases, out, { workers: 1 });
    assert.deepEqual([again.ok, again.skipped, again.failed], [0, 3, 0]);
    assert.equal(again.outcomes[0].summary?.hotspotCount, first.outcomes[0].summary?.hotspotCount);
    // Another setting: every case runs again.
    const other = await run(await folderCases(inDir, { ...FAST, minCoverage: 0.9 }), out);
    assert.deepEqual([other.ok, other.skipped], [3, 0]);
    // Another hotfield version in one report: that case runs again.
    const path = join(out, "QVT-24-102", "report.json");
    const report = JSON.parse(readFileSync(path, "utf8"));
    report.provenance.hotfield_version = "0.0.1";
    writeFileSync(path, JSON.stringify(report));
    const cases2 = await folderCases(inDir, { ...FAST, minCoverage: 0.9 });
    const fixed = await run(cases2, out);
    assert.deepEqual(fixed.outcomes.map((o) => o.status), ["skipped", "ok", "skipped"]);
    // --force runs everything.
    const forced = await run(cases2, out, { force: true });
    assert.deepEqual([forced.ok, forced.skipped], [3, 0]);
  }),
);

Deno.test(
  "runBatch() rebuilds the cohort files from every case folder, earlier runs included",
  withDirs(async (dir) => {
    const a = join(dir, "a"), b = join(dir, "b"), out = join(dir, "out");
    writeCases(a, 2);
    writeCases(b, 0);
    writeFileSync(join(b, "QVT-24-201.geojson"), caseGeoJson("QVT-24-201", 5));
    await run(await folderCases(a, FAST), out, { workers: 1 });
    const second = await run(await folderCases(b, FAST), out, { workers: 1 });
    assert.equal(second.ok, 1);
    const rows = parse(readFileSync(join(out, "cases.csv"), "utf8"), { columns: true }) as {
      case: string;
    }[];
    assert.deepEqual(rows.map((r) => r.case), ["QVT-24-101", "QVT-24-102", "QVT-24-201"]);
    const index = readFileSync(join(out, "index.html"), "utf8");
    assert.ok(index.includes("Cohort of 3 cases"));
    assert.ok(index.includes('href="QVT-24-101/report.html"'));
  }),
);

Deno.test(
  "runBatch() with a shard writes case folders only",
  withDirs(async (dir) => {
    writeCases(join(dir, "in"), 5);
    const cases = await folderCases(join(dir, "in"), FAST);
    const r = await run(cases, join(dir, "out"), { shard: { k: 2, n: 2 }, workers: 1 });
    assert.equal(r.cases.length, 2);
    assert.deepEqual(r.cohortFiles, []);
    assert.deepEqual(
      listFiles(join(dir, "out")).filter((f) => !f.includes("/")),
      [],
      "no cohort files at the top",
    );
  }),
);
