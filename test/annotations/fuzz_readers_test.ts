// Seeded fuzzing of the readers: valid annotation GeoJSON, case files,
// figures CSVs and PNG masks are mutated (truncation, byte flips, number
// changes, key deletions and repeats, values of the wrong type, rings and
// features moved about) and read. Every outcome must be either a result (whose
// valid region is then built, and for some a whole report) or an input error
// whose message starts `Cannot read <what> "<file>"` (or names the case and its
// file): never another exception, never a stack trace's worth of internals,
// never a hang. The seed is fixed; a failure prints the mutated text.

import { strict as assert } from "node:assert";
import { encode } from "fast-png";
import { join } from "node:path";
import { writeFileSync } from "node:fs";
import { parseAnnotations } from "../../lib/annotations/read_annotations.ts";
import { readAnnotationsBytes } from "../../lib/annotations/_scan_annotations.ts";
import { parseCaseFile } from "../../lib/annotations/read_case.ts";
import { parseFiguresCsv } from "../../lib/annotations/read_figures_csv.ts";
import { decodeMaskPng, maskToPolygons } from "../../lib/tissue/read_mask.ts";
import { checkPngBounds } from "../../lib/io/png_bounds.ts";
import { buildValidRegion } from "../../lib/geometry/valid_region.ts";
import { buildCaseResult } from "../../lib/pipeline/build_case_result.ts";
import { type Random, seededRandom } from "../../lib/random.ts";
import type { CaseData } from "../../lib/types.ts";

const FILE = "QVT-24-080.geojson";
/** A bound per case, far above any honest reading of these small files (ms). */
const BOUND_MS = 3000;

const sq = (x0: number, y0: number, x1: number, y1: number) => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
  [x0, y0],
];

function baseAnnotations(): unknown {
  const f = (role: string, geometry: unknown, props: Record<string, unknown> = {}) => ({
    type: "Feature",
    properties: { role, ...props },
    geometry,
  });
  return {
    type: "FeatureCollection",
    slide: { id: "QVT-24-080", mpp: [0.25, 0.26], width: 40000, height: 30000 },
    features: [
      f("tissue", {
        type: "Polygon",
        coordinates: [sq(0, 0, 30000, 20000), sq(2000, 2000, 4000, 4000)],
      }),
      f("tumour", {
        type: "MultiPolygon",
        coordinates: [[sq(1000, 1000, 20000, 15000)], [sq(22000, 1000, 29000, 9000)]],
      }),
      f("exclude", { type: "Polygon", coordinates: [sq(5000, 5000, 7000, 6000)] }, {
        reason: "necrosis",
      }),
      f("figure", { type: "Point", coordinates: [8000.5, 9000.25] }, { score: 0.91 }),
      f("figure", { type: "Point", coordinates: [8100, 9050] }, { label: "mimic", score: 0.2 }),
      f("figure", { type: "MultiPoint", coordinates: [[9000, 9000], [9100, 9100], [25000, 5000]] }),
      f("field", { type: "Point", coordinates: [9000, 9000] }, { reader: "reader-a" }),
      f("field", { type: "Polygon", coordinates: [sq(8000, 8000, 9800, 9400)] }, {
        reader: "trainee-2",
        date: "2024-11-16",
      }),
      f("field", { type: "MultiPoint", coordinates: [[8500, 8500], [9500, 9500]] }, {
        reader: "reader-a",
        field_diameter_mm: 0.55,
      }),
    ],
  };
}

const CASE_FILE = {
  hotfield_case: 1,
  id: "QVT-24-080",
  annotations: "QVT-24-080.geojson",
  figures: { path: "QVT-24-080.figures.csv", units: "px" },
  tissue_mask: { path: "QVT-24-080.tissue.png", mpp: [8, 8] },
  slide: { id: "QVT-24-080", mpp: 0.25, width: 40000, height: 30000 },
  scheme: "canine-mct-2tier",
  min_score: 0.5,
  count_labels: ["mitotic figure"],
};

const CSV =
  'x,y,label,score\n8000,9000,mitotic figure,0.9\n8100.5,9050,"atypical, tripolar",0.7\n' +
  "9000,9000,,\n25000,5000,mimic,0.1\n";

const INTERESTING_NUMBERS = [
  "0",
  "-0",
  "-1",
  "0.5",
  "2",
  "1e308",
  "1e999",
  "-1e999",
  "1e-320",
  "1e15",
  "-1e15",
  "123456789012345678901234567890",
  "4e5",
  "NaN",
  "0x10",
];
const JUNK = [
  "{",
  "}",
  "[",
  "]",
  ",",
  ":",
  '"',
  "\\",
  "0",
  "9",
  "-",
  ".",
  "e",
  "x",
  " ",
  "\n",
  "\u0000",
  "é",
  "\ud800",
];

