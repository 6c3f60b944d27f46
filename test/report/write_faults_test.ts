// All or nothing under faults: writeOutputs() on a tiny tmpfs that fills up at
// every point of a run, on a read-only file system, with a mount point in the
// way of a rename, and with folders or files where outputs go. Each case
// folder is written whole or not at all, and the cohort files together or not
// at all: after a failure every case folder holds either its old or its
// complete new content, the cohort files are as before, no temporary name is
// left, and the error names the folder. The tmpfs cases need root (mount);
// elsewhere they are skipped with a message.

import { strict as assert } from "node:assert";
import { mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { writeOutputs } from "../../lib/report/write_outputs.ts";
import { OutputTransaction, OutputWriteError } from "../../lib/io/output_transaction.ts";
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

const COHORT = [
  "assets/",
  "assets/plotly.min.js",
  "cases.csv",
  "fields.csv",
  "index.html",
  "readers.csv",
  "readers.html",
];

/** The part of a snapshot under `prefix` (a case folder, say), keys relative to it. */
function under(snap: Record<string, string>, prefix: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(snap)) {
    if (k.startsWith(prefix)) out[k.slice(prefix.length)] = v;
  }
  return out;
}

function pick(snap: Record<string, string>, keys: string[]): Record<string, string | undefined> {
  return Object.fromEntries(keys.map((k) => [k, snap[k]]));
}

Deno.test("writeOutputs() on a disk that fills up at any point leaves whole case folders and the cohort files as they were", () => {
  const fs = tmpfs(1024 * 1024);
  if (fs === null) {
    console.log("skipped: mounting a tmpfs needs root (mount failed here)");
    return;
  }
  const scratch = Deno.makeTempDirSync();
  try {
    const out = join(fs.dir, "out");
    const first = [
      fixtureResult({ caseId: "QVT-24-901" }),
      fixtureResult({ caseId: "QVT-24-902", seed: 3 }),
    ];
    // the new run replaces one case, adds one, and rewrites every cohort file
    const results = [
      fixtureResult({ caseId: "QVT-24-902", seed: 5 }),
      fixtureResult({ caseId: "QVT-24-903", seed: 9 }),
    ];
    // what the folder holds after a complete second run, written on an ordinary disk
    writeOutputs(first, scratch, OPTIONS);
    writeOutputs(results, scratch, OPTIONS);
    const after = snapshot(scratch);
    writeOutputs(first, out, OPTIONS);
    const before = snapshot(out);
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
            `^Cannot write (the report of "QVT-24-90\\d" in|the cohort files of) "${out}": no space left on the device \\(ENOSPC\\) while writing "${out}/`,
          ),
        );
        const now = snapshot(out);
        assert.ok(
          !Object.keys(now).some((k) => k.includes(".tmp-")),
          `left ${left}: no temporary names`,
        );
        for (const id of ["QVT-24-901", "QVT-24-902", "QVT-24-903"]) {
          const got = under(now, `${id}/`);
          const ok = [under(before, `${id}/`), under(after, `${id}/`)].some((want) =>
            JSON.stringify(got) === JSON.stringify(want)
          );
          assert.ok(ok, `left ${left}: ${id} is neither as before nor complete`);
        }
        assert.deepEqual(
          pick(now, COHORT),
          pick(before, COHORT),
          `left ${left}: cohort files changed`,
        );
      } finally {
        Deno.removeSync(filler);
      }
      // start each try from the first run's state
      Deno.removeSync(out, { recursive: true });
      writeOutputs(first, out, OPTIONS);
    }
    console.log(`the disk filled at ${failures} points of the run before it fit`);
    assert.ok(failures >= 3, `the disk filled at several stages (${failures})`);
    assert.equal(successes, 1, "with room enough the run completes");
    assert.deepEqual(snapshot(out), after);
  } finally {
    Deno.removeSync(scratch, { recursive: true });
    fs.close();
  }
});

Deno.test("writeOutputs() on a read-only file system fails naming the folder and changes nothing", () => {
  const fs = tmpfs(1024 * 1024);
  if (fs === null) {
    console.log("skipped: mounting a tmpfs needs root (mount failed here)");
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
          `Cannot write the report of "QVT-24-901" in "${out}": the file system is read-only (EROFS)`,
        ),
    );
    assert.deepEqual(snapshot(out), before);
    run("mount", ["-o", "remount,rw", fs.dir]);
  } finally {
    fs.close();
  }
});

Deno.test("OutputTransaction puts every target back when a rename fails midway", () => {
  // A folder that is a mount point cannot be moved aside (EBUSY): the folder
  // and file committed before it must be put back.
  const out = Deno.makeTempDirSync();
  try {
    mkdirSync(join(out, "QVT-24-901"));
    writeFileSync(join(out, "QVT-24-901", "report.json"), "old\n");
    writeFileSync(join(out, "cases.csv"), "old\n");
    mkdirSync(join(out, "QVT-24-902"));
    writeFileSync(join(out, "QVT-24-902", "keep.txt"), "a reader's note\n");
    const before = snapshot(out);
    if (!run("mount", ["--bind", join(out, "QVT-24-902"), join(out, "QVT-24-902")])) {
      console.log("skipped: a bind mount needs root (mount failed here)");
      return;
    }
    try {
      const tx = new OutputTransaction(out);
      tx.folder("QVT-24-901", [["report.json", "new\n"]]);
      tx.file("cases.csv", "new\n");
      tx.folder("QVT-24-902", [["report.json", "new\n"]]);
      assert.throws(
        () => tx.commit(),
        (e: Error) =>
          e instanceof OutputWriteError &&
          e.message.startsWith(`Cannot write reports to "${out}": `) &&
          e.message.endsWith(
            `while writing "${join(out, "QVT-24-902")}"; the folder was left as it was`,
          ),
      );
      assert.deepEqual(snapshot(out), before);
    } finally {
      run("umount", [join(out, "QVT-24-902")]);
    }
  } finally {
    Deno.removeSync(out, { recursive: true });
  }
});

Deno.test("writeOutputs() refuses a folder where a cohort file goes, and keeps the cohort files", () => {
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
          `Cannot write the cohort files of "${out}": a folder is in the way of a file (EISDIR) while writing "${out}/cases.csv"; the folder was left as it was`,
    );
    const now = snapshot(out);
    // the new case folder is whole; the cohort files, the folder in the way included, as before
    assert.ok(now["QVT-24-902/report.json"] !== undefined);
    assert.deepEqual(
      pick(now, [...COHORT, "cases.csv/", "cases.csv/mine.txt"]),
      pick(before, [...COHORT, "cases.csv/", "cases.csv/mine.txt"]),
    );
    assert.ok(!Object.keys(now).some((k) => k.includes(".tmp-")));
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
      /Cannot write the report of case "qvt-24-901" in ".*": "QVT-24-901" is already there and differs only by case/,
    );
    assert.deepEqual(snapshot(out), before);
    // the same id again simply replaces its folder
    writeOutputs([fixtureResult({ caseId: "QVT-24-901", seed: 11 })], out, OPTIONS);
  } finally {
    Deno.removeSync(out, { recursive: true });
  }
});
