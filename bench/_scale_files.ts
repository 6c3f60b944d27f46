/**
 * Files for the scaling rows of `deno task bench`: the benchmark slide
 * (lib/demo/bench_slide.ts) with more figure candidates, a finer tissue
 * outline, and its figures as a CSV beside a regions-only GeoJSON.
 *
 * @module
 */

import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { type BenchSlide, benchSlideGeoJson, generateBenchSlide } from "../lib/demo/bench_slide.ts";

/** The figures of a benchmark slide as CSV text (x,y,label,score; level-0 px). */
export function benchSlideCsv(s: BenchSlide): string {
  const { xPx, yPx, labelIndex, labels, score } = s.figures;
  const parts: string[] = ["x,y,label,score"];
  for (let k = 0; k < xPx.length; k++) {
    parts.push(`${xPx[k]},${yPx[k]},${labels[labelIndex[k]]},${score[k]}`);
  }
  return parts.join("\n") + "\n";
}

/** The slide without its figures (for the CSV route). */
export function withoutFigures(s: BenchSlide): BenchSlide {
  return {
    ...s,
    figures: {
      ...s.figures,
      xPx: new Float64Array(0),
      yPx: new Float64Array(0),
      labelIndex: new Uint8Array(0),
      score: new Float64Array(0),
    },
  };
}

/** A scaling file: name, GeoJSON path, optional CSV path, and what it varies. */
export interface ScaleFile {
  name: string;
  geojson: string;
  csv?: string;
  figures: number;
  vertices: number;
}

/** Writes one variant of the benchmark slide into `dir`. */
export function writeScaleFile(
  dir: string,
  seed: number,
  figures: number,
  vertices: number,
  csv = false,
): ScaleFile {
  const s = generateBenchSlide(seed, { figures, tissueVertices: vertices });
  const name = `slide_f${figures}_v${vertices}${csv ? "_csv" : ""}`;
  const geojson = join(dir, `${name}.geojson`);
  if (csv) {
    writeFileSync(geojson, benchSlideGeoJson(withoutFigures(s)));
    const csvPath = join(dir, `${name}.csv`);
    writeFileSync(csvPath, benchSlideCsv(s));
    return { name, geojson, csv: csvPath, figures, vertices };
  }
  writeFileSync(geojson, benchSlideGeoJson(s));
  return { name, geojson, figures, vertices };
}

if (import.meta.main) {
  const [dir, f, v, csv] = Deno.args;
  console.log(JSON.stringify(writeScaleFile(dir, 2024, Number(f), Number(v), csv === "csv")));
}
