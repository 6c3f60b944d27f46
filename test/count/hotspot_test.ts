import { strict as assert } from "node:assert";
import { computeCountMap } from "../../lib/count/compute_count_map.ts";
import { findHotspot } from "../../lib/count/find_hotspot.ts";
import { findTopHotspots } from "../../lib/count/find_top_hotspots.ts";
import { findBestFieldSet } from "../../lib/count/find_best_field_set.ts";
import { makeWindow } from "../../lib/count/make_window.ts";
import { countInWindow } from "../../lib/count/window_contains.ts";
import { diskOverlapArea, rectOverlapArea } from "../../lib/geometry/window_overlap.ts";
import { createSearch, searchBest } from "../../lib/count/_hotspot_search.ts";
import { RectCell } from "../../lib/count/_rect_cell.ts";
import type { Placement } from "../../lib/count/engine_types.ts";
import type { MultiPolygonPx } from "../../lib/types.ts";
import type { PreparedCase, WindowShape } from "../../lib/count/engine_types.ts";
import { randomPoints } from "./_brute.ts";
import { seededRandom } from "../../lib/random.ts";

// An L-shaped valid region (µm) with a hole, so coverage matters.
const L: MultiPolygonPx = [[
  [[0, 0], [600, 0], [600, 250], [300, 250], [300, 500], [0, 500], [0, 0]],
  [[60, 60], [60, 100], [100, 100], [100, 60], [60, 60]],
]];

function prepared(x: Float64Array, y: Float64Array, region = L) {
  return {
    validUm: region,
    xUm: x,
    yUm: y,
    slide: { id: "QVT-24-001", mppX: 0.5, mppY: 0.25 },
  } as unknown as PreparedCase;
}

/** Exhaustive enumeration, no pruning: every candidate vertex of the arrangement. */
function exhaustive(p: PreparedCase, w: WindowShape, minCoverage: number): number {
  const x = p.xUm, y = p.yUm;
  const cands: [number, number][] = [];
  if (w.shape === "rect") {
    const hw = w.widthUm / 2, hh = w.heightUm / 2;
    const xs: number[] = [], ys: number[] = [];
    for (let k = 0; k < x.length; k++) xs.push(x[k] - hw, x[k] + hw), ys.push(y[k] - hh, y[k] + hh);
    for (const a of xs) for (const b of ys) cands.push([a, b]);
  } else {
    const r = w.diameterUm / 2;
    for (let i = 0; i < x.length; i++) {
      for (let j = i + 1; j < x.length; j++) {
        const dx = x[j] - x[i], dy = y[j] - y[i], d = Math.hypot(dx, dy);
        if (d === 0 || d > 2 * r) continue;
        const h = Math.sqrt(r * r - d * d / 4) * (1 - 1e-9);
        const mx = (x[i] + x[j]) / 2, my = (y[i] + y[j]) / 2;
        cands.push([mx - h * dy / d, my + h * dx / d], [mx + h * dy / d, my - h * dx / d]);
      }
    }
  }
  let best = -1;
  for (const [cx, cy] of cands) {
    const n = countInWindow(x, y, w, cx, cy);
    if (n <= best) continue;
    const cov = minCoverage > 0 ? coverageOf(p.validUm, w, cx, cy) : 1;
    if (cov >= minCoverage - 1e-9) best = n;
  }
  return best;
}

function coverageOf(region: MultiPolygonPx, w: WindowShape, cx: number, cy: number): number {
  if (w.shape === "rect") {
    const hw = w.widthUm / 2, hh = w.heightUm / 2;
    return rectOverlapArea(region, [cx - hw, cy - hh, cx + hw, cy + hh]) / (w.widthUm * w.heightUm);
  }
  const r = w.diameterUm / 2;
  return diskOverlapArea(region, [cx, cy], r) / (Math.PI * r * r);
}

