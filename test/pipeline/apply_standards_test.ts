// applyStandards(): the report's classification and uncertainty blocks on
// hand-made engine data (plain objects), and with the engine when present.

import { strict as assert } from "node:assert";
import { applyStandards } from "../../lib/pipeline/apply_standards.ts";
import { garwoodInterval } from "../../lib/stats/garwood.ts";
import type { CountMap, PreparedCase, WindowShape } from "../../lib/count/engine_types.ts";
import type { ReportJson } from "../../lib/pipeline/report_types.ts";

const WINDOW: WindowShape = {
  shape: "rect",
  areaMm2: 2.37,
  widthUm: 1777.6,
  heightUm: 1333.2,
  aspect: [4, 3],
};

function fixture(hotspot: number, counts: number[], q1: number) {
  // A strip of windows side by side: grid of counts.length × 1.
  const n = counts.length;
  const map = {
    grid: { x0Um: 888.8, y0Um: 666.6, strideUm: 1777.6, nx: n, ny: 1 },
    window: WINDOW,
    counts: new Int32Array(counts),
    coverage: new Float32Array(n).fill(1),
    admissible: new Uint8Array(n).fill(1),
    minCoverage: 0.95,
    positions: n,
    discretization: "",
  } as CountMap;
  const total = counts.reduce((a, b) => a + b, 0);
  const prepared = {
    validUm: [[[[0, 0], [1777.6 * n, 0], [1777.6 * n, 1333.2], [0, 1333.2], [0, 0]]]],
    xUm: new Float64Array(total),
    yUm: new Float64Array(total),
  } as unknown as PreparedCase;
  const report = {
    window: { shape: "rect", area_mm2: 2.37, width_um: 1777.6, height_um: 1333.2 },
    hotspot: { center_px: [0, 0], count: hotspot, coverage: 1, per_mm2: hotspot / 2.37 },
    distribution: { positions: n, min: 0, q1, median: 0, q3: 0, max: hotspot, mean: 0 },
  } as unknown as ReportJson;
  return { report, prepared, map, window: WINDOW };
}

Deno.test("applyStandards() fills classification and uncertainty", () => {
  const input = fixture(7, [7, 2, 1, 3], 1.75);
  const r = applyStandards(input, { schemeId: "canine-mct-2tier", simulations: 99, seed: 4 });
  assert.equal(r.classification!.scheme, "canine-mct-2tier");
  assert.equal(r.classification!.class, "field-dependent");
  assert.equal(r.classification!.tier, "high");
  // Garwood 95% for 7 (REFERENCES.md §9, C): 2.8144–14.4227.
  const [lo, hi] = r.uncertainty!.count_ci95;
  assert.ok(Math.abs(lo - 2.8144) < 1e-4 && Math.abs(hi - 14.4227) < 1e-4);
  assert.ok(Math.abs(r.uncertainty!.per_mm2_ci95[0] - 1.1875) < 1e-4);
  assert.deepEqual(r.uncertainty!.count_ci95, garwoodInterval(7));
  assert.equal(r.uncertainty!.simulations, 99);
  assert.equal(r.uncertainty!.seed, 4);
  assert.ok(
    r.uncertainty!.scan_p !== null && r.uncertainty!.scan_p > 0 && r.uncertainty!.scan_p <= 1,
  );
  assert.ok(r.uncertainty!.p_other_side !== null && r.uncertainty!.p_other_side > 0.3);
  assert.equal(typeof r.uncertainty!.method, "object");
});

Deno.test("applyStandards() with simulations 0 skips the scan test", () => {
  const r = applyStandards(fixture(3, [3, 1], 1.25), { schemeId: "gist", simulations: 0 });
  assert.equal(r.uncertainty!.scan_p, null);
  assert.equal(r.uncertainty!.simulations, 0);
  assert.ok(r.warnings.some((w) => w.includes("converted by area")));
});

Deno.test("applyStandards() rejects an unknown scheme and bad simulations", () => {
  assert.throws(
    () => applyStandards(fixture(1, [1], 1), { schemeId: "nope" }),
    (e: Error) => e instanceof RangeError && e.message.startsWith('Unknown scheme "nope"; known: '),
  );
  assert.throws(
    () => applyStandards(fixture(1, [1], 1), { schemeId: "gist", simulations: 18 }),
    {
      name: "RangeError",
      message: "Simulations must be a whole number from 19 to 100,000: got 18",
    },
  );
  assert.throws(
    () => applyStandards(fixture(1, [1], 1), { schemeId: "gist", simulations: 100_001 }),
    RangeError,
  );
});

Deno.test("applyStandards() on the engine's count map: scan test of a planted focus", async () => {
  // Uses the engine (computeCountMap, makeWindow) on an invented 8 × 6 mm case:
  // 300 uniform figures plus 40 in a 500 µm focus.
  const { computeCountMap } = await import("../../lib/count/compute_count_map.ts");
  const { makeWindow } = await import("../../lib/count/make_window.ts");
  const { seededRandom } = await import("../../lib/random.ts");
  const random = seededRandom(11);
  const xs: number[] = [], ys: number[] = [];
  for (let i = 0; i < 300; i++) xs.push(random() * 8000), ys.push(random() * 6000);
  for (let i = 0; i < 40; i++) xs.push(5000 + random() * 500), ys.push(3000 + random() * 500);
  const validUm = [[[[0, 0], [8000, 0], [8000, 6000], [0, 6000], [0, 0]]]] as [
    number,
    number,
  ][][][];
  const prepared = { validUm, xUm: new Float64Array(xs), yUm: new Float64Array(ys) };
  const window = makeWindow({});
  const map = computeCountMap(prepared as unknown as PreparedCase, window, { strideUm: 50 });
  let max = 0;
  for (let k = 0; k < map.counts.length; k++) {
    if (map.admissible[k] && map.counts[k] > max) max = map.counts[k];
  }
  const report = {
    window: { shape: "rect", area_mm2: 2.37, width_um: 1777.6, height_um: 1333.2 },
    hotspot: { center_px: [0, 0], count: max, coverage: 1, per_mm2: max / 2.37 },
    distribution: { positions: map.positions, min: 0, q1: 10, median: 14, q3: 18, max, mean: 14 },
  } as unknown as ReportJson;
  const r = applyStandards(
    { report, prepared: prepared as unknown as PreparedCase, map, window },
    { schemeId: "canine-mct-2tier", simulations: 99, seed: 1 },
  );
  assert.equal(r.uncertainty!.scan_p, 0.01);
  assert.equal(r.classification!.class, "above");
  assert.equal(r.classification!.tier, "high");
});

Deno.test("applyStandards() leaves a case with no admissible window unclassified", () => {
  const input = fixture(0, [0, 0], 0);
  input.report.hotspot = null;
  const r = applyStandards(input, { schemeId: "canine-mct-2tier", simulations: 99, seed: 4 });
  assert.equal(r.classification, null);
  assert.equal(r.uncertainty, null);
  assert.match(
    r.warnings.join("\n"),
    /Not classified against "canine-mct-2tier": no window placement/,
  );
});
