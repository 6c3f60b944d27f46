// All or nothing under faults: writeOutputs() on a tiny tmpfs that fills up at
// every point of a run, on a read-only file system, with a mount point in the
// way of a rename, and with folders or files where outputs go. After each
// failure the output folder must be byte for byte as before (no partial case
// folder, no temporary names, the cohort files as they were), and the error
// must name the folder. The tmpfs cases need root (mount); elsewhere they are
// skipped with a message.

import { strict as assert } from "node:assert";
import { mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { writeOutputs } from "../../lib/report/write_outputs.ts";
import { OutputWriteError } from "../../lib/io/output_transaction.ts";
import { fixtureResult } from "./_fixture.ts";

const OPTIONS = { generatedAt: "2024-11-16T00:00:00Z", plotlyJs: "/* plotly stand-in */\n" };

/** Every file and folder under `dir` with its content, for before/after comparison. */
function snapshot(dir: string, skip: string[] = []): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string, rel: string) => {
    for (const name of readdirSync(d).sort()) {
      if (rel === "" && skip.includes(name)) continue;
      const p = join(d, name), r = rel === "" ? name : `${rel}/${name}`;
      if (statSync(p).isDirectory()) {
        out[r + "/"] = "";
        walk(p, r);
      } else out[r] = readFileSync(p, "latin1");
    }
  };
  walk(dir, "");
  return out;
}

function run(cmd: string, args: string[]): boolean {
  try {
    return new Deno.Command(cmd, { args, stdout: "null", stderr: "null" }).outputSync().success;
  } catch {
    return false;
  }
}

/** Mounts a tmpfs of `size` bytes on a new folder, or returns null (not root, no mount). */
function tmpfs(size: number): { dir: string; close: () => void } | null {
  if (Deno.uid() !== 0) return null;
  const dir = Deno.makeTempDirSync({ prefix: "hotfield-tmpfs-" });
  if (!run("mount", ["-t", "tmpfs", "-o", `size=${size}`, "tmpfs", dir])) {
    Deno.removeSync(dir);
    return null;
  }
  return {
    dir,
    close: () => {
      run("umount", [dir]);
      Deno.removeSync(dir, { recursive: true });
    },
  };
}

/** Free bytes on the file system holding `dir`. */
function freeBytes(dir: string): number {
  const out = new Deno.Command("df", { args: ["-B1", "--output=avail", dir] }).outputSync();
  return Number(new TextDecoder().decode(out.stdout).trim().split("\n")[1]);
}

Deno.test("writeOutputs() on a disk that fills up at any point leaves the folder as it was", () => {
  const fs = tmpfs(1024 * 1024);
  if (fs === null) {
    console.log("skipped: mounting a tmpfs needs root (the cases run in CI as root)");
    return;
  }
  try {
    const out = join(fs.dir, "out");
    // an earlier run: two cases and the cohort files
    writeOutputs(
      [fixtureResult({ caseId: "QVT-24-901" }), fixtureResult({ caseId: "QVT-24-902", seed: 3 })],
      out,
      OPTIONS,
    );
    const before = snapshot(out);
    // the new run replaces one case, adds one, and rewrites every cohort file
    const results = [
      fixtureResult({ caseId: "QVT-24-902", seed: 5 }),
      fixtureResult({ caseId: "QVT-24-903", seed: 9 }),
    ];
    const filler = join(fs.dir, "filler");
    const free = freeBytes(fs.dir);
    let failures = 0, successes = 0;
    // leave 0, 4 KiB, 8 KiB, … free: the disk fills at every stage of the run
    for (let left = 0; left <= free; left += 4096) {
      writeFileSync(filler, new Uint8Array(Math.max(0, free - left)));
      try {
        writeOutputs(results, out, OPTIONS);
        successes++;
        break; // enough room: the run is complete
      } catch (e) {
        failures++;
        assert.ok(e instanceof OutputWriteError, String(e));
        assert.match(
          (e as Error).message,
          new RegExp(
            `^Cannot write reports to "${out}": no space left on the device \\(ENOSPC\\) while writing "${out}/`,
          ),
        );
        assert.deepEqual(snapshot(out), before, `left ${left} bytes free: the folder changed`);
      } finally {
        Deno.removeSync(filler);
      }
    }
    console.log(`the disk filled at ${failures} points of the run before it fit`);
    assert.ok(failures >= 3, `the disk filled at several stages (${failures})`);
    assert.equal(successes, 1, "with room enough the run completes");
    assert.deepEqual(readdirSync(out).sort(), [
      "QVT-24-901",
      "QVT-24-902",
      "QVT-24-903",
      "assets",
      "cases.csv",
      "fields.csv",
      "index.html",
      "readers.csv",
      "readers.html",
    ]);
  } finally {
    fs.close();
  }
});

