/**
 * One-to-one matching of candidate figures (a detector's) to reference
 * figures within a radius, in the micrometre plane.
 *
 * @module
 */

import {
  buildPairGraph,
  type PairGraph,
  type PointsUm,
  rankCandidates,
  rankReferences,
} from "./_pair_graph.ts";
import { matchComponent } from "./_min_cost_matching.ts";

export type { PointsUm } from "./_pair_graph.ts";

/** Candidate points with a score in [0, 1] each (NaN where none was given). */
export interface ScoredPointsUm extends PointsUm {
  /** Score of each point; NaN for none (passes every threshold). */
  score: Float64Array;
}

/** How candidates are paired with references. */
export type MatchMode = "optimal" | "greedy";

/** The matching radius used when none is given, µm (see REFERENCES.md §10). */
export const DEFAULT_MATCH_RADIUS_UM = 7.5;

/** The largest matching radius accepted, µm (a figure is about 5–15 µm across). */
export const MAX_MATCH_RADIUS_UM = 50;

/** Options of {@linkcode matchFigures}. */
export interface MatchFiguresOptions {
  /** Largest centre distance of a pair, µm; a pair exactly at the radius is within it. @default 7.5 */
  radiusUm?: number;
  /** `optimal` (most pairs, then least total distance) or `greedy` (by score). @default "optimal" */
  mode?: MatchMode;
  /**
   * The operating threshold: candidates with a score below it take no part
   * in the returned pairs (a candidate without a score always does). The
   * counts by rank (`tpAt`) cover every candidate regardless. @default 0
   */
  minScore?: number;
}

/** A matching, at the operating threshold and at every rank. */
export interface FigureMatching {
  /** The mode used. */
  mode: MatchMode;
  /** The radius used, µm. */
  radiusUm: number;
  /** The operating threshold used. */
  minScore: number;
  /** For each candidate, the reference it is paired with at the operating threshold, or −1. */
  refOfCandidate: Int32Array;
  /** For each reference, its candidate at the operating threshold, or −1. */
  candidateOfRef: Int32Array;
  /** References. */
  references: number;
  /** Candidates at or above the operating threshold. */
  candidates: number;
  /** True positives (pairs), false positives (unpaired candidates), false negatives (unpaired references). */
  tp: number;
  /** Candidates at or above the threshold left unpaired. */
  fp: number;
  /** Reference figures left unpaired. */
  fn: number;
  /** Sum of the pair distances, µm. */
  totalDistanceUm: number;
  /**
   * Candidate indices in rank order: score descending (no score first, as
   * it passes every threshold), then y, then x ascending, then input order.
   */
  order: Int32Array;
  /**
   * `tpAt[k]` = pairs of the matching restricted to the first k candidates
   * in rank order (k = 0 … n), so the true positives at any threshold are
   * `tpAt[number of candidates at or above it]`.
   */
  tpAt: Int32Array;
}

/**
 * Matches candidate figures to reference figures one to one: a pair is a
 * candidate and a reference whose centres lie within `radiusUm`
 * (dx² + dy² ≤ r² in µm; convert pixels with each axis's mpp first, since
 * mpp x and y may differ).
 *
 * **optimal** (default): a matching with the most pairs; among those, the
 * least total distance. The pair graph is built from a bucket index, split
 * into connected components, and each component is solved exactly by
 * successive shortest augmenting paths (a min-cost max-flow), so the
 * result is exact for components of any size. Matchings with equal count
 * and equal total distance are told apart by the rank order of candidates
 * and references (y, then x, then input order), so shuffling the input
 * changes nothing but exact duplicates.
 *
 * **greedy**: candidates in rank order (score descending; equal scores by
 * y, then x, then input order) each take the nearest reference still
 * unpaired within the radius (equal distances: the reference with smaller
 * y, then x, then input order); a candidate with none is a false positive.
 *
 * True positives at every rank (`tpAt`) come for free: greedy is a prefix
 * process, so its first k steps are the greedy matching of the first k
 * candidates; for optimal, candidates are added in rank order with one
 * augmenting-path search each (Kuhn's method), which keeps a maximum
 * matching of every prefix (an augmenting path that does not exist cannot
 * appear later).
 *
 * @param reference Reference figures, µm.
 * @param candidates Candidate figures with scores, µm.
 * @param options Radius, mode and operating threshold.
 * @returns The pairs at the operating threshold and true positives by rank.
 * @throws {RangeError} When the radius is not in (0, 50] µm, the mode is
 *   unknown, or the arrays of a point set differ in length.
 *
 * @example Two references, three candidates, one tie broken by distance
 * ```ts
 * import { matchFigures } from "hotfield";
 * const reference = { xUm: Float64Array.of(0, 20), yUm: Float64Array.of(0, 0) };
 * const candidates = {
 *   xUm: Float64Array.of(3, 18, 100), yUm: Float64Array.of(0, 0, 0),
 *   score: Float64Array.of(0.9, 0.8, 0.7),
 * };
 * const m = matchFigures(reference, candidates, { radiusUm: 7.5 });
 * if (m.tp !== 2 || m.fp !== 1 || m.fn !== 0) throw new Error(`tp ${m.tp}`);
 * if (Math.abs(m.totalDistanceUm - 5) > 1e-12) throw new Error("3 µm + 2 µm");
 * if (m.tpAt.join() !== "0,1,2,2") throw new Error(`by rank ${m.tpAt}`);
 * ```
 */
