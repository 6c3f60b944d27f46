import { strict as assert } from "node:assert";
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { removeTemporaryEntries, writeCaseFolder } from "../../lib/report/case_folder.ts";

Deno.test("removeTemporaryEntries() clears what a killed run left and puts a moved-aside folder back", () => {
  const dir = Deno.makeTempDirSync();
  try {
    // Killed while staging QVT-24-001: only the staged folder is left.
    mkdirSync(join(dir, ".tmp-QVT-24-001-4242"));
    // Killed between moving QVT-24-002 aside and renaming its new folder in.
    mkdirSync(join(dir, ".tmp-QVT-24-002-4242.old"));
    writeFileSync(join(dir, ".tmp-QVT-24-002-4242.old", "report.json"), "old");
    mkdirSync(join(dir, ".tmp-QVT-24-002-4242"));
    // Killed after the rename, before the old folder was removed.
    mkdirSync(join(dir, "QVT-24-003"));
    mkdirSync(join(dir, ".tmp-QVT-24-003-4242.old"));
    // A half-written cohort file and asset.
    writeFileSync(join(dir, "cases.csv.tmp-4242-3"), "half");
    mkdirSync(join(dir, "assets"));
    writeFileSync(join(dir, "assets", "plotly.min.js.tmp-4242-0"), "half");
    const done = removeTemporaryEntries(dir);
    assert.deepEqual(done, [
      ".tmp-QVT-24-001-4242",
      ".tmp-QVT-24-002-4242",
      ".tmp-QVT-24-002-4242.old",
      ".tmp-QVT-24-003-4242.old",
      "assets/plotly.min.js.tmp-4242-0",
      "cases.csv.tmp-4242-3",
    ]);
    assert.deepEqual(readdirSync(dir).sort(), ["QVT-24-002", "QVT-24-003", "assets"]);
    assert.equal(readFileSync(join(dir, "QVT-24-002", "report.json"), "utf8"), "old");
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("writeCaseFolder() replaces a folder whole and clears the case's own leftovers only", () => {
  const dir = Deno.makeTempDirSync();
  try {
    mkdirSync(join(dir, ".tmp-QVT-24-001-1"));
    mkdirSync(join(dir, ".tmp-QVT-24-009-1"));
    writeCaseFolder(dir, "QVT-24-001", [["report.json", "{}"], ["report.html", "<p>"]]);
    writeCaseFolder(dir, "QVT-24-001", [["report.json", '{"a":1}']]);
    assert.deepEqual(readdirSync(join(dir, "QVT-24-001")), ["report.json"]);
    assert.ok(!existsSync(join(dir, ".tmp-QVT-24-001-1")));
    assert.ok(existsSync(join(dir, ".tmp-QVT-24-009-1")), "another case's leftovers stay");
    assert.throws(
      () => writeCaseFolder(dir, "../x", []),
      Error,
      'Cannot write the report of case "../x": the case id is not a safe folder name',
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
