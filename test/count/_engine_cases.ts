/**
 * Sixty seeded random cases for the engine's differential test: invented
 * outlines with holes, tumour and exclusions, clustered figures with mixed
 * labels and scores, reader fields, unequal mpp, and a spread of report
 * options (rectangles and circles, strides 8–50 µm, coverage limits, top-k,
 * best field sets). `engineCaseResults()` gives, per case, the report.json
 * and the unrounded hotspot, top-k, best fields, field checks and digests of
 * the count map and the valid region, so a speed change can be checked to
 * change no number at all.
 *
 * The stored results (test/fixtures/engine_differential/results.json) were
 * written before the engine's speed work, with
 * `deno run -A test/count/_engine_cases.ts --write`; rewrite them only on
 * purpose, and review the diff like code.
 *
 * @module
 */

import type { CaseData, FieldSpec, PolygonPx, Ring } from "../../lib/types.ts";
import type { Placement } from "../../lib/count/engine_types.ts";
import type { ReportOptions } from "../../lib/pipeline/case_result.ts";
import { normal, type Random, seededRandom } from "../../lib/random.ts";
import { blobRing, type Frame, randomProfile, reversed } from "../../lib/demo/_shapes.ts";
import { roundTo } from "../../lib/numbers.ts";
import { buildCaseResult } from "../../lib/pipeline/build_case_result.ts";
import { checkFields } from "../../lib/count/check_fields.ts";

/** Number of cases. */
export const ENGINE_CASES = 60;

const LABELS = ["mitotic figure", "apoptotic body", "pyknotic nucleus"];

/** One generated case and the report options it runs with. */
export interface EngineCase {
  caseData: CaseData;
  options: ReportOptions;
}

const round1 = (v: number) => roundTo(v, 1);

function pick<T>(random: Random, xs: T[]): T {
  return xs[Math.floor(random() * xs.length)];
}

