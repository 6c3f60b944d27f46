// The indexed edge-contact search against the uniform-grid search it
// replaced (test/geometry/_contacts_reference.ts): the same contacts, the
// same meeting points, in the same order, on seeded random sets of rings
// that cross, touch at vertices, overlap along edges and mix long and short
// edges. A regression check of a speed change; the outcomes that depend on
// contacts (unions, intersections, repairs) are checked against JSTS in
// valid_region_test.ts.
import { strict as assert } from "node:assert";
import { findContacts, sizedGridContacts, tagEdges } from "../../lib/geometry/_contacts.ts";
import { provesNoContacts } from "../../lib/geometry/_sweep.ts";
import * as reference from "./_contacts_reference.ts";
import { type Random, randomPolygon, seededRandom, starRing } from "./_shapes.ts";
import type { PolygonPx, Ring } from "../../lib/types.ts";

/** A random set of polygons, often overlapping, some sharing vertices or edges. */
function randomSet(rnd: Random): PolygonPx[] {
  const polys: PolygonPx[] = [];
  const k = 1 + Math.floor(rnd() * 5);
  for (let i = 0; i < k; i++) {
    const r = rnd();
    if (r < 0.5) {
      polys.push(
        randomPolygon(rnd, 100 * rnd(), 100 * rnd(), 20 + 60 * rnd(), 6 + Math.floor(rnd() * 200)),
      );
    } else if (r < 0.7) {
      // a rectangle on a coarse lattice: shared vertices and collinear edges
      const x = 10 * Math.floor(10 * rnd()), y = 10 * Math.floor(10 * rnd());
      const w = 10 * (1 + Math.floor(5 * rnd())), h = 10 * (1 + Math.floor(5 * rnd()));
      polys.push([[[x, y], [x + w, y], [x + w, y + h], [x, y + h], [x, y]]]);
    } else if (r < 0.85) {
      // a self-crossing star (bow ties) with long edges
      const ring: Ring = starRing(rnd, 50, 50, 5 + Math.floor(rnd() * 6), 10, 90);
      const order = ring.slice(0, -1).sort(() => rnd() - 0.5);
      polys.push([[...order, order[0]]]);
    } else {
      // a fine outline: many short edges
      polys.push([starRing(rnd, 50 + 20 * rnd(), 50, 2000, 40, 41)]);
    }
  }
  return polys;
}

Deno.test("findContacts() and its sized grid give the reference grid's contacts in its order", () => {
  let total = 0;
  for (let seed = 1; seed <= 120; seed++) {
    const rnd = seededRandom(seed);
    const polys = randomSet(rnd);
    const groups = polys.map((_, i) => (seed % 3 === 0 ? i % 2 : i));
    for (const mode of ["all", "across"] as const) {
      for (const firstOnly of [false, true]) {
        const want = reference.findContacts(reference.tagEdges(polys, groups), mode, firstOnly);
        // The grid sized to the edges (used from 50,000 edges), and the whole search.
        const sized = sizedGridContacts(tagEdges(polys, groups), mode, firstOnly);
        assert.deepStrictEqual(sized, want, `seed ${seed}, ${mode}, firstOnly ${firstOnly}`);
        const got = findContacts(tagEdges(polys, groups), mode, firstOnly);
        assert.deepStrictEqual(got, want, `seed ${seed}, ${mode}, firstOnly ${firstOnly}`);
        total += got.length;
      }
    }
  }
  // Enough meetings to test the order (hundreds of crossings and touches).
  assert.ok(total > 500, `${total} contacts`);
});

Deno.test("provesNoContacts() proves clean outlines and never a set with a contact", () => {
  // Against the reference search: whenever it finds a contact the sweep must
  // not claim there is none; on valid outlines (stars, holes, zigzags with
  // collinear lattice points, axis-parallel rectangles) it should prove it.
  let proved = 0, clean = 0;
  for (let seed = 1; seed <= 200; seed++) {
    const rnd = seededRandom(1000 + seed);
    const polys: PolygonPx[] = seed % 2 === 0 ? randomSet(rnd) : [
      seed % 3 === 0
        ? [starRing(rnd, 0, 0, 3000, 400, 500).map(([x, y]) => [Math.round(x), Math.round(y)])]
        : randomPolygon(rnd, 0, 0, 100, 50 + Math.floor(rnd() * 500), 3),
    ];
    const groups = polys.map((_, i) => i);
    for (const mode of ["all", "across"] as const) {
      const want = reference.findContacts(reference.tagEdges(polys, groups), mode, false);
      const t = tagEdges(polys, groups);
      const none = provesNoContacts(t, mode, (i, j) => meetOf(t, i, j));
      if (want.length > 0) assert.ok(!none, `seed ${seed} ${mode}: a contact was missed`);
      else {
        clean++;
        if (none) proved++;
      }
    }
  }
  assert.ok(proved > 0.6 * clean, `${proved} of ${clean} clean sets proved`);
});

/** The contact test, from the edges' own search (first contact of the pair, or null). */
function meetOf(t: ReturnType<typeof tagEdges>, i: number, j: number): unknown {
  const two = reference.findContacts(
    {
      ...t,
      x0: Float64Array.of(t.x0[i], t.x0[j]),
      y0: Float64Array.of(t.y0[i], t.y0[j]),
      x1: Float64Array.of(t.x1[i], t.x1[j]),
      y1: Float64Array.of(t.y1[i], t.y1[j]),
      group: Int32Array.of(0, 1),
      ring: Int32Array.of(t.ring[i], t.ring[j]),
      pos: Int32Array.of(t.pos[i], t.pos[j]),
      count: 2,
      minX: Math.min(t.x0[i], t.x1[i], t.x0[j], t.x1[j]),
      minY: Math.min(t.y0[i], t.y1[i], t.y0[j], t.y1[j]),
      maxX: Math.max(t.x0[i], t.x1[i], t.x0[j], t.x1[j]),
      maxY: Math.max(t.y0[i], t.y1[i], t.y0[j], t.y1[j]),
    },
    "all",
    true,
  );
  return two.length > 0 ? two[0] : null;
}

Deno.test("findContacts() on outlines of 200,000 edges (the sweep's range) agrees with the reference", () => {
  const rnd = seededRandom(7);
  // A crowded zigzag outline on a 0.1 lattice, clean; then with a hole that crosses it.
  const ring: Ring = starRing(rnd, 0, 0, 200_000, 4000, 4100).map(
    ([x, y]) => [Math.round(x * 10) / 10, Math.round(y * 10) / 10] as [number, number],
  );
  ring[ring.length - 1] = [ring[0][0], ring[0][1]];
  const hole: Ring = [[4050, -10], [4050, 10], [3000, 10], [3000, -10], [4050, -10]];
  for (const polys of [[[ring]], [[ring, hole]]] as PolygonPx[][]) {
    const got = findContacts(tagEdges(polys, [0]), "all", false);
    const want = reference.findContacts(reference.tagEdges(polys, [0]), "all", false);
    assert.deepStrictEqual(got, want);
  }
});
