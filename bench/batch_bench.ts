/**
 * Benchmark rows of `hotfield batch` (called from run_bench.ts): 200 cases
 * of the demo's size (the six GeoJSON-only demo cases, each copied under new
 * slide ids), whole processes under GNU time when present.
 *
 * Rows: `--workers 1` against `--workers 2` (target ≥ 1.7× on 2 cores), the
 * per-case overhead of batch against one `report` call with every file, a
 * rerun with nothing changed (target < 2 s), and peak memory with 2 workers
 * (target < 1 GB).
 *
 * @module
 */

import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";

/** What run_bench.ts lends the batch rows. */
export interface BatchBenchContext {
  /** Project root. */
  root: string;
  /** bench/output. */
  out: string;
  /** Fewer cases (50) for a quick look. */
  quick: boolean;
  /** Adds a row: step, measured, target, pass (null: info), note. */
  add(step: string, value: string, target: string, pass: boolean | null, note?: string): void;
  /** Logs progress to stderr. */
  log(line: string): void;
}

const GNU_TIME = "/usr/bin/time";

async function timed(
  root: string,
  args: string[],
): Promise<{ wallMs: number; rssMb: number | null; code: number; stdout: string; stderr: string }> {
  const deno = Deno.execPath();
  const base = [deno, "run", "--allow-read", "--allow-write", "--allow-env", "lib/cli.ts", ...args];
  const useTime = existsSync(GNU_TIME);
  const cmd = new Deno.Command(useTime ? GNU_TIME : base[0], {
    args: useTime ? ["-v", ...base] : base.slice(1),
    cwd: root,
    env: { NO_COLOR: "1", SOURCE_DATE_EPOCH: "1700000000" },
  });
  const t = performance.now();
  const r = await cmd.output();
  const wallMs = performance.now() - t;
  const stderr = new TextDecoder().decode(r.stderr);
  const m = /Maximum resident set size \(kbytes\): (\d+)/.exec(stderr);
  return {
    wallMs,
    rssMb: m ? Number(m[1]) / 1024 : null,
    code: r.code,
    stdout: new TextDecoder().decode(r.stdout),
    stderr,
  };
}

function s(ms: number): string {
  return `${(ms / 1000).toFixed(2)} s`;
}

function mb(v: number | null): string {
  return v === null ? "n/a (no /usr/bin/time)" : `${v.toFixed(0)} MB`;
}

/**
 * Writes `n` demo-size cases into `dir`: the six GeoJSON-only demo cases in
 * turn, each under a new slide id `QVT-25-NNN`.
 */
function writeCohort(root: string, dir: string, n: number): string[] {
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const demo = [1, 2, 3, 4, 5, 6].map((k) =>
    JSON.parse(readFileSync(join(root, "data", "demo", `QVT-24-00${k}.geojson`), "utf8"))
  );
  const files: string[] = [];
  for (let k = 0; k < n; k++) {
    const fc = demo[k % demo.length];
    const id = `QVT-25-${String(k + 1).padStart(3, "0")}`;
    fc.slide = { ...fc.slide, id };
    const path = join(dir, `${id}.geojson`);
    writeFileSync(path, JSON.stringify(fc));
    files.push(path);
  }
  return files;
}

/**
 * How many cores this machine gives right now: two 2-second busy loops in
 * separate processes, their CPU shares (GNU time %P) summed; null without
 * GNU time. On a machine shared with other work this is below 2.
 */
async function coresFree(): Promise<number | null> {
  if (!existsSync(GNU_TIME)) return null;
  const loop = () =>
    new Deno.Command(GNU_TIME, {
      args: [
        "-f",
        "%P",
        Deno.execPath(),
        "eval",
        "const t = Date.now(); let x = 0; while (Date.now() - t < 2000) x++;",
      ],
      stderr: "piped",
    }).output();
  const runs = await Promise.all([loop(), loop()]);
  const shares = runs.map((r) => parseFloat(new TextDecoder().decode(r.stderr).trim()));
  return shares.every(Number.isFinite) ? shares.reduce((a, b) => a + b, 0) / 100 : null;
}

