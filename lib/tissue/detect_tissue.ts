/**
 * Finding the tissue on a low-resolution RGB image of a slide.
 *
 * @module
 */

import type { MultiPolygonPx, RgbImage } from "../types.ts";
import { px2ToMm2 } from "../units.ts";
import { roundTo } from "../numbers.ts";
import { multiPolygonAreaPx2 } from "../geometry/planar_area.ts";
import { type Mask, maskToPolygons } from "./read_mask.ts";
import { otsuThreshold } from "./otsu_threshold.ts";
import { closeOrOpen, dilateDisk, labelComponents } from "./_morphology.ts";
import { simplifyPolygons } from "./_simplify.ts";
import { estimateBackground, stainChannel } from "./_stain_channel.ts";

/** Options of {@linkcode detectTissue}. */
export interface DetectTissueOptions {
  /** Micrometres per image pixel along x. */
  mppX: number;
  /** Micrometres per image pixel along y. */
  mppY: number;
  /** Level-0 slide pixels per image pixel along x (polygons are given in level-0 px). @default 1 */
  scaleX?: number;
  /** Level-0 slide pixels per image pixel along y. @default 1 */
  scaleY?: number;
  /** Least stain optical density counted as tissue, whatever Otsu's threshold says. @default 0.02 */
  floorOd?: number;
  /** Radius of the closing disk, µm (bridges gaps up to twice this). @default 50 */
  closingRadiusUm?: number;
  /** Radius of the opening disk, µm (removes strands thinner than twice this). @default 25 */
  openingRadiusUm?: number;
  /** Holes (enclosed glass) smaller than this are filled, mm²; larger ones stay holes. @default 0.1 */
  fillHolesBelowMm2?: number;
  /** Pieces smaller than this are dropped as specks, mm². @default 0.02 */
  minPieceMm2?: number;
  /** Contour simplification tolerance, µm. @default 20 */
  simplifyToleranceUm?: number;
  /** Least OD_R − OD_G taken for blue or green ink. @default 0.15 */
  penRedOverGreenOd?: number;
  /** Least OD in every channel taken for black ink. @default 0.8 */
  penBlackOd?: number;
  /** Margin around pen marks also excluded (their faint edges), µm. @default 50 */
  penMarginUm?: number;
  /** Tissue share of the image above which a warning is given. @default 0.85 */
  largeShare?: number;
  /** What the image is, for warnings (e.g. the file name). @default "the image" */
  source?: string;
}

/** What {@linkcode detectTissue} found. */
export interface TissueDetection {
  /** Tissue polygons in level-0 pixels (x right, y down), normalized; `[]` when none. */
  polygons: MultiPolygonPx;
  /** The final tissue mask at image resolution (1 = tissue). */
  mask: Mask;
  /** Tissue area, mm², of the polygons (the mask's area is in `method.mask_mm2`). */
  areaMm2: number;
  /** Tissue share of the image, 0..1. */
  share: number;
  /** Every step with its parameters and what it did (plain JSON). */
  method: Record<string, unknown>;
  /** Recoverable problems, one sentence each. */
  warnings: string[];
}

/** Method name and version written into every record, so outputs say which rules made them. */
export const TISSUE_METHOD = "hotfield tissue detection";
/** Version of the steps and defaults; raise it whenever they change. */
export const TISSUE_METHOD_VERSION = 1;

const BINS = 256;
const LOG_LO = -3; // stain OD 0.001
const LOG_HI = Math.log10(3); // stain OD 3

/**
 * Finds the tissue on a low-resolution RGB image of a slide (about 8–16 µm
 * per pixel suits the defaults).
 *
 * Steps, each recorded with its parameters in `method.steps`:
 * 1. **Background**: the glass colour, from the brightest pixels.
 * 2. **Tissue channel**: stain optical density, the spread of the three
 *    channels' OD relative to the glass. Grey glass, shadows and black are
 *    neutral and give 0 however dark; pale stained tissue does not.
 * 3. **Threshold**: Otsu's threshold (Otsu 1979) of the channel's log₁₀
 *    histogram (256 bins over OD 0.001–3; on a log scale the faint glass
 *    noise and pale tissue separate as well as strong stain), but never
 *    below `floorOd`, so a blank slide gives no tissue rather than noise.
 * 4. **Pen marks**: pixels taken for blue, green or black ink, in pieces of
 *    at least `minPieceMm2`, widened by `penMarginUm`, are excluded.
 * 5. **Closing**, then **opening**, with disks in µm.
 * 6. **Holes**: enclosed glass smaller than `fillHolesBelowMm2` is filled.
 * 7. **Specks**: pieces smaller than `minPieceMm2` are dropped.
 * 8. **Contours**: traced along pixel edges (tissue 4-connected, see
 *    `maskToPolygons`) and simplified with Douglas–Peucker at
 *    `simplifyToleranceUm`, keeping a ring as traced where simplifying would
 *    make outlines cross.
 *
 * Image pixel (i, j) covers level-0 pixels [i·scaleX, (i+1)·scaleX) ×
 * [j·scaleY, (j+1)·scaleY). Empty or all-glass images give no polygons and a
 * warning; the result is the same for the same image and options.
 *
 * @param image The RGB image (e.g. a slide's overview or a thumbnail).
 * @param options The image's µm per pixel, the scale to level 0, and parameters.
 * @returns Polygons, mask, area, the method record and warnings.
 * @throws {RangeError} When mpp or scale is not a positive number, or the image is empty.
 *
 * @example A pink square on glass
 * ```ts
 * import { detectTissue } from "hotfield";
 * const width = 100, height = 80, data = new Uint8Array(width * height * 3).fill(236);
 * for (let y = 20; y < 60; y++) {
 *   for (let x = 30; x < 70; x++) data.set([220, 140, 200], 3 * (y * width + x));
 * }
 * const t = detectTissue({ width, height, data }, { mppX: 10, mppY: 10, scaleX: 40, scaleY: 40 });
 * // 40 × 40 pixels of 10 µm: 0.16 mm², less the corners the 25 µm opening rounds off
 * if (!(t.areaMm2 > 0.15 && t.areaMm2 <= 0.16)) throw new Error(`area ${t.areaMm2}`);
 * if (t.polygons.length !== 1) throw new Error("one piece");
 * ```
 */
