/**
 * Tissue masks from PNG images: decoding, size checks and exact contour
 * tracing into slide-pixel polygons.
 *
 * @module
 */

import { decode } from "fast-png";
import type { MultiPolygonPx, PolygonPx, RegionPart, Ring, SlideInfo } from "../types.ts";
import { inputError } from "../errors.ts";
import { ringAreaPx2 } from "../geometry/planar_area.ts";
import { roundTo } from "../numbers.ts";

/** A binary mask, row-major, `data[y·width + x]` is 1 for tissue and 0 for background. */
export interface Mask {
  /** Width in mask pixels. */
  width: number;
  /** Height in mask pixels. */
  height: number;
  /** `width × height` values, 1 for tissue and 0 for background. */
  data: Uint8Array;
}

/** Options of {@linkcode decodeMaskPng}. */
export interface DecodeMaskOptions {
  /** The file name as the user gave it, for messages. */
  fileName: string;
}

/**
 * Decodes a PNG tissue mask.
 *
 * A pixel is tissue when any colour channel is nonzero and it is not fully
 * transparent: greyscale (any bit depth, 1-bit included) nonzero; RGB when any
 * of R, G, B is nonzero; palette images through their palette colours;
 * an alpha of 0 (alpha channel, or a `tRNS` transparent colour or palette
 * entry) is always background.
 *
 * @param bytes The PNG file's bytes.
 * @param options `fileName` for messages.
 * @returns The mask (1 = tissue, 0 = background).
 * @throws {SyntaxError} When the bytes are not a PNG that can be decoded.
 *
 * @example A 2 × 1 greyscale mask
 * ```ts
 * import { encode } from "fast-png";
 * import { decodeMaskPng } from "./read_mask.ts";
 * const png = encode({ width: 2, height: 1, data: new Uint8Array([0, 255]), channels: 1, depth: 8 });
 * const m = decodeMaskPng(png, { fileName: "QVT-24-001-mask.png" });
 * if (m.data.join() !== "0,1") throw new Error(m.data.join());
 * ```
 */
export function decodeMaskPng(bytes: Uint8Array, options: DecodeMaskOptions): Mask {
  const fileName = options.fileName;
  let png: ReturnType<typeof decode>;
  try {
    png = decode(bytes, { checkCrc: true });
  } catch (e) {
    // the decoder may quote damaged bytes (a chunk type): keep the message on one printable line
    const why = (e instanceof Error ? e.message : String(e)).replace(/[^\x20-\x7e]/g, "?");
    throw inputError(SyntaxError, "tissue mask", fileName, `not a readable PNG image (${why})`, e);
  }
  const { width, height, channels, depth } = png;
  if (!(width > 0 && height > 0)) {
    throw inputError(
      SyntaxError,
      "tissue mask",
      fileName,
      `the image is empty (${width} × ${height})`,
    );
  }
  const n = width * height;
  const out = new Uint8Array(n);
  const src = png.data;
  const rowSamples = width * channels;
  const rowBytes = Math.ceil(rowSamples * depth / 8);
  const need = depth < 8 ? rowBytes * height : rowSamples * height;
  if (src.length < need) {
    throw inputError(SyntaxError, "tissue mask", fileName, "the image data is truncated");
  }
  const sample = (y: number, s: number): number => {
    if (depth >= 8) return src[y * rowSamples + s];
    const bit = s * depth;
    const byte = src[y * rowBytes + (bit >> 3)];
    return (byte >> (8 - depth - (bit & 7))) & ((1 << depth) - 1);
  };
  const palette = png.palette;
  const trns = png.transparency;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const s = x * channels;
      let on = false;
      if (palette !== undefined) {
        const c = palette[sample(y, s)];
        if (c === undefined) {
          throw inputError(
            SyntaxError,
            "tissue mask",
            fileName,
            `pixel (${x}, ${y}) uses a colour missing from the palette`,
          );
        }
        on = (c[0] !== 0 || c[1] !== 0 || c[2] !== 0) && (c.length < 4 || c[3] !== 0);
      } else {
        // colour channels: 1 (grey), 2 (grey + alpha), 3 (RGB), 4 (RGBA)
        const colours = channels === 2 || channels === 4 ? channels - 1 : channels;
        for (let c = 0; c < colours; c++) if (sample(y, s + c) !== 0) on = true;
        if (on && colours < channels && sample(y, s + colours) === 0) on = false;
        if (on && trns !== undefined && trns.length === colours) {
          let same = true;
          for (let c = 0; c < colours; c++) if (sample(y, s + c) !== trns[c]) same = false;
          if (same) on = false;
        }
      }
      out[y * width + x] = on ? 1 : 0;
    }
  }
  return { width, height, data: out };
}