export function matchFigures(
  reference: PointsUm,
  candidates: ScoredPointsUm,
  options: MatchFiguresOptions = {},
): FigureMatching {
  const radiusUm = options.radiusUm ?? DEFAULT_MATCH_RADIUS_UM;
  const mode = options.mode ?? "optimal";
  const minScore = options.minScore ?? 0;
  if (!(radiusUm > 0 && radiusUm <= MAX_MATCH_RADIUS_UM)) {
    throw new RangeError(
      `Matching radius must be a number of µm in (0, ${MAX_MATCH_RADIUS_UM}]: got ${radiusUm}`,
    );
  }
  if (mode !== "optimal" && mode !== "greedy") {
    throw new RangeError(`Matching must be "optimal" or "greedy": got "${mode}"`);
  }
  if (Number.isNaN(minScore)) throw new RangeError("Minimum score must be a number: got NaN");
  if (reference.xUm.length !== reference.yUm.length) {
    throw new RangeError("Reference x and y must have equal lengths");
  }
  const nc = candidates.xUm.length, nr = reference.xUm.length;
  if (candidates.yUm.length !== nc || candidates.score.length !== nc) {
    throw new RangeError("Candidate x, y and score must have equal lengths");
  }
  const refRank = rankReferences(reference);
  const order = rankCandidates(candidates, candidates.score);
  const graph = buildPairGraph(reference, candidates, radiusUm, refRank);
  // Candidates at or above the operating threshold lead the rank order.
  let kMin = 0;
  while (kMin < nc && !(candidates.score[order[kMin]] < minScore)) kMin++;

  const refOfCandidate = new Int32Array(nc).fill(-1);
  const candidateOfRef = new Int32Array(nr).fill(-1);
  let tpAt: Int32Array;
  if (mode === "greedy") {
    tpAt = greedyByRank(graph, order, nr, refOfCandidate, candidateOfRef);
    // Pairs made after the operating threshold's prefix are undone.
    for (let k = kMin; k < nc; k++) {
      const c = order[k], r = refOfCandidate[c];
      if (r !== -1) {
        refOfCandidate[c] = -1;
        candidateOfRef[r] = -1;
      }
    }
  } else {
    tpAt = maximumByRank(graph, order, nr);
    optimalPairs(graph, order, kMin, nr, refRank, refOfCandidate, candidateOfRef);
  }
  let tp = 0, totalDistanceUm = 0;
  for (let c = 0; c < nc; c++) {
    const r = refOfCandidate[c];
    if (r === -1) continue;
    tp++;
    for (let e = graph.start[c]; e < graph.start[c + 1]; e++) {
      if (graph.ref[e] === r) {
        totalDistanceUm += graph.distUm[e];
        break;
      }
    }
  }
  return {
    mode,
    radiusUm,
    minScore,
    refOfCandidate,
    candidateOfRef,
    references: nr,
    candidates: kMin,
    tp,
    fp: kMin - tp,
    fn: nr - tp,
    totalDistanceUm,
    order,
    tpAt,
  };
}

