/**
 * A binary heap on a plain array, ordered by `before(a, b)` (a comes out
 * first), shared by the rectangle cell and circle searches. Equal items
 * keep no particular order, so `before` must break every tie the searches
 * depend on.
 *
 * @module
 */

/** Adds `it` to `heap`. */
export function heapPush<T>(heap: T[], it: T, before: (a: T, b: T) => boolean): void {
  let i = heap.length;
  heap.push(it);
  while (i > 0) {
    const p = (i - 1) >> 1;
    if (!before(it, heap[p])) break;
    heap[i] = heap[p];
    i = p;
  }
  heap[i] = it;
}

/** Removes and returns the first item of a non-empty `heap`. */
export function heapPop<T>(heap: T[], before: (a: T, b: T) => boolean): T {
  const top = heap[0];
  const last = heap.pop()!;
  const n = heap.length;
  if (n > 0) {
    let i = 0;
    for (;;) {
      const l = 2 * i + 1;
      if (l >= n) break;
      const c = l + 1 < n && before(heap[l + 1], heap[l]) ? l + 1 : l;
      if (!before(heap[c], last)) break;
      heap[i] = heap[c];
      i = c;
    }
    heap[i] = last;
  }
  return top;
}
