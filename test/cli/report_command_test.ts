import { strict as assert } from "node:assert";
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { main } from "../../lib/cli.ts";

function caseFile(dir: string): string {
  const sq = [[0, 0], [12000, 0], [12000, 12000], [0, 12000], [0, 0]];
  const figs = [[6000, 6000], [6100, 6050], [6200, 5900], [1000, 1000]];
  const fc = {
    type: "FeatureCollection",
    slide: { id: "QVT-24-050", mpp: 0.5 },
    features: [
      {
        type: "Feature",
        properties: { role: "tissue" },
        geometry: { type: "Polygon", coordinates: [sq] },
      },
      {
        type: "Feature",
        properties: { role: "figure" },
        geometry: { type: "MultiPoint", coordinates: figs },
      },
      {
        type: "Feature",
        properties: { role: "field", reader: "reader-a" },
        geometry: { type: "Point", coordinates: [3000, 3000] },
      },
    ],
  };
  const path = join(dir, "QVT-24-050.geojson");
  writeFileSync(path, JSON.stringify(fc));
  return path;
}

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  const out: string[] = [], err: string[] = [];
  const code = await main(["report", ...args], {
    stdout: (s) => out.push(s),
    stderr: (s) => err.push(s),
  });
  return { code, out: out.join(""), err: err.join("") };
}

