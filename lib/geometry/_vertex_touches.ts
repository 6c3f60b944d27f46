/**
 * Private: telling touching rings from crossing ones where edges meet at a
 * shared vertex (moved here from `valid_region.ts` so that the outline
 * checks of `polygon_validity.ts` use the same rule).
 *
 * @module
 */

import type { Contact, TaggedEdges } from "./_contacts.ts";

/**
 * Whether a contact is two edges sharing an end point (and nothing else known yet).
 *
 * @param t The tagged edges.
 * @param c A contact found among them.
 * @returns True when both edges end or start at the contact point.
 *
 * @example Two squares sharing a corner
 * ```ts
 * import { findContacts, tagEdges } from "./_contacts.ts";
 * import { isVertexContact } from "./_vertex_touches.ts";
 * const sq = (x0: number, y0: number, x1: number, y1: number): [number, number][] =>
 *   [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
 * const t = tagEdges([[sq(0, 0, 1, 1)], [sq(1, 1, 2, 2)]], [0, 1]);
 * const contacts = findContacts(t, "across", false);
 * if (!contacts.every((c) => isVertexContact(t, c))) throw new Error("they meet only at (1, 1)");
 * ```
 */
export function isVertexContact(t: TaggedEdges, c: Contact): boolean {
  const at = (e: number) =>
    (t.x0[e] === c.x && t.y0[e] === c.y) || (t.x1[e] === c.x && t.y1[e] === c.y);
  return at(c.a) && at(c.b);
}

/**
 * At each shared vertex, the rings passing through must only touch. Every
 * ring has the solid side on its right (outer rings clockwise on screen,
 * holes anticlockwise); each pass through the vertex covers a wedge of solid.
 * Returns the contacts at vertices where they do (crossings, overlaps).
 *
 * @param t The tagged edges (rings oriented, solid on the right).
 * @param contacts Contacts at shared vertices.
 * @returns The contacts where rings cross or overlap at the vertex.
 *
 * @example Squares meeting corner to corner only touch
 * ```ts
 * import { findContacts, tagEdges } from "./_contacts.ts";
 * import { badVertexTouches } from "./_vertex_touches.ts";
 * const sq = (x0: number, y0: number, x1: number, y1: number): [number, number][] =>
 *   [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
 * const t = tagEdges([[sq(0, 0, 1, 1)], [sq(1, 1, 2, 2)]], [0, 1]);
 * if (badVertexTouches(t, findContacts(t, "all", false)).length !== 0) throw new Error("a touch, not a crossing");
 * ```
 */
export function badVertexTouches(t: TaggedEdges, contacts: Contact[]): Contact[] {
  const byVertex = new Map<string, Contact[]>();
  for (const c of contacts) {
    const key = `${c.x},${c.y}`;
    const list = byVertex.get(key);
    if (list === undefined) byVertex.set(key, [c]);
    else list.push(c);
  }
  const bad: Contact[] = [];
  const TWO_PI = 2 * Math.PI;
  for (const list of byVertex.values()) {
    const vx = list[0].x, vy = list[0].y;
    const passes = new Map<number, [number, number]>(); // in-edge → [start, length] of its wedge
    for (const c of list) {
      for (const e of [c.a, c.b]) {
        const m = t.ringEdges[t.ring[e]];
        const first = e - t.pos[e];
        let inE: number, outE: number;
        if (t.x1[e] === vx && t.y1[e] === vy) {
          inE = e;
          outE = first + (t.pos[e] + 1) % m;
        } else {
          outE = e;
          inE = first + (t.pos[e] + m - 1) % m;
        }
        if (passes.has(inE)) continue;
        const start = Math.atan2(t.y1[outE] - vy, t.x1[outE] - vx);
        const end = Math.atan2(t.y0[inE] - vy, t.x0[inE] - vx);
        let len = end - start;
        if (len <= 0) len += TWO_PI;
        passes.set(inE, [start, len]);
      }
    }
    // sweep once around the vertex: the number of solid wedges covering each
    // sector may vary by at most one (0/1 for touching pieces, 1/2 where a
    // hole touches its outer ring); any more means overlap or a crossing
    const events: [number, number][] = [];
    let count = 0;
    for (const [start, len] of passes.values()) {
      events.push([start, 1]);
      let end = start + len;
      if (end > Math.PI) {
        end -= TWO_PI;
        count++; // the wedge covers the sweep's starting angle −π
      }
      events.push([end, -1]);
    }
    events.sort((p, q) => p[0] - q[0]);
    let lo = count, hi = count, ok = true;
    for (let i = 0; i < events.length; i++) {
      if (i > 0 && events[i][0] === events[i - 1][0]) ok = false; // edges along each other
      count += events[i][1];
      if (count < lo) lo = count;
      if (count > hi) hi = count;
    }
    if (hi - lo > 1) ok = false;
    if (!ok) bad.push(list[0]);
  }
  return bad;
}
