/**
 * Collects figure points into the columnar {@linkcode FigureSet}.
 *
 * @module
 */

import type { FigureSet } from "../types.ts";
import { DEFAULT_COUNT_LABEL } from "../defaults.ts";

/** The label a figure gets when its input names none. */
export const DEFAULT_FIGURE_LABEL = DEFAULT_COUNT_LABEL;

/** Appends points one at a time, then freezes them into typed arrays. */
export class FigureSetBuilder {
  #n = 0;
  #x = new Float64Array(1024);
  #y = new Float64Array(1024);
  #label = new Uint32Array(1024);
  #score = new Float64Array(1024);
  #origin = new Int32Array(1024);
  #labels: string[] = [];
  #labelIndex = new Map<string, number>();
  #lastLabel = "";
  #lastIndex = -1;

  /** Number of points so far. */
  get length(): number {
    return this.#n;
  }

  /** Adds one point; `score` is NaN when the input gave none. */
  add(xPx: number, yPx: number, label: string, score: number, origin: number): void {
    let li = label === this.#lastLabel ? this.#lastIndex : this.#labelIndex.get(label);
    if (li === undefined || li < 0) {
      li = this.#labels.length;
      this.#labels.push(label);
      this.#labelIndex.set(label, li);
    }
    this.#lastLabel = label;
    this.#lastIndex = li;
    const k = this.#n;
    if (k === this.#x.length) this.#grow();
    this.#x[k] = xPx;
    this.#y[k] = yPx;
    this.#label[k] = li;
    this.#score[k] = score;
    this.#origin[k] = origin;
    this.#n = k + 1;
  }

  #grow(): void {
    const m = this.#x.length * 2;
    const grow = <T extends Float64Array | Uint32Array | Int32Array>(
      a: T,
      make: (n: number) => T,
    ) => {
      const b = make(m);
      b.set(a);
      return b;
    };
    this.#x = grow(this.#x, (n) => new Float64Array(n));
    this.#y = grow(this.#y, (n) => new Float64Array(n));
    this.#label = grow(this.#label, (n) => new Uint32Array(n));
    this.#score = grow(this.#score, (n) => new Float64Array(n));
    this.#origin = grow(this.#origin, (n) => new Int32Array(n));
  }

  /** The points as a FigureSet. */
  build(): FigureSet {
    const n = this.#n;
    return {
      xPx: this.#x.slice(0, n),
      yPx: this.#y.slice(0, n),
      labelIndex: this.#label.slice(0, n),
      labels: [...this.#labels],
      score: this.#score.slice(0, n),
      origin: this.#origin.slice(0, n),
    };
  }
}

/** A FigureSet with no points. */
export function emptyFigureSet(): FigureSet {
  return new FigureSetBuilder().build();
}
