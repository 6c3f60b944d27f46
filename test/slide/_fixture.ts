/**
 * Shared helpers of the slide tests: whether OpenSlide can be used, generated
 * slides in a temporary folder (made once per test run), exact IoU of
 * outlines, and running the command line.
 */

import { join } from "node:path";
import { main } from "../../lib/cli.ts";
import {
  type SyntheticSlide,
  type SyntheticSlideOptions,
  writeSyntheticSlide,
} from "../../lib/demo/synthetic_slide.ts";
import { multiPolygonAreaPx2 } from "../../lib/geometry/planar_area.ts";
import { polygonOverlapArea } from "../../lib/geometry/window_overlap.ts";
import type { MultiPolygonPx } from "../../lib/types.ts";

export const inCi = Deno.env.get("CI") === "true";

/** OpenSlide is installed and FFI is permitted. */
export const hasOpenSlide = (() => {
  try {
    Deno.dlopen("libopenslide.so.0", {}).close();
    return true;
  } catch {
    return false;
  }
})();

export const OPENSLIDE_HINT =
  "CI needs OpenSlide (apt-get install libopenslide0, as .ci/run does) and --allow-ffi";

if (!hasOpenSlide && !inCi) {
  console.log(
    `slide tests: OpenSlide not usable here, slide-file tests ignored. ${OPENSLIDE_HINT}`,
  );
}

/** Test options for slide-file tests: ignored only off CI when OpenSlide is missing. */
export const needsOpenSlide = { ignore: !hasOpenSlide && !inCi };

let dir: string | undefined;
/** A temporary folder for this test run, removed when the process ends. */
export function tempDir(): string {
  if (dir === undefined) {
    dir = Deno.makeTempDirSync({ prefix: "hotfield-slide-" });
    globalThis.addEventListener("unload", () => {
      try {
        Deno.removeSync(dir!, { recursive: true });
      } catch {
        // already gone
      }
    });
  }
  return dir;
}

const made = new Map<string, { path: string; slide: SyntheticSlide }>();

/** A generated slide file `name` (made once per run), with what is on it. */
export function slideFile(
  name: string,
  seed: number,
  options: SyntheticSlideOptions = {},
): { path: string; slide: SyntheticSlide } {
  const key = `${name}|${seed}|${JSON.stringify(options)}`;
  let m = made.get(key);
  if (m === undefined) {
    const path = join(tempDir(), name);
    m = { path, slide: writeSyntheticSlide(path, seed, options) };
    made.set(key, m);
  }
  return m;
}

/** Area of a ∩ b, exact (b's polygons must not overlap each other). */
export function overlapArea(a: MultiPolygonPx, b: MultiPolygonPx): number {
  return b.reduce((sum, p) => sum + polygonOverlapArea(a, p), 0);
}

/** Intersection over union of two regions, from exact polygon areas. */
export function iou(a: MultiPolygonPx, b: MultiPolygonPx): number {
  const i = overlapArea(a, b);
  return i / (multiPolygonAreaPx2(a) + multiPolygonAreaPx2(b) - i);
}

/** Runs `hotfield ARGS` and collects the exit code and text. */
export async function cli(args: string[]): Promise<{ code: number; out: string; err: string }> {
  const out: string[] = [], err: string[] = [];
  const code = await main(args, { stdout: (s) => out.push(s), stderr: (s) => err.push(s) });
  return { code, out: out.join(""), err: err.join("") };
}

/** The tissue polygons of a GeoJSON written by `hotfield tissue`. */
export function tissueOf(path: string): { fc: TissueFc; polygons: MultiPolygonPx } {
  const fc = JSON.parse(Deno.readTextFileSync(path)) as TissueFc;
  const polygons: MultiPolygonPx = [];
  for (const f of fc.features) {
    if (f.geometry.type === "Polygon") polygons.push(f.geometry.coordinates as MultiPolygonPx[0]);
    else polygons.push(...(f.geometry.coordinates as MultiPolygonPx));
  }
  return { fc, polygons };
}

/** The GeoJSON `hotfield tissue` writes. */
export interface TissueFc {
  type: string;
  slide: { id: string; mpp: [number, number]; width: number; height: number };
  features: {
    properties: { role: string; method: { steps: { step: string }[] }; [k: string]: unknown };
    geometry: { type: string; coordinates: unknown };
  }[];
}