/** Greedy over all candidates in rank order; returns pairs after each step. */
function greedyByRank(
  graph: PairGraph,
  order: Int32Array,
  nr: number,
  refOfCand: Int32Array,
  candOfRef: Int32Array,
): Int32Array {
  const n = order.length;
  const tpAt = new Int32Array(n + 1);
  let tp = 0;
  const taken = new Uint8Array(nr);
  for (let k = 0; k < n; k++) {
    const c = order[k];
    // Edges are sorted by distance, then reference rank: the first free one is the nearest.
    for (let e = graph.start[c]; e < graph.start[c + 1]; e++) {
      const r = graph.ref[e];
      if (taken[r]) continue;
      taken[r] = 1;
      refOfCand[c] = r;
      candOfRef[r] = c;
      tp++;
      break;
    }
    tpAt[k + 1] = tp;
  }
  return tpAt;
}

/**
 * Size of a maximum matching of every prefix of the rank order: candidates
 * are added one at a time, each with one augmenting-path search (iterative
 * depth-first, references marked per search).
 */
function maximumByRank(graph: PairGraph, order: Int32Array, nr: number): Int32Array {
  const n = order.length;
  const tpAt = new Int32Array(n + 1);
  const nc = graph.start.length - 1;
  const matchCand = new Int32Array(nc).fill(-1);
  const matchRef = new Int32Array(nr).fill(-1);
  const seen = new Int32Array(nr);
  const stackCand: number[] = [], stackEdge: number[] = [], stackVia: number[] = [];
  let stamp = 0, tp = 0;
  for (let k = 0; k < n; k++) {
    const c0 = order[k];
    if (graph.start[c0] < graph.start[c0 + 1]) {
      stamp++;
      stackCand.length = stackEdge.length = stackVia.length = 0;
      stackCand.push(c0);
      stackEdge.push(graph.start[c0]);
      stackVia.push(-1);
      while (stackCand.length > 0) {
        const d = stackCand.length - 1;
        const c = stackCand[d];
        const e = stackEdge[d];
        if (e >= graph.start[c + 1]) {
          stackCand.pop();
          stackEdge.pop();
          stackVia.pop();
          continue;
        }
        stackEdge[d] = e + 1;
        const r = graph.ref[e];
        if (seen[r] === stamp) continue;
        seen[r] = stamp;
        if (matchRef[r] === -1) {
          // Augment: each candidate on the stack takes the reference below it.
          let give = r;
          for (let t = d; t >= 0; t--) {
            const cand = stackCand[t];
            matchCand[cand] = give;
            matchRef[give] = cand;
            give = stackVia[t];
          }
          tp++;
          break;
        }
        const next = matchRef[r];
        stackCand.push(next);
        stackEdge.push(graph.start[next]);
        stackVia.push(r);
      }
    }
    tpAt[k + 1] = tp;
  }
  return tpAt;
}

/** Exact min-cost maximum matching of the first `kMin` ranked candidates, by component. */
function optimalPairs(
  graph: PairGraph,
  order: Int32Array,
  kMin: number,
  nr: number,
  refRank: Int32Array,
  refOfCand: Int32Array,
  candOfRef: Int32Array,
): void {
  // Union-find over candidates (0 … nc−1) and references (nc … nc+nr−1).
  const nc = graph.start.length - 1;
  const parent = new Int32Array(nc + nr);
  for (let i = 0; i < parent.length; i++) parent[i] = i;
  const find = (x: number): number => {
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  };
  for (let k = 0; k < kMin; k++) {
    const c = order[k];
    for (let e = graph.start[c]; e < graph.start[c + 1]; e++) {
      const a = find(c), b = find(nc + graph.ref[e]);
      if (a !== b) parent[a] = b;
    }
  }
  const cands = new Map<number, number[]>();
  const refs = new Map<number, number[]>();
  for (let k = 0; k < kMin; k++) {
    const c = order[k];
    if (graph.start[c] === graph.start[c + 1]) continue;
    const root = find(c);
    const list = cands.get(root);
    if (list) list.push(c);
    else cands.set(root, [c]);
  }
  for (let r = 0; r < nr; r++) {
    const root = find(nc + r);
    if (!cands.has(root)) continue;
    const list = refs.get(root);
    if (list) list.push(r);
    else refs.set(root, [r]);
  }
  const localOfRef = new Int32Array(nr);
  for (const [root, list] of cands) {
    const rs = refs.get(root)!.sort((a, b) => refRank[a] - refRank[b]);
    matchComponent(graph, list, rs, localOfRef, refOfCand, candOfRef);
  }
}
