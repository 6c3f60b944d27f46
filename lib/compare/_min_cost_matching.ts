/**
 * Maximum-cardinality, minimum-total-distance matching on one connected
 * component of the pair graph: successive shortest augmenting paths with
 * Dijkstra on reduced costs (Johnson potentials). Not public.
 *
 * Network: source → each candidate (cost 0), candidate → reference (cost =
 * distance), reference → sink (cost 0), unit capacities. Each round finds a
 * cheapest augmenting path in the residual network, so after k rounds the
 * matching has the least total distance among matchings of k pairs; rounds
 * stop when no augmenting path is left, which is the maximum cardinality.
 *
 * @module
 */

import type { PairGraph } from "./_pair_graph.ts";

/** A binary min-heap of (key, node), ties by node index. */
class Heap {
  keys: number[] = [];
  nodes: number[] = [];
  get size(): number {
    return this.nodes.length;
  }
  private less(i: number, j: number): boolean {
    return this.keys[i] < this.keys[j] ||
      (this.keys[i] === this.keys[j] && this.nodes[i] < this.nodes[j]);
  }
  private swap(i: number, j: number): void {
    [this.keys[i], this.keys[j]] = [this.keys[j], this.keys[i]];
    [this.nodes[i], this.nodes[j]] = [this.nodes[j], this.nodes[i]];
  }
  push(key: number, node: number): void {
    this.keys.push(key);
    this.nodes.push(node);
    let i = this.nodes.length - 1;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (!this.less(i, p)) break;
      this.swap(i, p);
      i = p;
    }
  }
  pop(): [number, number] {
    const top: [number, number] = [this.keys[0], this.nodes[0]];
    const lastK = this.keys.pop()!, lastN = this.nodes.pop()!;
    if (this.nodes.length > 0) {
      this.keys[0] = lastK;
      this.nodes[0] = lastN;
      let i = 0;
      for (;;) {
        const l = 2 * i + 1, r = l + 1;
        let m = i;
        if (l < this.nodes.length && this.less(l, m)) m = l;
        if (r < this.nodes.length && this.less(r, m)) m = r;
        if (m === i) break;
        this.swap(i, m);
        i = m;
      }
    }
    return top;
  }
}

/**
 * Matches the candidates `cands` (global indices, all of one component) to
 * their references, writing `refOfCand` and `candOfRef` (global, −1 when
 * unmatched; both must start at −1 for this component).
 *
 * @param graph The pair graph.
 * @param cands Candidates of the component, in rank order.
 * @param refs References of the component, in rank order.
 * @param localOfRef Work array over all references (any content on entry).
 * @param refOfCand Output, per candidate.
 * @param candOfRef Output, per reference.
 */
export function matchComponent(
  graph: PairGraph,
  cands: readonly number[],
  refs: readonly number[],
  localOfRef: Int32Array,
  refOfCand: Int32Array,
  candOfRef: Int32Array,
): void {
  const k = cands.length, m = refs.length;
  for (let j = 0; j < m; j++) localOfRef[refs[j]] = j;
  // Local nodes: candidates 0..k−1, references k..k+m−1, sink k+m.
  const T = k + m;
  const pot = new Float64Array(T + 1);
  const dist = new Float64Array(T + 1);
  const pred = new Int32Array(T + 1);
  const done = new Uint8Array(T + 1);
  const matchC = new Int32Array(k).fill(-1); // local reference of each candidate
  const matchR = new Int32Array(m).fill(-1); // local candidate of each reference
  const costOf = (u: number, v: number): number => {
    const c = cands[u];
    for (let e = graph.start[c]; e < graph.start[c + 1]; e++) {
      if (localOfRef[graph.ref[e]] === v) return graph.distUm[e];
    }
    return Infinity;
  };
  const heap = new Heap();
  for (let round = 0; round < Math.min(k, m); round++) {
    dist.fill(Infinity);
    done.fill(0);
    pred.fill(-1);
    heap.keys.length = 0;
    heap.nodes.length = 0;
    for (let u = 0; u < k; u++) {
      if (matchC[u] !== -1) continue;
      // source → free candidate, cost 0 (source potential stays 0)
      const d = Math.max(0, -pot[u]);
      dist[u] = d;
      pred[u] = -2;
      heap.push(d, u);
    }
    while (heap.size > 0) {
      const [d, x] = heap.pop();
      if (done[x] || d > dist[x]) continue;
      done[x] = 1;
      if (x === T) break;
      if (x < k) {
        const c = cands[x];
        for (let e = graph.start[c]; e < graph.start[c + 1]; e++) {
          const v = k + localOfRef[graph.ref[e]];
          if (matchC[x] === v - k || done[v]) continue;
          const nd = d + Math.max(0, graph.distUm[e] + pot[x] - pot[v]);
          if (nd < dist[v]) {
            dist[v] = nd;
            pred[v] = x;
            heap.push(nd, v);
          }
        }
      } else {
        const j = x - k;
        const u = matchR[j];
        if (u === -1) {
          const nd = d + Math.max(0, pot[x] - pot[T]);
          if (nd < dist[T]) {
            dist[T] = nd;
            pred[T] = x;
            heap.push(nd, T);
          }
        } else if (!done[u]) {
          const nd = d + Math.max(0, -costOf(u, j) + pot[x] - pot[u]);
          if (nd < dist[u]) {
            dist[u] = nd;
            pred[u] = x;
            heap.push(nd, u);
          }
        }
      }
    }
    if (!done[T]) break;
    const D = dist[T];
    for (let x = 0; x <= T; x++) pot[x] += Math.min(dist[x], D);
    // Flip the path: sink ← reference ← candidate ← reference ← … ← source.
    let v = pred[T];
    for (;;) {
      const u = pred[v];
      const from = pred[u];
      matchC[u] = v - k;
      matchR[v - k] = u;
      if (from === -2) break;
      v = from;
    }
  }
  for (let u = 0; u < k; u++) {
    if (matchC[u] === -1) continue;
    const c = cands[u], r = refs[matchC[u]];
    refOfCand[c] = r;
    candOfRef[r] = c;
  }
}
