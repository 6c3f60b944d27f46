/**
 * Brute-force references for the matching tests: every matching enumerated
 * (optimal), and greedy written the plain way, straight from the definitions.
 */

export interface Pts {
  x: number[];
  y: number[];
}

/** Most pairs within r, then least total distance, by trying every matching. */
export function bruteOptimal(
  ref: Pts,
  cand: Pts,
  r: number,
): { tp: number; total: number } {
  const used = new Array(ref.x.length).fill(false);
  let best = { tp: 0, total: 0 };
  const go = (c: number, tp: number, total: number) => {
    if (c === cand.x.length) {
      if (tp > best.tp || (tp === best.tp && total < best.total - 1e-9)) best = { tp, total };
      return;
    }
    go(c + 1, tp, total);
    for (let i = 0; i < ref.x.length; i++) {
      if (used[i]) continue;
      const dx = ref.x[i] - cand.x[c], dy = ref.y[i] - cand.y[c];
      if (dx * dx + dy * dy > r * r) continue;
      used[i] = true;
      go(c + 1, tp + 1, total + Math.sqrt(dx * dx + dy * dy));
      used[i] = false;
    }
  };
  go(0, 0, 0);
  return best;
}

/**
 * Greedy from its definition: candidates by score descending (ties: y, x,
 * input order), each takes the nearest free reference within r (ties: y, x,
 * input order of the reference). Returns the reference of each candidate.
 */
export function bruteGreedy(ref: Pts, cand: Pts & { score: number[] }, r: number): number[] {
  const idx = cand.x.map((_, i) => i);
  idx.sort((a, b) =>
    cand.score[b] - cand.score[a] || cand.y[a] - cand.y[b] || cand.x[a] - cand.x[b] || a - b
  );
  const free = ref.x.map(() => true);
  const out = cand.x.map(() => -1);
  for (const c of idx) {
    let best = -1, bestD = Infinity;
    for (let i = 0; i < ref.x.length; i++) {
      if (!free[i]) continue;
      const dx = ref.x[i] - cand.x[c], dy = ref.y[i] - cand.y[c];
      if (dx * dx + dy * dy > r * r) continue;
      const d = Math.sqrt(dx * dx + dy * dy);
      const better = best === -1 || d < bestD ||
        (d === bestD &&
          (ref.y[i] < ref.y[best] || (ref.y[i] === ref.y[best] && ref.x[i] < ref.x[best])));
      if (better) {
        best = i;
        bestD = d;
      }
    }
    if (best !== -1) {
      free[best] = false;
      out[c] = best;
    }
  }
  return out;
}
