/**
 * The edges of a set of rings with their tags, shared by the contact search
 * and the sweep (kept apart so those two files do not import each other).
 *
 * @module
 */

/** Edges of a list of rings, each tagged with a group (e.g. part or set) and its ring. */
export interface TaggedEdges {
  x0: Float64Array;
  y0: Float64Array;
  x1: Float64Array;
  y1: Float64Array;
  /** Group of each edge (part index, or set 0/1). */
  group: Int32Array;
  /** Global ring number of each edge. */
  ring: Int32Array;
  /** Position of the edge in its ring. */
  pos: Int32Array;
  /** Number of edges of each ring, by global ring number. */
  ringEdges: Int32Array;
  count: number;
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}
