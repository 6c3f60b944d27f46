/**
 * Binary morphology with disks measured in micrometres, and connected
 * components, on row-major 0/1 masks. Private to lib/tissue.
 *
 * Disks are exact Euclidean disks in µm, also when pixels are not square:
 * a pixel's distance to another is √((Δi·mppX)² + (Δj·mppY)²). Distances
 * come from the exact squared Euclidean distance transform of Felzenszwalb
 * and Huttenlocher (2012, Theory of Computing 8:415–428), with the sample
 * spacing of each axis folded into its one-dimensional pass.
 *
 * @module
 */

const FAR = 1e20;

/** One-dimensional squared distance transform of `f` (n samples `w` apart) into `d`. */
function transform1d(
  f: Float64Array,
  n: number,
  w: number,
  d: Float64Array,
  v: Int32Array,
  z: Float64Array,
): void {
  let k = 0;
  v[0] = 0;
  z[0] = -Infinity;
  z[1] = Infinity;
  for (let q = 1; q < n; q++) {
    const fq = f[q] + (q * w) * (q * w);
    let p = v[k];
    let s = (fq - (f[p] + (p * w) * (p * w))) / (2 * w * (q - p));
    // z[0] is −∞, so this stops at k = 0
    while (s <= z[k]) {
      k--;
      p = v[k];
      s = (fq - (f[p] + (p * w) * (p * w))) / (2 * w * (q - p));
    }
    k++;
    v[k] = q;
    z[k] = s;
    z[k + 1] = Infinity;
  }
  k = 0;
  for (let q = 0; q < n; q++) {
    while (z[k + 1] < q * w) k++;
    const dq = (q - v[k]) * w;
    d[q] = dq * dq + f[v[k]];
  }
}

/**
 * Squared distance in µm² from each pixel to the nearest pixel whose mask
 * value is `target` (a huge number when there is none).
 */
export function squaredDistanceTo(
  mask: Uint8Array,
  width: number,
  height: number,
  target: 0 | 1,
  mppX: number,
  mppY: number,
): Float64Array {
  const out = new Float64Array(width * height);
  for (let k = 0; k < out.length; k++) out[k] = (mask[k] !== 0) === (target === 1) ? 0 : FAR;
  const n = Math.max(width, height);
  const f = new Float64Array(n), d = new Float64Array(n);
  const v = new Int32Array(n), z = new Float64Array(n + 1);
  // columns (along y), then rows (along x)
  for (let x = 0; x < width; x++) {
    for (let y = 0; y < height; y++) f[y] = out[y * width + x];
    transform1d(f, height, mppY, d, v, z);
    for (let y = 0; y < height; y++) out[y * width + x] = d[y];
  }
  for (let y = 0; y < height; y++) {
    const row = y * width;
    for (let x = 0; x < width; x++) f[x] = out[row + x];
    transform1d(f, width, mppX, d, v, z);
    for (let x = 0; x < width; x++) out[row + x] = d[x];
  }
  return out;
}

/**
 * Dilation by a closed disk of `radiusUm`: a pixel is set when a set pixel
 * lies within the radius (centre to centre).
 */
export function dilateDisk(
  mask: Uint8Array,
  width: number,
  height: number,
  radiusUm: number,
  mppX: number,
  mppY: number,
): Uint8Array {
  if (radiusUm <= 0) return mask.slice();
  const d = squaredDistanceTo(mask, width, height, 1, mppX, mppY);
  const r2 = radiusUm * radiusUm, out = new Uint8Array(mask.length);
  for (let k = 0; k < out.length; k++) out[k] = d[k] <= r2 ? 1 : 0;
  return out;
}

/**
 * Erosion by a closed disk of `radiusUm`: a pixel stays set when no unset
 * pixel of the image lies within the radius. Beyond the image counts as set,
 * so that the border does not eat into tissue cut by it (see also `closeOrOpen`).
 */
export function erodeDisk(
  mask: Uint8Array,
  width: number,
  height: number,
  radiusUm: number,
  mppX: number,
  mppY: number,
): Uint8Array {
  if (radiusUm <= 0) return mask.slice();
  const d = squaredDistanceTo(mask, width, height, 0, mppX, mppY);
  const r2 = radiusUm * radiusUm, out = new Uint8Array(mask.length);
  for (let k = 0; k < out.length; k++) out[k] = mask[k] !== 0 && d[k] > r2 ? 1 : 0;
  return out;
}

