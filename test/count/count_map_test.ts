import { strict as assert } from "node:assert";
import { computeCountMap } from "../../lib/count/compute_count_map.ts";
import { makeWindow } from "../../lib/count/make_window.ts";
import { prepareCase } from "../../lib/count/prepare_case.ts";
import { countInWindow } from "../../lib/count/window_contains.ts";
import { percentileRank } from "../../lib/count/percentile_rank.ts";
import { summarizeDistribution } from "../../lib/count/summarize_distribution.ts";
import { checkFields } from "../../lib/count/check_fields.ts";
import { buildCaseResult } from "../../lib/pipeline/build_case_result.ts";
import { diskOverlapArea, rectOverlapArea } from "../../lib/geometry/window_overlap.ts";
import type { CaseData, MultiPolygonPx } from "../../lib/types.ts";
import type { PreparedCase } from "../../lib/count/engine_types.ts";
import { randomPoints } from "./_brute.ts";

Deno.test("makeWindow() sizes a 2.37 mm² window: 1777.6 × 1333.2 µm at 4:3, 1737.1 µm circle", () => {
  // Area: Meuten, Moore & George, Vet Pathol 2016;53(1):7-9 (10 fields of FN 22 at 40×).
  // Sizes: hand calculation, W = √(2.37e6·4/3), H = √(2.37e6·3/4), d = 2√(2.37e6/π)
  // (REFERENCES.md §1). Tolerance 0.05 µm: the table gives one decimal.
  const r = makeWindow({});
  if (r.shape !== "rect") throw new Error();
  assert.ok(Math.abs(r.widthUm - 1777.6) < 0.05 && Math.abs(r.heightUm - 1333.2) < 0.05);
  const c = makeWindow({ shape: "circle" });
  if (c.shape !== "circle") throw new Error();
  assert.ok(Math.abs(c.diameterUm - 1737.1) < 0.05);
  // A 0.55 mm field (FN 22 / 40×; common practice: diameter = field number / objective)
  // has area π·0.275² = 0.2376 mm² (REFERENCES.md §1, C). Tolerance 5e-5 mm² (4 d.p.).
  assert.ok(Math.abs(Math.PI * 0.275 ** 2 - 0.2376) < 5e-5);
  assert.throws(() => makeWindow({ areaMm2: 0 }), RangeError);
  assert.throws(() => makeWindow({ aspect: [4, -3] }), RangeError);
});

const L: MultiPolygonPx = [[
  [[0, 0], [900, 0], [900, 400], [450, 400], [450, 800], [0, 800], [0, 0]],
  [[100, 100], [100, 200], [250, 200], [250, 100], [100, 100]],
]];

Deno.test("computeCountMap() rectangle coverage equals rectOverlapArea at every centre", () => {
  const w = makeWindow({ areaMm2: 0.03, aspect: [5, 3] });
  if (w.shape !== "rect") throw new Error();
  const { x, y } = randomPoints(3, 200, [0, 0, 900, 800]);
  const p = { validUm: L, xUm: x, yUm: y } as unknown as PreparedCase;
  const map = computeCountMap(p, w, { strideUm: 17, minCoverage: 0.6 });
  const { x0Um, y0Um, strideUm: s, nx, ny } = map.grid;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const cx = x0Um + i * s, cy = y0Um + j * s;
      const hw = w.widthUm / 2, hh = w.heightUm / 2;
      const exact = rectOverlapArea(L, [cx - hw, cy - hh, cx + hw, cy + hh]) /
        (w.widthUm * w.heightUm);
      // Float32 storage: tolerance 1e-6.
      assert.ok(Math.abs(map.coverage[j * nx + i] - exact) < 1e-6, `${i},${j}`);
      assert.equal(map.counts[j * nx + i], countInWindow(x, y, w, cx, cy));
    }
  }
});

