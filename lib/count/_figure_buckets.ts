/**
 * A bucket grid over points, for fetching the points near a place.
 *
 * @module
 */

/** Points sorted into square buckets (CSR layout). */
export interface FigureBuckets {
  x0: number;
  y0: number;
  size: number;
  nbx: number;
  nby: number;
  /** start[b]..start[b+1] index into `order`. */
  start: Int32Array;
  order: Int32Array;
  xUm: Float64Array;
  yUm: Float64Array;
}

/** Sorts points into buckets of `size` µm. */
export function bucketFigures(xUm: Float64Array, yUm: Float64Array, size: number): FigureBuckets {
  const n = xUm.length;
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let k = 0; k < n; k++) {
    if (xUm[k] < minX) minX = xUm[k];
    if (xUm[k] > maxX) maxX = xUm[k];
    if (yUm[k] < minY) minY = yUm[k];
    if (yUm[k] > maxY) maxY = yUm[k];
  }
  if (n === 0) {
    minX =
      minY =
      maxX =
      maxY =
        0;
  }
  const nbx = Math.max(1, Math.floor((maxX - minX) / size) + 1);
  const nby = Math.max(1, Math.floor((maxY - minY) / size) + 1);
  const start = new Int32Array(nbx * nby + 1);
  const bucket = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const b = Math.floor((yUm[k] - minY) / size) * nbx + Math.floor((xUm[k] - minX) / size);
    bucket[k] = b;
    start[b + 1]++;
  }
  for (let b = 0; b < nbx * nby; b++) start[b + 1] += start[b];
  const fill = start.slice(0, nbx * nby);
  const order = new Int32Array(n);
  for (let k = 0; k < n; k++) order[fill[bucket[k]]++] = k;
  return { x0: minX, y0: minY, size, nbx, nby, start, order, xUm, yUm };
}

/** Indices of the points in the box [x0, x1] × [y0, y1] (inclusive), in bucket order. */
export function pointsInBox(
  b: FigureBuckets,
  x0: number,
  y0: number,
  x1: number,
  y1: number,
): number[] {
  const out: number[] = [];
  const i0 = Math.max(0, Math.floor((x0 - b.x0) / b.size));
  const i1 = Math.min(b.nbx - 1, Math.floor((x1 - b.x0) / b.size));
  const j0 = Math.max(0, Math.floor((y0 - b.y0) / b.size));
  const j1 = Math.min(b.nby - 1, Math.floor((y1 - b.y0) / b.size));
  for (let j = j0; j <= j1; j++) {
    for (let i = i0; i <= i1; i++) {
      const q = j * b.nbx + i;
      for (let t = b.start[q]; t < b.start[q + 1]; t++) {
        const k = b.order[t];
        const x = b.xUm[k], y = b.yUm[k];
        if (x >= x0 && x <= x1 && y >= y0 && y <= y1) out.push(k);
      }
    }
  }
  return out;
}
