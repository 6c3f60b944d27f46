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

/**
 * Adds readers' fields to a slide's GeoJSON text: two point fields and two
 * polygon fields (a rectangle and a 64-gon, about one window in area) near
 * the tissue's centre, so the field check has work at every outline size.
 */
export function withFields(geojson: string, s: BenchSlide): string {
  const [cx, cy] = [s.slide.width / 2, s.slide.height / 2];
  const mpp = s.slide.mpp;
  const hw = 888.8 / mpp, hh = 666.6 / mpp; // a 2.37 mm² 4:3 rectangle, px
  const rect = [[cx - hw, cy - hh], [cx + hw, cy - hh], [cx + hw, cy + hh], [cx - hw, cy + hh]];
  const gon = Array.from({ length: 64 }, (_, k) => {
    const a = (2 * Math.PI * k) / 64;
    return [Math.round(cx + 4000 + 3500 * Math.cos(a)), Math.round(cy - 3000 + 3500 * Math.sin(a))];
  });
  const close = (r: number[][]) => [...r, r[0]];
  const fields = [
    { type: "Point", coordinates: [cx - 8000, cy] },
    { type: "Point", coordinates: [cx + 8000, cy + 2000] },
    { type: "Polygon", coordinates: [close(rect)] },
    { type: "Polygon", coordinates: [close(gon)] },
  ].map((geometry, k) =>
    JSON.stringify({
      type: "Feature",
      properties: { role: "field", reader: `reader-${k % 2}` },
      geometry,
    })
  );
  return geojson.replace('"features":[\n', `"features":[\n${fields.join(",\n")},\n`);
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
  fields = false,
  tissueOnly = false,
): ScaleFile {
  const s = generateBenchSlide(seed, { figures, tissueVertices: vertices });
  const name = `slide_f${figures}_v${vertices}${csv ? "_csv" : ""}${fields ? "_fields" : ""}${
    tissueOnly ? "_tissue" : ""
  }`;
  const geojson = join(dir, `${name}.geojson`);
  if (csv) {
    writeFileSync(geojson, benchSlideGeoJson(withoutFigures(s)));
    const csvPath = join(dir, `${name}.csv`);
    writeFileSync(csvPath, benchSlideCsv(s));
    return { name, geojson, csv: csvPath, figures, vertices };
  }
  const text = benchSlideGeoJson(s, { tissueOnly });
  writeFileSync(geojson, fields ? withFields(text, s) : text);
  return { name, geojson, figures, vertices };
}

if (import.meta.main) {
  const [dir, f, v, kind] = Deno.args;
  console.log(
    JSON.stringify(
      writeScaleFile(
        dir,
        2024,
        Number(f),
        Number(v),
        kind === "csv",
        kind === "fields" || kind === "fields-tissue",
        kind === "fields-tissue",
      ),
    ),
  );
}