Deno.test("computeCountMap() rectangle coverage is exact on a raster wider than a band", () => {
  // 2.37 mm² window at a 5 µm stride over a 10.5 mm strip: one window spans more raster
  // rows than the 4M-cell band budget allows, so bands are sized to the window. Reference:
  // rectOverlapArea (exact clipping) at sampled centres; Float32 storage, tolerance 1e-6.
  const strip: MultiPolygonPx = [[
    [[0, 0], [10500, 0], [10500, 2600], [5200, 1900], [0, 2600], [0, 0]],
    [[3000, 900], [3400, 900], [3400, 1200], [3000, 1200], [3000, 900]],
  ]];
  const w = makeWindow({});
  if (w.shape !== "rect") throw new Error();
  const p = { validUm: strip, xUm: new Float64Array(0), yUm: new Float64Array(0) };
  const map = computeCountMap(p as unknown as PreparedCase, w, { strideUm: 5, counts: false });
  const { x0Um, y0Um, strideUm: s, nx, ny } = map.grid;
  // Raster columns × twice the raster rows under one window: beyond the band budget.
  assert.ok(2 * nx * (2 * (2 * w.heightUm / s) + 1) > 4_000_000, "the case must exceed a band");
  const hw = w.widthUm / 2, hh = w.heightUm / 2;
  for (let j = 0; j < ny; j += 37) {
    for (let i = 0; i < nx; i += 53) {
      const cx = x0Um + i * s, cy = y0Um + j * s;
      const exact = rectOverlapArea(strip, [cx - hw, cy - hh, cx + hw, cy + hh]) /
        (w.widthUm * w.heightUm);
      const got = map.coverage[j * nx + i];
      assert.ok(
        Math.abs(got - Math.max(0, Math.min(1, exact))) < 1e-6,
        `${i},${j}: ${got} ${exact}`,
      );
    }
  }
});

Deno.test("computeCountMap() coverage bounds for circles are bounds, and close", () => {
  // Reference: diskOverlapArea (exact, checked against JSTS in window_overlap_test.ts).
  // The upper bound must never be below the exact coverage, nor the lower one
  // above it (1e-6: single precision); their slack is that of whole raster
  // cells about the disk, a few per cent here.
  const w = makeWindow({ areaMm2: 0.05, shape: "circle" });
  if (w.shape !== "circle") throw new Error();
  const r = w.diameterUm / 2;
  const p = { validUm: L, xUm: new Float64Array(0), yUm: new Float64Array(0) };
  for (const strideUm of [7, 20, 45]) {
    const map = computeCountMap(p as unknown as PreparedCase, w, {
      strideUm,
      minCoverage: 0.5,
      counts: false,
      coverageUpperBound: true,
    });
    const { x0Um, y0Um, nx, ny } = map.grid;
    let worst = 0;
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const cx = x0Um + i * strideUm, cy = y0Um + j * strideUm;
        const exact = diskOverlapArea(L, [cx, cy], r) / (Math.PI * r * r);
        const got = map.coverage[j * nx + i], low = map.coverageLow![j * nx + i];
        assert.ok(got >= exact - 1e-6, `stride ${strideUm} (${i}, ${j}): ${got} < ${exact}`);
        assert.ok(low <= exact + 1e-6, `stride ${strideUm} (${i}, ${j}): low ${low} > ${exact}`);
        worst = Math.max(worst, got - exact, exact - low);
      }
    }
    assert.ok(worst < 0.25, `stride ${strideUm}: slack ${worst}`);
  }
});

