/**
 * Collects figure points into the columnar {@linkcode FigureSet}.
 *
 * @module
 */

import type { FigureSet } from "../types.ts";

/** The label a figure gets when its input names none. */
export const DEFAULT_FIGURE_LABEL = "mitotic figure";

/** Appends points one at a time, then freezes them into typed arrays. */
export class FigureSetBuilder {
  #x: number[] = [];
  #y: number[] = [];
  #label: number[] = [];
  #score: number[] = [];
  #origin: number[] = [];
  #labels: string[] = [];
  #labelIndex = new Map<string, number>();

  /** Number of points so far. */
  get length(): number {
    return this.#x.length;
  }

  /** Adds one point; `score` is NaN when the input gave none. */
  add(xPx: number, yPx: number, label: string, score: number, origin: number): void {
    let li = this.#labelIndex.get(label);
    if (li === undefined) {
      li = this.#labels.length;
      this.#labels.push(label);
      this.#labelIndex.set(label, li);
    }
    this.#x.push(xPx);
    this.#y.push(yPx);
    this.#label.push(li);
    this.#score.push(score);
    this.#origin.push(origin);
  }

  /** The points as a FigureSet. */
  build(): FigureSet {
    return {
      xPx: Float64Array.from(this.#x),
      yPx: Float64Array.from(this.#y),
      labelIndex: Uint32Array.from(this.#label),
      labels: [...this.#labels],
      score: Float64Array.from(this.#score),
      origin: Int32Array.from(this.#origin),
    };
  }
}

/** A FigureSet with no points. */
export function emptyFigureSet(): FigureSet {
  return new FigureSetBuilder().build();
}