/** Best admissible count on a square grid of centres `stepUm` apart, separate from `chosen`. */
function gridBest(
  p: PreparedCase,
  w: WindowShape,
  minCoverage: number,
  stepUm: number,
  box: [number, number, number, number],
  chosen: Placement[] = [],
): number {
  if (w.shape !== "circle") throw new Error("circle only");
  const r = w.diameterUm / 2;
  let best = -1;
  for (let cy = box[1]; cy <= box[3]; cy += stepUm) {
    for (let cx = box[0]; cx <= box[2]; cx += stepUm) {
      if (chosen.some((q) => Math.hypot(cx - q.centerUm[0], cy - q.centerUm[1]) <= 2 * r)) continue;
      const n = countInWindow(p.xUm, p.yUm, w, cx, cy);
      if (n > best && coverageOf(p.validUm, w, cx, cy) >= minCoverage) best = n;
    }
  }
  return best;
}

Deno.test("findHotspot() equals an exhaustive candidate enumeration and beats a 1 µm grid (rect)", () => {
  const w = makeWindow({ areaMm2: 0.012, aspect: [4, 3] }); // 126.5 × 94.9 µm
  for (const seed of [1, 2, 3, 4]) {
    const { x, y } = randomPoints(seed, 60, [0, 0, 600, 500]);
    const p = prepared(x, y);
    const map = computeCountMap(p, w, { strideUm: 20, minCoverage: 0.9 });
    const h = findHotspot(p, map)!;
    assert.equal(h.count, countInWindow(x, y, w, h.centerUm[0], h.centerUm[1]));
    assert.ok(coverageOf(L, w, h.centerUm[0], h.centerUm[1]) >= 0.9 - 1e-9);
    assert.equal(h.count, exhaustive(p, w, 0.9), `seed ${seed}`);
    // A 1 µm brute-force grid of centres over the whole region.
    let grid = 0;
    for (let cy = 0; cy <= 500; cy += 1) {
      for (let cx = 0; cx <= 600; cx += 1) {
        const n = countInWindow(x, y, w, cx, cy);
        if (n > grid && coverageOf(L, w, cx, cy) >= 0.9) grid = n;
      }
    }
    assert.ok(h.count >= grid, `${h.count} < ${grid}`);
  }
});

Deno.test("findHotspot() for circles equals an exhaustive pair enumeration", () => {
  const sq: MultiPolygonPx = [[[[0, 0], [800, 0], [800, 800], [0, 800], [0, 0]]]];
  const w = makeWindow({ areaMm2: 0.02, shape: "circle" }); // r ≈ 79.8 µm
  for (const seed of [5, 6, 7]) {
    const { x, y } = randomPoints(seed, 80, [100, 100, 700, 700]);
    const p = prepared(x, y, sq);
    const map = computeCountMap(p, w, { strideUm: 20, minCoverage: 0.5 });
    const h = findHotspot(p, map)!;
    assert.equal(h.count, countInWindow(x, y, w, h.centerUm[0], h.centerUm[1]));
    // Candidates are well inside the square here, so coverage never binds.
    assert.equal(h.count, exhaustive(p, w, 0), `seed ${seed}`);
    let grid = 0;
    for (let k = 0; k < map.counts.length; k++) {
      if (map.admissible[k]) grid = Math.max(grid, map.counts[k]);
    }
    assert.ok(h.count >= grid);
  }
});

Deno.test("findHotspot() for circles where coverage binds: exact count, admissible, ≥ pairs and a 2 µm grid", () => {
  const w = makeWindow({ areaMm2: 0.012, shape: "circle" }); // r ≈ 61.8 µm
  for (const seed of [31, 32, 33]) {
    const { x, y } = randomPoints(seed, 90, [0, 0, 600, 500]);
    const p = prepared(x, y);
    const map = computeCountMap(p, w, { strideUm: 20, minCoverage: 0.9 });
    const h = findHotspot(p, map)!;
    assert.equal(h.count, countInWindow(x, y, w, h.centerUm[0], h.centerUm[1]));
    // Exact coverage of the reported window, independently of the search's index.
    assert.ok(Math.abs(coverageOf(L, w, h.centerUm[0], h.centerUm[1]) - h.coverage) < 1e-9);
    assert.ok(h.coverage >= 0.9 - 1e-9);
    assert.ok(h.count >= exhaustive(p, w, 0.9), `seed ${seed}`);
    assert.ok(h.count >= gridBest(p, w, 0.9, 2, [0, 0, 600, 500]), `seed ${seed}`);
  }
});

