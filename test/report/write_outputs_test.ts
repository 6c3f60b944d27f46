import { strict as assert } from "node:assert";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { parse } from "csv-parse/sync";
import { CASE_COLUMNS, casesCsv, FIELD_COLUMNS, fieldsCsv } from "../../lib/report/report_csv.ts";
import { generationTime, writeOutputs } from "../../lib/report/write_outputs.ts";
import { renderCaseHtml } from "../../lib/report/report_html.ts";
import { renderCohortIndex } from "../../lib/report/cohort_index.ts";
import { escapeHtml, jsonForScript } from "../../lib/report/html_escape.ts";
import { findPlotlyPath, PLOTLY_PACKAGE, PLOTLY_VERSION } from "../../lib/report/plotly_asset.ts";
import { countMapFigure, heatmapGrid } from "../../lib/report/count_map_figure.ts";
import { plotText } from "../../lib/report/plot_labels.ts";
import { caseHotspotGeoJson } from "../../lib/report/hotspot_geojson.ts";
import { fixtureResult } from "./_fixture.ts";

const HOSTILE_CASE = '<script>alert("case")</script>';
const HOSTILE_READERS: [string, string] = ['</script><b>"reader" & co</b>', "trainee\u2028<!--2"];
const HOSTILE_REASON = "<img src=x onerror=alert(1)>";
const HOSTILE_WARNING = 'Field 3 has "</script>" & <b>tags</b>';
const CONTEXT = {
  plotlySrc: "../assets/plotly.min.js",
  generatedAt: "2026-01-01T00:00:00Z",
  version: "0.1.0",
  options: { note: "</script>" },
};
const FAKE_PLOTLY = "window.Plotly={newPlot:function(){return Promise.resolve();}};\n";

function tempDir(): string {
  return mkdtempSync(join(tmpdir(), "hotfield-report-test-"));
}

function listFiles(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d).sort()) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else out.push(relative(dir, p));
    }
  };
  walk(dir);
  return out;
}

/** The contents of `<script ...id="hotfield-plots">` up to the first `</script`. */
function plotJson(html: string): unknown {
  const start = html.indexOf('id="hotfield-plots">');
  assert.ok(start > 0, "plot data block present");
  const from = start + 'id="hotfield-plots">'.length;
  const end = html.toLowerCase().indexOf("</script", from);
  return JSON.parse(html.slice(from, end));
}

function hostileResult() {
  const r = fixtureResult({
    caseId: "QVT-24-901",
    readers: HOSTILE_READERS,
    reason: HOSTILE_REASON,
    warnings: [HOSTILE_WARNING],
    standards: true,
  });
  r.report.case = HOSTILE_CASE;
  return r;
}

Deno.test("renderCaseHtml() shows names from input as text, never markup", () => {
  const html = renderCaseHtml(hostileResult(), CONTEXT);
  for (const raw of [HOSTILE_CASE, HOSTILE_READERS[0], HOSTILE_REASON, HOSTILE_WARNING]) {
    assert.ok(!html.includes(raw), `raw text leaked: ${raw}`);
  }
  assert.ok(html.includes(escapeHtml(HOSTILE_CASE)));
  assert.ok(html.includes(escapeHtml(HOSTILE_READERS[0])));
  assert.ok(html.includes(escapeHtml(HOSTILE_WARNING)));
  // Exactly three script elements: plotly.js, the plot data, the draw code
  // (HTML Standard, "Restrictions for contents of script elements": no
  // "</script" or "<!--" inside the data).
  assert.equal(html.match(/<script/gi)?.length, 3);
  assert.equal(html.match(/<\/script/gi)?.length, 3);
  // U+2028 is escaped inside scripts (a raw one ended a JavaScript string before ES2019).
  const scripts = html.match(/<script[^>]*>[\s\S]*?<\/script>/gi) ?? [];
  assert.ok(scripts.every((s) => !s.includes("\u2028")));
  const specs = plotJson(html) as { figure: { data: { name?: string }[] } }[];
  assert.equal(specs.length, 2);
  const names = specs[0].figure.data.map((t) => t.name ?? "");
  // plotly.js reads tags and entities in labels, so labels carry escaped text.
  assert.ok(
    names.some((n) => n.startsWith(`${plotText(HOSTILE_READERS[0])}'s field`)),
    names.join(" | "),
  );
  assert.ok(names.includes(`excluded: ${plotText(HOSTILE_REASON)}`));
  assert.ok(!names.some((n) => n.includes("<")));
});

