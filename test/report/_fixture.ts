/**
 * A hand-built engine result (plain data) for the report tests, independent
 * of the count engine: a rectangular valid region with one rectangular
 * exclusion, seeded figures, counts by brute force and coverage by exact
 * rectangle overlap (hand-checkable geometry).
 *
 * @module
 */

import type { Placement, RectWindow } from "../../lib/count/engine_types.ts";
import type { CaseResult } from "../../lib/pipeline/case_result.ts";
import type { ReportJson } from "../../lib/pipeline/report_types.ts";
import type { MultiPolygonPx } from "../../lib/types.ts";
import { seededRandom } from "../../lib/random.ts";

/** Options of {@linkcode fixtureResult}. */
export interface FixtureOptions {
  caseId?: string;
  readers?: [string, string];
  reason?: string;
  warnings?: string[];
  /** Shrink the valid region below the window so no position is admissible. */
  noAdmissible?: boolean;
  /** Add classification and uncertainty blocks. */
  standards?: boolean;
  seed?: number;
}

function rectOverlap(
  a: [number, number, number, number],
  b: [number, number, number, number],
): number {
  const w = Math.min(a[2], b[2]) - Math.max(a[0], b[0]);
  const h = Math.min(a[3], b[3]) - Math.max(a[1], b[1]);
  return w > 0 && h > 0 ? w * h : 0;
}

function rectPx(r: [number, number, number, number], mpp: number): MultiPolygonPx {
  const [x0, y0, x1, y1] = r.map((v) => v / mpp);
  return [[[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]]];
}