Deno.test("circle top-k resumes its search: each pick equals a fresh search given the earlier picks", () => {
  const w = makeWindow({ areaMm2: 0.006, shape: "circle" }); // r ≈ 43.7 µm
  for (const seed of [41, 42]) {
    const { x, y } = randomPoints(seed, 160, [0, 0, 600, 500], 4);
    const p = prepared(x, y);
    const map = computeCountMap(p, w, { strideUm: 15, minCoverage: 0.9 });
    const picks = findTopHotspots(p, map, 6);
    assert.ok(picks.length >= 4);
    if (w.shape !== "circle") throw new Error();
    for (let i = 0; i < picks.length; i++) {
      const earlier = picks.slice(0, i);
      const fresh = searchBest(createSearch(p, map), earlier)!;
      assert.equal(picks[i].count, fresh.count, `seed ${seed}, pick ${i + 1}`);
      assert.equal(
        picks[i].count,
        countInWindow(x, y, w, picks[i].centerUm[0], picks[i].centerUm[1]),
      );
      for (const q of earlier) {
        const d = Math.hypot(
          picks[i].centerUm[0] - q.centerUm[0],
          picks[i].centerUm[1] - q.centerUm[1],
        );
        assert.ok(d > w.diameterUm, "closed circles are disjoint");
      }
      // Never below a 4 µm grid of separate admissible centres.
      assert.ok(picks[i].count >= gridBest(p, w, 0.9, 4, [0, 0, 600, 500], earlier));
    }
  }
});

Deno.test("a circle search asked twice with the same chosen windows answers the same", () => {
  const w = makeWindow({ areaMm2: 0.006, shape: "circle" });
  const { x, y } = randomPoints(43, 120, [0, 0, 600, 500]);
  const p = prepared(x, y);
  const st = createSearch(p, computeCountMap(p, w, { strideUm: 15, minCoverage: 0.9 }));
  const a = searchBest(st, []), b = searchBest(st, []);
  assert.deepEqual(b, a);
  const c = searchBest(st, [a!]), d = searchBest(st, [a!]);
  assert.deepEqual(d, c);
});

Deno.test("findHotspot() counts a figure exactly on the window edge", () => {
  const sq: MultiPolygonPx = [[[[0, 0], [1000, 0], [1000, 1000], [0, 1000], [0, 0]]]];
  const w = makeWindow({ areaMm2: 0.04, aspect: [1, 1] }); // 200 × 200 µm
  // Two figures exactly 200 µm apart: one closed window holds both.
  const p = prepared(new Float64Array([400, 600]), new Float64Array([500, 500]), sq);
  const h = findHotspot(p, computeCountMap(p, w, { strideUm: 30 }))!;
  assert.equal(h.count, 2);
});

Deno.test("findHotspot() is unchanged when figures are shuffled, and shifts with the case", () => {
  const w = makeWindow({ areaMm2: 0.012 });
  const { x, y } = randomPoints(11, 80, [0, 0, 600, 500]);
  const h1 = findHotspot(prepared(x, y), computeCountMap(prepared(x, y), w, { strideUm: 20 }))!;
  const rnd = seededRandom(2);
  const idx = [...x.keys()].sort(() => rnd() - 0.5);
  const xs = new Float64Array(idx.map((i) => x[i])), ys = new Float64Array(idx.map((i) => y[i]));
  const h2 = findHotspot(prepared(xs, ys), computeCountMap(prepared(xs, ys), w, { strideUm: 20 }))!;
  assert.deepEqual(h2, h1);
  // Shift by a whole number of strides (exact in binary): same placement, shifted.
  const d = 20 * 37;
  const shift = (a: Float64Array) => a.map((v) => v + d);
  const Ls: MultiPolygonPx = L.map((poly) =>
    poly.map((ring) => ring.map(([a, b]) => [a + d, b + d]))
  );
  const p3 = prepared(shift(x), shift(y), Ls);
  const h3 = findHotspot(p3, computeCountMap(p3, w, { strideUm: 20 }))!;
  assert.equal(h3.count, h1.count);
  assert.ok(Math.abs(h3.centerUm[0] - d - h1.centerUm[0]) < 1e-9);
  assert.ok(Math.abs(h3.coverage - h1.coverage) < 1e-9);
});

