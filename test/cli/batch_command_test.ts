import { strict as assert } from "node:assert";
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { DatabaseSync } from "node:sqlite";
import {
  caseGeoJson,
  FAST,
  listFiles,
  reportJsons,
  runCli,
  spawnCli,
  writeCases,
} from "../batch/_cases.ts";

function withDir(fn: (dir: string) => Promise<void>): () => Promise<void> {
  return async () => {
    const dir = Deno.makeTempDirSync({ prefix: "hotfield-batch-cli-" });
    try {
      await fn(dir);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  };
}

Deno.test(
  "hotfield batch: 24 cases with 2 malformed, then a rerun, then one changed input",
  withDir(async (dir) => {
    const inDir = join(dir, "in"), out = join(dir, "out");
    writeCases(inDir, 24, [7, 19]);
    const args = ["batch", inDir, "--out", out, ...FAST, "--workers", "2"];

    const first = await spawnCli(args);
    assert.equal(first.code, 1, first.err);
    assert.equal(first.lastLine, "batch: 22 ok, 0 skipped, 2 failed");
    assert.match(
      first.err,
      /hotfield batch: 2 cases failed:\n {2}\S*QVT-24-107\.geojson: Cannot read annotations "QVT-24-107\.geojson": /,
    );
    assert.match(first.err, /QVT-24-119\.geojson: Cannot read annotations "QVT-24-119\.geojson"/);
    assert.ok(!first.err.includes("    at "), "no stack trace");
    // One timestamped line per case when stdout is not a terminal.
    const caseLines = first.out.split("\n").filter((l) => /^\S+Z (ok|skipped|failed) +\S/.test(l));
    assert.equal(caseLines.length, 24);
    assert.match(caseLines[0], /^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ (ok|failed) /);

    const again = await spawnCli(args);
    assert.equal(again.code, 1);
    assert.equal(again.lastLine, "batch: 0 ok, 22 skipped, 2 failed");

    writeFileSync(join(inDir, "QVT-24-103.geojson"), caseGeoJson("QVT-24-103", 1003));
    const changed = await spawnCli(args);
    assert.equal(changed.lastLine, "batch: 1 ok, 21 skipped, 2 failed");

    // The run history, read back with SQLite.
    const db = new DatabaseSync(join(out, "runs.sqlite"), { readOnly: true });
    try {
      const runs = db.prepare(
        "SELECT run_id, ok, skipped, failed, finished_at IS NOT NULL AS done, exit_code FROM runs ORDER BY run_id",
      ).all();
      assert.deepEqual(runs.map((r) => ({ ...r })), [
        { run_id: 1, ok: 22, skipped: 0, failed: 2, done: 1, exit_code: 1 },
        { run_id: 2, ok: 0, skipped: 22, failed: 2, done: 1, exit_code: 1 },
        { run_id: 3, ok: 1, skipped: 21, failed: 2, done: 1, exit_code: 1 },
      ]);
      const failed = db.prepare(
        "SELECT case_id, label, message FROM case_runs WHERE run_id = 1 AND status = 'failed' ORDER BY label",
      ).all();
      assert.equal(failed.length, 2);
      assert.equal(failed[0].case_id, null, "the id of an unreadable case is not known");
      assert.match(String(failed[0].message), /^Cannot read annotations "QVT-24-107\.geojson"/);
      const ok = db.prepare("SELECT case_id FROM case_runs WHERE run_id = 3 AND status = 'ok'")
        .all();
      assert.deepEqual(ok.map((r) => r.case_id), ["QVT-24-103"]);
    } finally {
      db.close();
    }

    // A clean sequential run in-process gives the same files (SOURCE_DATE_EPOCH as the subprocess).
    const before = Deno.env.get("SOURCE_DATE_EPOCH");
    Deno.env.set("SOURCE_DATE_EPOCH", "1700000000");
    try {
      const clean = join(dir, "clean");
      const r = await runCli([
        "batch",
        inDir,
        "--out",
        clean,
        ...FAST,
        "--workers",
        "1",
        "--quiet",
      ]);
      assert.equal(r.lastLine, "batch: 22 ok, 0 skipped, 2 failed");
      assert.equal(r.out, "batch: 22 ok, 0 skipped, 2 failed\n", "--quiet: the closing line only");
      const files = listFiles(clean, /^runs\.sqlite/);
      assert.deepEqual(files, listFiles(out, /^runs\.sqlite/));
      for (const f of files) {
        assert.ok(
          readFileSync(join(clean, f)).equals(readFileSync(join(out, f))),
          `${f}: 2 workers and reruns differ from one clean sequential run`,
        );
      }
    } finally {
      if (before === undefined) Deno.env.delete("SOURCE_DATE_EPOCH");
      else Deno.env.set("SOURCE_DATE_EPOCH", before);
    }
  }),
);

Deno.test(
  "hotfield batch: killed with SIGKILL mid-run, the same command completes it",
  withDir(async (dir) => {
    const inDir = join(dir, "in"), out = join(dir, "out"), clean = join(dir, "clean");
    writeCases(inDir, 10);
    // Default stride and field set: slow enough per case to stop the run between cases.
    const args = ["batch", inDir, "--out", out, "--simulations", "0", "--workers", "1"];
    const { cliCommand } = await import("../batch/_cases.ts");
    const [cmd, ...rest] = cliCommand();
    const child = new Deno.Command(cmd, {
      args: [...rest, ...args],
      env: { NO_COLOR: "1", SOURCE_DATE_EPOCH: "1700000000" },
      stdout: "piped",
      stderr: "null",
    }).spawn();
    let seen = "", killed = false;
    const decoder = new TextDecoder();
    for await (const chunk of child.stdout) {
      seen += decoder.decode(chunk);
      if (!killed && (seen.match(/ ok {6}/g) ?? []).length >= 3) {
        child.kill("SIGKILL");
        killed = true;
      }
    }
    const status = await child.status;
    assert.ok(killed, "the run was stopped before its end");
    assert.equal(status.signal, "SIGKILL");
    const done = Object.keys(reportJsons(out)).length;
    assert.ok(done >= 3 && done < 10, `${done} cases done when killed`);

    const resumed = await spawnCli(args);
    assert.equal(resumed.code, 0, resumed.err);
    assert.match(resumed.lastLine, /^batch: \d+ ok, \d+ skipped, 0 failed$/);
    const [, ok, skipped] = /(\d+) ok, (\d+) skipped/.exec(resumed.lastLine)!.map(Number);
    assert.equal(ok + skipped, 10);
    assert.ok(skipped >= 3, "finished cases are not redone");
    assert.deepEqual(
      readdirSync(out).filter((n) => n.startsWith(".tmp-") || /\.tmp-\d+-\d+$/.test(n)),
      [],
      "no temporary folders left",
    );

    const fresh = await spawnCli(["batch", inDir, "--out", clean, "--simulations", "0"]);
    assert.equal(fresh.code, 0);
    assert.deepEqual(
      reportJsons(out),
      reportJsons(clean),
      "every report.json equals a clean run's",
    );
    const db = new DatabaseSync(join(out, "runs.sqlite"), { readOnly: true });
    try {
      const runs = db.prepare("SELECT finished_at FROM runs ORDER BY run_id").all();
      assert.equal(runs.length, 2);
      assert.equal(runs[0].finished_at, null, "the killed run is marked unfinished");
    } finally {
      db.close();
    }
  }),
);

Deno.test(
  "hotfield batch --shard 1/3..3/3 then hotfield cohort equals the unsharded run",
  withDir(async (dir) => {
    const inDir = join(dir, "in");
    writeCases(inDir, 7);
    const before = Deno.env.get("SOURCE_DATE_EPOCH");
    Deno.env.set("SOURCE_DATE_EPOCH", "1700000000");
    try {
      const whole = await runCli([
        "batch",
        inDir,
        "--out",
        join(dir, "whole"),
        ...FAST,
        "--workers",
        "1",
      ]);
      assert.equal(whole.lastLine, "batch: 7 ok, 0 skipped, 0 failed");
      const sizes: number[] = [];
      for (const k of [1, 2, 3]) {
        const r = await runCli([
          "batch",
          inDir,
          "--out",
          join(dir, "sharded"),
          ...FAST,
          "--workers",
          "1",
          "--shard",
          `${k}/3`,
        ]);
        assert.equal(r.code, 0, r.err);
        sizes.push(Number(/^batch: (\d+) ok/.exec(r.lastLine)![1]));
      }
      assert.deepEqual(sizes, [3, 2, 2], "7 cases in shares of 3, 2 and 2");
      assert.ok(!existsSync(join(dir, "sharded", "index.html")), "shards write case folders only");
      const merged = await runCli(["cohort", join(dir, "sharded")]);
      assert.equal(merged.code, 0, merged.err);
      assert.equal(merged.lastLine, "cohort: 7 cases");
      const files = listFiles(join(dir, "whole"), /^runs\.sqlite/);
      assert.deepEqual(files, listFiles(join(dir, "sharded"), /^runs\.sqlite/));
      for (const f of files) {
        assert.ok(
          readFileSync(join(dir, "whole", f)).equals(readFileSync(join(dir, "sharded", f))),
          `${f} differs`,
        );
      }
    } finally {
      if (before === undefined) Deno.env.delete("SOURCE_DATE_EPOCH");
      else Deno.env.set("SOURCE_DATE_EPOCH", before);
    }
  }),
);

Deno.test(
  "hotfield batch: bad options exit 2 and bad sources exit 1, nothing written",
  withDir(async (dir) => {
    const inDir = join(dir, "in"), out = join(dir, "out");
    writeCases(inDir, 1);
    const usage: [string[], string][] = [
      [
        ["--shard", "0/3"],
        'hotfield batch: Option --shard needs 1 ≤ K ≤ N (K from 1 to 3): got "0/3"\n',
      ],
      [
        ["--shard", "4/3"],
        'hotfield batch: Option --shard needs 1 ≤ K ≤ N (K from 1 to 3): got "4/3"\n',
      ],
      [
        ["--shard", "a/b"],
        'hotfield batch: Option --shard needs K/N with whole numbers 1 ≤ K ≤ N, e.g. 2/3: got "a/b"\n',
      ],
      [["--workers", "0"], 'hotfield batch: Option --workers needs a whole number ≥ 1: got "0"\n'],
      [
        ["--workers", "1.5"],
        'hotfield batch: Option --workers needs a whole number ≥ 1: got "1.5"\n',
      ],
    ];
    for (const [extra, message] of usage) {
      const r = await runCli(["batch", inDir, "--out", out, ...extra]);
      assert.equal(r.code, 2, extra.join(" "));
      assert.equal(r.err, message);
      assert.ok(!existsSync(out), "nothing written on a usage error");
    }
    assert.equal((await runCli(["batch", "--out", out])).code, 2);
    assert.equal((await runCli(["batch", inDir])).code, 2);

    // DIR that is a file.
    const file = join(dir, "taken");
    writeFileSync(file, "x");
    const r1 = await runCli(["batch", inDir, "--out", file]);
    assert.equal(r1.code, 1);
    assert.equal(
      r1.err,
      `hotfield batch: Cannot write reports to "${file}": it is a file, not a folder\n`,
    );
    assert.equal(readFileSync(file, "utf8"), "x");

    // A manifest that cannot be read: exit 1, nothing written.
    const missing = join(dir, "none.csv");
    const r2 = await runCli(["batch", missing, "--out", out]);
    assert.equal(r2.code, 1);
    assert.equal(r2.err, `hotfield batch: Cannot read manifest "${missing}": file not found\n`);
    const manifest = join(dir, "m.csv");
    writeFileSync(manifest, "annotation,id\nin/QVT-24-101.geojson,../up\n");
    const r3 = await runCli(["batch", manifest, "--out", out]);
    assert.equal(r3.code, 1);
    assert.equal(
      r3.err,
      `hotfield batch: Cannot read manifest "${manifest}": row 1, column 1: unknown column ` +
        '"annotation"; did you mean "annotations"? Known columns: annotations, case_file, id, ' +
        "figures, figures_units, tissue_mask, mask_mpp, mpp, scheme, min_score, slide\n" +
        `Cannot read manifest "${manifest}": row 1: the header needs a column "annotations" or ` +
        '"case_file": found "annotation", "id"\n' +
        `Cannot read manifest "${manifest}": row 2, column "id": case id "../up" would lead ` +
        'outside the output folder; use letters, digits, "-", "_" and "."\n',
    );
    assert.ok(!existsSync(out), "nothing written when the manifest is unreadable");
  }),
);

Deno.test(
  "hotfield batch MANIFEST: a missing file fails its row only; row settings win over options",
  withDir(async (dir) => {
    const inDir = join(dir, "in"), out = join(dir, "out");
    writeCases(inDir, 2);
    const manifest = join(dir, "cases.csv");
    writeFileSync(
      manifest,
      "annotations,id,scheme,min_score,mpp\r\n" +
        "in/QVT-24-101.geojson,,canine-mct-2tier,,\r\n" +
        "in/QVT-24-999.geojson,,,,\r\n" +
        'in/QVT-24-102.geojson,second,,0.5,"0.5,0.5"\r\n',
    );
    const r = await runCli(["batch", manifest, "--out", out, ...FAST, "--workers", "1"]);
    assert.equal(r.code, 1);
    assert.equal(r.lastLine, "batch: 2 ok, 0 skipped, 1 failed");
    assert.equal(
      r.err,
      "hotfield batch: 1 case failed:\n" +
        '  row 3 (in/QVT-24-999.geojson): Cannot read annotations "in/QVT-24-999.geojson": file not found\n',
    );
    const one = JSON.parse(readFileSync(join(out, "QVT-24-101", "report.json"), "utf8"));
    assert.equal(one.settings.scheme, "canine-mct-2tier");
    assert.deepEqual(one.provenance.inputs.map((i: { path: string }) => i.path), [
      "in/QVT-24-101.geojson",
    ]);
    const two = JSON.parse(readFileSync(join(out, "second", "report.json"), "utf8"));
    assert.equal(two.case, "second");
    assert.equal(two.settings.min_score, 0.5);
    assert.equal(two.settings.scheme, null);
  }),
);

Deno.test(
  "hotfield cohort DIR: rebuilt from the case folders; a missing DIR is exit 1",
  withDir(async (dir) => {
    const out = join(dir, "out");
    writeCases(join(dir, "in"), 2);
    await runCli(["batch", join(dir, "in"), "--out", out, ...FAST, "--workers", "1", "--quiet"]);
    rmSync(join(out, "index.html"));
    mkdirSync(join(out, ".tmp-QVT-24-101-99999"));
    mkdirSync(join(out, "stray"));
    writeFileSync(join(out, "stray", "report.json"), "{ broken");
    const r = await runCli(["cohort", out]);
    assert.equal(r.code, 0);
    assert.equal(r.lastLine, "cohort: 2 cases");
    assert.ok(existsSync(join(out, "index.html")));
    assert.ok(!existsSync(join(out, ".tmp-QVT-24-101-99999")), "temporary folder removed");
    assert.match(r.err, /^hotfield cohort: passed over \S+stray\/report\.json: not valid JSON/);
    const missing = await runCli(["cohort", join(dir, "nope")]);
    assert.equal(missing.code, 1);
    assert.equal(
      missing.err,
      `hotfield cohort: Cannot read the output folder "${join(dir, "nope")}": not found\n`,
    );
    assert.equal((await runCli(["cohort"])).code, 2);
  }),
);
