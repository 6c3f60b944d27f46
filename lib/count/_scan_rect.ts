/**
 * The rectangle simulator of the scan test: simulated counts are exact for
 * the simulated points (each point, on a 256 × 256 sub-grid of its cell, adds
 * 1 to the block of scanned positions whose closed window holds it; 2-D
 * prefix sums).
 *
 * @module
 */

import { type AliasTable, cellCountSampler } from "./_scan_sampling.ts";

/**
 * One simulation of the rectangle statistic: cell counts, then cell by cell
 * (row-major, so the difference array is written nearly in order) each
 * figure gets a uniform spot in its cell (on a 256 × 256 sub-grid) and adds 1
 * to the block of scanned positions whose closed window holds it. Positions
 * are in scanned-lattice units (node i at x0 + i·S).
 */
export function rectSimulator(o: {
  alias: AliasTable;
  weights: Float64Array;
  cw: number;
  ch: number;
  m: number;
  kx0: number;
  ky0: number;
  mx: number;
  my: number;
  halfX: number;
  halfY: number;
  evalAdmissible: Uint8Array;
  n: number;
}): (random: () => number) => number {
  const { alias, weights, cw, ch, m, kx0, ky0, mx, my, halfX, halfY, evalAdmissible, n } = o;
  const w1 = mx + 1;
  const diff = new Int32Array(w1 * (my + 1));
  const nCells = cw * ch;
  const cellCounts = new Int32Array(nCells);
  const scale = m / 256;
  const drawCounts = cellCountSampler(weights, alias, n);
  // Node offsets of the window range for each of the 256 sub-grid spots.
  const whole = Number.isInteger(m) && Number.isInteger(kx0) && Number.isInteger(ky0);
  const loX = new Int32Array(256), hiX = new Int32Array(256);
  const loY = new Int32Array(256), hiY = new Int32Array(256);
  for (let b = 0; b < 256; b++) {
    const u = (b + 0.5) * scale;
    loX[b] = Math.ceil(u - halfX);
    hiX[b] = Math.floor(u + halfX);
    loY[b] = Math.ceil(u - halfY);
    hiY[b] = Math.floor(u + halfY);
  }
  return (random) => {
    diff.fill(0);
    drawCounts(cellCounts, random);
    let bits = 0, left = 0;
    for (let cy = 0; cy < ch; cy++) {
      const yBase = ky0 + cy * m;
      for (let cx = 0; cx < cw; cx++) {
        let k = cellCounts[cy * cw + cx];
        if (k === 0) continue;
        const xBase = kx0 + cx * m;
        for (; k > 0; k--) {
          // A spot on a 256 × 256 sub-grid of the cell (8 bits per axis;
          // one 32-bit draw serves two figures).
          if (left === 0) {
            bits = (random() * 4294967296) >>> 0;
            left = 2;
          }
          const bx = bits & 0xff, by = (bits >>> 8) & 0xff;
          bits >>>= 16;
          left--;
          // Closed window: |x − node| ≤ W/2 → node range [lo, hi]; with whole
          // cell origins the offsets come from tables, else computed.
          let ilo: number, ihi: number, jlo: number, jhi: number;
          if (whole) {
            ilo = xBase + loX[bx];
            ihi = xBase + hiX[bx];
            jlo = yBase + loY[by];
            jhi = yBase + hiY[by];
          } else {
            const x = xBase + (bx + 0.5) * scale;
            const y = yBase + (by + 0.5) * scale;
            ilo = Math.ceil(x - halfX);
            ihi = Math.floor(x + halfX);
            jlo = Math.ceil(y - halfY);
            jhi = Math.floor(y + halfY);
          }
          if (ilo < 0) ilo = 0;
          if (jlo < 0) jlo = 0;
          if (ihi > mx - 1) ihi = mx - 1;
          if (jhi > my - 1) jhi = my - 1;
          if (ilo > ihi || jlo > jhi) continue;
          diff[jlo * w1 + ilo]++;
          diff[jlo * w1 + ihi + 1]--;
          diff[(jhi + 1) * w1 + ilo]--;
          diff[(jhi + 1) * w1 + ihi + 1]++;
        }
      }
    }
    // In-place 2-D prefix sums give the count at every scanned position.
    let max = 0;
    for (let jj = 0; jj < my; jj++) {
      let run = 0;
      for (let ii = 0; ii < mx; ii++) {
        const k = jj * w1 + ii;
        run += diff[k];
        const v = run + (jj > 0 ? diff[k - w1] : 0);
        diff[k] = v;
        if (v > max && evalAdmissible[jj * mx + ii]) max = v;
      }
    }
    return max;
  };
}