Deno.test("findHotspot() returns null when the valid region is smaller than the window", () => {
  const tiny: MultiPolygonPx = [[[[0, 0], [50, 0], [50, 50], [0, 50], [0, 0]]]];
  const p = prepared(new Float64Array([10]), new Float64Array([10]), tiny);
  assert.equal(
    findHotspot(p, computeCountMap(p, makeWindow({ areaMm2: 0.01 }), { strideUm: 5 })),
    null,
  );
});

Deno.test("findTopHotspots() picks disjoint windows, each the best left", () => {
  const w = makeWindow({ areaMm2: 0.012 });
  const { x, y } = randomPoints(21, 120, [0, 0, 600, 500]);
  const p = prepared(x, y);
  const map = computeCountMap(p, w, { strideUm: 20, minCoverage: 0.9 });
  const top = findTopHotspots(p, map, 3);
  assert.ok(top.length >= 2);
  if (w.shape !== "rect") throw new Error();
  for (let i = 0; i < top.length; i++) {
    for (let j = 0; j < i; j++) {
      const dx = Math.abs(top[i].centerUm[0] - top[j].centerUm[0]);
      const dy = Math.abs(top[i].centerUm[1] - top[j].centerUm[1]);
      assert.ok(dx > w.widthUm || dy > w.heightUm, "closed windows are disjoint");
    }
    assert.ok(i === 0 || top[i].count <= top[i - 1].count);
  }
  assert.deepEqual(top[0], findHotspot(p, map));
});

Deno.test("findBestFieldSet() states its guarantee and sums its fields", () => {
  const sq: MultiPolygonPx = [[[[0, 0], [3000, 0], [3000, 3000], [0, 3000], [0, 0]]]];
  const { x, y } = randomPoints(4, 300, [0, 0, 3000, 3000]);
  const set = findBestFieldSet(prepared(x, y, sq), { n: 4, strideUm: 50 });
  assert.equal(set.fields.length, 4);
  assert.equal(set.total, set.fields.reduce((a, f) => a + f.count, 0));
  assert.match(set.guarantee, /1\/5/);
  if (set.window.shape !== "circle") throw new Error();
  // FN 22 at 40×: d = 22/40 = 0.55 mm (common practice: diameter = field number / objective;
  // Renne, Pathologica 2023), area π·0.275² = 0.2376 mm² (REFERENCES.md §1). Tolerance 0.05 µm.
  assert.ok(Math.abs(set.window.diameterUm - 550) < 0.05, String(set.window.diameterUm));
});

