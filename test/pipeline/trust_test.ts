// Trust at a glance: a count made meaningless by its input is never graded
// silently, the hotspot centre recounts to its count, and every warning
// reaches report.json, the HTML page and the command's output.
//
// These checks are of hotfield's own contract (no published value is
// involved); the recount uses the closed-window rule stated in DEVELOPERS.md.

import { strict as assert } from "node:assert";
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { main } from "../../lib/cli.ts";
import { buildCaseResult } from "../../lib/pipeline/build_case_result.ts";
import { countInWindow } from "../../lib/count/window_contains.ts";
import { makeWindow } from "../../lib/count/make_window.ts";
import { listSchemes } from "../../lib/standards/list_schemes.ts";
import { renderCaseHtml } from "../../lib/report/report_html.ts";
import { seededRandom } from "../../lib/random.ts";
import type { CaseData } from "../../lib/types.ts";

const MPP = 0.5;
const SIDE_PX = 16000; // 8 mm square of tissue

function square(side: number): [number, number][][] {
  return [[[0, 0], [side, 0], [side, side], [0, side], [0, 0]]];
}

/** A case with tissue and the given figures (px), labels and scores. */
function caseOf(
  points: [number, number][],
  options: { labels?: string[]; labelOf?: (k: number) => number; score?: (k: number) => number } =
    {},
): CaseData {
  const n = points.length;
  const labels = options.labels ?? ["mitotic figure"];
  return {
    caseId: "QVT-24-300",
    slide: { id: "QVT-24-300", mppX: MPP, mppY: MPP },
    tissue: [{ polygons: [square(SIDE_PX)], source: "test" }],
    tumour: [],
    exclude: [],
    figures: {
      xPx: Float64Array.from(points, (p) => p[0]),
      yPx: Float64Array.from(points, (p) => p[1]),
      labelIndex: Uint32Array.from({ length: n }, (_, k) => options.labelOf?.(k) ?? 0),
      labels,
      score: Float64Array.from({ length: n }, (_, k) => options.score?.(k) ?? NaN),
      origin: Int32Array.from({ length: n }, (_, k) => k),
    },
    fields: [],
    sources: [],
    warnings: [],
  };
}

function cluster(n: number, cx: number, cy: number, seed: number): [number, number][] {
  const random = seededRandom(seed);
  return Array.from(
    { length: n },
    () => [cx + (random() - 0.5) * 2000, cy + (random() - 0.5) * 2000],
  );
}

const HTML_CONTEXT = { plotlySrc: "plotly.js", generatedAt: null, version: "test", options: {} };

function assertUnclassifiedEverywhere(c: CaseData, problem: RegExp, minScore = 0): void {
  const result = buildCaseResult(c, {
    scheme: "canine-mct-2tier",
    bestN: 0,
    strideUm: 100,
    minScore,
  });
  const r = result.report;
  assert.equal(r.classification, null, "no classification");
  assert.equal(r.uncertainty, null, "no uncertainty");
  assert.equal(r.count_problems?.length, 1, JSON.stringify(r.count_problems));
  assert.match(r.count_problems![0], problem);
  assert.ok(r.warnings.some((w) => problem.test(w)), "the problem is a warning too");
  assert.match(r.verdict ?? "", /^Not graded\./);
  const html = renderCaseHtml(result, HTML_CONTEXT);
  const alert = /<aside class="problem" role="alert">(.*?)<\/aside>/s.exec(html);
  assert.ok(alert, "a problem box in the HTML");
  assert.ok(problem.test(alert[1].replaceAll("&quot;", '"')), alert[1]);
  // Near the top: before the count map.
  assert.ok(html.indexOf('role="alert"') < html.indexOf("map-section"));
}

Deno.test("buildCaseResult() leaves a case whose labels all miss unclassified, naming the near label", () => {
  const c = caseOf(cluster(30, 8000, 8000, 1), { labels: ["Mitotic Figure"] });
  assertUnclassifiedEverywhere(
    c,
    /Nothing counted: none of the 30 figure points has a counted label/,
  );
  const r = buildCaseResult(c, { scheme: "canine-mct-2tier", bestN: 0, strideUm: 100 }).report;
  assert.ok(
    r.warnings.some((w) => w.includes('"Mitotic Figure" is close to the counted label')),
    r.warnings.join("\n"),
  );
  assert.match(r.count_problems![0], /Did you mean --count-label "Mitotic Figure"\?/);
});

Deno.test("buildCaseResult() leaves a case whose scores all fall below the minimum unclassified", () => {
  const c = caseOf(cluster(20, 8000, 8000, 2), { score: () => 0.4 });
  const r = buildCaseResult(c, {
    scheme: "canine-mct-2tier",
    minScore: 0.9,
    bestN: 0,
    strideUm: 100,
  });
  assert.equal(r.report.classification, null);
  assert.match(
    r.report.count_problems![0],
    /every one of the 20 figures with a counted label scores below the minimum score 0\.9 \(highest score 0\.4\)/,
  );
  assertUnclassifiedEverywhere(
    caseOf(cluster(20, 8000, 8000, 2), { score: () => 0.4 }),
    /Nothing counted: every one of the 20/,
    0.9,
  );
});

