// hotfield report under faults and with colliding case ids, through the real
// command line: a full disk ends with exit 1 naming the output folder and
// leaves no partial case folder and no temporary name; ids that are the
// cohort's own names are renamed with a warning; of two ids that differ only
// by case the second is refused before its folder is written.

import { strict as assert } from "node:assert";
import { readdirSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";

const ROOT = new URL("../../", import.meta.url).pathname;

async function cli(args: string[], cwd: string) {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "-A", join(ROOT, "lib/cli.ts"), "report", ...args],
    cwd,
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1", SOURCE_DATE_EPOCH: "1731715200" },
    signal: AbortSignal.timeout(60_000),
  }).output();
  const dec = new TextDecoder();
  return { code: out.code, stdout: dec.decode(out.stdout), stderr: dec.decode(out.stderr) };
}

function caseFile(dir: string, name: string, id: string): string {
  const sq = [[0, 0], [12000, 0], [12000, 12000], [0, 12000], [0, 0]];
  writeFileSync(
    join(dir, name),
    JSON.stringify({
      type: "FeatureCollection",
      slide: { id, mpp: 0.5 },
      features: [
        {
          type: "Feature",
          properties: { role: "tissue" },
          geometry: { type: "Polygon", coordinates: [sq] },
        },
        {
          type: "Feature",
          properties: { role: "figure" },
          geometry: { type: "MultiPoint", coordinates: [[6000, 6000], [6100, 6050], [1000, 1000]] },
        },
      ],
    }),
  );
  return name;
}

Deno.test("hotfield report renames case ids that are the cohort's own names, with a warning", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const files = ["assets", "index.html", "Cases.csv"].map((id, i) =>
      caseFile(dir, `c${i}.geojson`, id)
    );
    const r = await cli(
      [...files, "--out", "out", "--stride-um", "100", "--simulations", "0"],
      dir,
    );
    assert.equal(r.code, 0, r.stderr);
    assert.match(
      r.stdout,
      /warning: Case id "assets" is written "_assets": hotfield writes a file or folder named "assets" of its own beside the case folders/,
    );
    const out = join(dir, "out");
    for (const id of ["_assets", "_index.html", "_Cases.csv"]) {
      assert.ok(statSync(join(out, id)).isDirectory(), id);
    }
    for (const f of ["index.html", "cases.csv", "assets/plotly.min.js"]) {
      assert.ok(statSync(join(out, f)).isFile(), `${f} is the cohort's file`);
    }
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield report refuses the second of two case ids that differ only by case", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const a = caseFile(dir, "a.geojson", "QVT-24-070");
    const b = caseFile(dir, "b.geojson", "qvt-24-070");
    const r = await cli([a, b, "--out", "out", "--simulations", "0"], dir);
    assert.equal(r.code, 1, r.stderr);
    assert.match(
      r.stderr,
      /b\.geojson: Case id "qvt-24-070" differs only by case from "QVT-24-070", the id of a\.geojson \(one folder on a case-insensitive file system\)/,
    );
    assert.deepEqual(readdirSync(join(dir, "out", "QVT-24-070")).sort(), [
      "hotspot.geojson",
      "report.html",
      "report.json",
    ]);
    assert.ok(!readdirSync(join(dir, "out")).includes("qvt-24-070"));
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield report on a full disk exits 1 naming the folder and leaves nothing", async () => {
  const dir = Deno.makeTempDirSync();
  const disk = join(dir, "disk");
  Deno.mkdirSync(disk);
  const mounted =
    new Deno.Command("mount", { args: ["-t", "tmpfs", "-o", "size=16k", "tmpfs", disk] })
      .outputSync().success;
  if (!mounted) {
    console.log("skipped: mounting a tmpfs needs root (mount failed here)");
    Deno.removeSync(dir, { recursive: true });
    return;
  }
  try {
    const a = caseFile(dir, "a.geojson", "QVT-24-071");
    const out = join(disk, "out");
    const r = await cli(
      [a, "--out", out, "--format", "json,geojson,csv", "--simulations", "0"],
      dir,
    );
    assert.equal(r.code, 1, r.stderr);
    assert.match(
      r.stderr,
      new RegExp(
        `^hotfield report: a\\.geojson: Cannot write the report of "QVT-24-071" in "${out}": no space left on the device \\(ENOSPC\\)`,
      ),
    );
    assert.equal(r.stderr.trim().split("\n").length, 1, "one line, no stack trace");
    assert.deepEqual(readdirSync(disk), [], "no output folder, no temporary names");
  } finally {
    new Deno.Command("umount", { args: [disk] }).outputSync();
    Deno.removeSync(dir, { recursive: true });
  }
});