/** Options of {@linkcode maskToPolygons}. */
export interface MaskToPolygonsOptions {
  /** Slide pixels per mask pixel along x (mask µm/px ÷ slide µm/px). */
  scaleX: number;
  /** Slide pixels per mask pixel along y. */
  scaleY: number;
  /** Slide x of the mask's left edge. @default 0 */
  originX?: number;
  /** Slide y of the mask's top edge. @default 0 */
  originY?: number;
  /**
   * Most outline vertices traced before giving up: a noisy mask (salt and
   * pepper) traces into millions of tiny polygons.
   * @default Infinity
   */
  maxVertices?: number;
}

/** A traced mask outline has more vertices than `maxVertices` allows. */
export class MaskOutlineTooLargeError extends RangeError {
  /** Always "MaskOutlineTooLargeError". */
  override name = "MaskOutlineTooLargeError";
}

const DX = [1, 0, -1, 0];
const DY = [0, 1, 0, -1];

/**
 * Traces a mask's tissue into polygons along pixel edges.
 *
 * Tissue is **4-connected**: pixels that touch only diagonally belong to
 * different polygons (at such a corner the contour turns towards the tissue
 * pixel it came along, so the two polygons share just that vertex). Each
 * 4-connected component gives one polygon: its outer boundary and its holes
 * (the background it encloses; background is thereby 8-connected, so
 * enclosed background pixels touching diagonally form one hole whose ring
 * passes their shared corner twice). Runs of collinear pixel
 * edges are merged into single edges. Mask pixel (i, j) covers
 * `[originX + i·scaleX, originX + (i+1)·scaleX] × [originY + j·scaleY, …]` in
 * slide pixels; polygons are normalized (outer rings positive shoelace area
 * in x right, y down) and come in scan order of their top-left corner.
 *
 * Because contours follow pixel edges, the polygons cover exactly the tissue
 * pixels: their area is (number of tissue pixels)·scaleX·scaleY and
 * rasterizing them back at mask resolution reproduces the mask, with no
 * error beyond floating-point rounding of the vertex coordinates (exactly
 * zero when scale and origin are integers or powers of two).
 *
 * @param mask The mask.
 * @param options Scale and origin, in slide pixels.
 * @returns The tissue polygons in slide pixels (`[]` when the mask is empty).
 * @throws {RangeError} When a scale is not a positive finite number.
 * @throws {MaskOutlineTooLargeError} (a RangeError) When the outline has more
 *   than `maxVertices` vertices.
 *
 * @example An L-shaped tissue piece with 4 px per mask pixel
 * ```ts
 * import { maskToPolygons } from "./read_mask.ts";
 * const mask = { width: 2, height: 2, data: new Uint8Array([1, 0, 1, 1]) };
 * const mp = maskToPolygons(mask, { scaleX: 4, scaleY: 4 });
 * if (mp.length !== 1 || mp[0][0].length !== 7) throw new Error(JSON.stringify(mp));
 * ```
 */
