/**
 * Showing found tissue over a slide's low-resolution image in a notebook.
 *
 * @module
 */

import { encode } from "fast-png";
import { roundTo } from "../numbers.ts";
import type { SlideImage } from "../annotations/read_slide_file.ts";
import type { TissueDetection } from "../tissue/detect_tissue.ts";
import { OKABE_ITO, type PlotFigure } from "../report/plot_style.ts";
import { plotText } from "../report/plot_labels.ts";
import {
  type Displayable,
  JUPYTER_DISPLAY,
  plotlyMimeBundle,
  type ShowPlotOptions,
} from "./show.ts";

/**
 * The figure of {@linkcode showTissue}: the slide image (a PNG data URI in a
 * plotly `image` trace placed in level-0 pixels) and each tissue ring as a
 * line, outer rings solid and holes dotted, y pointing down.
 *
 * @param image The slide image the tissue was found on.
 * @param detection The detection.
 * @returns The figure as plain data.
 *
 * @example One square piece over a 4 × 3 image
 * ```ts
 * import type { SlideImage } from "../annotations/read_slide_file.ts";
 * import { tissueFigure } from "./show_tissue.ts";
 * import type { TissueDetection } from "../tissue/detect_tissue.ts";
 * const image = { path: "QVT-24-009.tiff", scaleX: 100, scaleY: 100,
 *   slide: { id: "QVT-24-009", mppX: 2, mppY: 2, widthPx: 400, heightPx: 300 },
 *   image: { width: 4, height: 3, data: new Uint8Array(36).fill(236) } } as SlideImage;
 * const sq: [number, number][] = [[100, 100], [200, 100], [200, 200], [100, 200], [100, 100]];
 * const f = tissueFigure(image, { polygons: [[sq]], areaMm2: 0.04, warnings: [] } as unknown as TissueDetection);
 * if (f.data[0].type !== "image" || f.data.length !== 2) throw new Error();
 * ```
 */
export function tissueFigure(image: SlideImage, detection: TissueDetection): PlotFigure {
  const { width, height, data } = image.image;
  const png = encode({ width, height, data, channels: 3, depth: 8 });
  const traces: Record<string, unknown>[] = [{
    type: "image",
    source: `data:image/png;base64,${base64(png)}`,
    x0: image.scaleX / 2,
    dx: image.scaleX,
    y0: image.scaleY / 2,
    dy: image.scaleY,
    hoverinfo: "skip",
    name: "slide",
  }];
  detection.polygons.forEach((polygon, i) => {
    polygon.forEach((ring, r) => {
      traces.push({
        type: "scatter",
        mode: "lines",
        x: ring.map((p) => p[0]),
        y: ring.map((p) => p[1]),
        line: {
          color: OKABE_ITO.bluishGreen,
          width: r === 0 ? 2.5 : 1.8,
          dash: r === 0 ? "solid" : "dot",
        },
        name: r === 0 ? "tissue" : "hole",
        showlegend: r === 0 && i === 0,
        legendgroup: "tissue",
        hovertemplate: `${
          plotText(r === 0 ? `piece ${i + 1}` : `hole in piece ${i + 1}`)
        }<br>x %{x:.0f} px, y %{y:.0f} px<extra></extra>`,
      });
    });
  });
  const s = image.slide;
  const aspect = (s.heightPx * s.mppY) / (s.widthPx * s.mppX);
  return {
    data: traces,
    layout: {
      height: Math.round(Math.min(900, Math.max(320, 760 * aspect))),
      margin: { l: 60, r: 20, t: 40, b: 50 },
      title: { text: plotText(`${s.id}: tissue found on the slide`), x: 0.02 },
      xaxis: { title: { text: "x (level-0 px)" }, range: [0, s.widthPx], constrain: "domain" },
      yaxis: {
        title: { text: "y (level-0 px)" },
        range: [s.heightPx, 0],
        scaleanchor: "x",
        scaleratio: s.mppY / s.mppX,
      },
      showlegend: true,
    },
    caption: `${s.id}: ${detection.polygons.length} tissue piece${
      detection.polygons.length === 1 ? "" : "s"
    }, ${
      roundTo(detection.areaMm2, 3)
    } mm², found automatically; check the outline before counting on it`,
  };
}

/**
 * Shows the tissue found on a slide over its low-resolution image.
 *
 * @param image The slide image.
 * @param detection The detection.
 * @param options How plotly.js reaches the HTML fallback.
 * @returns A displayable object.
 *
 * @example A bundle with an HTML fallback
 * ```ts
 * import { JUPYTER_DISPLAY, showTissue } from "hotfield";
 * import type { SlideImage } from "../annotations/read_slide_file.ts";
 * import type { TissueDetection } from "../tissue/detect_tissue.ts";
 * const image = { path: "x.png", scaleX: 1, scaleY: 1,
 *   slide: { id: "QVT-24-009", mppX: 8, mppY: 8, widthPx: 2, heightPx: 2 },
 *   image: { width: 2, height: 2, data: new Uint8Array(12).fill(236) } } as SlideImage;
 * const shown = showTissue(image, { polygons: [], areaMm2: 0 } as unknown as TissueDetection,
 *   { inlinePlotly: "never" });
 * if (!("text/html" in shown[JUPYTER_DISPLAY]())) throw new Error();
 * ```
 */
export function showTissue(
  image: SlideImage,
  detection: TissueDetection,
  options: ShowPlotOptions = {},
): Displayable {
  return {
    [JUPYTER_DISPLAY]: () => plotlyMimeBundle(tissueFigure(image, detection), options),
  } as Displayable;
}

function base64(bytes: Uint8Array): string {
  let s = "";
  for (let i = 0; i < bytes.length; i += 0x8000) {
    s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  }
  return btoa(s);
}