Deno.test("hotfield report writes DIR/<case>/report.json with the contract keys", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const file = caseFile(dir);
    const out = join(dir, "out");
    const r = await run([
      file,
      "--out",
      out,
      "--stride-um",
      "50",
      "--best-n",
      "2",
      "--format",
      "json,geojson",
    ]);
    assert.equal(r.code, 0, r.err);
    assert.match(r.out, /^QVT-24-050\thotspot 3 /);
    const report = JSON.parse(readFileSync(join(out, "QVT-24-050", "report.json"), "utf8"));
    for (
      const key of [
        "schema",
        "case",
        "window",
        "settings",
        "valid_area_mm2",
        "figures",
        "hotspot",
        "distribution",
        "fields",
        "classification",
        "warnings",
      ]
    ) assert.ok(key in report, key);
    assert.equal(report.schema, "hotfield.report/1");
    assert.deepEqual(Object.keys(report.hotspot).slice(0, 4), [
      "center_px",
      "count",
      "coverage",
      "per_mm2",
    ]);
    assert.deepEqual(Object.keys(report.settings).slice(0, 4), [
      "stride_um",
      "min_coverage",
      "min_score",
      "count_labels",
    ]);
    assert.deepEqual(
      Object.keys(report.distribution).slice(0, 7),
      ["positions", "min", "q1", "median", "q3", "max", "mean"],
    );
    assert.deepEqual(Object.keys(report.fields[0]).slice(0, 5), [
      "reader",
      "center_px",
      "count",
      "coverage",
      "percentile",
    ]);
    assert.deepEqual(Object.keys(report.figures).slice(0, 4), [
      "total",
      "counted",
      "outside_valid",
      "below_score",
    ]);
    assert.equal(report.hotspot.count, 3);
    assert.equal(report.classification, null);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("hotfield report exits 2 naming the option for each bad value", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const file = caseFile(dir);
    const out = join(dir, "out");
    const bad: [string[], RegExp][] = [
      [["--area", "0"], /--area/],
      [["--area", "-2"], /--area/],
      [["--aspect", "4x3"], /--aspect/],
      [["--aspect", "4:-3"], /--aspect/],
      [["--stride-um", "0"], /--stride-um/],
      [["--stride-um", "0.001"], /--stride-um.*cells/],
      [["--min-coverage", "0"], /--min-coverage/],
      [["--min-coverage", "1.2"], /--min-coverage/],
      [["--top", "-1"], /--top/],
      [["--shape", "hexagon"], /--shape/],
      [["--format", "pdf"], /--format/],
      [["--scheme", "no-such-scheme"], /--scheme/],
    ];
    for (const [extra, re] of bad) {
      const r = await run([file, "--out", out, ...extra]);
      assert.equal(r.code, 2, `${extra.join(" ")}: ${r.err}`);
      assert.match(r.err, re);
      assert.ok(!existsSync(out), "no output folder on a usage error");
    }
    const none = await run([file]);
    assert.equal(none.code, 2);
    assert.match(none.err, /--out/);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("hotfield report exits 1 on bad input and leaves no output folder", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const good = caseFile(dir);
    const broken = join(dir, "QVT-24-051.geojson");
    writeFileSync(broken, "{ not json");
    const out = join(dir, "out");
    const lone = await run([broken, "--out", out]);
    assert.equal(lone.code, 1);
    assert.match(lone.err, /QVT-24-051\.geojson/);
    assert.ok(!existsSync(out), "nothing written when no case succeeds");
    // Several files: the bad one fails, the good one is still written.
    const r = await run([good, broken, "--out", out, "--best-n", "0", "--stride-um", "100"]);
    assert.equal(r.code, 1);
    assert.match(r.err, /QVT-24-051\.geojson/);
    assert.match(r.err, /1 ok, 1 failed/);
    assert.ok(existsSync(join(out, "QVT-24-050", "report.json")));
    assert.ok(!existsSync(join(out, "QVT-24-051")));
    // An output "folder" that is a file.
    const asFile = join(dir, "taken");
    writeFileSync(asFile, "x");
    const r2 = await run([good, "--out", asFile, "--best-n", "0", "--format", "json"]);
    assert.equal(r2.code, 1);
    assert.match(r2.err, /is a file, not a folder/);
    mkdirSync(join(dir, "ok"));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("hotfield report in/*: a GeoJSON a listed case file names is not a case of its own", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const inDir = join(dir, "in");
    mkdirSync(inDir);
    caseFile(inDir); // QVT-24-050.geojson
    writeFileSync(
      join(inDir, "QVT-24-050.case.json"),
      JSON.stringify({ hotfield_case: 1, annotations: "QVT-24-050.geojson" }),
    );
    const files = ["QVT-24-050.case.json", "QVT-24-050.geojson"].map((f) => join(inDir, f));
    const out = join(dir, "out");
    const r = await run([...files, "--out", out, "--best-n", "0", "--stride-um", "100"]);
    assert.equal(r.code, 0, r.err);
    assert.equal(
      r.err,
      `hotfield report: ${files[1]} is read through a case file given too, not as a case\n`,
    );
    assert.equal(r.out.split("\n").filter((l) => l.startsWith("QVT-24-050\t")).length, 1);
    // A folder stands for its cases, the same way.
    const r2 = await run([
      inDir,
      "--out",
      join(dir, "out2"),
      "--best-n",
      "0",
      "--stride-um",
      "100",
    ]);
    assert.equal(r2.code, 0, r2.err);
    const report = JSON.parse(readFileSync(join(dir, "out2", "QVT-24-050", "report.json"), "utf8"));
    assert.deepEqual(
      report.provenance.inputs.map((i: { path: string }) => i.path),
      ["QVT-24-050.case.json", "QVT-24-050.geojson"],
    );
    // --no-cohort writes the case folder only.
    const r3 = await run([
      files[0],
      "--out",
      join(dir, "out3"),
      "--best-n",
      "0",
      "--stride-um",
      "100",
      "--no-cohort",
    ]);
    assert.equal(r3.code, 0);
    assert.ok(!existsSync(join(dir, "out3", "index.html")));
    assert.ok(existsSync(join(dir, "out3", "QVT-24-050", "report.html")));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("hotfield report --mpp replaces the slide's mpp with a warning", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const file = caseFile(dir);
    const out = join(dir, "out");
    const r = await run([
      file,
      "--out",
      out,
      "--best-n",
      "0",
      "--stride-um",
      "100",
      "--mpp",
      "0.25",
    ]);
    assert.equal(r.code, 0, r.err);
    const report = JSON.parse(readFileSync(join(out, "QVT-24-050", "report.json"), "utf8"));
    assert.deepEqual(report.mpp, [0.25, 0.25]);
    assert.ok(
      report.warnings.includes(
        "The mpp given for the case sets slide mpp 0.25, replacing 0.5 from the annotation file",
      ),
    );
    const bad = await run([file, "--out", out, "--mpp", "0"]);
    assert.equal(bad.code, 2);
    assert.match(bad.err, /Option --mpp needs a positive number N or a pair N,M/);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