function rectRing(x0: number, y0: number, x1: number, y1: number): Ring {
  return [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
}

/**
 * Case `c` (0 … 59). Cases 56–59 are larger (a 12 × 8 mm outline at fine
 * strides), so the coverage raster runs in several bands.
 */
export function engineCase(c: number): EngineCase {
  const random = seededRandom(9001 + 7919 * c);
  const large = c >= ENGINE_CASES - 4;
  const mppX = pick(random, [0.25, 0.2427, 0.5, 0.3]);
  const mppY = random() < 0.4 ? mppX * (0.8 + 0.45 * random()) : mppX;
  // Outline size in µm, then pixels.
  const rxUm = large ? 6000 : 1800 + 2500 * random();
  const ryUm = large ? 4000 : 1500 + 2000 * random();
  const frame: Frame = {
    cx: (rxUm * 1.3) / mppX,
    cy: (ryUm * 1.3) / mppY,
    rx: rxUm / mppX,
    ry: ryUm / mppY,
    rotation: random() * 3,
  };
  const nv = large ? 3000 : 40 + Math.floor(random() * 600);
  const outer = blobRing(frame, randomProfile(random, 0.25, 6), nv, { jitter: 0.01, random });
  const tissuePoly: PolygonPx = [outer];
  const nHoles = Math.floor(random() * 4);
  for (let h = 0; h < nHoles; h++) {
    const ang = 2 * Math.PI * random(), rad = 0.5 * random();
    tissuePoly.push(
      reversed(
        blobRing(frame, randomProfile(random, 0.3, 3), 12 + Math.floor(random() * 30), {
          u0: rad * Math.cos(ang),
          v0: rad * Math.sin(ang),
          scale: 0.05 + 0.08 * random(),
        }),
      ),
    );
  }
  const tissue = [{ polygons: [tissuePoly], source: `case ${c} tissue` }];
  if (random() < 0.25) {
    // A second, overlapping tissue piece: the reader's union must merge them.
    const f2: Frame = { ...frame, cx: frame.cx + frame.rx * 0.9, rx: frame.rx * 0.4 };
    tissue.push({
      polygons: [[blobRing(f2, randomProfile(random, 0.2, 4), 60, { jitter: 0.01, random })]],
      source: `case ${c} tissue 2`,
    });
  }
  const tumour = random() < 0.5
    ? [{
      polygons: [[
        blobRing(frame, randomProfile(random, 0.15, 4), 200, { scale: 0.75, jitter: 0.01, random }),
      ]],
      source: `case ${c} tumour`,
    }]
    : [];
  const exclude = [];
  const nEx = Math.floor(random() * 3);
  for (let e = 0; e < nEx; e++) {
    const ang = 2 * Math.PI * random(), rad = 0.6 * random();
    exclude.push({
      polygons: [[
        blobRing(frame, randomProfile(random, 0.2, 3), 30, {
          u0: rad * Math.cos(ang),
          v0: rad * Math.sin(ang),
          scale: 0.1 + 0.15 * random(),
        }),
      ]],
      source: `case ${c} exclude ${e}`,
      reason: pick(random, ["necrosis", "fold artefact"]),
    });
  }

  // Figures: foci plus background over the outline's box, some duplicated.
  const nFig = large ? 20_000 : 150 + Math.floor(random() * (random() < 0.2 ? 12_000 : 2500));
  const xPx = new Float64Array(nFig), yPx = new Float64Array(nFig);
  const labelIndex = new Uint32Array(nFig), score = new Float64Array(nFig);
  const foci = Array.from({ length: 1 + Math.floor(random() * 5) }, () => ({
    x: frame.cx + frame.rx * (random() - 0.5) * 1.2,
    y: frame.cy + frame.ry * (random() - 0.5) * 1.2,
    s: (80 + 700 * random()) / mppX,
  }));
  for (let k = 0; k < nFig; k++) {
    if (k > 0 && random() < 0.02) {
      xPx[k] = xPx[k - 1];
      yPx[k] = yPx[k - 1];
    } else if (random() < 0.55) {
      const f = pick(random, foci);
      xPx[k] = round1(f.x + f.s * normal(random));
      yPx[k] = round1(f.y + f.s * normal(random) * (mppX / mppY));
    } else {
      xPx[k] = round1(frame.cx + frame.rx * 1.1 * (2 * random() - 1));
      yPx[k] = round1(frame.cy + frame.ry * 1.1 * (2 * random() - 1));
    }
    const t = random();
    labelIndex[k] = t < 0.7 ? 0 : t < 0.85 ? 1 : 2;
    score[k] = random() < 0.2 ? NaN : Math.round(random() * 1000) / 1000;
  }

  const fields: FieldSpec[] = [];
  const nFields = Math.floor(random() * 5);
  for (let f = 0; f < nFields; f++) {
    const cx = round1(frame.cx + frame.rx * (random() - 0.5)),
      cy = round1(frame.cy + frame.ry * (random() - 0.5));
    const reader = pick(random, ["reader-a", "reader-b"]);
    const kind = random();
    if (kind < 0.35) {
      fields.push({ reader, kind: "point", centerPx: [cx, cy], featureIndex: f });
    } else if (kind < 0.7) {
      const hw = (600 + 400 * random()) / mppX, hh = (500 + 300 * random()) / mppY;
      const polygon: PolygonPx = random() < 0.5 ? [rectRing(cx - hw, cy - hh, cx + hw, cy + hh)] : [
        blobRing(
          { cx, cy, rx: hw, ry: hh, rotation: random() },
          randomProfile(random, 0.2, 3),
          48,
        ),
      ];
      fields.push({ reader, kind: "polygon", centerPx: [cx, cy], polygon, featureIndex: f });
    } else if (kind < 0.85) {
      // Separate areas counted together.
      const d = 900 / mppX;
      const parts: PolygonPx[] = [
        [rectRing(cx - d, cy - d / 2, cx - d / 4, cy + d / 2)],
        [rectRing(cx + d / 4, cy - d / 2, cx + d, cy + d / 2)],
      ];
      fields.push({ reader, kind: "polygons", centerPx: [cx, cy], parts, featureIndex: f });
    } else {
      // Circular microscope fields, one at each point.
      const pointsPx: [number, number][] = Array.from({ length: 1 + Math.floor(random() * 4) }, (
        _,
        k,
      ) => [round1(cx + (k * 700) / mppX), round1(cy + (k % 2) * (300 / mppY))]);
      fields.push({
        reader,
        kind: "circles",
        centerPx: [cx, cy],
        pointsPx,
        diameterMm: 0.55,
        featureIndex: f,
      });
    }
  }

  const circle = random() < 0.2;
  const options: ReportOptions = {
    shape: circle ? "circle" : "rect",
    areaMm2: pick(random, [2.37, 2.37, 1, 0.5]),
    aspect: pick(random, [[4, 3], [4, 3], [1, 1], [3, 2]] as [number, number][]),
    strideUm: large ? pick(random, [8, 10]) : pick(random, [10, 20, 25, 25, 40, 50]),
    minCoverage: pick(random, [0.95, 0.95, 0.8, 1, 0.5, 0.4]),
    top: Math.floor(random() * 5),
    bestN: pick(random, [0, 3, 10, 10]),
    fieldAreaMm2: pick(random, [0.2376, 0.2376, 0.15]),
    minScore: random() < 0.3 ? 0.4 : 0,
  };
  if (circle) delete options.aspect;
  return {
    caseData: {
      caseId: `QVT-24-${String(100 + c).padStart(3, "0")}`,
      slide: { id: `QVT-24-${String(100 + c).padStart(3, "0")}`, mppX, mppY },
      tissue,
      tumour,
      exclude,
      figures: {
        xPx,
        yPx,
        labelIndex,
        labels: LABELS,
        score,
        origin: Int32Array.from({ length: nFig }, (_, k) => k),
      },
      fields,
      sources: [],
      warnings: [],
    },
    options,
  };
}

/** FNV-1a over the bytes of typed arrays, as hex. */
function digest(...arrays: ArrayBufferView[]): string {
  let h = 0x811c9dc5;
  for (const a of arrays) {
    const b = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
    for (let i = 0; i < b.length; i++) h = Math.imul(h ^ b[i], 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, "0");
}

function raw(p: Placement) {
  return { centerUm: p.centerUm, count: p.count, coverage: p.coverage };
}

/** The unrounded results of case `c`. */
export function engineCaseResult(c: number): Record<string, unknown> {
  const { caseData, options } = engineCase(c);
  const r = buildCaseResult(caseData, options);
  const { hotfield_version: _v, inputs: _i, ...report } = r.report;
  // The histogram is long; its digest is enough.
  const histogram = digest(Int32Array.from(report.distribution.histogram ?? []));
  const distribution = { ...report.distribution, histogram };
  const checks = checkFields(r.prepared, r.map, r.hotspot, r.window);
  const flat = new Float64Array(r.prepared.validUm.flat(3) as unknown as number[]);
  return {
    case: c,
    options,
    report: { ...report, distribution },
    hotspot: r.hotspot ? raw(r.hotspot) : null,
    top: r.top.map(raw),
    bestFields: r.bestFields.map(raw),
    fields: checks.map((f) => ({ count: f.count, coverage: f.coverage, percentile: f.percentile })),
    map: {
      nx: r.map.grid.nx,
      ny: r.map.grid.ny,
      positions: r.map.positions,
      counts: digest(r.map.counts),
      coverage: digest(r.map.coverage),
      admissible: digest(r.map.admissible),
    },
    validUm: { values: flat.length, digest: digest(flat) },
    validAreaMm2: r.prepared.validAreaMm2,
  };
}

/** Where the stored results live. */
export const ENGINE_RESULTS_PATH = new URL(
  "../fixtures/engine_differential/results.json",
  import.meta.url,
);

if (import.meta.main) {
  const out: unknown[] = [];
  for (let c = 0; c < ENGINE_CASES; c++) {
    const t = performance.now();
    out.push(engineCaseResult(c));
    console.error(`case ${c}: ${(performance.now() - t).toFixed(0)} ms`);
  }
  const text = "[\n" + out.map((r) => JSON.stringify(r)).join(",\n") + "\n]\n";
  if (Deno.args.includes("--write")) {
    Deno.mkdirSync(new URL(".", ENGINE_RESULTS_PATH), { recursive: true });
    Deno.writeTextFileSync(ENGINE_RESULTS_PATH, text);
  } else console.log(text);
}
