// Hostile input paths through the real command line (a subprocess under a time
// bound): named pipes, devices, folders and oversized files end with exit 1 and
// one line naming the path, at once, and nothing is written.

import { strict as assert } from "node:assert";
import { readdirSync, truncateSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { readCaseFile } from "../../lib/annotations/read_case.ts";

const ROOT = new URL("../../", import.meta.url).pathname;

async function cli(args: string[], cwd: string) {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "-A", join(ROOT, "lib/cli.ts"), ...args],
    cwd,
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1" },
    signal: AbortSignal.timeout(30_000),
  }).output();
  const dec = new TextDecoder();
  return { code: out.code, stdout: dec.decode(out.stdout), stderr: dec.decode(out.stderr) };
}

function mkfifo(path: string): boolean {
  try {
    return new Deno.Command("mkfifo", { args: [path] }).outputSync().success;
  } catch {
    return false;
  }
}

const GOOD = JSON.stringify({
  type: "FeatureCollection",
  slide: { id: "QVT-24-062", mpp: 0.5 },
  features: [{
    type: "Feature",
    properties: { role: "tissue" },
    geometry: { type: "Polygon", coordinates: [[[0, 0], [9000, 0], [9000, 9000], [0, 0]]] },
  }],
});

function assertRefused(
  r: { code: number; stdout: string; stderr: string },
  path: string,
  why: RegExp,
) {
  assert.equal(r.code, 1, r.stderr);
  assert.ok(r.stderr.includes(`"${path}"`), `names ${path}: ${r.stderr}`);
  assert.match(r.stderr, why);
  assert.equal(r.stderr.trim().split("\n").length, 1, `one line, no stack trace: ${r.stderr}`);
}

Deno.test("hotfield refuses named pipes, devices and folders as inputs without blocking", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    writeFileSync(join(dir, "good.geojson"), GOOD);
    const fifo = join(dir, "pipe.geojson");
    const haveFifo = mkfifo(fifo);
    if (!haveFifo) console.log("FIFO cases skipped: mkfifo is not available here");
    const out = join(dir, "out");
    const runs: [string[], string, RegExp][] = [
      [["inspect", dir], dir, /it is a folder, not a file/],
      [["inspect", "/dev/zero"], "/dev/zero", /it is a device, not a regular file/],
      [
        ["report", "good.geojson", "--out", out, "--figures", "/dev/urandom"],
        "/dev/urandom",
        /Cannot read figures CSV .*a device/,
      ],
      [
        ["inspect", "good.geojson", "--tissue-mask", dir, "--mask-mpp", "8"],
        dir,
        /Cannot read tissue mask .*a folder/,
      ],
    ];
    if (haveFifo) {
      runs.push(
        [["inspect", fifo], fifo, /named pipe \(FIFO\)/],
        [["report", fifo, "--out", out], fifo, /named pipe \(FIFO\)/],
        [["inspect", "good.geojson", "--figures", fifo], fifo, /Cannot read figures CSV .*FIFO/],
      );
      writeFileSync(
        join(dir, "QVT-24-062.case.json"),
        JSON.stringify({ hotfield_case: 1, annotations: "pipe.geojson" }),
      );
      // the case file names the pipe relative to its folder, and so does the message
      runs.push([["inspect", "QVT-24-062.case.json"], "pipe.geojson", /named pipe \(FIFO\)/]);
    }
    for (const [args, path, why] of runs) {
      const t = performance.now();
      const r = await cli(args, dir);
      assertRefused(r, path, why);
      assert.ok(performance.now() - t < 20_000, `${args.join(" ")} answered in time`);
    }
    assert.ok(!readdirSync(dir).includes("out"), "nothing written");
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield refuses an annotation file over the size limit, giving size and limit", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const big = join(dir, "QVT-24-063.geojson");
    writeFileSync(big, "");
    truncateSync(big, 600 * 1024 * 1024); // sparse: takes no disk space
    const r = await cli(["inspect", big], dir);
    assertRefused(
      r,
      big,
      /the file is 629\.1 MB, more than the limit of 524\.3 MB for annotations/,
    );
    const caseFile = join(dir, "QVT-24-063.case.json");
    writeFileSync(caseFile, "");
    truncateSync(caseFile, 2 * 1024 * 1024);
    await assert.rejects(
      readCaseFile(caseFile),
      new RegExp(
        `"${caseFile}": the file is 2\\.1 MB, more than the limit of 1\\.0 MB for case file`,
      ),
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});
