/**
 * Small helpers the figures share: outlines as one plotly line with null
 * breaks, outline traces with a white halo, hover text of a placement.
 *
 * @module
 */

import type { Placement } from "../count/engine_types.ts";
import type { MultiPolygonPx } from "../types.ts";
import { roundTo } from "../numbers.ts";
import { type Mpp, regionPxToUm } from "../units.ts";

/** Rings of a pixel region as one µm line with null breaks (plotly draws them in one trace). */
export function regionLineUm(
  region: MultiPolygonPx,
  mpp: Mpp,
): { x: (number | null)[]; y: (number | null)[] } {
  return ringsLineUm(regionPxToUm(region, mpp).flat());
}

/** Rings in µm as one line with null breaks, positions to 0.001 µm. */
export function ringsLineUm(
  rings: [number, number][][],
): { x: (number | null)[]; y: (number | null)[] } {
  const x: (number | null)[] = [], y: (number | null)[] = [];
  for (const ring of rings) {
    if (x.length > 0) {
      x.push(null);
      y.push(null);
    }
    for (const [ux, uy] of ring) {
      x.push(roundTo(ux, 3));
      y.push(roundTo(uy, 3));
    }
  }
  return { x, y };
}

export function outlineTraces(
  name: string,
  line: { x: (number | null)[]; y: (number | null)[] },
  style: { color: string; dash: string; width: number },
  hover: string,
  legendgroup: string,
  showlegend = true,
): Record<string, unknown>[] {
  // A white halo under each outline keeps it legible on dark and light cells alike.
  return [
    {
      type: "scatter",
      mode: "lines",
      x: line.x,
      y: line.y,
      line: { color: "#ffffff", width: style.width + 2.5 },
      hoverinfo: "skip",
      showlegend: false,
      legendgroup,
    },
    {
      type: "scatter",
      mode: "lines",
      name,
      x: line.x,
      y: line.y,
      line: { color: style.color, width: style.width, dash: style.dash },
      hovertemplate: hover + "<extra></extra>",
      showlegend,
      legendgroup,
    },
  ];
}

export function placementHover(kind: string, p: Placement): string {
  return `${kind}<br>${p.count} figure${p.count === 1 ? "" : "s"}, coverage ${
    (p.coverage * 100).toFixed(1)
  }%<br>${p.perMm2.toFixed(2)} per mm²<br>centre ${p.centerPx[0].toFixed(0)}, ${
    p.centerPx[1].toFixed(0)
  } px`;
}