Deno.test("computeCountMap() circle coverage stays within its stated error bound", () => {
  const w = makeWindow({ areaMm2: 0.05, shape: "circle" });
  if (w.shape !== "circle") throw new Error();
  const p = {
    validUm: L,
    xUm: new Float64Array(),
    yUm: new Float64Array(),
  } as unknown as PreparedCase;
  const map = computeCountMap(p, w, { strideUm: 20, minCoverage: 0.9 });
  const r = w.diameterUm / 2;
  let worst = 0;
  for (let k = 0; k < map.coverage.length; k += 7) {
    const cx = map.grid.x0Um + (k % map.grid.nx) * 20,
      cy = map.grid.y0Um + Math.floor(k / map.grid.nx) * 20;
    const exact = diskOverlapArea(L, [cx, cy], r) / (Math.PI * r * r);
    worst = Math.max(worst, Math.abs(map.coverage[k] - exact));
    // Admissibility is exact near the limit.
    assert.equal(map.admissible[k] === 1, exact >= 0.9 - 1e-9, `${cx},${cy}`);
  }
  assert.ok(worst <= map.coverageError! + 1e-6, `${worst} > ${map.coverageError}`);
});

Deno.test("computeCountMap() decides circle admissibility exactly at every centre, on any raster", () => {
  const w = makeWindow({ areaMm2: 0.05, shape: "circle" });
  if (w.shape !== "circle") throw new Error();
  const p = {
    validUm: L,
    xUm: new Float64Array(),
    yUm: new Float64Array(),
  } as unknown as PreparedCase;
  const r = w.diameterUm / 2;
  for (const q of [1, 2, 4]) {
    for (const minCoverage of [0.6, 0.9, 0.999]) {
      const map = computeCountMap(p, w, { strideUm: 20, minCoverage, circleCellsPerStride: q });
      for (let k = 0; k < map.coverage.length; k++) {
        const cx = map.grid.x0Um + (k % map.grid.nx) * 20,
          cy = map.grid.y0Um + Math.floor(k / map.grid.nx) * 20;
        // Exact planar disk ∩ polygon area (checked against the circular-segment closed form and
        // numeric integration in test/geometry/window_overlap_test.ts).
        const exact = diskOverlapArea(L, [cx, cy], r) / (Math.PI * r * r);
        if (Math.abs(exact - minCoverage) < 1e-9) continue; // on the limit: either is fair
        assert.equal(map.admissible[k] === 1, exact >= minCoverage, `q ${q}, ${cx},${cy}`);
      }
      // Most centres in doubt are decided by the cell bounds, not by exact queries.
      const m = /cells \((\d+)\) or recomputed exactly \((\d+)/.exec(map.discretization)!;
      assert.ok(Number(m[1]) > Number(m[2]), map.discretization);
    }
  }
});

Deno.test("computeCountMap() refuses a grid beyond the limit, naming its size", () => {
  const p = {
    validUm: L,
    xUm: new Float64Array(),
    yUm: new Float64Array(),
  } as unknown as PreparedCase;
  assert.throws(
    () => computeCountMap(p, makeWindow({ areaMm2: 0.01 }), { strideUm: 1, maxGridCells: 1000 }),
    (e: Error) =>
      e instanceof RangeError && /would have \d+ cells \(about \d+ MB\)/.test(e.message),
  );
});

function caseOf(mppX: number, mppY: number, figures: [number, number][]): CaseData {
  const sq = [[[0, 0], [4000, 0], [4000, 4000], [0, 4000], [0, 0]]] as [number, number][][];
  const n = figures.length;
  return {
    caseId: "QVT-24-002",
    slide: { id: "QVT-24-002", mppX, mppY },
    tissue: [{ polygons: [sq], source: "test" }],
    tumour: [],
    exclude: [],
    figures: {
      xPx: new Float64Array(figures.map((f) => f[0])),
      yPx: new Float64Array(figures.map((f) => f[1])),
      labelIndex: new Uint32Array(n),
      labels: ["mitotic figure"],
      score: new Float64Array(n).fill(NaN),
      origin: new Int32Array(n),
    },
    fields: [],
    sources: [],
    warnings: [],
  };
}

Deno.test("prepareCase() keeps circles round when mpp x ≠ mpp y", () => {
  // 0.25 × 0.5 µm pixels: +400 px in x and +200 px in y are both 100 µm in the µm plane.
  const p = prepareCase(caseOf(0.25, 0.5, [[2000, 2000], [2400, 2000], [2000, 2200]]), {});
  assert.deepEqual([...p.xUm], [500, 600, 500]);
  assert.deepEqual([...p.yUm], [1000, 1000, 1100]);
  const w = { shape: "circle" as const, areaMm2: Math.PI * 0.01, diameterUm: 200 };
  assert.equal(countInWindow(p.xUm, p.yUm, w, 500, 1000), 3); // both exactly on the rim
  const map = computeCountMap(p, w, { strideUm: 10, minCoverage: 0.5 });
  for (let k = 0; k < map.counts.length; k += 3) {
    const cx = map.grid.x0Um + (k % map.grid.nx) * 10,
      cy = map.grid.y0Um + Math.floor(k / map.grid.nx) * 10;
    assert.equal(map.counts[k], countInWindow(p.xUm, p.yUm, w, cx, cy));
  }
});

Deno.test("percentileRank() edge cases: all equal, above the maximum, no positions", () => {
  assert.equal(percentileRank([0, 0, 5], 2), 50); // all positions equal c: half weight
  assert.equal(percentileRank([3, 2], 9), 100);
  assert.equal(percentileRank([3, 2], 0), 30); // 0 below, 3 equal → 1.5 / 5
  assert.equal(percentileRank([], 1), null);
  const d = summarizeDistribution({ counts: new Int32Array([4]), admissible: new Uint8Array([0]) });
  assert.equal(d.positions, 0);
  assert.equal(d.median, null);
});

Deno.test("checkFields() warns about a polygon field of another size and scales its count", () => {
  const sq: MultiPolygonPx = [[[[0, 0], [4000, 0], [4000, 4000], [0, 4000], [0, 0]]]];
  const poly = [[[0, 0], [2000, 0], [2000, 1000], [0, 1000], [0, 0]]] as [number, number][][];
  const prepared = {
    validUm: sq,
    xUm: new Float64Array([500, 2000, 3000]),
    yUm: new Float64Array([500, 1000, 3000]),
    slide: { id: "QVT-24-003", mppX: 1, mppY: 1 },
    fields: [{
      reader: "trainee-2",
      kind: "polygon",
      centerPx: [1000, 500],
      polygon: poly,
      featureIndex: 3,
    }],
  } as unknown as PreparedCase;
  const map = { counts: new Int32Array([0, 1, 2, 3]), admissible: new Uint8Array([1, 1, 1, 1]) };
  const w = makeWindow({ areaMm2: 1, aspect: [1, 1] });
  const [f] = checkFields(prepared, map as never, null, w);
  assert.equal(f.count, 2); // (2000, 1000) lies on the polygon's corner: inside
  assert.equal(f.coverage, 1);
  assert.equal(f.areaMm2, 2);
  assert.equal(f.countScaledToWindow, 1);
  // Compared through the count scaled to the window, 1: one position below
  // (count 0), one equal → (1 + ½) / 4 = 37.5 (hand calculation).
  assert.equal(f.percentile, 37.5);
  assert.match(f.warnings[0], /covers 2 mm², 100% more than the window's 1 mm²/);
});

Deno.test("buildCaseResult() explains why there is no hotspot", () => {
  const r = buildCaseResult(caseOf(0.5, 0.5, [[100, 100]]), { bestN: 0 });
  // valid area 2 × 2 mm = 4 mm²: a 5 mm² window cannot fit.
  const r2 = buildCaseResult(caseOf(0.5, 0.5, [[100, 100]]), { areaMm2: 5, bestN: 0 });
  assert.ok(r.report.hotspot !== null);
  assert.equal(r2.report.hotspot, null);
  assert.ok(
    r2.report.warnings.some((w) =>
      w.includes("valid area 4 mm² is smaller than 0.95 × the window's 5 mm²")
    ),
    r2.report.warnings.join("\n"),
  );
  assert.deepEqual(
    Object.keys(r.report).slice(0, 12),
    [
      "schema",
      "case",
      "window",
      "settings",
      "valid_area_mm2",
      "figures",
      "hotspot",
      "distribution",
      "fields",
      "classification",
      "uncertainty",
      "warnings",
    ],
  );
});

Deno.test("checkFields() counts several fields as one reading: sum of counts and areas", () => {
  // Hand-checkable: a 4 × 4 mm valid square at 1 µm/px, a 1 mm² square window.
  const sq: MultiPolygonPx = [[[[0, 0], [4000, 0], [4000, 4000], [0, 4000], [0, 0]]]];
  const a = [[[0, 0], [1000, 0], [1000, 500], [0, 500], [0, 0]]] as [number, number][][];
  const b = [[[2000, 2000], [3000, 2000], [3000, 2500], [2000, 2500], [2000, 2000]]] as [
    number,
    number,
  ][][];
  const prepared = {
    validUm: sq,
    // Two figures in part a, one in part b, one in neither; the circles of
    // radius 250 µm about (500, 3000) and (3500, 3500) hold 1 and 2 figures
    // ((3500, 3750) lies on the rim: inside, closed).
    xUm: new Float64Array([100, 900, 2500, 3900, 500, 3500, 3600]),
    yUm: new Float64Array([100, 400, 2250, 100, 3000, 3750, 3500]),
    slide: { id: "QVT-24-011", mppX: 1, mppY: 1 },
    fields: [
      { reader: "trainee-1", kind: "polygons", centerPx: [0, 0], parts: [a, b], featureIndex: 5 },
      {
        reader: "trainee-1",
        kind: "circles",
        centerPx: [2000, 3250],
        pointsPx: [[500, 3000], [3500, 3500]],
        diameterMm: 0.5,
        featureIndex: 6,
        date: "2024-05-02",
      },
    ],
  } as unknown as PreparedCase;
  const map = { counts: new Int32Array([0, 1, 2, 3]), admissible: new Uint8Array([1, 1, 1, 1]) };
  const w = makeWindow({ areaMm2: 1, aspect: [1, 1] });
  const [poly, circles] = checkFields(prepared, map as never, null, w);
  assert.equal(poly.count, 3);
  assert.equal(poly.parts, 2);
  assert.equal(poly.areaMm2, 1); // 0.5 + 0.5 mm²
  assert.equal(poly.coverage, 1);
  // Same area as the window, still compared through the scaled count: 3 × 1 / 1 = 3.
  assert.equal(poly.countScaledToWindow, 3);
  assert.equal(poly.percentile, 87.5); // 3 below, 1 equal → 3.5 / 4
  assert.equal(circles.count, 3);
  assert.equal(circles.parts, 2);
  assert.equal(circles.diameterMm, 0.5);
  assert.equal(circles.date, "2024-05-02");
  // Two circles of 0.5 mm: 2 · π · 0.25² = 0.392699 mm² (hand calculation).
  assert.ok(Math.abs(circles.areaMm2 - 2 * Math.PI * 0.0625) < 1e-12);
  assert.ok(Math.abs(circles.countScaledToWindow! - 3 / (2 * Math.PI * 0.0625)) < 1e-9);
  assert.match(circles.warnings.join("\n"), /covers 0\.393 mm² in 2 parts, 60\.7% less/);
  // Overlapping circles are flagged.
  const overlapping = {
    ...prepared,
    fields: [{ ...prepared.fields[1], pointsPx: [[500, 3000], [800, 3000]] }],
  } as unknown as PreparedCase;
  const [o] = checkFields(overlapping, map as never, null, w);
  assert.match(o.warnings.join("\n"), /circular fields 1 and 2 overlap/);
});