Deno.test("RectCell gives every candidate of a cell, exactly counted, in search order", () => {
  // Reference: the cell's candidate set enumerated directly (all combinations of the
  // figures' window edges in the cell and the cell centre, nudged by ulps as the search
  // does), each counted by brute force, sorted by count, then y, then x.
  const nudged = (v: number, f: number, h: number) => {
    const buf = new Float64Array(1), bits = new BigInt64Array(buf.buffer);
    for (let t = 0; t < 64; t++) {
      if (Math.abs(f - v) <= h) return v;
      buf[0] = v;
      bits[0] += (f > v) === (v > 0) ? 1n : -1n;
      v = buf[0];
    }
    return null;
  };
  for (
    const [seed, area, stride] of [[51, 0.012, 20], [52, 0.004, 25], [53, 0.03, 8], [54, 0.004, 40]]
  ) {
    const w = makeWindow({ areaMm2: area, aspect: [4, 3] });
    if (w.shape !== "rect") throw new Error();
    const hw = w.widthUm / 2, hh = w.heightUm / 2;
    const { x, y } = randomPoints(seed, 400, [0, 0, 600, 500], 2);
    const p = prepared(x, y);
    const map = computeCountMap(p, w, { strideUm: stride, minCoverage: 0.5 });
    const st = createSearch(p, map);
    const { nx, x0Um, y0Um, strideUm: s } = map.grid;
    for (let k = 0; k < map.counts.length; k += 97) {
      const cx = x0Um + (k % nx) * s, cy = y0Um + Math.floor(k / nx) * s;
      const xs = new Set([cx]), ys = new Set([cy]);
      for (let f = 0; f < x.length; f++) {
        if (Math.abs(x[f] - cx) > hw + s || Math.abs(y[f] - cy) > hh + s) continue;
        for (const v of [x[f] - hw, x[f] + hw]) {
          const u = v >= cx - s / 2 && v <= cx + s / 2 ? nudged(v, x[f], hw) : null;
          if (u !== null) xs.add(u);
        }
        for (const v of [y[f] - hh, y[f] + hh]) {
          const u = v >= cy - s / 2 && v <= cy + s / 2 ? nudged(v, y[f], hh) : null;
          if (u !== null) ys.add(u);
        }
      }
      const want: [number, number, number][] = [];
      for (const b of ys) for (const a of xs) want.push([countInWindow(x, y, w, a, b), b, a]);
      want.sort((u, v) => v[0] - u[0] || u[1] - v[1] || u[2] - v[2]);
      const cell = new RectCell(st, k, cx, cy, [], 0, true);
      const got: [number, number, number][] = [];
      for (let c = cell.next(0); c; c = cell.next(0)) got.push([c.count, c.cy, c.cx]);
      assert.deepEqual(got, want, `seed ${seed}, cell ${k}`);
    }
  }
});

Deno.test("quarter bounds change no pick: evenly spread figures, rectangles and circles", () => {
  // Evenly spread figures are the case quarter bounds are made for; here they
  // are forced on from the first cell and every pick must equal the search
  // without them (checked against the exhaustive enumeration above), while
  // fewer cells are opened.
  const sq: MultiPolygonPx = [[[[0, 0], [700, 0], [700, 600], [0, 600], [0, 0]]]];
  for (const seed of [11, 12, 13]) {
    const rnd = seededRandom(seed);
    const n = 1200;
    const x = new Float64Array(n), y = new Float64Array(n);
    for (let k = 0; k < n; k++) x[k] = 20 + 660 * rnd(), y[k] = 20 + 560 * rnd();
    const p = prepared(x, y, seed === 13 ? L : sq);
    const windows = [
      makeWindow({ areaMm2: 0.012, aspect: [4, 3] }),
      makeWindow({ areaMm2: 0.01, shape: "circle" }),
    ];
    for (const w of windows) {
      const map = computeCountMap(p, w, { strideUm: 10, minCoverage: 0.9 });
      const picks = (forced: boolean) => {
        const st = createSearch(p, map);
        if (forced) st.quartersAfter = st.quartersWork = 0;
        const out: Placement[] = [];
        let opened = 0;
        for (let i = 0; i < 4; i++) {
          const q = searchBest(st, out);
          opened += st.stats.blocks;
          if (!q) break;
          out.push(q);
        }
        return { out, opened, quarters: st.quarters !== null };
      };
      const plain = picks(false), forced = picks(true);
      assert.ok(forced.quarters, "the forced search made its quarter bounds");
      assert.ok(forced.opened < plain.opened, `opened ${forced.opened} of ${plain.opened} cells`);
      assert.deepEqual(forced.out, plain.out, `seed ${seed}, ${w.shape}`);
    }
  }
});
