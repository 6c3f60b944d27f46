/**
 * `deno task bench`: speed and memory of hotfield on an invented slide at
 * whole-slide scale (lib/demo/bench_slide.ts: 30 × 20 mm at 0.25 µm/px,
 * 250,000 figure candidates, a tissue outline of ~20,000 vertices with 40
 * holes), in one run, with the targets beside each figure.
 *
 * Writes the slide to bench/output/ (gitignored) and the table to stdout and
 * bench/output/results.md. Times on a shared 2-core machine are noisy: read
 * the ratios measured in the same run rather than single times.
 *
 * Options: `--seed N` (slide seed, default 2024), `--quick` (one repeat of
 * everything, fewer Turf windows, no 3M-figure or 1M-vertex runs),
 * `--skip-process` (no CLI runs), `--skip-scaling` (no scaling rows).
 *
 * The scaling rows (bench/_scaling.ts) run `hotfield report` on the slide
 * grown along one axis at a time — 250k/1M/3M figures, 20k/200k/1M outline
 * vertices, strides 25/10/5 µm, figures as CSV — with the apparent exponent
 * of each step, and the default report against a bare `JSON.parse`.
 *
 * @module
 */

import { existsSync, mkdirSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import booleanPointInPolygon from "@turf/boolean-point-in-polygon";
import { benchSlideGeoJson, generateBenchSlide } from "../lib/demo/bench_slide.ts";
import { batchBenchRows } from "./batch_bench.ts";
import { scalingRows } from "./_scaling.ts";
import { hostileBenchRows } from "./hostile_bench.ts";

const ROOT = join(import.meta.dirname ?? ".", "..");
const OUT = join(ROOT, "bench", "output");

interface Row {
  step: string;
  value: string;
  target: string;
  verdict: "PASS" | "MISS" | "info" | "n/a";
  note: string;
}

const rows: Row[] = [];
const log = (s: string) => console.error(s);

function ms(v: number): string {
  return v >= 1000 ? `${(v / 1000).toFixed(2)} s` : `${v.toFixed(v < 10 ? 2 : 0)} ms`;
}

function add(
  step: string,
  value: string,
  target: string,
  pass: boolean | null,
  note = "",
): void {
  const verdict = pass === null ? (target === "" ? "info" : "n/a") : pass ? "PASS" : "MISS";
  rows.push({ step, value, target, verdict, note });
  log(
    `  ${step}: ${value}${target ? ` (target ${target}: ${verdict})` : ""}${
      note ? ` — ${note}` : ""
    }`,
  );
}

function missing(step: string, target: string, why: string): void {
  rows.push({ step, value: "not available", target, verdict: "n/a", note: why });
  log(`  ${step}: not available (${why})`);
}

/** Best of `n` runs of `fn`, in ms; returns the last result too. */
function best<T>(n: number, fn: () => T): { ms: number; all: number[]; result: T } {
  const all: number[] = [];
  let result!: T;
  for (let k = 0; k < n; k++) {
    const t = performance.now();
    result = fn();
    all.push(performance.now() - t);
  }
  return { ms: Math.min(...all), all, result };
}

async function bestAsync<T>(
  n: number,
  fn: () => Promise<T>,
): Promise<{ ms: number; all: number[]; result: T }> {
  const all: number[] = [];
  let result!: T;
  for (let k = 0; k < n; k++) {
    const t = performance.now();
    result = await fn();
    all.push(performance.now() - t);
  }
  return { ms: Math.min(...all), all, result };
}

function runsNote(all: number[]): string {
  return all.length > 1 ? `best of ${all.length}: ${all.map(ms).join(", ")}` : "1 run";
}

/** Imports a module, or null (with the reason) when it is not there yet. */
async function optional<T>(load: () => Promise<T>): Promise<T | { missing: string }> {
  try {
    return await load();
  } catch (e) {
    return { missing: (e as Error).message.split("\n")[0] };
  }
}

function isMissing(m: unknown): m is { missing: string } {
  return typeof m === "object" && m !== null && "missing" in m;
}

// ---------------------------------------------------------------------------
// Whole-process runs of the CLI, under GNU time when present.

const GNU_TIME = "/usr/bin/time";

async function runProcess(
  args: string[],
  program: string[] = [Deno.execPath(), "run", "-A"],
): Promise<{ wallMs: number; rssMb: number | null; code: number; stderr: string }> {
  const useTime = existsSync(GNU_TIME);
  const all = [...program, ...args];
  const cmd = useTime
    ? new Deno.Command(GNU_TIME, { args: ["-v", ...all], cwd: ROOT })
    : new Deno.Command(all[0], { args: all.slice(1), cwd: ROOT });
  const t = performance.now();
  const out = await cmd.output();
  const wallMs = performance.now() - t;
  const stderr = new TextDecoder().decode(out.stderr);
  const m = /Maximum resident set size \(kbytes\): (\d+)/.exec(stderr);
  return { wallMs, rssMb: m ? Number(m[1]) / 1024 : null, code: out.code, stderr };
}

async function processRows(
  label: string,
  file: string,
  repeats: number,
  reportVariants: [string, string[], "info"?][],
): Promise<void> {
  const cliPresent = existsSync(join(ROOT, "lib", "cli.ts")) &&
    existsSync(join(ROOT, "lib", "cli", "inspect_command.ts"));
  if (!cliPresent) {
    missing(`hotfield inspect --json (${label}), whole process`, "< 2 s", "CLI not present");
  } else {
    const runs = [];
    for (let k = 0; k < repeats; k++) {
      runs.push(await runProcess(["lib/cli.ts", "inspect", "--json", file]));
    }
    if (runs.some((r) => r.code !== 0)) {
      missing(
        `hotfield inspect --json (${label}), whole process`,
        "< 2 s",
        `exit ${runs[0].code}: ${lastLine(runs[0].stderr)}`,
      );
    } else {
      const wall = Math.min(...runs.map((r) => r.wallMs));
      const rss = maxRss(runs);
      add(
        `hotfield inspect --json (${label}), whole process`,
        ms(wall),
        "< 2 s",
        wall < 2000,
        `${runsNote(runs.map((r) => r.wallMs))}; peak RSS ${rss}`,
      );
    }
  }
  if (!existsSync(join(ROOT, "lib", "cli", "report_command.ts"))) {
    missing(
      `hotfield report (${label}), whole process`,
      "< 2 s, < 1 GB",
      "report command not present",
    );
    return;
  }
  for (const [name, extra, info] of reportVariants) {
    const outDir = join(OUT, `report_${label.replace(/\W+/g, "_")}`);
    const runs = [];
    for (let k = 0; k < repeats; k++) {
      rmSync(outDir, { recursive: true, force: true });
      runs.push(await runProcess(["lib/cli.ts", "report", file, "--out", outDir, ...extra]));
    }
    const step = `hotfield report (${label}, ${name}), whole process`;
    if (runs.some((r) => r.code !== 0)) {
      missing(step, "< 2 s, < 1 GB", `exit ${runs[0].code}: ${lastLine(runs[0].stderr)}`);
      continue;
    }
    const wall = Math.min(...runs.map((r) => r.wallMs));
    const rssValues = runs.map((r) => r.rssMb).filter((v): v is number => v !== null);
    const rssOk = rssValues.length === 0 ? true : Math.max(...rssValues) < 1024;
    add(
      step,
      `${ms(wall)}, peak RSS ${maxRss(runs)}`,
      info ? "" : "< 2 s, < 1 GB",
      info ? null : wall < 2000 && rssOk,
      runsNote(runs.map((r) => r.wallMs)) + (info ? " (beyond the stated targets)" : ""),
    );
  }
}

/**
 * `hotfield tissue` on a generated 40,000 × 30,000 px slide at 0.25 µm/px
 * (lib/demo/synthetic_slide.ts; the two finest levels are flat tiles, so the
 * file stays small): only the level nearest 8–16 µm/px is read.
 */
async function tissueCommandRow(seed: number, repeats: number): Promise<void> {
  const step = "hotfield tissue (generated 40,000 × 30,000 px slide), whole process";
  const target = "< 2 s";
  const gen = await optional(() => import("../lib/demo/synthetic_slide.ts"));
  if (isMissing(gen) || !existsSync(join(ROOT, "lib", "cli", "tissue_command.ts"))) {
    missing(step, target, isMissing(gen) ? gen.missing : "tissue command not present");
    return;
  }
  const slidePath = join(OUT, "tissue_bench_slide.tiff");
  const made = best(1, () =>
    gen.writeSyntheticSlide(slidePath, seed, {
      id: "QVT-24-B02",
      widthPx: 40_000,
      heightPx: 30_000,
      mpp: 0.25,
    }));
  const runs = [];
  for (let k = 0; k < repeats; k++) {
    runs.push(
      await runProcess([
        "lib/cli.ts",
        "tissue",
        slidePath,
        "--out",
        join(OUT, "tissue_bench.geojson"),
      ]),
    );
  }
  rmSync(slidePath, { force: true });
  if (runs.some((r) => r.code !== 0)) {
    missing(step, target, `exit ${runs[0].code}: ${lastLine(runs[0].stderr)}`);
    return;
  }
  const wall = Math.min(...runs.map((r) => r.wallMs));
  add(
    step,
    ms(wall),
    target,
    wall < 2000,
    `${runsNote(runs.map((r) => r.wallMs))}; peak RSS ${maxRss(runs)}; slide of ${
      (made.result.bytes.length / 1e6).toFixed(1)
    } MB, ${made.result.levels.length} levels, written in ${ms(made.ms)}`,
  );
}

function maxRss(runs: { rssMb: number | null }[]): string {
  const v = runs.map((r) => r.rssMb).filter((x): x is number => x !== null);
  return v.length === 0
    ? "n/a (no /usr/bin/time; Debian package time)"
    : `${Math.max(...v).toFixed(0)} MB`;
}

function lastLine(s: string): string {
  const lines = s.trim().split("\n").filter((l) =>
    !/^\s/.test(l) && !l.startsWith("Command being")
  );
  return lines[0] ?? "";
}

// ---------------------------------------------------------------------------

async function main(): Promise<void> {
  const { values } = parseArgs({
    args: Deno.args,
    options: {
      seed: { type: "string" },
      quick: { type: "boolean" },
      "skip-process": { type: "boolean" },
      "skip-scaling": { type: "boolean" },
    },
  });
  const seed = values.seed === undefined ? 2024 : Number(values.seed);
  const quick = values.quick === true;
  const reps = quick ? 1 : 3;
  mkdirSync(OUT, { recursive: true });
  const started = new Date();

  log("Generating the benchmark slide …");
  const gen = best(1, () => generateBenchSlide(seed));
  const slide = gen.result;
  const file = join(OUT, "bench_slide.geojson");
  const fileTissue = join(OUT, "bench_slide_tissue_only.geojson");
  const text = benchSlideGeoJson(slide);
  writeFileSync(file, text);
  writeFileSync(fileTissue, benchSlideGeoJson(slide, { tissueOnly: true }));
  const holes = slide.tissue.length - 1;
  add(
    "generate slide (seeded)",
    ms(gen.ms),
    "",
    null,
    `${slide.figures.xPx.length} candidates, tissue ring ${
      slide.tissue[0].length - 1
    } vertices, ${holes} holes, ` +
      `${(text.length / 1e6).toFixed(1)} MB GeoJSON`,
  );

  if (!values["skip-process"]) {
    log("Whole-process runs …");
    // A report run takes long enough that one run each is a fair figure.
    await processRows("full", file, reps, [
      ["defaults", []],
      ["--best-n 0", ["--best-n", "0"]],
      ["--shape circle", ["--shape", "circle"], "info"],
    ]);
    await processRows("tissue only", fileTissue, reps, [["defaults", []]]);
    await batchBenchRows({ root: ROOT, out: OUT, quick, add, log });
    await hostileBenchRows({ root: ROOT, out: OUT, quick, add, log });
    await tissueCommandRow(seed, reps);
    if (!values["skip-scaling"]) {
      log("Scaling runs …");
      await scalingRows({ runProcess, add, log }, join(OUT, "scaling"), seed, reps, quick);
    }
  }

  log("In-process steps …");
  const annotations = await optional(() => import("../lib/mod.ts"));
  const geometry = await optional(() => import("../lib/mod.ts"));
  const count = await optional(() => import("../lib/mod.ts"));
  const stats = await optional(() => import("../lib/mod.ts"));

  if (isMissing(annotations) || typeof annotations.loadCase !== "function") {
    missing(
      "read case (loadCase)",
      "",
      isMissing(annotations) ? annotations.missing : "no loadCase",
    );
    return finish(started);
  }
  const read = await bestAsync(reps, () => annotations.loadCase({ annotationsPath: file }));
  const caseData = read.result;
  add("read case (loadCase: file, parse, checks)", ms(read.ms), "", null, runsNote(read.all));

  if (isMissing(geometry) || typeof geometry.buildValidRegion !== "function") {
    missing("valid region", "", isMissing(geometry) ? geometry.missing : "no buildValidRegion");
  } else {
    const vr = best(reps, () =>
      geometry.buildValidRegion({
        tissue: caseData.tissue,
        tumour: caseData.tumour,
        exclude: caseData.exclude,
      }));
    add("valid region (tissue ∩ tumour − exclude)", ms(vr.ms), "", null, runsNote(vr.all));
    if (typeof geometry.createRegionIndex === "function") {
      const { xPx, yPx } = caseData.figures;
      const pip = best(
        reps,
        () => geometry.createRegionIndex(vr.result.region).containsPoints(xPx, yPx),
      );
      let inside = 0;
      for (const v of pip.result) inside += v;
      add(
        `point-in-region, ${xPx.length} points (index + query)`,
        ms(pip.ms),
        "",
        null,
        `${inside} inside; ${runsNote(pip.all)}`,
      );
    } else missing("point-in-region", "", "no createRegionIndex");
  }

  if (isMissing(count) || typeof count.computeCountMap !== "function") {
    missing("count map", "", isMissing(count) ? count.missing : "no computeCountMap");
    return finish(started);
  }
  const prep = best(reps, () => count.prepareCase(caseData, {}));
  const prepared = prep.result;
  add(
    "prepare case (valid region, tallies, µm plane)",
    ms(prep.ms),
    "",
    null,
    `${prepared.xUm.length} counted figures; ${runsNote(prep.all)}`,
  );
  const window = count.makeWindow({});
  const cm = best(reps, () => count.computeCountMap(prepared, window, {}));
  const map = cm.result;
  const cells = map.grid.nx * map.grid.ny;
  add(
    "count map (counts + coverage, every grid centre)",
    ms(cm.ms),
    "",
    null,
    `${map.grid.nx} × ${map.grid.ny} = ${cells} centres at ${map.grid.strideUm} µm, ${map.positions} admissible; ${
      runsNote(cm.all)
    }`,
  );

  if (typeof count.findHotspot === "function") {
    const hs = best(reps, () => count.findHotspot(prepared, map));
    add(
      "exact hotspot step",
      ms(hs.ms),
      "< 300 ms",
      hs.ms < 300,
      `count ${hs.result?.count ?? "none"}; ${runsNote(hs.all)}`,
    );
  } else missing("exact hotspot step", "< 300 ms", "no findHotspot");

  if (typeof count.findTopHotspots === "function") {
    const tk = best(reps, () => count.findTopHotspots(prepared, map, 3));
    add(
      "top 3 separate windows (one search, kept between picks)",
      ms(tk.ms),
      "",
      null,
      `counts ${tk.result.map((p) => p.count).join(", ")}; ${runsNote(tk.all)}`,
    );
  }
  if (typeof count.findBestFieldSet === "function") {
    const bf = best(reps, () => count.findBestFieldSet(prepared, { n: 10 }));
    add(
      "best set of 10 circular fields (coverage bound map + one kept search)",
      ms(bf.ms),
      "",
      null,
      `total ${bf.result.total}; ${runsNote(bf.all)}`,
    );
  }

  if (typeof count.summarizeDistribution === "function") {
    const ds = best(reps, () => count.summarizeDistribution(map));
    add("distribution (five numbers, histogram)", ms(ds.ms), "", null, runsNote(ds.all));
  } else missing("distribution", "", "no summarizeDistribution");

  // Count map against a per-window loop of Turf point-in-polygon tests.
  const sample = quick ? 5 : 20;
  const admissible: number[] = [];
  for (let k = 0; k < map.admissible.length; k++) if (map.admissible[k]) admissible.push(k);
  if (admissible.length === 0 || window.shape !== "rect") {
    missing("count map vs Turf loop", "≥ 100×", "no admissible rectangle window");
  } else {
    const { xUm, yUm } = prepared;
    const hw = window.widthUm / 2, hh = window.heightUm / 2;
    let agree = 0;
    const chosen = Array.from(
      { length: sample },
      (_, s) => admissible[Math.floor((s + 0.5) * admissible.length / sample)],
    );
    const t = performance.now();
    for (const k of chosen) {
      const i = k % map.grid.nx, j = Math.floor(k / map.grid.nx);
      const cx = map.grid.x0Um + i * map.grid.strideUm, cy = map.grid.y0Um + j * map.grid.strideUm;
      const poly = {
        type: "Polygon" as const,
        coordinates: [[[cx - hw, cy - hh], [cx + hw, cy - hh], [cx + hw, cy + hh], [
          cx - hw,
          cy + hh,
        ], [
          cx - hw,
          cy - hh,
        ]]],
      };
      let n = 0;
      // Turf's test includes the boundary by default, as hotfield's closed windows do.
      for (let f = 0; f < xUm.length; f++) if (booleanPointInPolygon([xUm[f], yUm[f]], poly)) n++;
      if (n === map.counts[k]) agree++;
    }
    const perWindow = (performance.now() - t) / sample;
    const extrapolated = perWindow * cells;
    const ratio = extrapolated / cm.ms;
    add(
      "count map vs per-window Turf point-in-polygon loop",
      `${ratio.toFixed(0)}× faster`,
      "≥ 100×",
      ratio >= 100,
      `Turf ${ms(perWindow)} per window × ${cells} centres ≈ ${ms(extrapolated)} vs ${
        ms(cm.ms)
      }; ` +
        `${sample} sampled windows, ${agree}/${sample} counts agree with the map`,
    );
  }

  if (isMissing(stats) || typeof stats.scanTest !== "function") {
    missing(
      "scan test, 999 simulations",
      "< 10 s",
      isMissing(stats) ? stats.missing : "no scanTest",
    );
  } else {
    const st = best(1, () =>
      stats.scanTest(
        { validUm: prepared.validUm, totalCount: prepared.xUm.length, map, window },
        { simulations: 999, seed: 1 },
      ));
    add(
      "scan test, 999 Monte Carlo simulations",
      ms(st.ms),
      "< 10 s",
      st.ms < 10_000,
      `p = ${st.result.p.toFixed(4)}, grid step ${st.result.gridStep}; 1 run`,
    );
  }

  // Tissue-only variant: the region is the tissue alone.
  const readT = await annotations.loadCase({ annotationsPath: fileTissue });
  const prepT = count.prepareCase(readT, {});
  const cmT = best(reps, () => count.computeCountMap(prepT, window, {}));
  add(
    "count map, tissue-only variant",
    ms(cmT.ms),
    "",
    null,
    `${prepT.xUm.length} counted figures, ${cmT.result.positions} admissible; ${runsNote(cmT.all)}`,
  );
  if (typeof count.findHotspot === "function") {
    const hsT = best(reps, () => count.findHotspot(prepT, cmT.result));
    add(
      "exact hotspot step, tissue-only variant",
      ms(hsT.ms),
      "< 300 ms",
      hsT.ms < 300,
      runsNote(hsT.all),
    );
  }
  // How the hotspot step scales with the number of counted figures: the
  // same slide counting only high-scoring figures.
  if (typeof count.findHotspot === "function") {
    const prepHi = count.prepareCase(caseData, { minScore: 0.9 });
    const cmHi = count.computeCountMap(prepHi, window, {});
    const hsHi = best(reps, () => count.findHotspot(prepHi, cmHi));
    add(
      "exact hotspot step, only score ≥ 0.9 counted",
      ms(hsHi.ms),
      "",
      null,
      `${prepHi.xUm.length} counted figures, hotspot count ${hsHi.result?.count ?? "none"}; ${
        runsNote(hsHi.all)
      }`,
    );
  }
  await compareRows(caseData, reps);
  finish(started);
}

/**
 * `hotfield compare` at whole-slide scale: the benchmark slide's 250,000
 * candidates (as they are: mixed labels and scores) against 20,000 invented
 * reference figures (seeded: counted candidates inside the valid region,
 * moved by a normal error of 2 µm per axis).
 */
async function compareRows(
  caseData: import("../lib/types.ts").CaseData,
  reps: number,
): Promise<void> {
  const compare = await optional(() => import("../lib/mod.ts"));
  if (isMissing(compare)) {
    missing("compare: 101 thresholds with hotspots", "< 10 s", compare.missing);
    return;
  }
  const { prepareCase } = await import("../lib/count/prepare_case.ts");
  const { createRegionIndex } = await import("../lib/geometry/region_index.ts");
  const { normal, seededRandom } = await import("../lib/random.ts");
  const prepared = prepareCase(caseData, {});
  const f = caseData.figures;
  const inside = createRegionIndex(prepared.validPx).containsPoints(f.xPx, f.yPx);
  const pool: number[] = [];
  const mitotic = f.labels.indexOf("mitotic figure");
  for (let k = 0; k < f.xPx.length; k++) if (inside[k] && f.labelIndex[k] === mitotic) pool.push(k);
  const random = seededRandom(13);
  for (let k = pool.length - 1; k > 0; k--) {
    const j = Math.floor(random() * (k + 1));
    [pool[k], pool[j]] = [pool[j], pool[k]];
  }
  const chosen = pool.slice(0, 20_000);
  const { mppX, mppY } = caseData.slide;
  const n = chosen.length;
  const reference = {
    ...caseData,
    figures: {
      xPx: Float64Array.from(chosen, (k) => f.xPx[k] + (normal(random) * 2) / mppX),
      yPx: Float64Array.from(chosen, (k) => f.yPx[k] + (normal(random) * 2) / mppY),
      labelIndex: new Uint32Array(n),
      labels: ["mitotic figure"],
      score: new Float64Array(n).fill(NaN),
      origin: Int32Array.from(chosen),
    },
  };
  const first = compare.compareCase(reference, { figures: f }, { matching: "optimal" });
  const cand = first.candidates, ref = first.reference;
  for (const mode of ["optimal", "greedy"] as const) {
    const m = best(reps, () => compare.matchFigures(ref, cand, { mode }));
    add(
      `compare: matching alone (${mode}), ${cand.xUm.length} candidates × ${ref.xUm.length} reference figures`,
      ms(m.ms),
      "< 1 s",
      m.ms < 1000,
      `tp ${m.result.tp}, fp ${m.result.fp}, fn ${m.result.fn}, and true positives at every rank; ${
        runsNote(m.all)
      }`,
    );
  }
  for (const mode of ["optimal", "greedy"] as const) {
    const c = best(
      mode === "optimal" ? reps : 1,
      () =>
        compare.compareCase(reference, { figures: f }, {
          matching: mode,
          scheme: "canine-mct-2tier",
        }),
    );
    const j = c.result.json;
    const distinct = new Set(j.curve.map((p) => p.candidate)).size;
    add(
      `compare: all 101 thresholds with their exact hotspots (${mode}), whole comparison`,
      ms(c.ms),
      "< 10 s",
      c.ms < 10_000,
      `${f.xPx.length} candidates (${cand.xUm.length} counted in the valid region), ${ref.xUm.length} reference figures; ` +
        `${distinct} distinct candidate sets; hotspot ${j.hotspot.reference?.count} → ${j.hotspot.candidate?.count}; ` +
        `AP ${j.average_precision}; ${runsNote(c.all)}`,
    );
  }
}

function gitCommit(): string {
  try {
    const out = new Deno.Command("git", { args: ["rev-parse", "--short", "HEAD"], cwd: ROOT })
      .outputSync();
    const rev = new TextDecoder().decode(out.stdout).trim();
    return out.code === 0 && rev ? `commit ${rev}` : "commit unknown";
  } catch {
    return "commit unknown";
  }
}

function finish(started: Date): void {
  const lines = [
    `# hotfield benchmark`,
    "",
    `Run ${started.toISOString()} at ${gitCommit()}, Deno ${Deno.version.deno}, ${navigator.hardwareConcurrency} cores. ` +
    "Invented slide from lib/demo/bench_slide.ts (30 × 20 mm at 0.25 µm/px, 120,000 × 80,000 px). " +
    "Times on a shared machine are noisy; compare ratios within one run. " +
    'The slide is a stress case: with every candidate labelled "mitotic figure" counted ' +
    "(the default, no minimum score) its densest window holds thousands of figures, far more " +
    "than real tissue; the row with only score ≥ 0.9 counted is nearer real densities.",
    "",
    "| step | measured | target | verdict | notes |",
    "| --- | --- | --- | --- | --- |",
    ...rows.map((r) =>
      `| ${r.step} | ${r.value} | ${r.target || "—"} | ${r.verdict} | ${r.note} |`
    ),
    "",
  ];
  const md = lines.join("\n");
  writeFileSync(join(OUT, "results.md"), md);
  console.log(md);
  console.log(`Written to ${join("bench", "output", "results.md")}`);
}

await main();