export function maskToPolygons(mask: Mask, options: MaskToPolygonsOptions): MultiPolygonPx {
  const { scaleX, scaleY } = options;
  const maxVertices = options.maxVertices ?? Infinity;
  let vertices = 0;
  const originX = options.originX ?? 0, originY = options.originY ?? 0;
  if (!(scaleX > 0 && scaleY > 0 && Number.isFinite(scaleX) && Number.isFinite(scaleY))) {
    throw new RangeError(
      `Cannot trace a mask: scaleX and scaleY must be positive numbers, got ${scaleX} and ${scaleY}`,
    );
  }
  const W = mask.width, H = mask.height;
  const m = mask.data;
  if (m.length < W * H) {
    throw new RangeError(`Cannot trace a mask: data has ${m.length} values for ${W} × ${H} pixels`);
  }
  const VW = W + 1;
  // out-going edge directions at each pixel corner (bit d for direction d)
  const out = new Uint8Array(VW * (H + 1));
  const fg = (x: number, y: number) => x >= 0 && y >= 0 && x < W && y < H && m[y * W + x] !== 0;
  let any = false;
  for (let y = 0; y <= H; y++) {
    for (let x = 0; x <= W; x++) {
      const br = fg(x, y), bl = fg(x - 1, y), tr = fg(x, y - 1), tl = fg(x - 1, y - 1);
      let bits = 0;
      // horizontal edge to the right of this corner, along y: tissue below → +x
      if (x < W && br && !tr) bits |= 1;
      // horizontal edge to the left: tissue above → −x
      if (x > 0 && tl && !bl) bits |= 4;
      // vertical edge below this corner: tissue on its left → +y
      if (y < H && bl && !br) bits |= 2;
      // vertical edge above: tissue on its right → −y
      if (y > 0 && tr && !tl) bits |= 8;
      out[y * VW + x] = bits;
      if (bits) any = true;
    }
  }
  if (!any) return [];
  // 4-connected component labels, to group rings into polygons
  const label = new Int32Array(W * H).fill(-1);
  const parent: number[] = [];
  const find = (a: number): number => {
    while (parent[a] !== a) {
      parent[a] = parent[parent[a]];
      a = parent[a];
    }
    return a;
  };
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = y * W + x;
      if (m[i] === 0) continue;
      const l = x > 0 ? label[i - 1] : -1, u = y > 0 ? label[i - W] : -1;
      if (l < 0 && u < 0) {
        label[i] = parent.length;
        parent.push(parent.length);
      } else if (l >= 0 && u >= 0) {
        const a = find(l), b = find(u);
        if (a !== b) parent[a > b ? a : b] = a > b ? b : a;
        label[i] = a < b ? a : b;
      } else label[i] = l >= 0 ? l : u;
    }
  }
  const polyOf = new Map<number, number>();
  const polys: PolygonPx[] = [];
  const holesWithoutOuter: Ring[] = [];
  const px = (vx: number) => originX + vx * scaleX;
  const py = (vy: number) => originY + vy * scaleY;
  for (let sy = 0; sy <= H; sy++) {
    for (let sx = 0; sx <= W; sx++) {
      let bits = out[sy * VW + sx];
      while (bits !== 0) {
        const startDir = bits & 1 ? 0 : bits & 2 ? 1 : bits & 4 ? 2 : 3;
        // the tissue pixel right of the first edge names the component
        const fx = startDir === 0 || startDir === 3 ? sx : sx - 1;
        const fy = startDir === 0 || startDir === 1 ? sy : sy - 1;
        const comp = find(label[fy * W + fx]);
        const ring: Ring = [[px(sx), py(sy)]];
        let vx = sx, vy = sy, d = startDir;
        for (;;) {
          out[vy * VW + vx] &= ~(1 << d);
          vx += DX[d];
          vy += DY[d];
          const b = out[vy * VW + vx];
          let nd: number;
          if (
            vx === sx && vy === sy && ((b | (1 << startDir)) === (1 << startDir) ||
              ((d + 1) & 3) === startDir)
          ) {
            break;
          }
          if ((b & (b - 1)) !== 0) nd = (d + 1) & 3; // a diagonal corner: turn towards the tissue
          else nd = b === 1 ? 0 : b === 2 ? 1 : b === 4 ? 2 : 3;
          if (nd !== d) ring.push([px(vx), py(vy)]);
          d = nd;
        }
        // close; drop the start vertex when it lies inside a straight run
        if (d === startDir) ring.shift();
        vertices += ring.length;
        if (vertices > maxVertices) {
          throw new MaskOutlineTooLargeError(
            `Cannot trace a mask: its outline has more than ${maxVertices} vertices`,
          );
        }
        ring.push([ring[0][0], ring[0][1]]);
        const pi = polyOf.get(comp);
        if (ringAreaPx2(ring) > 0) {
          if (pi !== undefined) {
            throw new Error("Cannot trace a mask: a component has two outer rings");
          }
          polyOf.set(comp, polys.length);
          polys.push([ring]);
        } else if (pi === undefined) holesWithoutOuter.push(ring);
        else polys[pi].push(ring);
        bits = out[sy * VW + sx];
      }
    }
  }
  if (holesWithoutOuter.length > 0) {
    // cannot happen: a component's top-left corner starts its outer ring
    throw new Error("Cannot trace a mask: a hole was found before its outer boundary");
  }
  return polys;
}

