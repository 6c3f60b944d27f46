/** Hand-built comparison cases for the tests (invented; QVT ids). */

import type { CaseData, FigureSet } from "../../lib/types.ts";

/** A figure set from plain lists (label "mitotic figure" unless given). */
export function figureSet(
  x: number[],
  y: number[],
  score: number[] = x.map(() => NaN),
  labels?: string[],
): FigureSet {
  const names = labels ? [...new Set(labels)] : ["mitotic figure"];
  return {
    xPx: Float64Array.from(x),
    yPx: Float64Array.from(y),
    labelIndex: Uint32Array.from(x.map((_, i) => (labels ? names.indexOf(labels[i]) : 0))),
    labels: names,
    score: Float64Array.from(score),
    origin: Int32Array.from(x.map((_, i) => i)),
  };
}

/** A 10 × 10 mm tissue square at 0.25 µm/px (40,000 px a side) with the given figures. */
export function squareCase(figures: FigureSet, id = "QVT-24-901"): CaseData {
  const s = 40000;
  return {
    caseId: id,
    slide: { id, mppX: 0.25, mppY: 0.25 },
    tissue: [{ polygons: [[[[0, 0], [s, 0], [s, s], [0, s], [0, 0]]]], source: "test square" }],
    tumour: [],
    exclude: [],
    figures,
    fields: [],
    sources: [],
    warnings: [],
  };
}

/** Points on a lattice of `nx × ny` spaced `stepPx` from (x0, y0). */
export function lattice(
  x0: number,
  y0: number,
  nx: number,
  ny: number,
  stepPx: number,
): [number[], number[]] {
  const xs: number[] = [], ys: number[] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      xs.push(x0 + i * stepPx);
      ys.push(y0 + j * stepPx);
    }
  }
  return [xs, ys];
}
