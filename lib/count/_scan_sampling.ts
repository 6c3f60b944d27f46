/**
 * Sampling helpers of the scan test: the area of the valid region in each
 * cell of a raster, Walker's alias table over those areas and multinomial
 * cell counts drawn from them.
 *
 * @module
 */

import type { MultiPolygonPx } from "../types.ts";

/** Walker's alias table over cell weights. */
export interface AliasTable {
  prob: Float64Array;
  alias: Int32Array;
  n: number;
}

/** Walker's alias table (Vose's construction) over non-negative weights; null when all are 0. */
export function buildAlias(weights: Float64Array): AliasTable | null {
  const n = weights.length;
  let total = 0;
  for (let i = 0; i < n; i++) total += weights[i];
  if (!(total > 0)) return null;
  const prob = new Float64Array(n);
  const alias = new Int32Array(n);
  const scaled = new Float64Array(n);
  const small: number[] = [], large: number[] = [];
  for (let i = 0; i < n; i++) {
    scaled[i] = (weights[i] * n) / total;
    (scaled[i] < 1 ? small : large).push(i);
  }
  while (small.length && large.length) {
    const l = small.pop()!, g = large.pop()!;
    prob[l] = scaled[l];
    alias[l] = g;
    scaled[g] = scaled[g] + scaled[l] - 1;
    (scaled[g] < 1 ? small : large).push(g);
  }
  for (const g of large) prob[g] = 1;
  for (const l of small) prob[l] = 1; // rounding leftovers
  let firstPositive = 0;
  while (weights[firstPositive] === 0) firstPositive++;
  for (let i = 0; i < n; i++) {
    if (weights[i] === 0 && prob[i] === 1) {
      prob[i] = 0;
      alias[i] = firstPositive;
    }
  }
  return { prob, alias, n };
}

/**
 * Area of a region in each cell of a cw × ch raster of square cells of side
 * `s` from (x0, y0): even–odd scanlines at `sub` rows per cell (exact along x,
 * midpoint rule along y).
 */
export function cellAreas(
  region: MultiPolygonPx,
  x0: number,
  y0: number,
  s: number,
  cw: number,
  ch: number,
  sub: number,
): Float64Array {
  const area = new Float64Array(cw * ch);
  const rows = ch * sub;
  const dy = s / sub;
  const crossings: number[][] = Array.from({ length: rows }, () => []);
  for (const poly of region) {
    for (const ring of poly) {
      for (let e = 0; e + 1 < ring.length; e++) {
        const [ax, ay] = ring[e];
        const [bx, by] = ring[e + 1];
        if (ay === by) continue;
        const yLo = Math.min(ay, by), yHi = Math.max(ay, by);
        // Rows whose sample line y_r = y0 + (r + ½)·dy lies in [yLo, yHi).
        const r0 = Math.max(0, Math.ceil((yLo - y0) / dy - 0.5));
        const r1 = Math.min(rows - 1, Math.ceil((yHi - y0) / dy - 0.5) - 1);
        for (let r = r0; r <= r1; r++) {
          const y = y0 + (r + 0.5) * dy;
          if (y < yLo || y >= yHi) continue;
          crossings[r].push(ax + ((y - ay) / (by - ay)) * (bx - ax));
        }
      }
    }
  }
  for (let r = 0; r < rows; r++) {
    const xs = crossings[r];
    if (xs.length < 2) continue;
    xs.sort((a, b) => a - b);
    const cy = Math.floor(r / sub);
    for (let k = 0; k + 1 < xs.length; k += 2) {
      const a = (xs[k] - x0) / s, b = (xs[k + 1] - x0) / s;
      let ca = Math.max(0, Math.floor(a));
      const cb = Math.min(cw - 1, Math.floor(b));
      for (; ca <= cb; ca++) {
        const len = Math.min(b, ca + 1) - Math.max(a, ca);
        if (len > 0) area[cy * cw + ca] += len * s * dy;
      }
    }
  }
  return area;
}

