/**
 * Small invented cases for the batch tests: a rectangle of tissue with a few
 * seeded figure points, fast to report with a coarse stride.
 *
 * @module
 */

import { existsSync, mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { seededRandom } from "../../lib/random.ts";

/** The project root. */
export const ROOT = fileURLToPath(new URL("../../", import.meta.url));

/** Fast report options: coarse grid, no best field set, no scan test. */
export const FAST = ["--stride-um", "250", "--best-n", "0", "--simulations", "0"];

/**
 * The GeoJSON text of an invented case: 4 × 3 mm of tissue at 0.5 µm/px and
 * `figures` points placed by `seed`.
 */
export function caseGeoJson(id: string, seed: number, figures = 12): string {
  const random = seededRandom(seed);
  const w = 8000, h = 6000;
  const points: [number, number][] = [];
  for (let k = 0; k < figures; k++) {
    points.push([Math.round(500 + random() * (w - 1000)), Math.round(500 + random() * (h - 1000))]);
  }
  return JSON.stringify({
    type: "FeatureCollection",
    slide: { id, mpp: 0.5 },
    features: [
      {
        type: "Feature",
        properties: { role: "tissue" },
        geometry: { type: "Polygon", coordinates: [[[0, 0], [w, 0], [w, h], [0, h], [0, 0]]] },
      },
      {
        type: "Feature",
        properties: { role: "figure" },
        geometry: { type: "MultiPoint", coordinates: points },
      },
    ],
  });
}

/**
 * Writes `n` cases `QVT-24-1NN.geojson` into `dir` (ids QVT-24-101…); the
 * cases listed in `malformed` get text that is not JSON.
 *
 * @returns The file names written.
 */
export function writeCases(dir: string, n: number, malformed: number[] = []): string[] {
  mkdirSync(dir, { recursive: true });
  const names: string[] = [];
  for (let k = 1; k <= n; k++) {
    const id = `QVT-24-${String(100 + k)}`;
    const name = `${id}.geojson`;
    writeFileSync(
      join(dir, name),
      malformed.includes(k) ? '{"type": "FeatureCollection",' : caseGeoJson(id, k),
    );
    names.push(name);
  }
  return names;
}

/** Every file under `dir` (relative paths, sorted), skipping names that `skip` matches. */
export function listFiles(dir: string, skip: RegExp = /^$/): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d).sort()) {
      const p = join(d, name);
      if (skip.test(relative(dir, p))) continue;
      if (statSync(p).isDirectory()) walk(p);
      else out.push(relative(dir, p));
    }
  };
  if (existsSync(dir)) walk(dir);
  return out;
}

/** The report.json files of `dir`, keyed by case folder, as text. */
export function reportJsons(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const f of listFiles(dir)) {
    if (f.endsWith("/report.json")) out[f] = readFileSync(join(dir, f), "utf8");
  }
  return out;
}

/** Runs the CLI in-process and collects its output. */
export async function runCli(
  args: string[],
): Promise<{ code: number; out: string; err: string; lastLine: string }> {
  const { main } = await import("../../lib/cli.ts");
  const out: string[] = [], err: string[] = [];
  const code = await main(args, { stdout: (s) => out.push(s), stderr: (s) => err.push(s) });
  const text = out.join("");
  const lines = text.trimEnd().split("\n");
  return { code, out: text, err: err.join(""), lastLine: lines[lines.length - 1] };
}

/** The deno command line that runs the CLI in a subprocess. */
export function cliCommand(): string[] {
  return [
    Deno.execPath(),
    "run",
    "--allow-read",
    "--allow-write",
    "--allow-env",
    "--config",
    join(ROOT, "deno.json"),
    join(ROOT, "lib", "cli.ts"),
  ];
}

/** Runs the CLI in a subprocess (`deno run`, so Web Workers start without a type check). */
export async function spawnCli(
  args: string[],
  options: { env?: Record<string, string>; cwd?: string } = {},
): Promise<{ code: number; out: string; err: string; lastLine: string }> {
  const [cmd, ...rest] = cliCommand();
  const r = await new Deno.Command(cmd, {
    args: [...rest, ...args],
    env: { NO_COLOR: "1", SOURCE_DATE_EPOCH: "1700000000", ...options.env },
    cwd: options.cwd,
    stdout: "piped",
    stderr: "piped",
  }).output();
  const out = new TextDecoder().decode(r.stdout);
  const lines = out.trimEnd().split("\n");
  return {
    code: r.code,
    out,
    err: new TextDecoder().decode(r.stderr),
    lastLine: lines[lines.length - 1],
  };
}
