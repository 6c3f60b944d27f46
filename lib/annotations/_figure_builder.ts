/**
 * Collects figure points into the columnar {@linkcode FigureSet}.
 *
 * @module
 */

import type { FigureSet } from "../types.ts";
import { DEFAULT_COUNT_LABEL } from "../defaults.ts";

/** The label a figure gets when its input names none. */
export const DEFAULT_FIGURE_LABEL = DEFAULT_COUNT_LABEL;

/**
 * A figure's label as given in a file: trimmed, and the default when empty.
 *
 * @example
 * ```ts
 * import { figureLabelText } from "./_figure_builder.ts";
 * if (figureLabelText("  mimic ") !== "mimic" || figureLabelText(" ") !== "mitotic figure") {
 *   throw new Error("trimmed, default when empty");
 * }
 * ```
 */
export function figureLabelText(raw: string): string {
  if (raw === DEFAULT_FIGURE_LABEL) return raw;
  const label = raw.trim();
  return label === "" ? DEFAULT_FIGURE_LABEL : label;
}

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
    this.addIndexed(xPx, yPx, li, score, origin);
  }

  /**
   * The index of `label`, numbering it now when it is new (labels are
   * numbered by first appearance: ask just before adding its first point).
   */
  labelIndexOf(label: string): number {
    let li = this.#labelIndex.get(label);
    if (li === undefined) {
      li = this.#labels.length;
      this.#labels.push(label);
      this.#labelIndex.set(label, li);
    }
    return li;
  }

  /** Adds one point whose label index came from {@linkcode labelIndexOf}. */
  addIndexed(xPx: number, yPx: number, li: number, score: number, origin: number): void {
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
