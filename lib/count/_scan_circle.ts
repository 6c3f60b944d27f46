/**
 * The circle simulator of the scan test: a simulated point counts at its
 * cell's node, and the count is interpolated between the two node disks
 * whose sizes bracket the circle's area (so the simulated window has the
 * window's area; the simulated maximum may be fractional).
 *
 * @module
 */

import { type AliasTable, cellCountSampler } from "./_scan_sampling.ts";

/**
 * One simulation of the circle statistic. A point counts at its cell's node;
 * the window holds the nodes within a distance threshold (half-widths per
 * row). No threshold gives exactly the circle's area, so the count is
 * interpolated between the largest inner and smallest outer disk of whole
 * rings: v = v_in + w·(v_out − v_in) with w matching the area. Cells are
 * centred on the nodes of a lattice of spacing S/q; scanned node (ii, jj)
 * is fine-lattice node (ii·q, jj·q), and the first cell's node is (kx0, ky0).
 */
export function circleSimulator(o: {
  alias: AliasTable;
  weights: Float64Array;
  cw: number;
  ch: number;
  q: number;
  kx0: number;
  ky0: number;
  mx: number;
  my: number;
  /** Window radius in cell spacings. */
  radiusNodes: number;
  evalAdmissible: Uint8Array;
  n: number;
}): (random: () => number) => number {
  const { alias, weights, cw, ch, q, kx0, ky0, mx, my, radiusNodes, evalAdmissible, n } = o;
  const st = diskStencils(radiusNodes);
  const reach = st.reach, hIn = st.halfIn, hOut = st.halfOut, wRing = st.weight;
  const cellCounts = new Int32Array(cw * ch);
  const prefix = new Int32Array(ch * (cw + 1));
  const drawCounts = cellCountSampler(weights, alias, n);
  return (random) => {
    drawCounts(cellCounts, random);
    for (let cy = 0; cy < ch; cy++) {
      let run = 0;
      const base = cy * (cw + 1);
      prefix[base] = 0;
      for (let cx = 0; cx < cw; cx++) {
        run += cellCounts[cy * cw + cx];
        prefix[base + cx + 1] = run;
      }
    }
    let max = 0;
    for (let jj = 0; jj < my; jj++) {
      for (let ii = 0; ii < mx; ii++) {
        if (!evalAdmissible[jj * mx + ii]) continue;
        const ci = ii * q - kx0;
        let vIn = 0, vOut = 0;
        for (let dj = -reach; dj <= reach; dj++) {
          const cy = jj * q + dj - ky0;
          if (cy < 0 || cy >= ch) continue;
          const base = cy * (cw + 1);
          const ho = hOut[dj + reach];
          let lo = ci - ho, hi = ci + ho;
          if (lo < 0) lo = 0;
          if (hi > cw - 1) hi = cw - 1;
          if (lo <= hi) vOut += prefix[base + hi + 1] - prefix[base + lo];
          const h = hIn[dj + reach];
          if (h < 0) continue;
          lo = ci - h;
          hi = ci + h;
          if (lo < 0) lo = 0;
          if (hi > cw - 1) hi = cw - 1;
          if (lo <= hi) vIn += prefix[base + hi + 1] - prefix[base + lo];
        }
        const v = vIn + wRing * (vOut - vIn);
        if (v > max) max = v;
      }
    }
    return max;
  };
}

/**
 * Two disks of grid nodes around a circle of radius `radiusNodes` (in node
 * spacings): the largest whole-ring disk with at most π·r² nodes and the
 * smallest with at least that many, as half-widths per row offset (−1: row
 * empty), and the weight w with n_in + w·(n_out − n_in) = π·r².
 */
function diskStencils(radiusNodes: number): {
  reach: number;
  halfIn: Int32Array;
  halfOut: Int32Array;
  weight: number;
} {
  const target = Math.PI * radiusNodes * radiusNodes;
  const lim = Math.floor(radiusNodes) + 2;
  const d2s: number[] = [];
  for (let a = -lim; a <= lim; a++) for (let b = -lim; b <= lim; b++) d2s.push(a * a + b * b);
  d2s.sort((x, y) => x - y);
  // Whole rings: the count of nodes with d² ≤ t for each distinct t.
  let inD2 = -1, inN = 0, outD2 = 0, outN = 0;
  for (let k = 0; k < d2s.length; k++) {
    if (k + 1 < d2s.length && d2s[k + 1] === d2s[k]) continue;
    if (k + 1 <= target) {
      inD2 = d2s[k];
      inN = k + 1;
    } else {
      outD2 = d2s[k];
      outN = k + 1;
      break;
    }
  }
  const reach = Math.floor(Math.sqrt(outD2));
  const rowHalf = (d2: number) => {
    const half = new Int32Array(2 * reach + 1);
    for (let dj = -reach; dj <= reach; dj++) {
      half[dj + reach] = d2 - dj * dj < 0 ? -1 : Math.floor(Math.sqrt(d2 - dj * dj) + 1e-9);
    }
    return half;
  };
  return {
    reach,
    halfIn: rowHalf(inD2),
    halfOut: rowHalf(outD2),
    weight: outN === inN ? 0 : (target - inN) / (outN - inN),
  };
}
