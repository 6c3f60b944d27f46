/**
 * Private: exact per-edge area contributions (Green's theorem).
 *
 * For a region bounded by oriented edges (outer rings positive, holes
 * negative in the shoelace sense), area = Σ over edges of ∫ x dy. Restricted
 * to the box [X0, X1] × [lo, hi], each edge contributes
 * ∫ clamp(x(y) − X0, 0, X1 − X0) dy over the part of the edge with y in
 * [lo, hi]; the integrand is piecewise linear, so the pieces are exact
 * trapezoids.
 *
 * @module
 */

/** c(x) = clamp(x − X0, 0, W). */
function clampW(x: number, x0: number, w: number): number {
  const d = x - x0;
  return d <= 0 ? 0 : d >= w ? w : d;
}

/**
 * ∫ clamp(x(y) − X0, 0, X1 − X0) dy along the segment (ax, ay) → (bx, by),
 * restricted to y in [lo, hi] (signed by the direction of travel in y).
 */
export function edgeBoxIntegral(
  ax: number,
  ay: number,
  bx: number,
  by: number,
  X0: number,
  X1: number,
  lo: number,
  hi: number,
): number {
  if (ay === by) return 0;
  // clip to the y-band
  let sax = ax, say = ay, sbx = bx, sby = by;
  const up = by > ay;
  const ymin = up ? ay : by, ymax = up ? by : ay;
  if (ymax <= lo || ymin >= hi) return 0;
  if (ymin < lo || ymax > hi) {
    const k = (bx - ax) / (by - ay);
    if (say < lo) {
      say = lo;
      sax = ax + (lo - ay) * k;
    } else if (say > hi) {
      say = hi;
      sax = ax + (hi - ay) * k;
    }
    if (sby < lo) {
      sby = lo;
      sbx = ax + (lo - ay) * k;
    } else if (sby > hi) {
      sby = hi;
      sbx = ax + (hi - ay) * k;
    }
  }
  const w = X1 - X0;
  const dy = sby - say;
  // fast regimes
  if (sax <= X0 && sbx <= X0) return 0;
  if (sax >= X1 && sbx >= X1) return w * dy;
  if (sax >= X0 && sax <= X1 && sbx >= X0 && sbx <= X1) {
    return dy * ((sax + sbx) / 2 - X0);
  }
  // split where x crosses X0 and X1; each piece is linear in one regime
  const dx = sbx - sax;
  let ta = (X0 - sax) / dx, xa = X0;
  let tb = (X1 - sax) / dx, xb = X1;
  if (ta > tb) {
    const t = ta;
    ta = tb;
    tb = t;
    xa = X1;
    xb = X0;
  }
  let sum = 0;
  let py = say, pc = clampW(sax, X0, w);
  if (ta > 0 && ta < 1) {
    const y = say + ta * dy;
    const cc = xa === X0 ? 0 : w;
    sum += (y - py) * (pc + cc) / 2;
    py = y;
    pc = cc;
  }
  if (tb > 0 && tb < 1) {
    const y = say + tb * dy;
    const cc = xb === X0 ? 0 : w;
    sum += (y - py) * (pc + cc) / 2;
    py = y;
    pc = cc;
  }
  sum += (sby - py) * (pc + clampW(sbx, X0, w)) / 2;
  return sum;
}

/** Signed angle from p to q (radians, in (−π, π]). */
function angle(px: number, py: number, qx: number, qy: number): number {
  return Math.atan2(px * qy - py * qx, px * qx + py * qy);
}

/**
 * Signed area of triangle(origin, p, q) ∩ disk(origin, r), for the segment
 * p → q given relative to the disk centre. Pieces inside the circle add
 * ½·cross, pieces outside add the circular sector ½·r²·angle.
 */
export function edgeDiskArea(px: number, py: number, qx: number, qy: number, r: number): number {
  const r2 = r * r;
  const dx = qx - px, dy = qy - py;
  const a = dx * dx + dy * dy;
  if (a === 0) return 0;
  const b = px * dx + py * dy;
  const c = px * px + py * py - r2;
  const disc = b * b - a * c;
  if (disc <= 0) {
    // the line misses (or touches) the circle: a pure sector
    return 0.5 * r2 * angle(px, py, qx, qy);
  }
  const sq = Math.sqrt(disc);
  // roots of a·t² + 2b·t + c = 0, computed stably
  let t1: number, t2: number;
  if (b >= 0) {
    const u = -b - sq;
    t1 = u / a;
    t2 = c / u;
  } else {
    const u = -b + sq;
    t1 = c / u;
    t2 = u / a;
  }
  if (t1 > t2) {
    const t = t1;
    t1 = t2;
    t2 = t;
  }
  if (t2 <= 0 || t1 >= 1) return 0.5 * r2 * angle(px, py, qx, qy);
  const s1 = t1 > 0 ? t1 : 0, s2 = t2 < 1 ? t2 : 1;
  const ux = px + s1 * dx, uy = py + s1 * dy;
  const vx = px + s2 * dx, vy = py + s2 * dy;
  let sum = 0.5 * (ux * vy - uy * vx);
  if (s1 > 0) sum += 0.5 * r2 * angle(px, py, ux, uy);
  if (s2 < 1) sum += 0.5 * r2 * angle(vx, vy, qx, qy);
  return sum;
}

/** ½·r²·angle subtended by the segment at the origin (its area if it stayed outside). */
export function edgeSector(px: number, py: number, qx: number, qy: number, r: number): number {
  return 0.5 * r * r * angle(px, py, qx, qy);
}