/**
 * Adds the batch rows to the benchmark table.
 *
 * @param ctx Root, output folder, row and log functions.
 */
export async function batchBenchRows(ctx: BatchBenchContext): Promise<void> {
  const n = ctx.quick ? 50 : 200;
  const dir = join(ctx.out, "batch");
  const cases = join(dir, "cases");
  ctx.log(`Batch: ${n} demo-size cases …`);
  const files = writeCohort(ctx.root, cases, n);
  const options = ["--simulations", "0", "--quiet"];
  const runBatch = async (workers: number, out: string, fresh: boolean) => {
    if (fresh) rmSync(out, { recursive: true, force: true });
    return await timed(ctx.root, [
      "batch",
      cases,
      "--out",
      out,
      "--workers",
      String(workers),
      ...options,
    ]);
  };
  const coresBefore = await coresFree();
  const one = await runBatch(1, join(dir, "out1"), true);
  const two = await runBatch(2, join(dir, "out2"), true);
  const coresAfter = await coresFree();
  const failed = [one, two].find((r) => r.code !== 0 || !r.stdout.includes(`batch: ${n} ok`));
  if (failed) {
    ctx.add(`batch, ${n} cases`, "failed", "", null, failed.stderr.split("\n")[0]);
    return;
  }
  const speedup = one.wallMs / two.wallMs;
  ctx.add(
    `batch ${n} demo-size cases, --workers 1, whole process`,
    s(one.wallMs),
    "",
    null,
    `${(one.wallMs / n).toFixed(0)} ms per case; peak RSS ${mb(one.rssMb)}`,
  );
  ctx.add(
    `batch ${n} demo-size cases, --workers 2, whole process`,
    s(two.wallMs),
    "",
    null,
    `${(two.wallMs / n).toFixed(0)} ms per case`,
  );
  // The target is about 2 free cores; when the machine gives fewer, say so instead of judging.
  const free = coresBefore === null || coresAfter === null
    ? null
    : Math.min(coresBefore, coresAfter);
  const judged = free === null || free >= 1.8;
  ctx.add(
    "batch speed-up, --workers 2 over --workers 1",
    `${speedup.toFixed(2)}×`,
    "≥ 1.7× on 2 cores",
    judged ? speedup >= 1.7 : null,
    `${navigator.hardwareConcurrency} cores; free cores measured before and after (two busy ` +
      `loops): ${coresBefore?.toFixed(2) ?? "n/a"} and ${coresAfter?.toFixed(2) ?? "n/a"}` +
      (judged ? "" : ": fewer than 2 free, so the target cannot be judged on this run"),
  );
  ctx.add(
    "batch peak memory, --workers 2",
    mb(two.rssMb),
    "< 1 GB",
    two.rssMb === null ? null : two.rssMb < 1024,
    "GNU time, maximum resident set size of the whole process",
  );

  const reportOut = join(dir, "out-report");
  rmSync(reportOut, { recursive: true, force: true });
  const report = await timed(ctx.root, [
    "report",
    ...files,
    "--out",
    reportOut,
    "--simulations",
    "0",
  ]);
  if (report.code !== 0) {
    ctx.add("report with every file", "failed", "", null, report.stderr.split("\n")[0]);
  } else {
    const perCase = (one.wallMs - report.wallMs) / n;
    ctx.add(
      `report with all ${n} files in one call, whole process`,
      s(report.wallMs),
      "",
      null,
      `batch --workers 1 minus this: ${perCase.toFixed(1)} ms per case (hashing, skip check, ` +
        "run history, folder staging)",
    );
  }

  const rerun = await runBatch(2, join(dir, "out2"), false);
  ctx.add(
    `batch rerun with nothing changed (${n} cases skipped), whole process`,
    s(rerun.wallMs),
    "< 2 s",
    rerun.code === 0 && rerun.stdout.includes(`batch: 0 ok, ${n} skipped`) && rerun.wallMs < 2000,
    rerun.stdout.trim().split("\n").pop() ?? "",
  );
}