/**
 * Draws multinomial(n, w) cell counts. Cell counts are drawn as independent Poisson(n·w_c) variates (w_c = the
 * cell's share of V's area) and then made to total exactly n: surplus figures
 * are removed uniformly at random, missing ones added by the alias method, so
 * the counts are multinomial(n, w) as for n independent uniform figures.
 */
export function cellCountSampler(
  weights: Float64Array,
  alias: AliasTable,
  n: number,
): (counts: Int32Array, random: () => number) => void {
  const nCells = weights.length;
  // Poisson means per cell, split into pieces of at most 500 so e^−λ stays > 0.
  let total = 0;
  for (let c = 0; c < nCells; c++) total += weights[c];
  const cells: number[] = [];
  for (let c = 0; c < nCells; c++) if (weights[c] > 0) cells.push(c);
  const lam = new Float64Array(cells.length);
  const pieces = new Int32Array(cells.length);
  const expNeg = new Float64Array(cells.length);
  for (let q = 0; q < cells.length; q++) {
    const l = (n * weights[cells[q]]) / total;
    pieces[q] = Math.max(1, Math.ceil(l / 500));
    lam[q] = l / pieces[q];
    expNeg[q] = Math.exp(-lam[q]);
  }
  // Most cells lie wholly inside V and share one mean: for it, a table of the
  // Poisson distribution function with a guide table (Chen & Asau's indexed
  // search) replaces the term-by-term inversion.
  let full = 0;
  for (let q = 0; q < cells.length; q++) if (lam[q] > full) full = lam[q];
  const isFull = new Uint8Array(cells.length);
  for (let q = 0; q < cells.length; q++) {
    if (pieces[q] === 1 && Math.abs(lam[q] - full) <= 1e-9 * full) isFull[q] = 1;
  }
  const cdf: number[] = [];
  if (full > 0 && full <= 500) {
    let p = Math.exp(-full), f = p;
    cdf.push(f);
    for (let j = 1; f < 1 - 1e-15 && j < 100000; j++) {
      p *= full / j;
      f += p;
      cdf.push(f);
    }
    cdf[cdf.length - 1] = Infinity; // the last entry catches the remaining tail
  }
  const table = new Float64Array(cdf);
  const guideSize = 256;
  const guide = new Int32Array(guideSize);
  for (let g = 0, k = 0; g < guideSize && table.length > 0; g++) {
    while (table[k] < g / guideSize) k++;
    guide[g] = k;
  }
  const useTable = table.length > 0;
  const { prob, alias: other } = alias;
  return (counts, random) => {
    counts.fill(0);
    let drawn = 0;
    for (let q = 0; q < cells.length; q++) {
      let k = 0;
      if (useTable && isFull[q]) {
        const u = random();
        k = guide[(u * guideSize) | 0];
        while (u > table[k]) k++;
      } else {
        const l = lam[q];
        for (let piece = pieces[q]; piece > 0; piece--) {
          // Inversion: smallest j with F(j) ≥ u.
          const u = random();
          let p = expNeg[q];
          let f = p;
          let j = 0;
          while (u > f && j < 100000) {
            j++;
            p *= l / j;
            f += p;
          }
          k += j;
        }
      }
      counts[cells[q]] = k;
      drawn += k;
    }
    if (drawn > n) removeUniformly(counts, drawn, drawn - n, random);
    for (; drawn < n; drawn++) {
      const u = random() * nCells;
      const i = u | 0;
      counts[u - i < prob[i] ? i : other[i]]++;
    }
  };
}

/**
 * Removes `remove` of the `total` figures in `counts`, each subset of that
 * size equally likely: distinct ranks in [0, total), then one sweep.
 */
function removeUniformly(
  counts: Int32Array,
  total: number,
  remove: number,
  random: () => number,
): void {
  const chosen = new Set<number>();
  while (chosen.size < remove) chosen.add(Math.floor(random() * total));
  const ranks = [...chosen].sort((a, b) => a - b);
  let r = 0, before = 0;
  for (let c = 0; c < counts.length && r < ranks.length; c++) {
    const k = counts[c];
    let drop = 0;
    while (r < ranks.length && ranks[r] < before + k) {
      drop++;
      r++;
    }
    counts[c] = k - drop;
    before += k;
  }
}
