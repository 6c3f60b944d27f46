/**
 * The scaling rows of `deno task bench`: whole-process `hotfield report`
 * runs on the benchmark slide grown along one axis at a time (figures,
 * outline vertices, grid stride, figures as CSV), each with its apparent
 * exponent (log of the time ratio over log of the size ratio to the row
 * before), and the default report against a bare `JSON.parse` of the same
 * file as a whole process.
 *
 * @module
 */

import { existsSync, mkdirSync, rmSync } from "node:fs";
import { join } from "node:path";
import { type ScaleFile, writeScaleFile } from "./_scale_files.ts";

/** One whole-process run. */
export interface ProcessRun {
  wallMs: number;
  rssMb: number | null;
  code: number;
  stderr: string;
}

/** How the caller runs a process and records a row. */
export interface ScalingHooks {
  /** Runs `program` (default: `deno run -A`) with `args`. */
  runProcess(args: string[], program?: string[]): Promise<ProcessRun>;
  add(step: string, value: string, target: string, pass: boolean | null, note?: string): void;
  log(s: string): void;
}

/** Debian's Python, which has the peer's packages (a user's own Python may not). */
const PEER_PYTHON = "/usr/bin/python3";

function ms(v: number): string {
  return v >= 1000 ? `${(v / 1000).toFixed(2)} s` : `${v.toFixed(v < 10 ? 2 : 0)} ms`;
}

/** Best wall time and peak memory of `repeats` runs (null when a run failed). */
async function bestOf(
  hooks: ScalingHooks,
  repeats: number,
  args: string[],
  before?: () => void,
  program?: string[],
): Promise<{ wall: number; rss: number | null; all: number[]; error?: string }> {
  const all: number[] = [];
  let rss: number | null = null;
  for (let k = 0; k < repeats; k++) {
    before?.();
    const r = await hooks.runProcess(args, program);
    if (r.code !== 0) {
      const line = r.stderr.split("\n").find((l) => l.startsWith("Cannot") || l.includes("rror"));
      return { wall: NaN, rss: null, all, error: `exit ${r.code}: ${line ?? ""}` };
    }
    all.push(r.wallMs);
    if (r.rssMb !== null) rss = Math.max(rss ?? 0, r.rssMb);
  }
  return { wall: Math.min(...all), rss, all };
}

function exponent(t0: number, t1: number, n0: number, n1: number): string {
  return (Math.log(t1 / t0) / Math.log(n1 / n0)).toFixed(2);
}

/**
 * Runs the scaling rows. Files are written to `dir` (reused when present).
 * `quick` runs each once and leaves out the 3M-figure and 1M-vertex files.
 */