/** Builds the fixture result. */
export function fixtureResult(options: FixtureOptions = {}): CaseResult {
  const caseId = options.caseId ?? "QVT-24-901";
  const readers = options.readers ?? ["reader-a", "trainee-2"];
  const mpp = 0.25;
  // Hand-checkable: a 4:3 rectangle of 2.37 mm² is 1777.6 × 1333.2 µm (STYLE.md).
  const window: RectWindow = {
    shape: "rect",
    areaMm2: 2.37,
    widthUm: 1777.6,
    heightUm: 1333.2,
    aspect: [4, 3],
  };
  const valid: [number, number, number, number] = options.noAdmissible
    ? [0, 0, 1200, 1000]
    : [0, 0, 8000, 6000];
  const excl: [number, number, number, number] = [5000, 1000, 6500, 2500];
  const rnd = seededRandom(options.seed ?? 7);
  const xs: number[] = [], ys: number[] = [];
  const inValid = (x: number, y: number) =>
    x >= valid[0] && x <= valid[2] && y >= valid[1] && y <= valid[3] &&
    !(x > excl[0] && x < excl[2] && y > excl[1] && y < excl[3]);
  for (let k = 0; k < 160; k++) {
    const x = rnd() * valid[2], y = rnd() * valid[3];
    if (inValid(x, y)) xs.push(x), ys.push(y);
  }
  for (let k = 0; k < 40; k++) {
    const x = 2400 + (rnd() - 0.5) * 1400, y = 4000 + (rnd() - 0.5) * 1100;
    if (inValid(x, y)) xs.push(x), ys.push(y);
  }
  const stride = 100;
  const hw = window.widthUm / 2, hh = window.heightUm / 2;
  const x0 = 0, y0 = 0;
  const nx = 81, ny = 61;
  const counts = new Int32Array(nx * ny);
  const coverage = new Float32Array(nx * ny);
  const admissible = new Uint8Array(nx * ny);
  const area = window.widthUm * window.heightUm;
  let positions = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const cx = x0 + i * stride, cy = y0 + j * stride;
      const w: [number, number, number, number] = [cx - hw, cy - hh, cx + hw, cy + hh];
      const cov = (rectOverlap(w, valid) - rectOverlap(w, excl)) / area;
      let c = 0;
      for (let k = 0; k < xs.length; k++) {
        if (xs[k] >= w[0] && xs[k] <= w[2] && ys[k] >= w[1] && ys[k] <= w[3]) c++;
      }
      const idx = j * nx + i;
      counts[idx] = c;
      coverage[idx] = cov;
      if (cov >= 0.95) {
        admissible[idx] = 1;
        positions++;
      }
    }
  }
  const placementAt = (idx: number): Placement => {
    const cx = x0 + (idx % nx) * stride, cy = y0 + Math.floor(idx / nx) * stride;
    return {
      centerUm: [cx, cy],
      centerPx: [cx / mpp, cy / mpp],
      count: counts[idx],
      coverage: coverage[idx],
      perMm2: counts[idx] / window.areaMm2,
    };
  };
  const order: number[] = [];
  for (let k = 0; k < counts.length; k++) if (admissible[k]) order.push(k);
  order.sort((a, b) => counts[b] - counts[a] || a - b);
  const top: Placement[] = [];
  for (const k of order) {
    const p = placementAt(k);
    if (
      top.every((q) =>
        Math.abs(q.centerUm[0] - p.centerUm[0]) >= window.widthUm ||
        Math.abs(q.centerUm[1] - p.centerUm[1]) >= window.heightUm
      )
    ) top.push(p);
    if (top.length === 3) break;
  }
  const hotspot = top[0] ?? null;
  const admissibleCounts = order.map((k) => counts[k]).sort((a, b) => a - b);
  const q = (p: number) => {
    if (admissibleCounts.length === 0) return null;
    const h = (admissibleCounts.length - 1) * p;
    const lo = Math.floor(h);
    return admissibleCounts[lo] +
      (h - lo) * ((admissibleCounts[Math.min(lo + 1, admissibleCounts.length - 1)]) -
          admissibleCounts[lo]);
  };
  const fieldsAt: [number, number][] = [[2400, 4000], [6000, 4500]];
  const fieldIdx = fieldsAt.map(([x, y]) => (y / stride) * nx + x / stride);
  const percentile = (c: number) => {
    if (admissibleCounts.length === 0) return null;
    const below = admissibleCounts.filter((v) => v < c).length;
    const equal = admissibleCounts.filter((v) => v === c).length;
    return (100 * (below + equal / 2)) / admissibleCounts.length;
  };
  const warnings = [...(options.warnings ?? [])];
  if (!hotspot) {
    warnings.push(
      "No admissible window position: the valid region (1.2 mm²) is smaller than the window (2.37 mm²)",
    );
  }
  const report: ReportJson = {
    schema: "hotfield.report/1",
    case: caseId,
    window: { shape: "rect", area_mm2: 2.37, width_um: 1777.6, height_um: 1333.2, aspect: [4, 3] },
    settings: {
      stride_um: stride,
      min_coverage: 0.95,
      min_score: 0,
      count_labels: ["mitotic figure"],
      top_k: 3,
    },
    valid_area_mm2: ((valid[2] - valid[0]) * (valid[3] - valid[1]) -
      (options.noAdmissible ? 0 : rectOverlap(excl, valid))) / 1e6,
    figures: {
      total: xs.length + 5,
      counted: xs.length,
      outside_valid: 5,
      below_score: 0,
      by_label: { "mitotic figure": xs.length + 5 },
    },
    hotspot: hotspot
      ? {
        center_px: hotspot.centerPx,
        count: hotspot.count,
        coverage: hotspot.coverage,
        per_mm2: hotspot.perMm2,
        center_um: hotspot.centerUm,
      }
      : null,
    distribution: {
      positions,
      min: admissibleCounts[0] ?? null,
      q1: q(0.25),
      median: q(0.5),
      q3: q(0.75),
      max: admissibleCounts.at(-1) ?? null,
      mean: admissibleCounts.length
        ? admissibleCounts.reduce((a, b) => a + b, 0) / admissibleCounts.length
        : null,
      quantile_method: "R-7 (linear interpolation)",
    },
    fields: hotspot
      ? fieldIdx.map((idx, k) => ({
        reader: readers[k],
        kind: "point" as const,
        center_px: [fieldsAt[k][0] / mpp, fieldsAt[k][1] / mpp] as [number, number],
        count: counts[idx],
        coverage: coverage[idx],
        percentile: percentile(counts[idx]),
        shortfall: hotspot.count - counts[idx],
        feature_index: 10 + k,
      }))
      : [],
    classification: options.standards
      ? {
        scheme: "canine-mct-2tier",
        cutoff: 7,
        class: "field-dependent",
        fraction_at_or_above: 0.2,
        tier: "high",
        cutoff_rule: "≥",
        cutoff_for_window: 7,
        min_count_for_window: 7,
      }
      : null,
    uncertainty: options.standards
      ? {
        count_ci95: [5.5, 18.2],
        per_mm2_ci95: [2.3, 7.7],
        p_other_side: 0.04,
        scan_p: 0.01,
        simulations: 99,
      }
      : null,
    warnings,
    hotfield_version: "0.1.0",
    inputs: [{
      kind: "annotations",
      path: `data/${caseId}.geojson`,
      sha256: "0".repeat(63) + "1",
    }],
    mpp: [mpp, mpp],
    top: top.map((p, i) => ({
      center_px: p.centerPx,
      count: p.count,
      coverage: p.coverage,
      per_mm2: p.perMm2,
      rank: i + 1,
    })),
  };
  return {
    report,
    prepared: {
      caseId,
      slide: { id: caseId, mppX: mpp, mppY: mpp },
      validUm: [],
      validPx: options.noAdmissible ? rectPx(valid, mpp) : [[
        rectPx(valid, mpp)[0][0],
        rectPx(excl, mpp)[0][0].slice().reverse() as [number, number][],
      ]],
      validAreaMm2: report.valid_area_mm2,
      areasMm2: { tissue: 48, tumour: 0, excluded: 2.25, valid: report.valid_area_mm2 },
      xUm: new Float64Array(xs),
      yUm: new Float64Array(ys),
      tally: {
        total: xs.length + 5,
        counted: xs.length,
        outside_valid: 5,
        below_score: 0,
        by_label: {},
      },
      fields: report.fields.map((f, k) => ({
        reader: f.reader,
        kind: "point" as const,
        centerPx: f.center_px,
        featureIndex: 10 + k,
      })),
      excludePx: [{ polygons: rectPx(excl, mpp), reason: options.reason ?? "necrosis" }],
      minScore: 0,
      countLabels: ["mitotic figure"],
      warnings: [],
    },
    window,
    map: {
      grid: { x0Um: x0, y0Um: y0, strideUm: stride, nx, ny },
      window,
      counts,
      coverage,
      admissible,
      minCoverage: 0.95,
      positions,
      discretization: `Window centres on a ${stride} µm grid`,
    },
    hotspot,
    top,
    bestFields: [],
    bestFieldWindow: null,
    caseData: {
      caseId,
      slide: { id: caseId, mppX: mpp, mppY: mpp },
      tissue: [],
      tumour: [],
      exclude: [],
      figures: {
        xPx: new Float64Array(0),
        yPx: new Float64Array(0),
        labelIndex: new Uint32Array(0),
        labels: [],
        score: new Float64Array(0),
        origin: new Int32Array(0),
      },
      fields: [],
      sources: [{ kind: "annotations", path: `data/${caseId}.geojson`, sha256: "0".repeat(64) }],
      warnings: [],
    },
  };
}