Deno.test("renderCohortIndex() escapes case ids and links folders by URL encoding", () => {
  const r = hostileResult();
  const html = renderCohortIndex([r], { ...CONTEXT, plotlySrc: "assets/plotly.min.js" });
  assert.ok(!html.includes(HOSTILE_CASE));
  assert.ok(html.includes(`>${escapeHtml(HOSTILE_CASE)}</a>`));
  assert.ok(html.includes('href="QVT-24-901/report.html"'));
  // plotly.js, the table sorter, the plot data and the draw code.
  assert.equal(html.match(/<script/gi)?.length, 4);
  plotJson(html);
});

Deno.test("jsonForScript() escapes <, >, &, U+2028 and U+2029 and still round-trips", () => {
  const value = { a: "</script><!-- & \u2028\u2029 >" };
  const s = jsonForScript(value);
  assert.ok(!/[<>&\u2028\u2029]/.test(s));
  assert.deepEqual(JSON.parse(s), value);
});

Deno.test("renderCaseHtml() renders a case with no admissible placement and says why", () => {
  const r = fixtureResult({ noAdmissible: true, caseId: "QVT-24-905" });
  assert.equal(r.hotspot, null);
  assert.equal(r.map.positions, 0);
  const html = renderCaseHtml(r, CONTEXT);
  assert.ok(html.includes("No window of the standard area could be placed"));
  assert.ok(html.includes("No admissible window position: the valid region (1.2 mm²)"));
  assert.ok(html.includes("No window placed."));
  const specs = plotJson(html) as { figure: { data: { type: string; z?: unknown[][] }[] } }[];
  const heat = specs[0].figure.data.find((t) => t.type === "heatmap")!;
  assert.ok(heat.z!.flat().every((v) => v === null), "every position blank");
  const dir = tempDir();
  try {
    writeOutputs([r], dir, { plotlyJs: FAKE_PLOTLY, generatedAt: null });
    const rows = parse(readFileSync(join(dir, "cases.csv"), "utf8"), { columns: true }) as Record<
      string,
      string
    >[];
    assert.equal(rows[0].hotspot_count, "");
    assert.equal(rows[0].positions, "0");
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("writeOutputs() output is byte-identical across runs under SOURCE_DATE_EPOCH", () => {
  const a = tempDir(), b = tempDir();
  const before = Deno.env.get("SOURCE_DATE_EPOCH");
  // reproducible-builds.org SOURCE_DATE_EPOCH specification: seconds since
  // 1970-01-01 00:00:00 UTC. Hand calculation: 1700000000 s = 19675 days +
  // 80000 s; day 19675 is 2023-11-14 and 80000 s is 22:13:20.
  Deno.env.set("SOURCE_DATE_EPOCH", "1700000000");
  try {
    const results = () => [
      fixtureResult({ standards: true }),
      fixtureResult({ caseId: "QVT-24-902", seed: 9 }),
    ];
    writeOutputs(results(), a);
    writeOutputs(results(), b);
    const files = listFiles(a);
    assert.deepEqual(files, listFiles(b));
    assert.deepEqual(files, [
      "QVT-24-901/hotspot.geojson",
      "QVT-24-901/report.html",
      "QVT-24-901/report.json",
      "QVT-24-902/hotspot.geojson",
      "QVT-24-902/report.html",
      "QVT-24-902/report.json",
      "assets/plotly.min.js",
      "cases.csv",
      "fields.csv",
      "index.html",
      "readers.csv",
      "readers.html",
    ]);
    for (const f of files) {
      assert.ok(readFileSync(join(a, f)).equals(readFileSync(join(b, f))), `${f} differs`);
    }
    const html = readFileSync(join(a, "QVT-24-901", "report.html"), "utf8");
    assert.ok(html.includes("generated 2023-11-14T22:13:20Z"));
    assert.ok(html.includes('<script src="../assets/plotly.min.js"></script>'));
    // The shared asset is the npm package's bundle, byte for byte.
    assert.ok(
      readFileSync(join(a, "assets", "plotly.min.js")).equals(readFileSync(findPlotlyPath()!)),
    );
  } finally {
    if (before === undefined) Deno.env.delete("SOURCE_DATE_EPOCH");
    else Deno.env.set("SOURCE_DATE_EPOCH", before);
    rmSync(a, { recursive: true, force: true });
    rmSync(b, { recursive: true, force: true });
  }
});

Deno.test("generationTime() follows SOURCE_DATE_EPOCH and rejects a malformed value", () => {
  assert.equal(generationTime("1700000000", new Date(0)), "2023-11-14T22:13:20Z");
  assert.equal(generationTime("0", new Date(5e12)), "1970-01-01T00:00:00Z");
  assert.equal(generationTime("", new Date(0)), "1970-01-01T00:00:00Z");
  assert.throws(
    () => generationTime("17e8", new Date(0)),
    RangeError,
    'SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01 UTC: got "17e8"',
  );
});

Deno.test("cases.csv and fields.csv parse back with csv-parse (RFC 4180)", () => {
  const one = fixtureResult({ standards: true, readers: ['reader, "a"', "trainee\n2"] });
  const two = fixtureResult({ caseId: "QVT-24-902", seed: 3 });
  const reports = [one.report, two.report];
  const cases = casesCsv(reports);
  // RFC 4180 §2: CRLF line breaks, a header line, fields with commas,
  // quotes or line breaks enclosed in double quotes, quotes doubled.
  assert.ok(cases.endsWith("\r\n"));
  assert.ok(cases.startsWith(CASE_COLUMNS.join(",") + "\r\n"));
  const rows = parse(cases, { columns: true, record_delimiter: "\r\n" }) as Record<
    string,
    string
  >[];
  assert.equal(rows.length, 2);
  assert.deepEqual(Object.keys(rows[0]), [...CASE_COLUMNS]);
  assert.equal(rows[0].case, "QVT-24-901");
  assert.equal(Number(rows[0].hotspot_count), one.report.hotspot!.count);
  assert.equal(Number(rows[0].hotspot_per_mm2), one.report.hotspot!.per_mm2);
  assert.equal(Number(rows[0].q1), one.report.distribution.q1);
  assert.equal(Number(rows[0].mean), one.report.distribution.mean);
  assert.equal(rows[0].scheme, "canine-mct-2tier");
  assert.equal(rows[0].cutoff, "7");
  assert.equal(rows[0].count_ci95_low, "5.5");
  assert.equal(rows[1].scheme, "");
  assert.equal(rows[1].class, "");

  const fields = fieldsCsv(reports);
  assert.ok(fields.includes('"reader, ""a"""'), "RFC 4180 §2.7: quotes doubled");
  const frows = parse(fields, { columns: true }) as Record<string, string>[];
  assert.deepEqual(Object.keys(frows[0]), [...FIELD_COLUMNS]);
  assert.equal(frows.length, 4);
  assert.equal(frows[0].reader, 'reader, "a"');
  assert.equal(frows[1].reader, "trainee\n2");
  assert.equal(Number(frows[0].count), one.report.fields[0].count);
  assert.equal(Number(frows[1].percentile), one.report.fields[1].percentile);
  assert.equal(Number(frows[1].shortfall), one.report.fields[1].shortfall);
});

Deno.test("writeOutputs() refuses a file as output folder", () => {
  const dir = tempDir();
  const file = join(dir, "not-a-folder");
  Deno.writeTextFileSync(file, "x");
  try {
    assert.throws(
      () => writeOutputs([fixtureResult()], file, { plotlyJs: FAKE_PLOTLY }),
      Error,
      `Cannot write reports to "${file}": it is a file, not a folder`,
    );
    assert.equal(readFileSync(file, "utf8"), "x");
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("writeOutputs() writes nothing when a case fails to render", () => {
  const dir = tempDir();
  const out = join(dir, "out");
  const bad = fixtureResult({ caseId: "QVT-24-903" });
  Object.defineProperty(bad.report, "distribution", {
    get() {
      throw new Error("broken result");
    },
  });
  try {
    assert.throws(
      () => writeOutputs([fixtureResult(), bad], out, { plotlyJs: FAKE_PLOTLY }),
      /broken result/,
    );
    assert.equal(existsSync(out), false);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("writeOutputs() replaces an earlier run and leaves no staging folders", () => {
  const dir = tempDir();
  try {
    writeOutputs([fixtureResult()], dir, { plotlyJs: FAKE_PLOTLY, generatedAt: null });
    Deno.writeTextFileSync(join(dir, "QVT-24-901", "stale.txt"), "old");
    const written = writeOutputs([fixtureResult()], dir, {
      plotlyJs: FAKE_PLOTLY,
      generatedAt: null,
    });
    assert.equal(existsSync(join(dir, "QVT-24-901", "stale.txt")), false);
    assert.ok(written.every((p) => existsSync(p)));
    assert.deepEqual(readdirSync(dir).filter((n) => n.startsWith(".")), []);
    assert.ok(!listFiles(dir).some((f) => f.includes(".tmp-")));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("writeOutputs() writes only the formats asked for; standalone inlines plotly.js", () => {
  const dir = tempDir();
  try {
    writeOutputs([fixtureResult()], join(dir, "csv"), { formats: ["csv"] });
    assert.deepEqual(listFiles(join(dir, "csv")), ["cases.csv", "fields.csv", "readers.csv"]);
    writeOutputs([fixtureResult()], join(dir, "geo"), { formats: ["geojson", "json"] });
    assert.deepEqual(listFiles(join(dir, "geo")), [
      "QVT-24-901/hotspot.geojson",
      "QVT-24-901/report.json",
    ]);
    writeOutputs([fixtureResult()], join(dir, "alone"), {
      formats: ["html"],
      standalone: true,
      plotlyJs: FAKE_PLOTLY + "var s='</script><!--';",
      generatedAt: null,
    });
    assert.deepEqual(listFiles(join(dir, "alone")), [
      "QVT-24-901/report.html",
      "index.html",
      "readers.html",
    ]);
    const html = readFileSync(join(dir, "alone", "QVT-24-901", "report.html"), "utf8");
    assert.ok(html.includes(FAKE_PLOTLY));
    assert.ok(html.includes("var s='<\\/script><\\!--';"), "inlined code cannot close its element");
    assert.ok(!html.includes("generated "));
    // An output folder inside the input folder is fine.
    writeOutputs([fixtureResult()], join(dir, "geo", "QVT-24-901", "out"), { formats: ["json"] });
    assert.ok(existsSync(join(dir, "geo", "QVT-24-901", "out", "QVT-24-901", "report.json")));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("writeOutputs() refuses two results with the same case id", () => {
  assert.throws(
    () => writeOutputs([fixtureResult(), fixtureResult()], tempDir(), { plotlyJs: FAKE_PLOTLY }),
    Error,
    'case "QVT-24-901" appears twice',
  );
});

Deno.test("countMapFigure() reduces a huge grid and states the factor in the caption", () => {
  const r = fixtureResult();
  const nx = 1000, ny = 900;
  r.map = {
    ...r.map,
    grid: { x0Um: 0, y0Um: 0, strideUm: 10, nx, ny },
    counts: new Int32Array(nx * ny).map((_, k) => k % 7),
    coverage: new Float32Array(nx * ny).fill(1),
    admissible: new Uint8Array(nx * ny).fill(1),
  };
  // Hand calculation: ceil(sqrt(900000 / 40000)) = ceil(4.74) = 5.
  const g = heatmapGrid(r);
  assert.equal(g.factor, 5);
  assert.equal(g.xUm.length, 200);
  assert.equal(g.yUm.length, 180);
  assert.equal(g.xUm[0], 20, "centre of the first block of 5 positions: (0 + 4) / 2 × 10 µm");
  assert.ok(g.z.flat().every((v) => v === 6), "each block of 25 keeps its highest count");
  const fig = countMapFigure(r);
  assert.ok(fig.caption.includes("reduced by a factor of 5"), fig.caption);
  const html = renderCaseHtml(r, CONTEXT);
  assert.ok(html.length < 1_500_000, `report stays small: ${html.length} bytes`);
});

Deno.test("countMapFigure() draws mm axes, y down, equal aspect, cividis and the marks", () => {
  const r = fixtureResult({ standards: true });
  const fig = countMapFigure(r);
  const layout = fig.layout as {
    xaxis: { title: { text: string } };
    yaxis: { autorange: string; scaleanchor: string; scaleratio: number; title: { text: string } };
  };
  assert.equal(layout.yaxis.autorange, "reversed");
  assert.equal(layout.yaxis.scaleanchor, "x");
  assert.equal(layout.yaxis.scaleratio, 1);
  assert.equal(layout.xaxis.title.text, "x (mm)");
  const names = fig.data.map((t) => String(t.name ?? ""));
  assert.equal(fig.data[0].colorscale, "Cividis");
  for (const n of ["excluded: necrosis", "top windows 2–3"]) {
    assert.ok(names.includes(n), `${n} in ${names.join(" | ")}`);
  }
  assert.ok(names.some((n) => n.startsWith("not admissible")), names.join(" | "));
  assert.ok(names.some((n) => n.startsWith("reader-a's field: ")), names.join(" | "));
  assert.ok(names.some((n) => /^counted figures \(\d+\)$/.test(n)), names.join(" | "));
  // No text is drawn over the map: labels live in the legend.
  assert.ok(fig.data.every((t) => !String(t.mode ?? "").includes("text")));
  // The hotspot is drawn last, on top of everything.
  assert.ok(String(fig.data[fig.data.length - 1].name).startsWith("hotspot: "));
  assert.ok(names.some((n) => n.startsWith("hotspot: ")));
  // Inadmissible positions are blank: the corner centre (0, 0) is outside V.
  assert.equal((fig.data[0].z as (number | null)[][])[0][0], null);
});

Deno.test("hotspot.geojson has closed rings in pixels around each window", () => {
  const r = fixtureResult();
  const fc = caseHotspotGeoJson(r) as {
    features: {
      properties: { kind: string; count: number };
      geometry: { coordinates: number[][][] };
    }[];
  };
  assert.equal(fc.features[0].properties.kind, "hotspot");
  assert.equal(fc.features[0].properties.count, r.hotspot!.count);
  for (const f of fc.features) {
    const ring = f.geometry.coordinates[0];
    // RFC 7946 §3.1.6: a linear ring is closed, with four or more positions.
    assert.deepEqual(ring[0], ring[ring.length - 1]);
    assert.ok(ring.length >= 4);
  }
  // Hand calculation: 1777.6 µm / 0.25 µm per px = 7110.4 px wide.
  const ring = fc.features[0].geometry.coordinates[0];
  assert.ok(Math.abs(ring[1][0] - ring[0][0] - 7110.4) < 1e-9);
});

Deno.test("PLOTLY_VERSION matches the pin in deno.json", () => {
  const config = JSON.parse(readFileSync("deno.json", "utf8"));
  assert.equal(config.imports[PLOTLY_PACKAGE], `npm:${PLOTLY_PACKAGE}@${PLOTLY_VERSION}`);
  assert.ok(findPlotlyPath(), "plotly.js is in Deno's cache (the test run caches it)");
});