export async function scalingRows(
  hooks: ScalingHooks,
  dir: string,
  seed: number,
  repeats: number,
  quick: boolean,
): Promise<void> {
  mkdirSync(dir, { recursive: true });
  const file = (figures: number, vertices: number, csv = false): ScaleFile => {
    const name = `slide_f${figures}_v${vertices}${csv ? "_csv" : ""}`;
    const geojson = join(dir, `${name}.geojson`);
    const csvPath = join(dir, `${name}.csv`);
    if (existsSync(geojson) && (!csv || existsSync(csvPath))) {
      return { name, geojson, csv: csv ? csvPath : undefined, figures, vertices };
    }
    hooks.log(`  writing ${name} …`);
    return writeScaleFile(dir, seed, figures, vertices, csv);
  };
  const out = join(dir, "report");
  const report = (f: ScaleFile, extra: string[] = []) => {
    const args = ["lib/cli.ts", "report", f.geojson, "--out", out, "--format", "json", ...extra];
    if (f.csv) args.push("--figures", f.csv);
    return bestOf(hooks, repeats, args, () => rmSync(out, { recursive: true, force: true }));
  };

  // The default report against a bare parse of the same file.
  const base = file(250_000, 20_000);
  const bare = await bestOf(hooks, repeats, ["bench/_bare_parse.ts", base.geojson]);
  const full = await report(base);
  if (bare.error || full.error) {
    hooks.add("report vs bare JSON.parse", "not available", "≤ 3×", null, bare.error ?? full.error);
  } else {
    const ratio = full.wall / bare.wall;
    hooks.add(
      "report (defaults) ÷ bare JSON.parse of the same file, whole processes",
      `${ratio.toFixed(2)}×`,
      "≤ 3×",
      ratio <= 3,
      `report ${ms(full.wall)}, peak RSS ${
        full.rss?.toFixed(0) ?? "?"
      } MB; read + decode + JSON.parse ${ms(bare.wall)}, peak RSS ${
        bare.rss?.toFixed(0) ?? "?"
      } MB; best of ${repeats}`,
    );
  }
  // The vectorised-script peer (bench/peer/grid_peer.py) on the same file.
  const peer = await bestOf(hooks, repeats, ["bench/peer/grid_peer.py", base.geojson], undefined, [
    PEER_PYTHON,
  ]);
  if (peer.error || full.error) {
    hooks.add(
      "report ÷ vectorised-script peer",
      "not available",
      "≤ 0.5×",
      null,
      `${
        peer.error ?? full.error
      }; the peer needs Debian's python3-numpy, python3-shapely, python3-pil`,
    );
  } else {
    const ratio = full.wall / peer.wall;
    hooks.add(
      "report (defaults) ÷ vectorised-script peer (grid parts only), whole processes",
      `${ratio.toFixed(2)}×`,
      "≤ 0.5×",
      ratio <= 0.5,
      `report ${ms(full.wall)}; peer ${ms(peer.wall)}, peak RSS ${
        peer.rss?.toFixed(0) ?? "?"
      } MB (Python array, geometry and imaging packages: counts on the grid, coverage from a 5 µm raster, percentiles; no exact hotspot, top windows, best field set or scan test); best of ${repeats}`,
    );
  }

  // Figures: 250k, 1M, 3M.
  const sizes = quick ? [250_000, 1_000_000] : [250_000, 1_000_000, 3_000_000];
  let prev: { n: number; wall: number } | null = null;
  for (const n of sizes) {
    const r = n === 250_000 ? full : await report(file(n, 20_000));
    if (r.error) {
      hooks.add(`report, ${n} figures`, "not available", "", null, r.error);
      continue;
    }
    const goal = n === 3_000_000;
    const rssOk = r.rss === null || r.rss < 1536;
    hooks.add(
      `report, ${n.toLocaleString("en")} figure candidates`,
      `${ms(r.wall)}, peak RSS ${r.rss?.toFixed(0) ?? "?"} MB`,
      goal ? "< 10 s, < 1.5 GB" : "",
      goal ? r.wall < 10_000 && rssOk : null,
      (prev ? `exponent ${exponent(prev.wall, r.wall, prev.n, n)} from the row before; ` : "") +
        `best of ${r.all.length}`,
    );
    prev = { n, wall: r.wall };
  }

  // Outline vertices: 20k, 200k, 1M.
  prev = null;
  for (const v of quick ? [20_000, 200_000] : [20_000, 200_000, 1_000_000]) {
    const r = v === 20_000 ? full : await report(file(250_000, v));
    if (r.error) {
      hooks.add(`report, ${v} outline vertices`, "not available", "", null, r.error);
      continue;
    }
    const goal = v === 1_000_000;
    hooks.add(
      `report, tissue outline of ${v.toLocaleString("en")} vertices`,
      `${ms(r.wall)}, peak RSS ${r.rss?.toFixed(0) ?? "?"} MB`,
      goal ? "< 5 s" : "",
      goal ? r.wall < 5000 : null,
      (prev ? `exponent ${exponent(prev.wall, r.wall, prev.n, v)} from the row before; ` : "") +
        `best of ${r.all.length}`,
    );
    prev = { n: v, wall: r.wall };
  }

  // Strides 25, 10, 5 µm (cells grow as 1/stride²).
  let s25 = NaN;
  prev = null;
  for (const s of [25, 10, 5]) {
    const r = s === 25 ? full : await report(base, ["--stride-um", String(s)]);
    if (r.error) {
      hooks.add(`report, stride ${s} µm`, "not available", "", null, r.error);
      continue;
    }
    if (s === 25) s25 = r.wall;
    const cells = 1 / (s * s);
    hooks.add(
      `report, stride ${s} µm`,
      `${ms(r.wall)}, peak RSS ${r.rss?.toFixed(0) ?? "?"} MB`,
      s === 5 ? "< 4× stride 25" : "",
      s === 5 ? r.wall < 4 * s25 : null,
      (s === 5 ? `${(r.wall / s25).toFixed(2)}× stride 25; ` : "") +
        (prev ? `exponent ${exponent(prev.wall, r.wall, prev.n, cells)} in grid cells; ` : "") +
        `best of ${r.all.length}`,
    );
    prev = { n: cells, wall: r.wall };
  }

  // Figures as CSV beside a regions-only GeoJSON.
  const csv = await report(file(250_000, 20_000, true));
  if (csv.error || full.error) {
    hooks.add("report, figures as CSV", "not available", "", null, csv.error);
  } else {
    hooks.add(
      "report, figures as CSV (vs the same as GeoJSON)",
      `${ms(csv.wall)} vs ${ms(full.wall)}`,
      "CSV < GeoJSON",
      csv.wall < full.wall,
      `best of ${csv.all.length}`,
    );
  }
}
