/**
 * The bipartite graph of candidate–reference pairs within a radius, and the
 * canonical orders both matchings use (not public).
 *
 * @module
 */

/** Points in the µm plane (x right, y down). */
export interface PointsUm {
  /** x of each point, µm. */
  xUm: Float64Array;
  /** y of each point, µm. */
  yUm: Float64Array;
}

/** Pairs within the radius, per candidate (compressed rows). */
export interface PairGraph {
  /** Edges of candidate c are `start[c]` … `start[c + 1] − 1`. */
  start: Int32Array;
  /** Reference of each edge. */
  ref: Int32Array;
  /** Distance of each edge, µm. */
  distUm: Float64Array;
}

/**
 * Candidate indices in rank order: score descending (a missing score, NaN,
 * ranks above every score, since it passes every threshold), then y, then x
 * ascending, then input order.
 */
export function rankCandidates(points: PointsUm, score: Float64Array): Int32Array {
  const n = points.xUm.length;
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  const { xUm, yUm } = points;
  const key = (i: number) => (Number.isNaN(score[i]) ? Infinity : score[i]);
  return order.sort((a, b) => key(b) - key(a) || yUm[a] - yUm[b] || xUm[a] - xUm[b] || a - b);
}

/** Rank of each reference point: y, then x ascending, then input order. */
export function rankReferences(points: PointsUm): Int32Array {
  const n = points.xUm.length;
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  const { xUm, yUm } = points;
  order.sort((a, b) => yUm[a] - yUm[b] || xUm[a] - xUm[b] || a - b);
  const rank = new Int32Array(n);
  for (let k = 0; k < n; k++) rank[order[k]] = k;
  return rank;
}

/**
 * Every candidate–reference pair with dx² + dy² ≤ r² (µm; a pair exactly at
 * the radius is within it). References are bucketed in cells a little wider
 * than r, sorted by cell, and each candidate reads the three rows of three
 * cells around its own. Each candidate's edges are sorted by distance, then
 * by reference rank, so "the nearest" is well defined.
 */
export function buildPairGraph(
  reference: PointsUm,
  candidates: PointsUm,
  radiusUm: number,
  refRank: Int32Array,
): PairGraph {
  const nr = reference.xUm.length, nc = candidates.xUm.length;
  const start = new Int32Array(nc + 1);
  if (nr === 0 || nc === 0) {
    return { start, ref: new Int32Array(0), distUm: new Float64Array(0) };
  }
  const { xUm: rx, yUm: ry } = reference;
  let minX = Infinity, minY = Infinity, maxX = -Infinity;
  for (let i = 0; i < nr; i++) {
    if (rx[i] < minX) minX = rx[i];
    if (rx[i] > maxX) maxX = rx[i];
    if (ry[i] < minY) minY = ry[i];
  }
  // Slightly wider than r, so rounding can never put a pair two cells apart.
  const cell = radiusUm * (1 + 1e-6);
  const cols = Math.floor((maxX - minX) / cell) + 3;
  const cellOf = (x: number, y: number) =>
    Math.floor((y - minY) / cell) * cols + Math.floor((x - minX) / cell) + 1;
  const keys = new Float64Array(nr);
  const byCell = new Int32Array(nr);
  for (let i = 0; i < nr; i++) {
    keys[i] = cellOf(rx[i], ry[i]);
    byCell[i] = i;
  }
  byCell.sort((a, b) => keys[a] - keys[b] || a - b);
  const sortedKeys = new Float64Array(nr);
  for (let k = 0; k < nr; k++) sortedKeys[k] = keys[byCell[k]];
  const lowerBound = (v: number) => {
    let lo = 0, hi = nr;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sortedKeys[mid] < v) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };

  const r2 = radiusUm * radiusUm;
  let cap = Math.max(16, nc);
  let edgeRef = new Int32Array(cap);
  let edgeDist = new Float64Array(cap);
  let m = 0;
  const { xUm: cx, yUm: cy } = candidates;
  const localRef: number[] = [], localD: number[] = [], idx: number[] = [];
  for (let c = 0; c < nc; c++) {
    const x = cx[c], y = cy[c];
    const row = Math.floor((y - minY) / cell);
    const col = Math.floor((x - minX) / cell) + 1;
    localRef.length = localD.length = 0;
    if (col >= -1 && col <= cols + 1) {
      for (let dr = -1; dr <= 1; dr++) {
        const base = (row + dr) * cols;
        const lo = base + Math.max(col - 1, 0), hi = base + Math.min(col + 1, cols - 1);
        if (hi < lo) continue;
        for (let k = lowerBound(lo); k < nr && sortedKeys[k] <= hi; k++) {
          const i = byCell[k];
          const dx = rx[i] - x, dy = ry[i] - y;
          const d2 = dx * dx + dy * dy;
          if (d2 <= r2) {
            localRef.push(i);
            localD.push(Math.sqrt(d2));
          }
        }
      }
    }
    const L = localRef.length;
    if (m + L > cap) {
      cap = Math.max(2 * cap, m + L);
      const nr2 = new Int32Array(cap), nd2 = new Float64Array(cap);
      nr2.set(edgeRef.subarray(0, m));
      nd2.set(edgeDist.subarray(0, m));
      edgeRef = nr2;
      edgeDist = nd2;
    }
    if (L === 1) {
      edgeRef[m] = localRef[0];
      edgeDist[m++] = localD[0];
    } else if (L > 1) {
      idx.length = 0;
      for (let t = 0; t < L; t++) idx.push(t);
      idx.sort((a, b) => localD[a] - localD[b] || refRank[localRef[a]] - refRank[localRef[b]]);
      for (const t of idx) {
        edgeRef[m] = localRef[t];
        edgeDist[m++] = localD[t];
      }
    }
    start[c + 1] = m;
  }
  return { start, ref: edgeRef.slice(0, m), distUm: edgeDist.slice(0, m) };
}
