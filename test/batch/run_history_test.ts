import { strict as assert } from "node:assert";
import { readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { DatabaseSync } from "node:sqlite";
import { RunHistory } from "../../lib/batch/run_history.ts";
import type { CaseOutcome } from "../../lib/batch/batch_types.ts";
import { HOTFIELD_VERSION } from "../../lib/version.ts";
import { ROOT } from "./_cases.ts";

/** The ```sql blocks of README.md, in order. */
function readmeQueries(): string[] {
  const text = readFileSync(join(ROOT, "README.md"), "utf8");
  return [...text.matchAll(/```sql\n([\s\S]*?)```/g)].map((m) => m[1]);
}

function outcome(
  caseId: string | null,
  status: CaseOutcome["status"],
  cls: string | null,
): CaseOutcome {
  return {
    index: 0,
    status,
    caseId,
    seconds: 1,
    message: status === "failed" ? `problem of ${caseId ?? "a file"}` : null,
    summary: cls === null ? null : {
      hotspotCount: 5,
      perMm2: 2.1,
      positions: 10,
      scheme: "canine-mct-2tier",
      class: cls,
      tier: null,
    },
  };
}

Deno.test("README's run-history queries find this month's failures and changed classes", () => {
  const dir = Deno.makeTempDirSync();
  const path = join(dir, "runs.sqlite");
  try {
    const info = { source: "cases.csv", shard: null, workers: 2, forced: false };
    // An older version's runs: one last century (its failure is not this month's), one now.
    const old = RunHistory.open(path, info);
    old.record(outcome("QVT-24-009", "failed", null), "row 9 (i.geojson)");
    old.finish(1);
    old.close();
    const earlier = RunHistory.open(path, info);
    earlier.recordMany([
      { outcome: outcome("QVT-24-001", "ok", "below"), label: "row 2 (a.geojson)" },
      { outcome: outcome("QVT-24-002", "ok", "above"), label: "row 3 (b.geojson)" },
      { outcome: outcome(null, "failed", null), label: "row 4 (c.geojson)" },
    ]);
    earlier.finish(1);
    earlier.close();
    const db = new DatabaseSync(path);
    db.exec("UPDATE runs SET hotfield_version = '0.0.9'");
    db.exec("UPDATE runs SET started_at = '2000-01-01T02:30:00Z' WHERE run_id = 1");
    db.close();
    // This version's run.
    const now = RunHistory.open(path, info);
    now.recordMany([
      { outcome: outcome("QVT-24-001", "ok", "above"), label: "row 2 (a.geojson)" },
      { outcome: outcome("QVT-24-002", "skipped", "above"), label: "row 3 (b.geojson)" },
      { outcome: outcome("QVT-24-004", "failed", null), label: "row 5 (d.geojson)" },
    ]);
    now.finish(1);
    now.close();

    const [failures, changed] = readmeQueries();
    const read = new DatabaseSync(path, { readOnly: true });
    try {
      const f = read.prepare(failures).all().map((r) => [r.label, r.case_id]);
      assert.deepEqual(f.sort(), [["row 4 (c.geojson)", null], [
        "row 5 (d.geojson)",
        "QVT-24-004",
      ]]);
      const c = read.prepare(changed).all().map((r) => ({ ...r }));
      assert.deepEqual(c, [{
        case_id: "QVT-24-001",
        version_before: "0.0.9",
        class_before: "below",
        version_after: HOTFIELD_VERSION,
        class_after: "above",
      }]);
      const runs = read.prepare("SELECT run_id, ok, skipped, failed, exit_code FROM runs").all();
      assert.deepEqual(runs.map((r) => ({ ...r })), [
        { run_id: 1, ok: 0, skipped: 0, failed: 1, exit_code: 1 },
        { run_id: 2, ok: 2, skipped: 0, failed: 1, exit_code: 1 },
        { run_id: 3, ok: 1, skipped: 1, failed: 1, exit_code: 1 },
      ]);
    } finally {
      read.close();
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("RunHistory.open() names the file when it is not a database", () => {
  const dir = Deno.makeTempDirSync();
  try {
    const path = join(dir, "runs.sqlite");
    Deno.writeTextFileSync(
      path,
      "not a database, just text that is long enough to be read as a header",
    );
    assert.throws(
      () => RunHistory.open(path, { source: "x", shard: null, workers: 1, forced: false }),
      Error,
      `Cannot open the run history "${path}": `,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