export function detectTissue(image: RgbImage, options: DetectTissueOptions): TissueDetection {
  const { mppX, mppY } = options;
  const scaleX = options.scaleX ?? 1, scaleY = options.scaleY ?? 1;
  for (
    const [name, v] of [["mppX", mppX], ["mppY", mppY], ["scaleX", scaleX], [
      "scaleY",
      scaleY,
    ]] as const
  ) {
    if (!(v > 0 && Number.isFinite(v))) {
      throw new RangeError(`Cannot detect tissue: ${name} must be a positive number: got ${v}`);
    }
  }
  const W = image.width, H = image.height, n = W * H;
  if (!(W > 0 && H > 0) || image.data.length < 3 * n) {
    throw new RangeError(`Cannot detect tissue: the image is empty or short (${W} × ${H})`);
  }
  const floorOd = options.floorOd ?? 0.02;
  const closingRadiusUm = options.closingRadiusUm ?? 50;
  const openingRadiusUm = options.openingRadiusUm ?? 25;
  const fillHolesBelowMm2 = options.fillHolesBelowMm2 ?? 0.1;
  const minPieceMm2 = options.minPieceMm2 ?? 0.02;
  const simplifyToleranceUm = options.simplifyToleranceUm ?? 20;
  const penRedOverGreenOd = options.penRedOverGreenOd ?? 0.15;
  const penBlackOd = options.penBlackOd ?? 0.8;
  const penMarginUm = options.penMarginUm ?? 50;
  const largeShare = options.largeShare ?? 0.85;
  const source = options.source ?? "the image";
  const pxMm2 = px2ToMm2(1, { mppX, mppY });
  const warnings: string[] = [];
  const steps: Record<string, unknown>[] = [];

  // 1–2. background and tissue channel
  const background = estimateBackground(image);
  steps.push({ step: "background", rgb: background.rgb, how: background.how });
  const { stain, pen } = stainChannel(image, background, penRedOverGreenOd, penBlackOd);
  steps.push({
    step: "tissue channel",
    channel: "stain optical density",
    definition:
      "max minus min over R, G, B of OD = log10((background + 1) / (value + 1)); 0 for neutral grey, glass, shadows and black",
  });

  // 3. Otsu on the log histogram, with a floor
  const hist = new Float64Array(BINS);
  const step = (LOG_HI - LOG_LO) / BINS;
  for (let k = 0; k < n; k++) {
    const v = Math.log10(Math.max(stain[k], 1e-3));
    hist[Math.min(BINS - 1, Math.max(0, Math.floor((v - LOG_LO) / step)))]++;
  }
  const kOtsu = otsuThreshold(hist);
  const otsuOd = Math.pow(10, LOG_LO + (kOtsu + 1) * step);
  const usedOd = Math.max(otsuOd, floorOd);
  const mask = new Uint8Array(n);
  for (let k = 0; k < n; k++) mask[k] = stain[k] >= usedOd ? 1 : 0;
  steps.push({
    step: "threshold",
    method: "Otsu 1979 on the log10 histogram of the channel",
    bins: BINS,
    range_od: [roundTo(Math.pow(10, LOG_LO), 6), roundTo(Math.pow(10, LOG_HI), 6)],
    otsu_od: roundTo(otsuOd, 5),
    floor_od: floorOd,
    used_od: roundTo(usedOd, 5),
  });

  // 4. pen marks
  const penPieces = labelComponents(pen, W, H, 1, 8);
  const penKept = new Uint8Array(n);
  let penPx = 0;
  for (let k = 0; k < n; k++) {
    const c = penPieces.labels[k];
    if (c >= 0 && penPieces.sizes[c] * pxMm2 >= minPieceMm2) {
      penKept[k] = 1;
      penPx++;
    }
  }
  const penAreaMm2 = penPx * pxMm2;
  if (penPx > 0) {
    const wide = dilateDisk(penKept, W, H, penMarginUm, mppX, mppY);
    for (let k = 0; k < n; k++) if (wide[k]) mask[k] = 0;
    warnings.push(
      `Likely pen marks (strongly saturated blue, green or black) covering ${
        roundTo(penAreaMm2, 3)
      } mm² were excluded from the tissue of ${source}`,
    );
  }
  steps.push({
    step: "pen marks",
    rule:
      "OD_R - OD_G above the limit (blue or green ink; haematoxylin and eosin absorb green at least as much as red), or every channel's OD above the black limit",
    red_over_green_od: penRedOverGreenOd,
    black_od: penBlackOd,
    min_piece_mm2: minPieceMm2,
    margin_um: penMarginUm,
    excluded_mm2: roundTo(penAreaMm2, 6),
  });

  // 5. closing, then opening
  // (the image is extended by repeating its edges, as if the scene went on)
  let m = closeOrOpen("close", mask, W, H, closingRadiusUm, mppX, mppY);
  steps.push({
    step: "closing",
    disk_radius_um: closingRadiusUm,
    beyond_edges: "edge pixels repeated",
  });
  m = closeOrOpen("open", m, W, H, openingRadiusUm, mppX, mppY);
  steps.push({
    step: "opening",
    disk_radius_um: openingRadiusUm,
    beyond_edges: "edge pixels repeated",
  });

  // 6. fill small holes (background not reaching the border, 8-connected)
  const glass = labelComponents(m, W, H, 0, 8);
  let filled = 0, kept = 0;
  const fill = glass.sizes.map((size, c) => {
    if (glass.touchesBorder[c]) return false;
    if (size * pxMm2 < fillHolesBelowMm2) {
      filled++;
      return true;
    }
    kept++;
    return false;
  });
  for (let k = 0; k < n; k++) if (glass.labels[k] >= 0 && fill[glass.labels[k]]) m[k] = 1;
  steps.push({
    step: "fill holes",
    below_mm2: fillHolesBelowMm2,
    filled,
    kept_as_holes: kept,
  });

  // 7. drop specks (tissue 4-connected, as traced)
  const pieces = labelComponents(m, W, H, 1, 4);
  let dropped = 0, remaining = 0;
  const drop = pieces.sizes.map((size) => {
    if (size * pxMm2 < minPieceMm2) {
      dropped++;
      return true;
    }
    remaining++;
    return false;
  });
  let tissuePx = 0, touching = false;
  for (let k = 0; k < n; k++) {
    const c = pieces.labels[k];
    if (c < 0) continue;
    if (drop[c]) m[k] = 0;
    else {
      tissuePx++;
      if (pieces.touchesBorder[c]) touching = true;
    }
  }
  steps.push({ step: "drop specks", below_mm2: minPieceMm2, dropped, pieces: remaining });

  // 8. contours
  const finalMask: Mask = { width: W, height: H, data: m };
  const traced = maskToPolygons(finalMask, { scaleX: 1, scaleY: 1 });
  const simple = simplifyPolygons(traced, simplifyToleranceUm, mppX, mppY);
  const polygons: MultiPolygonPx = simple.polygons.map((p) =>
    p.map((r) => r.map(([x, y]) => [roundTo(x * scaleX, 2), roundTo(y * scaleY, 2)]))
  );
  steps.push({
    step: "contours",
    tracing: "pixel edges, tissue 4-connected",
    simplification: "Douglas-Peucker 1973",
    tolerance_um: simplifyToleranceUm,
    rings_kept_as_traced: simple.keptAsTraced,
    vertices: polygons.reduce((a, p) => a + p.reduce((b, r) => b + r.length - 1, 0), 0),
  });

  const maskMm2 = tissuePx * pxMm2;
  const areaMm2 = px2ToMm2(multiPolygonAreaPx2(polygons), {
    mppX: mppX / scaleX,
    mppY: mppY / scaleY,
  });
  const share = tissuePx / n;
  if (tissuePx === 0) {
    warnings.push(
      `No tissue was found on ${source}: nothing stained stood out from the glass (stain OD threshold ${
        roundTo(usedOd, 4)
      })`,
    );
  } else {
    if (touching) {
      warnings.push(
        `Tissue on ${source} touches the image border: the slide or the scanned area may cut it off`,
      );
    }
    if (share > largeShare) {
      warnings.push(
        `Tissue covers ${
          Math.round(share * 100)
        } % of ${source}, unusually much: a blank, dark or out-of-focus slide can look like this; check the outline`,
      );
    }
  }
  const method: Record<string, unknown> = {
    name: TISSUE_METHOD,
    version: TISSUE_METHOD_VERSION,
    image: { width: W, height: H, mpp: [roundTo(mppX, 6), roundTo(mppY, 6)] },
    steps,
    tissue_mm2: roundTo(areaMm2, 6),
    mask_mm2: roundTo(maskMm2, 6),
    tissue_share: roundTo(share, 6),
  };
  return { polygons, mask: finalMask, areaMm2, share, method, warnings };
}
