import { strict as assert } from "node:assert";
import { chmodSync, cpSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { delimiter, dirname, join } from "node:path";
import { generateDemoCohort } from "../../lib/demo/demo_cohort.ts";
import { cliCommand, listFiles, ROOT, spawnCli } from "../batch/_cases.ts";

// Outside reference: Snakemake 7.21 (Debian package `snakemake`), an independent workflow
// engine, runs one `hotfield report` job per manifest row; its report.json files must be the
// bytes `hotfield batch` writes for the same manifest (SOURCE_DATE_EPOCH, reproducible-builds.org).

const OPTIONS = ["--simulations", "0", "--best-n", "0", "--stride-um", "100"];
const ENV = { NO_COLOR: "1", SOURCE_DATE_EPOCH: "1700000000" };

/** The demo cohort copied to `dir/cases` with a manifest using every kind of row. */
function demoManifest(dir: string): string {
  const cases = join(dir, "cases");
  mkdirSync(cases, { recursive: true });
  cpSync(join(ROOT, "data", "demo"), cases, { recursive: true });
  const scheme = new Map(generateDemoCohort().map((c) => [c.caseId, c.scheme]));
  const rows = [
    "annotations,case_file,id,scheme,min_score,mpp",
    `QVT-24-001.geojson,,,${scheme.get("QVT-24-001")},,`,
    `QVT-24-002.geojson,,,${scheme.get("QVT-24-002")},,0.26`,
    `QVT-24-003.geojson,,,${scheme.get("QVT-24-003")},0.5,`,
    `QVT-24-004.geojson,,QVT-24-004-second-look,,,`,
    `QVT-24-005.geojson,,,${scheme.get("QVT-24-005")},,`,
    `QVT-24-006.geojson,,,${scheme.get("QVT-24-006")},,`,
    `,QVT-24-007.case.json,,${scheme.get("QVT-24-007")},,`,
    `,QVT-24-008.case.json,,${scheme.get("QVT-24-008")},,`,
  ];
  const path = join(cases, "manifest.csv");
  writeFileSync(path, rows.join("\r\n") + "\r\n");
  return path;
}

function sameFiles(a: string, b: string, skip: RegExp): void {
  const files = listFiles(a, skip);
  assert.deepEqual(files, listFiles(b, skip));
  assert.ok(files.filter((f) => f.endsWith("report.json")).length === 8, files.join(" "));
  for (const f of files) {
    assert.ok(readFileSync(join(a, f)).equals(readFileSync(join(b, f))), `${f} differs`);
  }
}

Deno.test("workflows/Snakefile on the demo cohort writes the reports batch writes, byte for byte", async () => {
  const dir = Deno.makeTempDirSync({ prefix: "hotfield-snakemake-" });
  try {
    const manifest = demoManifest(dir);
    const batch = await spawnCli(["batch", manifest, "--out", join(dir, "batch"), ...OPTIONS]);
    assert.equal(batch.lastLine, "batch: 8 ok, 0 skipped, 0 failed", batch.err);

    const r = await new Deno.Command("snakemake", {
      args: [
        "--cores",
        "2",
        "--quiet",
        "-s",
        join(ROOT, "workflows", "Snakefile"),
        "--directory",
        dir,
        "--config",
        `manifest=${manifest}`,
        `out=${join(dir, "snakemake")}`,
        `hotfield=${cliCommand().join(" ")}`,
        `options=${OPTIONS.join(" ")}`,
      ],
      env: { ...ENV, PATH: `${dirname(Deno.execPath())}${delimiter}${Deno.env.get("PATH")}` },
      stdout: "piped",
      stderr: "piped",
    }).output().catch((e) => {
      throw new Error(
        `Cannot run snakemake (Debian package snakemake, installed by .ci/run): ${e}`,
      );
    });
    const log = new TextDecoder().decode(r.stderr) + new TextDecoder().decode(r.stdout);
    assert.equal(r.code, 0, log);
    // Everything but the run history (batch) and the receipts (Snakemake) is the same.
    sameFiles(join(dir, "batch"), join(dir, "snakemake"), /^(runs\.sqlite|\.jobs|\.cohort\.done)/);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("workflows/slurm-array.sh: N shard tasks and a cohort job equal one batch run", async () => {
  const dir = Deno.makeTempDirSync({ prefix: "hotfield-slurm-" });
  try {
    const manifest = demoManifest(dir);
    // A stand-in for sbatch that runs each job at once, array tasks one after another.
    const bin = join(dir, "bin");
    mkdirSync(bin);
    writeFileSync(
      join(bin, "sbatch"),
      `#!/usr/bin/env bash
set -euo pipefail
array=""; wrap=""; cpus=1
for a in "$@"; do
  case "$a" in
    --array=*) array=\${a#--array=} ;;
    --wrap=*) wrap=\${a#--wrap=} ;;
    --cpus-per-task=*) cpus=\${a#--cpus-per-task=} ;;
  esac
done
echo "sbatch $*" >> "$FAKE_SBATCH_LOG"
if [ -n "$array" ]; then
  for i in $(seq "\${array%-*}" "\${array#*-}"); do
    SLURM_ARRAY_TASK_ID=$i SLURM_CPUS_PER_TASK=$cpus bash -c "$wrap" >> "$FAKE_SBATCH_LOG" 2>&1 || true
  done
else
  bash -c "$wrap" >> "$FAKE_SBATCH_LOG" 2>&1
fi
echo 4242
`,
    );
    chmodSync(join(bin, "sbatch"), 0o755);
    const log = join(dir, "sbatch.log");
    const r = await new Deno.Command("bash", {
      args: [join(ROOT, "workflows", "slurm-array.sh"), manifest, join(dir, "slurm"), "3"],
      env: {
        ...ENV,
        PATH: `${bin}${delimiter}${dirname(Deno.execPath())}${delimiter}${Deno.env.get("PATH")}`,
        HOTFIELD: cliCommand().join(" "),
        HOTFIELD_OPTIONS: OPTIONS.join(" "),
        FAKE_SBATCH_LOG: log,
      },
      stdout: "piped",
      stderr: "piped",
    }).output();
    const text = readFileSync(log, "utf8");
    assert.equal(r.code, 0, new TextDecoder().decode(r.stderr) + text);
    assert.match(text, /--array=1-3 /);
    assert.match(text, /--dependency=afterany:4242 /);
    assert.match(text, /--shard \$SLURM_ARRAY_TASK_ID\/3/);
    assert.match(text, /cohort: 8 cases/);

    const batch = await spawnCli(["batch", manifest, "--out", join(dir, "batch"), ...OPTIONS]);
    assert.equal(batch.code, 0, batch.err);
    sameFiles(join(dir, "batch"), join(dir, "slurm"), /^runs\.sqlite/);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
