// applyStandards(): the report's classification and uncertainty blocks on
// hand-made engine data (plain objects), and with the engine when present.

import { strict as assert } from "node:assert";
import { applyStandards } from "../../lib/standards/apply_standards.ts";
import { garwoodInterval } from "../../lib/stats/garwood.ts";
import type { CountMap, PreparedCase, WindowShape } from "../../lib/count/engine_types.ts";
import type { ReportJson } from "../../lib/report/report_types.ts";

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
  assert.equal(r.classification.scheme, "canine-mct-2tier");
  assert.equal(r.classification.class, "field-dependent");
  assert.equal(r.classification.tier, "high");
  // Garwood 95% for 7 (REFERENCES.md §9, C): 2.8144–14.4227.
  const [lo, hi] = r.uncertainty.count_ci95;
  assert.ok(Math.abs(lo - 2.8144) < 1e-4 && Math.abs(hi - 14.4227) < 1e-4);
  assert.ok(Math.abs(r.uncertainty.per_mm2_ci95[0] - 1.1875) < 1e-4);
  assert.deepEqual(r.uncertainty.count_ci95, garwoodInterval(7));
  assert.equal(r.uncertainty.simulations, 99);
  assert.equal(r.uncertainty.seed, 4);
  assert.ok(r.uncertainty.scan_p !== null && r.uncertainty.scan_p > 0 && r.uncertainty.scan_p <= 1);
  assert.ok(r.uncertainty.p_other_side !== null && r.uncertainty.p_other_side > 0.3);
  assert.equal(typeof r.uncertainty.method, "object");
});

Deno.test("applyStandards() with simulations 0 skips the scan test", () => {
  const r = applyStandards(fixture(3, [3, 1], 1.25), { schemeId: "gist", simulations: 0 });
  assert.equal(r.uncertainty.scan_p, null);
  assert.equal(r.uncertainty.simulations, 0);
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
