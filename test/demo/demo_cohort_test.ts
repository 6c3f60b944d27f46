/**
 * The demo cohort keeps the geometric promises its README makes, checked
 * with JSTS 2.12.1 (a port of the JTS Topology Suite) as the outside planar
 * reference, and the PNG mask decoded with fast-png.
 */

import { strict as assert } from "node:assert";
import GeoJSONReader from "jsts/org/locationtech/jts/io/GeoJSONReader.js";
import IsValidOp from "jsts/org/locationtech/jts/operation/valid/IsValidOp.js";
import "jsts/org/locationtech/jts/monkey.js";
import { decode } from "fast-png";
import { generateDemoCohort } from "../../lib/demo/demo_cohort.ts";
import { maskPngBytes } from "../../lib/demo/demo_files.ts";
import type { DemoCase, DemoFeature } from "../../lib/demo/demo_cohort.ts";

const reader = new GeoJSONReader();
const cohort = generateDemoCohort();

function geoms(c: DemoCase, role: string): DemoFeature["geometry"][] {
  return c.annotations.features.filter((f) => f.properties.role === role).map((f) => f.geometry);
}

function mpp(c: DemoCase): [number, number] {
  const m = c.annotations.slide.mpp;
  return typeof m === "number" ? [m, m] : m;
}

Deno.test("generateDemoCohort() draws valid polygons, the tumour inside the tissue (JSTS)", () => {
  for (const c of cohort) {
    for (const role of ["tissue", "tumour", "exclude"]) {
      for (const g of geoms(c, role)) {
        const j = reader.read(g);
        assert.ok(new IsValidOp(j).isValid(), `${c.caseId} ${role} is not a valid polygon`);
      }
    }
    const tissue = geoms(c, "tissue");
    if (tissue.length === 0) continue; // mask case
    const tumour = reader.read(geoms(c, "tumour")[0]);
    // The tumour outline lies inside the tissue's outer ring (holes may cut it).
    const shell = reader.read({
      type: "Polygon",
      coordinates: [
        (tissue[0].type === "Polygon"
          ? tissue[0].coordinates
          : (tissue[0].coordinates as number[][][][])[0])[0],
      ],
    });
    assert.ok(shell.contains(tumour), `${c.caseId}: tumour leaves the tissue`);
  }
});

Deno.test("generateDemoCohort() gives QVT-24-005 a tumour smaller than 2.37 mm² (JSTS area)", () => {
  const c = cohort.find((c) => c.caseId === "QVT-24-005")!;
  const [mx, my] = mpp(c);
  const areaMm2 = reader.read(geoms(c, "tumour")[0]).getArea() * mx * my / 1e6;
  // Standard area 2.37 mm²: Meuten, Moore & George, Vet Pathol 2016;53(1):7-9 (via REFERENCES.md).
  assert.ok(areaMm2 < 2.37, `tumour is ${areaMm2} mm²`);
});

Deno.test("generateDemoCohort() draws the polygon field at about 2.37 mm² (JSTS area)", () => {
  const polys = cohort.flatMap((c) =>
    geoms(c, "field").filter((g) => g.type === "Polygon").map((g) => ({ c, g }))
  );
  assert.ok(polys.length >= 1);
  for (const { c, g } of polys) {
    const [mx, my] = mpp(c);
    const areaMm2 = reader.read(g).getArea() * mx * my / 1e6;
    // hand calculation: 1777.6 µm × 1333.2 µm = 2.3699 mm²; corners jitter by ±20 µm,
    // so the area may move by about 2·(1777.6 + 1333.2)·20 µm² ≈ 0.12 mm² at most.
    assert.ok(Math.abs(areaMm2 - 2.37) < 0.13, `${c.caseId} field is ${areaMm2} mm²`);
  }
});

Deno.test("the demo mask's tissue area matches the polygons it was drawn from (fast-png, JSTS)", () => {
  const c = cohort.find((c) => c.tissueMask)!;
  const png = decode(maskPngBytes(c.tissueMask!));
  let on = 0;
  for (const v of png.data) if (v !== 0) on++;
  const um = c.tissueMask!.umPerPx;
  const maskMm2 = on * um * um / 1e6;
  const [mx, my] = mpp(c);
  const poly = reader.read({ type: "MultiPolygon", coordinates: c.maskDrawnFrom });
  const polyMm2 = poly.getArea() * mx * my / 1e6;
  // Sampling pixel centres errs by at most half a pixel across the boundary:
  // |error| ≤ perimeter × um / 2 (hand bound; the signed errors mostly cancel).
  const perimeterUm = poly.getLength() * mx;
  const boundMm2 = perimeterUm * um / 2 / 1e6;
  assert.ok(
    Math.abs(maskMm2 - polyMm2) < boundMm2,
    `mask ${maskMm2} mm², polygons ${polyMm2} mm², bound ${boundMm2}`,
  );
});

Deno.test("generateDemoCohort() puts figures in excluded zones and outside the tumour (JSTS)", () => {
  for (const c of cohort) {
    const tumour = reader.read(geoms(c, "tumour")[0]);
    const excl = geoms(c, "exclude").map((g) => reader.read(g));
    const pts = c.figuresCsv
      ? c.figuresCsv.map((r) => [r.xPx, r.yPx])
      : geoms(c, "figure").flatMap((g) =>
        g.type === "Point" ? [g.coordinates] : (g.coordinates as number[][])
      );
    let inExcluded = 0, outsideTumour = 0;
    for (const [x, y] of pts) {
      const p = reader.read({ type: "Point", coordinates: [x, y] });
      if (excl.some((e) => e.contains(p))) inExcluded++;
      if (!tumour.contains(p)) outsideTumour++;
    }
    assert.ok(inExcluded > 0, `${c.caseId}: no figure in an excluded zone`);
    assert.ok(outsideTumour > 0, `${c.caseId}: no figure outside the tumour`);
  }
});
