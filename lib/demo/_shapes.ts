/**
 * Private shape helpers of the demo and benchmark generators: seeded
 * irregular outlines, a point-in-ring test and a scanline rasterizer.
 *
 * Everything is in level-0 pixels (x right, y down) unless a name says µm.
 * These helpers only place invented data; the library's own geometry lives in
 * lib/geometry/.
 *
 * @module
 */

import type { PolygonPx, Ring, Vec2 } from "../types.ts";
import { normal, type Random } from "../random.ts";
import { roundTo } from "../numbers.ts";

/** A smooth random radius profile r(θ) = 1 + Σ a_k cos(kθ + φ_k), |Σ a_k| ≤ `wobble`. */
export interface Profile {
  amps: number[];
  phases: number[];
}

/** Draws a profile with harmonics 2..`harmonics`+1 whose amplitudes sum to `wobble`. */
export function randomProfile(random: Random, wobble: number, harmonics = 6): Profile {
  const raw: number[] = [];
  for (let k = 0; k < harmonics; k++) raw.push((0.3 + random()) / (k + 1));
  const total = raw.reduce((a, b) => a + b, 0);
  return {
    amps: raw.map((a) => a / total * wobble),
    phases: raw.map(() => random() * 2 * Math.PI),
  };
}

/** Evaluates a profile at angle θ. */
export function profileAt(p: Profile, theta: number): number {
  let r = 1;
  for (let k = 0; k < p.amps.length; k++) r += p.amps[k] * Math.cos((k + 2) * theta + p.phases[k]);
  return r;
}

/** An affine frame: a normalized disc-like blob of radius ~1 mapped to the slide. */
export interface Frame {
  cx: number;
  cy: number;
  rx: number;
  ry: number;
  rotation: number;
}

/** Maps normalized (u, v) to slide pixels through `frame`. */
export function toSlide(f: Frame, u: number, v: number): Vec2 {
  const c = Math.cos(f.rotation), s = Math.sin(f.rotation);
  const x = u * f.rx, y = v * f.ry;
  return [f.cx + c * x - s * y, f.cy + s * x + c * y];
}

/**
 * Samples a closed star-shaped ring in normalized space, centre (u0, v0),
 * radius `scale`·r(θ), `n` vertices, then maps it to the slide and rounds.
 * `clockwise` reverses the order (used for holes, to vary winding).
 */
export function blobRing(
  f: Frame,
  p: Profile,
  n: number,
  options: { u0?: number; v0?: number; scale?: number; jitter?: number; random?: Random } = {},
): Ring {
  const { u0 = 0, v0 = 0, scale = 1, jitter = 0, random } = options;
  const ring: Ring = [];
  for (let i = 0; i < n; i++) {
    const theta = 2 * Math.PI * i / n;
    // A little per-vertex roughness so outlines look hand-drawn, not analytic.
    const j = jitter > 0 && random ? 1 + jitter * (random() - 0.5) : 1;
    const r = scale * profileAt(p, theta) * j;
    const [x, y] = toSlide(f, u0 + r * Math.cos(theta), v0 + r * Math.sin(theta));
    ring.push([roundTo(x, 1), roundTo(y, 1)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/** Reverses a closed ring (keeps it closed). */
export function reversed(ring: Ring): Ring {
  return ring.slice().reverse();
}

/** Even–odd point-in-ring test (ray casting); edges are not treated specially. */
export function inRing(ring: Ring, x: number, y: number): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 2; i < ring.length - 1; j = i++) {
    const [xi, yi] = ring[i], [xj, yj] = ring[j];
    if ((yi > y) !== (yj > y) && x < (xj - xi) * (y - yi) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/** Point in polygon (outer ring minus holes). */
export function inPolygon(polygon: PolygonPx, x: number, y: number): boolean {
  if (!inRing(polygon[0], x, y)) return false;
  for (let h = 1; h < polygon.length; h++) if (inRing(polygon[h], x, y)) return false;
  return true;
}

/** Point in any of the polygons. */
export function inAny(polygons: PolygonPx[], x: number, y: number): boolean {
  for (const p of polygons) if (inPolygon(p, x, y)) return true;
  return false;
}

/** Signed shoelace area of a closed ring, px² (positive = clockwise on screen with y down). */
export function ringArea(ring: Ring): number {
  let a = 0;
  for (let i = 0; i < ring.length - 1; i++) {
    a += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  }
  return a / 2;
}

/** Area of a polygon with holes, px² (absolute ring areas). */
export function polygonArea(polygon: PolygonPx): number {
  let a = Math.abs(ringArea(polygon[0]));
  for (let h = 1; h < polygon.length; h++) a -= Math.abs(ringArea(polygon[h]));
  return a;
}

/** Draws a point from an isotropic Gaussian focus (σ in px along x and y). */
export function gaussianPoint(
  random: Random,
  cx: number,
  cy: number,
  sx: number,
  sy: number,
): Vec2 {
  return [cx + sx * normal(random), cy + sy * normal(random)];
}

/**
 * Rasterizes polygons (even–odd over all rings) onto a `width`×`height` grid
 * whose pixel (i, j) has its centre at ((i + 0.5)·cell, (j + 0.5)·cell) in
 * slide px. Returns 255 inside, 0 outside, row-major.
 */
export function rasterize(
  polygons: PolygonPx[],
  width: number,
  height: number,
  cellPx: number,
): Uint8Array {
  const out = new Uint8Array(width * height);
  const rings: Ring[] = polygons.flat();
  const xs: number[] = [];
  for (let j = 0; j < height; j++) {
    const y = (j + 0.5) * cellPx;
    xs.length = 0;
    for (const ring of rings) {
      for (let i = 0; i < ring.length - 1; i++) {
        const [x1, y1] = ring[i], [x2, y2] = ring[i + 1];
        if ((y1 > y) !== (y2 > y)) xs.push(x1 + (y - y1) * (x2 - x1) / (y2 - y1));
      }
    }
    xs.sort((a, b) => a - b);
    for (let k = 0; k + 1 < xs.length; k += 2) {
      const i0 = Math.max(0, Math.ceil(xs[k] / cellPx - 0.5));
      const i1 = Math.min(width - 1, Math.floor(xs[k + 1] / cellPx - 0.5));
      for (let i = i0; i <= i1; i++) out[j * width + i] = 255;
    }
  }
  return out;
}
