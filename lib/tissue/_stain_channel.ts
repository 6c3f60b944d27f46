/**
 * The tissue channel and the pen-mark rule of tissue detection, from RGB.
 * Private to lib/tissue.
 *
 * Optical density (OD) of channel c is −log₁₀(I_c ÷ I₀_c), with I₀ the
 * glass (background) colour, +1 on both to keep the logarithm finite.
 *
 * - **Stain OD** = max_c OD_c − min_c OD_c. Neutral grey has equal OD in all
 *   channels, so glass, shadows, out-of-focus grey and black give 0 however
 *   dark they are, while stained tissue absorbs the channels unevenly (both
 *   haematoxylin and eosin absorb green most: Ruifrok and Johnston 2001,
 *   Anal Quant Cytol Histol 23:291–299) and stays above 0 however pale it is.
 * - **Pen**: red absorbed clearly more than green (OD_R − OD_G above a
 *   limit), which neither haematoxylin nor eosin does (their OD vectors have
 *   OD_G ≥ OD_R), but blue and green inks do; or black ink: every channel
 *   darker than a limit.
 *
 * @module
 */

import type { RgbImage } from "../types.ts";

/** The background colour and how it was found. */
export interface Background {
  rgb: [number, number, number];
  /** How it was found, for the method record. */
  how: string;
}

/**
 * Estimates the glass colour: per channel, the median of the brightest 10 %
 * of pixels (by R + G + B). When that colour is itself clearly stained
 * (stain OD above 0.05: tissue covers nearly everything), only its
 * brightness is kept, as a neutral grey, so tissue is not taken for glass.
 */
export function estimateBackground(image: RgbImage): Background {
  const n = image.width * image.height, d = image.data;
  const sums = new Uint32Array(766);
  for (let k = 0; k < n; k++) sums[d[3 * k] + d[3 * k + 1] + d[3 * k + 2]]++;
  let cut = 765;
  for (let acc = 0; cut > 0; cut--) {
    acc += sums[cut];
    if (acc >= 0.1 * n) break;
  }
  const hist = [new Uint32Array(256), new Uint32Array(256), new Uint32Array(256)];
  let m = 0;
  for (let k = 0; k < n; k++) {
    if (d[3 * k] + d[3 * k + 1] + d[3 * k + 2] < cut) continue;
    m++;
    for (let c = 0; c < 3; c++) hist[c][d[3 * k + c]]++;
  }
  const median = (h: Uint32Array) => {
    for (let v = 0, acc = 0; v < 256; v++) {
      acc += h[v];
      if (acc * 2 >= m) return v;
    }
    return 255;
  };
  const rgb: [number, number, number] = [median(hist[0]), median(hist[1]), median(hist[2])];
  const hi = Math.max(...rgb), lo = Math.min(...rgb);
  const how = "median colour of the brightest 10 % of pixels (by R + G + B)";
  if (Math.log10((hi + 1) / (lo + 1)) > 0.05) {
    return {
      rgb: [hi, hi, hi],
      how: `${how}; it was stained (${rgb.join(", ")}), so only its brightness is used`,
    };
  }
  return { rgb, how };
}

/** Per-pixel stain OD and pen flags. */
export interface StainChannel {
  /** Stain OD per pixel (≥ 0). */
  stain: Float32Array;
  /** 1 where the pen rule holds. */
  pen: Uint8Array;
}

/**
 * Computes the stain OD and the pen rule per pixel (see the module notes).
 *
 * @param image The RGB image.
 * @param background The glass colour.
 * @param penRedOverGreenOd Least OD_R − OD_G of blue and green inks.
 * @param penBlackOd Least OD of every channel for black ink.
 */
export function stainChannel(
  image: RgbImage,
  background: Background,
  penRedOverGreenOd: number,
  penBlackOd: number,
): StainChannel {
  const n = image.width * image.height, d = image.data;
  // log10 lookup per channel: OD of value v is lut[c][v]
  const lut = [0, 1, 2].map((c) => {
    const t = new Float32Array(256);
    for (let v = 0; v < 256; v++) t[v] = Math.log10((background.rgb[c] + 1) / (v + 1));
    return t;
  });
  const [lr, lg, lb] = lut;
  const stain = new Float32Array(n);
  const pen = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    const r = lr[d[3 * k]], g = lg[d[3 * k + 1]], b = lb[d[3 * k + 2]];
    const hi = r > g ? (r > b ? r : b) : (g > b ? g : b);
    const lo = r < g ? (r < b ? r : b) : (g < b ? g : b);
    stain[k] = hi - lo;
    if (r - g > penRedOverGreenOd || lo > penBlackOd) pen[k] = 1;
  }
  return { stain, pen };
}