function pick<T>(rnd: Random, xs: readonly T[]): T {
  return xs[Math.floor(rnd() * xs.length)];
}

/** Every object and array in a parsed value, with its parent. */
function nodes(v: unknown, out: unknown[] = []): unknown[] {
  if (v !== null && typeof v === "object") {
    out.push(v);
    for (const x of Object.values(v as object)) nodes(x, out);
  }
  return out;
}

/** One mutation of `text` (a JSON or CSV text). */
function mutate(text: string, rnd: Random, json: boolean): string {
  // JSON texts get mostly mutations that keep them JSON, so that the checks
  // after parsing are exercised as much as the parser's
  const u = rnd();
  const kind = !json
    ? Math.floor(u * 4)
    : u < 0.08
    ? 0
    : u < 0.16
    ? 1
    : u < 0.32
    ? 2
    : u < 0.44
    ? 8
    : u < 0.46
    ? 3
    : u < 0.6
    ? 4
    : u < 0.72
    ? 5
    : u < 0.95
    ? 6
    : 7;
  switch (kind) {
    case 0: // truncation
      return text.slice(0, Math.floor(rnd() * text.length));
    case 1: { // byte flips
      let t = text;
      const k = 1 + Math.floor(rnd() * 3);
      for (let i = 0; i < k; i++) {
        const at = Math.floor(rnd() * t.length);
        t = t.slice(0, at) + pick(rnd, JUNK) + t.slice(at + 1);
      }
      return t;
    }
    case 2: { // number change
      const spans = [...text.matchAll(/-?\d+(\.\d+)?([eE][+-]?\d+)?/g)];
      if (spans.length === 0) return text;
      const m = pick(rnd, spans);
      return text.slice(0, m.index) + pick(rnd, INTERESTING_NUMBERS) +
        text.slice(m.index! + m[0].length);
    }
    case 3: { // a line or a span removed or repeated
      const a = Math.floor(rnd() * text.length), b = a + Math.floor(rnd() * 40);
      return rnd() < 0.5
        ? text.slice(0, a) + text.slice(b)
        : text.slice(0, b) + text.slice(a, b) + text.slice(b);
    }
  }
  const root = JSON.parse(text);
  const all = nodes(root);
  const objects = all.filter((n) => !Array.isArray(n)) as Record<string, unknown>[];
  const arrays = all.filter((n) => Array.isArray(n)) as unknown[][];
  switch (kind) {
    case 4: { // key deletion
      const o = pick(rnd, objects);
      const keys = Object.keys(o);
      if (keys.length > 0) delete o[pick(rnd, keys)];
      return JSON.stringify(root);
    }
    case 5: { // a value of the wrong type
      const o = pick(rnd, objects);
      const keys = Object.keys(o);
      if (keys.length > 0) {
        o[pick(rnd, keys)] = pick(rnd, [null, "", [], {}, true, "x", -1, [[1, 2]], 1e300]);
      }
      return JSON.stringify(root);
    }
    case 6: { // array elements dropped, repeated, reversed or swapped in
      const a = pick(rnd, arrays);
      const r = rnd();
      if (a.length === 0) return JSON.stringify(root);
      const i = Math.floor(rnd() * a.length);
      if (r < 0.25) a.splice(i, 1);
      else if (r < 0.5) a.splice(i, 0, structuredClone(a[i]));
      else if (r < 0.75) a.reverse();
      else a[i] = structuredClone(pick(rnd, arrays));
      return JSON.stringify(root);
    }
    case 8: { // positions moved: rings that cross, fold, leave their polygon or the slide
      const isPos = (q: unknown) =>
        Array.isArray(q) && q.length === 2 && typeof q[0] === "number" && typeof q[1] === "number";
      const rings = arrays.filter((a) => a.length >= 4 && a.every(isPos)) as number[][][];
      if (rings.length === 0) return JSON.stringify(root);
      const ring = pick(rnd, rings);
      const scale = pick(rnd, [10, 1000, 20000, 1e6]);
      const dx = Math.round((rnd() - 0.5) * scale), dy = Math.round((rnd() - 0.5) * scale);
      if (rnd() < 0.5) {
        // the whole ring, closing position included
        for (const q of ring) q[0] += dx, q[1] += dy;
      } else {
        const q = ring[1 + Math.floor(rnd() * (ring.length - 2))];
        q[0] += dx, q[1] += dy;
      }
      return JSON.stringify(root);
    }
    default: { // a member repeated (the text is still JSON)
      const t = JSON.stringify(root);
      const m = pick(rnd, [...t.matchAll(/"([a-z_]+)":/g)]);
      return t.slice(0, m.index) + `${m[0]}0,` + t.slice(m.index);
    }
  }
}