/**
 * Checks that a mask covers the slide, from their sizes in micrometres.
 *
 * The mask's extent (width × mask µm/px) must match the slide's
 * (width × slide µm/px) within max(1 mask pixel, 2 %) along each axis.
 *
 * @param mask The mask's width and height (decoded, or from the PNG header).
 * @param maskMpp Mask micrometres per pixel, one number or `[x, y]`.
 * @param slide The slide (its `widthPx`/`heightPx` may be unknown).
 * @param fileName The mask file, for messages.
 * @returns Warnings (sizes unknown, or a small mismatch within tolerance).
 * @throws {RangeError} When the sizes differ by more than the tolerance;
 *   the message gives both sizes in µm and the mask mpp that would fit.
 *
 * @example A mask at 16 µm/px over a 0.25 µm/px slide
 * ```ts
 * import { checkMaskSize } from "./read_mask.ts";
 * const mask = { width: 100, height: 50, data: new Uint8Array(5000) };
 * const slide = { id: "QVT-24-001", mppX: 0.25, mppY: 0.25, widthPx: 6400, heightPx: 3200 };
 * // 100 × 50 mask pixels of 16 µm cover 6400 × 3200 px at 0.25 µm/px exactly.
 * const warnings = checkMaskSize(mask, 16, slide, "mask.png");
 * if (warnings.length !== 0) throw new Error(`a fitting mask warned: ${warnings}`);
 * let threw = false;
 * try { checkMaskSize(mask, 8, slide, "mask.png"); } catch (e) { threw = e instanceof RangeError; }
 * if (!threw) throw new Error("a 2× wrong mpp must be refused");
 * ```
 */
export function checkMaskSize(
  mask: Pick<Mask, "width" | "height">,
  maskMpp: number | [number, number],
  slide: SlideInfo,
  fileName: string,
): string[] {
  const [mx, my] = typeof maskMpp === "number" ? [maskMpp, maskMpp] : maskMpp;
  if (!(mx > 0 && my > 0 && Number.isFinite(mx) && Number.isFinite(my))) {
    throw inputError(
      RangeError,
      "tissue mask",
      fileName,
      `the mask micrometres per pixel must be positive numbers, got ${mx} and ${my}`,
    );
  }
  const warnings: string[] = [];
  const axes: [string, number, number, number, number | undefined, number][] = [
    ["width", mask.width, mx, slide.mppX, slide.widthPx, 0],
    ["height", mask.height, my, slide.mppY, slide.heightPx, 1],
  ];
  const r = (v: number) => String(roundTo(v, 1));
  for (const [name, maskPx, maskMppAxis, slideMpp, slidePx] of axes) {
    if (slidePx === undefined || !(slidePx > 0)) {
      warnings.push(
        `The slide ${name} is unknown, so the size of tissue mask "${fileName}" was not checked`,
      );
      continue;
    }
    const maskUm = maskPx * maskMppAxis, slideUm = slidePx * slideMpp;
    const diff = Math.abs(maskUm - slideUm);
    const tol = Math.max(maskMppAxis, 0.02 * slideUm);
    if (diff > tol) {
      throw inputError(
        RangeError,
        "tissue mask",
        fileName,
        `the mask ${name} is ${
          r(maskUm)
        } µm (${maskPx} px at ${maskMppAxis} µm/px) but the slide ${name} is ${
          r(slideUm)
        } µm (${slidePx} px at ${slideMpp} µm/px); a mask mpp of about ${
          roundTo(slideUm / maskPx, 4)
        } µm/px would fit`,
      );
    }
    if (diff > maskMppAxis / 2) {
      warnings.push(
        `The ${name} of tissue mask "${fileName}" (${r(maskUm)} µm) differs from the slide's (${
          r(slideUm)
        } µm) by ${r(diff)} µm, within the tolerance of ${r(tol)} µm`,
      );
    }
  }
  return warnings;
}

/** Options of {@linkcode maskToRegionPart}. */
export interface MaskToRegionPartOptions extends MaskToPolygonsOptions {
  /** Human-readable origin, e.g. the mask's file name. */
  source: string;
}

/**
 * Traces a mask into a tissue `RegionPart` (see {@linkcode maskToPolygons}).
 *
 * @param mask The mask.
 * @param options Scale, origin and the `source` to record.
 * @returns The region part.
 *
 * @example One mask pixel, 2 × 3 slide pixels
 * ```ts
 * import { maskToRegionPart } from "./read_mask.ts";
 * const part = maskToRegionPart({ width: 1, height: 1, data: new Uint8Array([1]) }, {
 *   scaleX: 2, scaleY: 3, source: "QVT-24-001-mask.png",
 * });
 * if (part.polygons[0][0][2].join() !== "2,3") throw new Error(JSON.stringify(part));
 * ```
 */
export function maskToRegionPart(mask: Mask, options: MaskToRegionPartOptions): RegionPart {
  return { polygons: maskToPolygons(mask, options), source: options.source };
}