/**
 * Closing (dilation, then erosion) or opening (erosion, then dilation) by a
 * closed disk of `radiusUm`. The image is first extended by the disk's
 * reach, repeating its edge pixels, as if the scene went on beyond the
 * border: glass along an edge is not closed over, and tissue cut by an edge
 * is not opened away from it.
 */
export function closeOrOpen(
  kind: "close" | "open",
  mask: Uint8Array,
  width: number,
  height: number,
  radiusUm: number,
  mppX: number,
  mppY: number,
): Uint8Array {
  if (radiusUm <= 0) return mask.slice();
  const px = Math.ceil(radiusUm / mppX) + 1, py = Math.ceil(radiusUm / mppY) + 1;
  const W = width + 2 * px, H = height + 2 * py;
  const big = new Uint8Array(W * H);
  for (let y = 0; y < H; y++) {
    const sy = Math.min(height - 1, Math.max(0, y - py));
    for (let x = 0; x < W; x++) {
      const sx = Math.min(width - 1, Math.max(0, x - px));
      big[y * W + x] = mask[sy * width + sx];
    }
  }
  const done = kind === "close"
    ? erodeDisk(dilateDisk(big, W, H, radiusUm, mppX, mppY), W, H, radiusUm, mppX, mppY)
    : dilateDisk(erodeDisk(big, W, H, radiusUm, mppX, mppY), W, H, radiusUm, mppX, mppY);
  const out = new Uint8Array(width * height);
  for (let y = 0; y < height; y++) {
    out.set(done.subarray((y + py) * W + px, (y + py) * W + px + width), y * width);
  }
  return out;
}

/** Connected components of the pixels equal to `value`. */
export interface Components {
  /** Component index per pixel, −1 for the other pixels. */
  labels: Int32Array;
  /** Pixels per component. */
  sizes: number[];
  /** Whether each component touches the image border. */
  touchesBorder: boolean[];
}

/**
 * Labels the connected components of the pixels equal to `value` (4- or
 * 8-connected), in scan order of their first pixel.
 */
export function labelComponents(
  mask: Uint8Array,
  width: number,
  height: number,
  value: 0 | 1,
  connectivity: 4 | 8,
): Components {
  const n = width * height;
  const labels = new Int32Array(n).fill(-1);
  const sizes: number[] = [], touchesBorder: boolean[] = [];
  const stack = new Int32Array(n);
  // 1 where the pixel is of the kind labelled and not yet labelled
  const open = new Uint8Array(n);
  for (let k = 0; k < n; k++) open[k] = (mask[k] !== 0) === (value === 1) ? 1 : 0;
  const eight = connectivity === 8;
  for (let start = 0; start < n; start++) {
    if (open[start] === 0) continue;
    const id = sizes.length;
    let size = 0, border = false, top = 0;
    stack[top++] = start;
    open[start] = 0;
    while (top > 0) {
      const k = stack[--top];
      labels[k] = id;
      size++;
      const x = k % width;
      const left = x > 0, right = x < width - 1, up = k >= width, down = k < n - width;
      if (!left || !right || !up || !down) border = true;
      if (left && open[k - 1]) (open[k - 1] = 0, stack[top++] = k - 1);
      if (right && open[k + 1]) (open[k + 1] = 0, stack[top++] = k + 1);
      if (up && open[k - width]) (open[k - width] = 0, stack[top++] = k - width);
      if (down && open[k + width]) (open[k + width] = 0, stack[top++] = k + width);
      if (eight) {
        if (left && up && open[k - width - 1]) {
          open[k - width - 1] = 0;
          stack[top++] = k - width - 1;
        }
        if (right && up && open[k - width + 1]) {
          open[k - width + 1] = 0;
          stack[top++] = k - width + 1;
        }
        if (left && down && open[k + width - 1]) {
          open[k + width - 1] = 0;
          stack[top++] = k + width - 1;
        }
        if (right && down && open[k + width + 1]) {
          open[k + width + 1] = 0;
          stack[top++] = k + width + 1;
        }
      }
    }
    sizes.push(size);
    touchesBorder.push(border);
  }
  return { labels, sizes, touchesBorder };
}