Deno.test("buildCaseResult() with --allow-empty classifies a case with nothing counted", () => {
  const c = caseOf(cluster(30, 8000, 8000, 3), { labels: ["Mitotic Figure"] });
  const r = buildCaseResult(c, {
    scheme: "canine-mct-2tier",
    bestN: 0,
    strideUm: 100,
    allowEmpty: true,
  }).report;
  assert.equal(r.classification?.class, "below");
  assert.equal(r.count_problems?.length, 1, "the problem is still reported");
});

Deno.test("hotfield report: a figures CSV in µm read as px is a problem in report.json, HTML and stdout", async () => {
  const dir = Deno.makeTempDirSync();
  const fc = {
    type: "FeatureCollection",
    slide: { id: "QVT-24-301", mpp: MPP },
    features: [{
      type: "Feature",
      properties: { role: "tissue" },
      geometry: { type: "Polygon", coordinates: square(SIDE_PX) },
    }],
  };
  writeFileSync(join(dir, "QVT-24-301.geojson"), JSON.stringify(fc));
  // Points spread over the whole tissue, written in µm (px × 0.5).
  const random = seededRandom(4);
  const rows = ["x,y"];
  for (let k = 0; k < 150; k++) {
    rows.push(`${(random() * SIDE_PX * MPP).toFixed(1)},${(random() * SIDE_PX * MPP).toFixed(1)}`);
  }
  writeFileSync(join(dir, "f.csv"), rows.join("\n") + "\n");
  const out: string[] = [];
  const code = await main(
    [
      "report",
      join(dir, "QVT-24-301.geojson"),
      "--figures",
      join(dir, "f.csv"),
      "--out",
      join(dir, "out"),
      "--scheme",
      "canine-mct-2tier",
      "--stride-um",
      "100",
      "--best-n",
      "0",
    ],
    { stdout: (s) => out.push(s), stderr: () => {} },
  );
  assert.equal(code, 0);
  const report = JSON.parse(readFileSync(join(dir, "out", "QVT-24-301", "report.json"), "utf8"));
  assert.equal(report.classification, null);
  assert.match(report.count_problems[0], /the coordinates look like micrometres \(--units um/);
  const html = readFileSync(join(dir, "out", "QVT-24-301", "report.html"), "utf8");
  assert.match(html, /role="alert"><strong>Not graded/);
  assert.match(out.join(""), /warning: Figures CSV .* look like micrometres/);
  assert.match(out.join(""), /verdict: Not graded\./);

  // Stated explicitly, the unit is trusted: a warning, and the case is graded.
  const out2: string[] = [];
  const code2 = await main(
    [
      "report",
      join(dir, "QVT-24-301.geojson"),
      "--figures",
      join(dir, "f.csv"),
      "--units",
      "px",
      "--out",
      join(dir, "out2"),
      "--scheme",
      "canine-mct-2tier",
      "--stride-um",
      "100",
      "--best-n",
      "0",
      "--strict",
    ],
    { stdout: (s) => out2.push(s), stderr: () => {} },
  );
  assert.equal(code2, 1, "--strict: a warning means exit 1");
  const report2 = JSON.parse(readFileSync(join(dir, "out2", "QVT-24-301", "report.json"), "utf8"));
  assert.notEqual(report2.classification, null);
  assert.deepEqual(report2.count_problems, []);
  assert.ok(report2.warnings.some((w: string) => w.includes("the unit was stated")));
  Deno.removeSync(dir, { recursive: true });
});

/** A window's rim points: corners and edge midpoints (rect) or eight compass points (circle). */
function rimPoints(shape: "rect" | "circle", cx: number, cy: number, hx: number, hy: number) {
  if (shape === "rect") {
    return [
      [cx - hx, cy - hy],
      [cx + hx, cy + hy],
      [cx - hx, cy],
      [cx + hx, cy],
      [cx, cy - hy],
      [cx, cy + hy],
    ];
  }
  return Array.from({ length: 8 }, (_, k) => {
    const a = (k * Math.PI) / 4;
    return [cx + hx * Math.cos(a), cy + hx * Math.sin(a)];
  });
}

Deno.test("the printed hotspot centre recounts to the reported count on 200 cases with figures on window rims", () => {
  const random = seededRandom(2026);
  for (let t = 0; t < 200; t++) {
    const shape = t % 2 === 0 ? "rect" : "circle";
    const window = makeWindow({ shape, areaMm2: 0.5 });
    const hx = (window.shape === "rect" ? window.widthUm : window.diameterUm) / 2 / MPP;
    const hy = (window.shape === "rect" ? window.heightUm : window.diameterUm) / 2 / MPP;
    const points: [number, number][] = [];
    // Two windows' rims, some rim points kept, plus scattered figures.
    for (let w = 0; w < 2; w++) {
      const cx = 3000 + random() * (SIDE_PX - 6000), cy = 3000 + random() * (SIDE_PX - 6000);
      for (const p of rimPoints(shape, cx, cy, hx, hy)) {
        if (random() < 0.8) points.push([p[0], p[1]]);
      }
      for (let k = 0; k < 3; k++) {
        points.push([cx + (random() - 0.5) * hx, cy + (random() - 0.5) * hy]);
      }
    }
    for (let k = 0; k < 15; k++) points.push([random() * SIDE_PX, random() * SIDE_PX]);
    const c = caseOf(points);
    const { report, prepared } = buildCaseResult(c, {
      shape,
      areaMm2: 0.5,
      strideUm: 100,
      top: 1,
      bestN: 0,
    });
    const h = report.hotspot!;
    const [px, py] = h.center_px;
    const recount = countInWindow(prepared.xUm, prepared.yUm, window, px * MPP, py * MPP);
    assert.equal(recount, h.count, `case ${t} (${shape}): centre ${px}, ${py}`);
    const [ux, uy] = h.center_um!;
    assert.equal(
      countInWindow(prepared.xUm, prepared.yUm, window, ux, uy),
      h.count,
      `case ${t} µm`,
    );
    assert.ok(typeof h.margin_um === "number" && h.margin_um >= 0, `margin ${h.margin_um}`);
  }
});

Deno.test("no scheme and no classification warning says 'from memory'", () => {
  for (const s of listSchemes()) {
    assert.ok(!JSON.stringify(s).includes("from memory"), s.id);
  }
  const c = caseOf(cluster(30, 8000, 8000, 5));
  for (const s of listSchemes()) {
    const r = buildCaseResult(c, { scheme: s.id, bestN: 0, strideUm: 200, simulations: 0 });
    const html = renderCaseHtml(r, HTML_CONTEXT);
    assert.ok(!html.includes("from memory"), s.id);
    assert.ok(!JSON.stringify(r.report).includes("from memory"), s.id);
  }
});

Deno.test("a case file's scheme is used, and an option it overrides gets a warning", async () => {
  const dir = Deno.makeTempDirSync();
  mkdirSync(join(dir, "in"));
  const fc = {
    type: "FeatureCollection",
    slide: { id: "QVT-24-302", mpp: MPP },
    features: [
      {
        type: "Feature",
        properties: { role: "tissue" },
        geometry: { type: "Polygon", coordinates: square(SIDE_PX) },
      },
      {
        type: "Feature",
        properties: { role: "figure" },
        geometry: { type: "MultiPoint", coordinates: cluster(12, 8000, 8000, 6) },
      },
    ],
  };
  writeFileSync(join(dir, "in", "a.geojson"), JSON.stringify(fc));
  writeFileSync(
    join(dir, "in", "QVT-24-302.case.json"),
    JSON.stringify({ hotfield_case: 1, annotations: "a.geojson", scheme: "canine-mammary" }),
  );
  const out: string[] = [];
  const code = await main(
    [
      "report",
      join(dir, "in", "QVT-24-302.case.json"),
      "--out",
      join(dir, "out"),
      "--scheme",
      "canine-mct-2tier",
      "--stride-um",
      "100",
      "--best-n",
      "0",
      "--simulations",
      "0",
      "--format",
      "json",
    ],
    { stdout: (s) => out.push(s), stderr: () => {} },
  );
  assert.equal(code, 0);
  const r = JSON.parse(readFileSync(join(dir, "out", "QVT-24-302", "report.json"), "utf8"));
  assert.equal(r.classification.scheme, "canine-mammary");
  assert.ok(
    r.warnings.some((w: string) => w.includes('sets scheme to "canine-mammary"')),
    r.warnings.join("\n"),
  );
  Deno.removeSync(dir, { recursive: true });
});

Deno.test("hotfield report --format csv writes no empty case folders", async () => {
  const dir = Deno.makeTempDirSync();
  const fc = {
    type: "FeatureCollection",
    slide: { id: "QVT-24-303", mpp: MPP },
    features: [{
      type: "Feature",
      properties: { role: "tissue" },
      geometry: { type: "Polygon", coordinates: square(SIDE_PX) },
    }],
  };
  writeFileSync(join(dir, "a.geojson"), JSON.stringify(fc));
  const code = await main(
    [
      "report",
      join(dir, "a.geojson"),
      "--out",
      join(dir, "out"),
      "--format",
      "csv",
      "--best-n",
      "0",
      "--stride-um",
      "200",
    ],
    { stdout: () => {}, stderr: () => {} },
  );
  assert.equal(code, 0);
  assert.deepEqual(readdirSync(join(dir, "out")).sort(), [
    "cases.csv",
    "fields.csv",
    "readers.csv",
  ]);
  Deno.removeSync(dir, { recursive: true });
});