/** Fails unless `e` is an input error naming `file` (or a refusal naming the case). */
function assertClean(e: unknown, what: string, file: string, text: string): void {
  const ok = (e instanceof SyntaxError || e instanceof TypeError || e instanceof RangeError ||
    e instanceof Error) &&
    ((e as Error).message.startsWith(`Cannot read ${what} "${file}": `) ||
      (e as Error).message.startsWith(`Cannot count case "`) ||
      (e as Error).message.startsWith(`Cannot read case "${file}`));
  if (!ok) {
    throw new Error(
      `not a clean refusal: ${(e as Error)?.stack ?? e}\n--- input (${text.length} chars) ---\n${
        text.slice(0, 2000)
      }`,
    );
  }
  const m = (e as Error).message;
  const control = [...m].some((c) => c.charCodeAt(0) < 0x20 || c.charCodeAt(0) === 0x7f);
  assert.ok(!control, `one printable line: ${JSON.stringify(m)}`);
  assert.ok(!/\bat \S+ \(|file:\/\//.test(m), `no stack in the message: ${m}`);
}

function timed<T>(fn: () => T): T {
  const t = performance.now();
  try {
    return fn();
  } finally {
    const ms = performance.now() - t;
    assert.ok(ms < BOUND_MS, `one case took ${Math.round(ms)} ms`);
  }
}

Deno.test("fuzz: 2,400 mutated annotation files are read or refused cleanly", () => {
  const rnd = seededRandom(2024_11_16);
  const base = JSON.stringify(baseAnnotations(), null, 1);
  let read = 0, refused = 0, reports = 0;
  for (let k = 0; k < 2400; k++) {
    let text = base;
    const rounds = 1 + Math.floor(rnd() * 2);
    for (let r = 0; r < rounds; r++) text = mutate(text, rnd, isJson(text));
    timed(() => {
      let parsed;
      // the byte reader (a scanner for figure features) must agree with the text reader
      // (a lone surrogate has no UTF-8 form: such texts are compared as text only)
      const bytes = new TextEncoder().encode(text);
      const same = new TextDecoder().decode(bytes) === text;
      let viaBytes: string | undefined;
      try {
        const b = readAnnotationsBytes(bytes, { fileName: FILE });
        viaBytes = `read ${b.figures.xPx.length} figures, ${b.warnings.length} warnings`;
      } catch (e) {
        assertClean(e, "annotations", FILE, text);
        viaBytes = (e as Error).message;
      }
      if (!same) viaBytes = undefined;
      try {
        parsed = parseAnnotations(text, { fileName: FILE });
        if (viaBytes !== undefined) {
          assert.equal(
            viaBytes,
            `read ${parsed.figures.xPx.length} figures, ${parsed.warnings.length} warnings`,
            text,
          );
        }
      } catch (e) {
        assertClean(e, "annotations", FILE, text);
        if (viaBytes !== undefined) {
          assert.equal(viaBytes, (e as Error).message, "the byte reader refuses alike");
        }
        refused++;
        return;
      }
      read++;
      const caseData: CaseData = {
        caseId: "QVT-24-080",
        slide: parsed.slide,
        tissue: parsed.tissue,
        tumour: parsed.tumour,
        exclude: parsed.exclude,
        figures: parsed.figures,
        fields: parsed.fields,
        sources: [{ kind: "annotations", path: FILE, sha256: "0".repeat(64) }],
        warnings: parsed.warnings,
      };
      try {
        buildValidRegion(parsed);
      } catch (e) {
        // no region with area: an input error naming the file and feature
        assert.ok(e instanceof TypeError && (e as Error).message.includes(FILE), String(e));
        return;
      }
      // a whole report for some (coarse, so the suite stays fast)
      if (read % 10 === 0) {
        try {
          const r = buildCaseResult(caseData, { strideUm: 400, bestN: 2, top: 1, simulations: 0 });
          assert.equal(r.report.case, "QVT-24-080");
          reports++;
        } catch (e) {
          assertClean(e, "annotations", FILE, text);
        }
      }
    });
  }
  console.log(`${read} read, ${refused} refused, ${reports} whole reports`);
  assert.ok(read > 200 && refused > 200, "both outcomes are exercised");
});

function isJson(text: string): boolean {
  try {
    JSON.parse(text);
    return true;
  } catch {
    return false;
  }
}

Deno.test("fuzz: 600 mutated case files and 600 figures CSVs are read or refused cleanly", () => {
  const rnd = seededRandom(80);
  const caseText = JSON.stringify(CASE_FILE, null, 2);
  for (let k = 0; k < 600; k++) {
    let text = caseText;
    for (let r = 0; r < 1 + Math.floor(rnd() * 2); r++) text = mutate(text, rnd, isJson(text));
    timed(() => {
      try {
        parseCaseFile(text, "cases/QVT-24-080.case.json");
      } catch (e) {
        assertClean(e, "case file", "cases/QVT-24-080.case.json", text);
      }
    });
  }
  for (let k = 0; k < 600; k++) {
    let text = CSV;
    for (let r = 0; r < 1 + Math.floor(rnd() * 3); r++) text = mutate(text, rnd, false);
    timed(() => {
      try {
        const { figures } = parseFiguresCsv(text, {
          fileName: "QVT-24-080.figures.csv",
          units: rnd() < 0.5 ? "px" : "um",
          mppX: 0.25,
          mppY: 0.25,
        });
        for (const v of figures.xPx) assert.ok(Number.isFinite(v));
      } catch (e) {
        assertClean(e, "figures CSV", "QVT-24-080.figures.csv", text);
      }
    });
  }
});

function packBits(data: Uint8Array, w: number, h: number): Uint8Array {
  const row = Math.ceil(w / 8);
  const out = new Uint8Array(row * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) if (data[y * w + x]) out[y * row + (x >> 3)] |= 0x80 >> (x & 7);
  }
  return out;
}

Deno.test("fuzz: 300 mutated PNG masks are decoded or refused cleanly", async () => {
  const rnd = seededRandom(81);
  const w = 24, h = 16;
  const data = new Uint8Array(w * h);
  for (let y = 3; y < 12; y++) {
    for (let x = 2; x < 20; x++) {
      data[y * w + x] = (x * y) % 7 === 0 ? 0 : 255;
    }
  }
  const variants = [
    encode({ width: w, height: h, data, channels: 1, depth: 8 }),
    // 1-bit: 24 pixels a row pack into 3 bytes
    encode({ width: w, height: h, data: packBits(data, w, h), channels: 1, depth: 1 }),
  ];
  for (let k = 0; k < 300; k++) {
    const bytes = new Uint8Array(pick(rnd, variants));
    let cut = bytes;
    const r = rnd();
    if (r < 0.3) cut = bytes.slice(0, Math.floor(rnd() * bytes.length));
    else {
      // flip bytes, sometimes inside the header (width and height at 16–23)
      const flips = 1 + Math.floor(rnd() * 4);
      for (let i = 0; i < flips; i++) {
        const at = r < 0.6 ? 16 + Math.floor(rnd() * 8) : Math.floor(rnd() * bytes.length);
        bytes[at] = Math.floor(rnd() * 256);
      }
    }
    const t = performance.now();
    try {
      await checkPngBounds(cut, { what: "tissue mask", fileName: "m.png", maxPixels: 1e8 });
      const mask = decodeMaskPng(cut, { fileName: "m.png" });
      if (mask.width * mask.height <= 1e6) {
        maskToPolygons(mask, { scaleX: 32, scaleY: 32, maxVertices: 1e6 });
      }
    } catch (e) {
      assertClean(e, "tissue mask", "m.png", `PNG of ${cut.length} bytes`);
    }
    assert.ok(performance.now() - t < BOUND_MS);
  }
});

Deno.test("fuzz: mutated files through hotfield report end with exit 0 or a one-line exit 1 naming the file", async () => {
  const rnd = seededRandom(82);
  const dir = Deno.makeTempDirSync();
  const root = new URL("../../", import.meta.url).pathname;
  try {
    const base = JSON.stringify(baseAnnotations());
    const files: string[] = [];
    for (let k = 0; k < 12; k++) {
      let text = base;
      for (let r = 0; r < 2; r++) text = mutate(text, rnd, isJson(text));
      const name = `QVT-24-08${k % 10}-${k}.geojson`;
      writeFileSync(join(dir, name), text);
      files.push(name);
    }
    for (const name of files) {
      const out = await new Deno.Command(Deno.execPath(), {
        args: [
          "run",
          "-A",
          join(root, "lib/cli.ts"),
          "report",
          name,
          "--out",
          "out",
          "--stride-um",
          "400",
          "--simulations",
          "0",
          "--format",
          "json",
        ],
        cwd: dir,
        stdout: "piped",
        stderr: "piped",
        env: { NO_COLOR: "1" },
        signal: AbortSignal.timeout(60_000),
      }).output();
      const err = new TextDecoder().decode(out.stderr);
      assert.ok(out.code === 0 || out.code === 1, `${name}: exit ${out.code}: ${err}`);
      if (out.code === 1) {
        assert.ok(err.includes(name), `${name}: the message names the file: ${err}`);
        assert.ok(!/^\s+at /m.test(err), `${name}: no stack trace: ${err}`);
      }
    }
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});