Deno.test("writeOutputs() on a read-only file system fails naming the folder and changes nothing", () => {
  const fs = tmpfs(1024 * 1024);
  if (fs === null) {
    console.log("skipped: mounting a tmpfs needs root");
    return;
  }
  try {
    const out = join(fs.dir, "out");
    writeOutputs([fixtureResult()], out, OPTIONS);
    const before = snapshot(out);
    assert.ok(run("mount", ["-o", "remount,ro", fs.dir]), "remount read-only");
    assert.throws(
      () => writeOutputs([fixtureResult({ seed: 2 })], out, OPTIONS),
      (e: Error) =>
        e instanceof OutputWriteError &&
        e.message.startsWith(
          `Cannot write reports to "${out}": the file system is read-only (EROFS)`,
        ),
    );
    assert.deepEqual(snapshot(out), before);
    run("mount", ["-o", "remount,rw", fs.dir]);
  } finally {
    fs.close();
  }
});

Deno.test("writeOutputs() puts every case back when a rename fails midway", () => {
  // A case folder that is a mount point cannot be moved aside (EBUSY): the
  // first case is already in place by then and must be put back.
  const fs = tmpfs(64 * 1024);
  if (fs === null) {
    console.log("skipped: mounting needs root");
    return;
  }
  const out = Deno.makeTempDirSync();
  try {
    writeOutputs([fixtureResult({ caseId: "QVT-24-901" })], out, OPTIONS);
    mkdirSync(join(out, "QVT-24-902"));
    writeFileSync(join(out, "QVT-24-902", "keep.txt"), "a reader's note\n");
    const before = snapshot(out);
    assert.ok(run("mount", ["--bind", join(out, "QVT-24-902"), join(out, "QVT-24-902")]));
    try {
      assert.throws(
        () =>
          writeOutputs(
            [
              fixtureResult({ caseId: "QVT-24-901", seed: 4 }),
              fixtureResult({ caseId: "QVT-24-902" }),
            ],
            out,
            OPTIONS,
          ),
        (e: Error) => e instanceof OutputWriteError && e.message.includes(`"${out}"`),
      );
      assert.deepEqual(snapshot(out), before);
    } finally {
      run("umount", [join(out, "QVT-24-902")]);
    }
  } finally {
    Deno.removeSync(out, { recursive: true });
    fs.close();
  }
});

Deno.test("writeOutputs() refuses a folder where a cohort file goes, before writing anything", () => {
  const out = Deno.makeTempDirSync();
  try {
    writeOutputs([fixtureResult({ caseId: "QVT-24-901" })], out, OPTIONS);
    Deno.removeSync(join(out, "cases.csv"));
    mkdirSync(join(out, "cases.csv"));
    writeFileSync(join(out, "cases.csv", "mine.txt"), "x");
    const before = snapshot(out);
    assert.throws(
      () => writeOutputs([fixtureResult({ caseId: "QVT-24-902" })], out, OPTIONS),
      (e: Error) =>
        e instanceof OutputWriteError &&
        e.message ===
          `Cannot write reports to "${out}": a folder is in the way of a file (EISDIR) while writing "${out}/cases.csv"; the folder was left as it was`,
    );
    assert.deepEqual(snapshot(out), before);
  } finally {
    Deno.removeSync(out, { recursive: true });
  }
});

Deno.test("writeOutputs() refuses reserved case ids and ids that differ only by case", () => {
  const out = Deno.makeTempDirSync();
  try {
    for (const id of ["assets", "index.html", "Cases.CSV", "runs.sqlite"]) {
      assert.throws(
        () => writeOutputs([fixtureResult({ caseId: id })], out, OPTIONS),
        new RegExp(
          `Cannot write the report of case "${
            id.replace(".", "\\.")
          }": hotfield writes a file or folder of that name`,
        ),
      );
    }
    assert.throws(
      () =>
        writeOutputs(
          [fixtureResult({ caseId: "QVT-24-901" }), fixtureResult({ caseId: "qvt-24-901" })],
          out,
          OPTIONS,
        ),
      /cases "QVT-24-901" and "qvt-24-901" differ only by case/,
    );
    writeOutputs([fixtureResult({ caseId: "QVT-24-901" })], out, OPTIONS);
    const before = snapshot(out);
    assert.throws(
      () => writeOutputs([fixtureResult({ caseId: "qvt-24-901" })], out, OPTIONS),
      /case "qvt-24-901" .*"QVT-24-901" is already there, and differs only by case/,
    );
    assert.deepEqual(snapshot(out), before);
    // the same id again simply replaces its folder
    writeOutputs([fixtureResult({ caseId: "QVT-24-901", seed: 11 })], out, OPTIONS);
  } finally {
    Deno.removeSync(out, { recursive: true });
  }
});
