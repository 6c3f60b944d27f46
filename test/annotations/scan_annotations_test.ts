// The annotation byte scanner against the ordinary reader (a differential
// check: the ordinary reader's own checks are tested, with their RFC 7946
// sources, in read_annotations_test.ts, whose every input also goes through
// both readers). Fixtures, the demo cohort, seeded random files written in
// many legal ways, and seeded random corruptions of them.
import { strict as assert } from "node:assert";
import { join } from "node:path";
import { compareBytes, scannerUse } from "./_both_readers.ts";
import { seededRandom } from "../../lib/random.ts";
import type { Random } from "../../lib/random.ts";

const ROOT = join(import.meta.dirname ?? ".", "..", "..");

function geojsonFiles(dir: string): string[] {
  const out: string[] = [];
  for (const e of Deno.readDirSync(dir)) {
    if (e.isFile && e.name.endsWith(".geojson")) out.push(join(dir, e.name));
  }
  return out.sort();
}

function agree(bytes: Uint8Array, fileName = "random.geojson"): "read" | "refused" {
  try {
    compareBytes(bytes, { fileName });
    return "read";
  } catch (e) {
    if ((e as Error).name === "AssertionError") throw e;
    return "refused";
  }
}

Deno.test("scanAnnotations() reads every fixture and demo file as the ordinary reader does", () => {
  const files = [
    ...geojsonFiles(join(ROOT, "test", "fixtures", "annotations")),
    ...geojsonFiles(join(ROOT, "data", "demo")),
  ];
  assert.ok(files.length >= 8);
  for (const f of files) {
    const before = scannerUse.scanned;
    assert.equal(agree(Deno.readFileSync(f), f), "read", f);
    assert.equal(scannerUse.scanned, before + 1, `the scanner read ${f} itself`);
  }
});

/** Writes a JSON value with random (legal) white space and number spellings. */
function write(v: unknown, rnd: Random): string {
  const ws = () => ["", "", " ", "\n", "\r\n  ", "\t"][Math.floor(rnd() * 6)];
  if (typeof v === "number") return spellNumber(v, rnd);
  if (typeof v === "string") return spellString(v, rnd);
  if (v === null || typeof v === "boolean") return String(v);
  if (Array.isArray(v)) {
    return `[${ws()}${v.map((x) => write(x, rnd)).join(`${ws()},${ws()}`)}${ws()}]`;
  }
  const entries = Object.entries(v as Record<string, unknown>);
  return `{${ws()}${
    entries.map(([k, x]) => `${spellString(k, rnd)}${ws()}:${ws()}${write(x, rnd)}`).join(
      `${ws()},${ws()}`,
    )
  }${ws()}}`;
}

/** Equal-valued spellings of a number: exponents, trailing zeros, −0. */
function spellNumber(v: number, rnd: Random): string {
  const r = rnd();
  if (Object.is(v, -0)) return "-0";
  if (r < 0.15 && v !== 0) return v.toExponential();
  if (r < 0.25 && v !== 0) return v.toExponential().replace("e", "E").replace("E+", "E");
  if (r < 0.35 && Number.isInteger(v) && Math.abs(v) < 1e15) return `${v}.000`;
  if (r < 0.4 && v !== 0 && Number(`${v * 100}e-2`) === v) return `${v * 100}e-2`;
  return String(v);
}

/** Equal-valued spellings of a string: sometimes with escapes. */
function spellString(s: string, rnd: Random): string {
  if (rnd() < 0.1) {
    return `"${[...s].map((c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`).join("")}"`;
  }
  return JSON.stringify(s);
}

const LABELS = [
  "mitotic figure",
  "mitotic figure",
  "atypical mitosis",
  " mimic ",
  "",
  "Mitosefigur (ü)",
  'with "quotes"',
  "tab\there",
  "μ-figure",
];

function randomFeature(rnd: Random, i: number): Record<string, unknown> {
  const pick = <T>(xs: T[]) => xs[Math.floor(rnd() * xs.length)];
  const coord = () => {
    const r = rnd();
    if (r < 0.5) return Math.round(rnd() * 1e5) / 10;
    if (r < 0.7) return Math.round(rnd() * 2e5); // integers up to 100 mm at 0.5 µm/px
    if (r < 0.8) return rnd() * 1e4; // 16–17 significant digits
    if (r < 0.85) return 0;
    if (r < 0.9) return -0;
    return -Math.round(rnd() * 1e3) / 100;
  };
  const r = rnd();
  if (r < 0.08) {
    const x = 100 * rnd(), y = 100 * rnd(), w = 50 + 100 * rnd();
    return {
      type: "Feature",
      properties: { role: pick(["tissue", "tumour", "exclude"]), reason: pick(["necrosis", 3]) },
      geometry: {
        type: "Polygon",
        coordinates: [[[x, y], [x + w, y], [x + w, y + w], [x, y + w], [x, y]]],
      },
    };
  }
  if (r < 0.12) {
    return {
      type: "Feature",
      properties: { role: "field", reader: pick(["reader-a", "trainee"]) },
      geometry: { type: "Point", coordinates: [coord(), coord()] },
    };
  }
  const props: Record<string, unknown> = { role: "figure" };
  const pr = rnd();
  if (pr < 0.5) props.label = pick(LABELS);
  else if (pr < 0.6) props.label = null;
  const sr = rnd();
  if (sr < 0.5) props.score = Math.round(rnd() * 1000) / 1000;
  else if (sr < 0.6) props.score = null;
  else if (sr < 0.65) props.score = pick([0, 1, 1e-7, 0.1 + 0.2]);
  if (rnd() < 0.2) props.detector = { name: "net-7", version: [1, 2], ok: true, note: "a\\b" };
  if (rnd() < 0.1) props.id = i;
  const multi = rnd() < 0.2;
  const position = () => rnd() < 0.1 ? [coord(), coord(), 0] : [coord(), coord()];
  const geometry: Record<string, unknown> = multi
    ? {
      type: "MultiPoint",
      coordinates: Array.from({ length: Math.floor(rnd() * 4) }, position),
    }
    : { type: "Point", coordinates: position() };
  if (rnd() < 0.1) geometry.bbox = [0, 0, 1, 1];
  const feature: Record<string, unknown> = { type: "Feature", properties: props, geometry };
  if (rnd() < 0.1) feature.id = `f${i}`;
  // Any member order.
  const keys = Object.keys(feature).sort(() => rnd() - 0.5);
  const shuffled: Record<string, unknown> = {};
  for (const k of keys) shuffled[k] = feature[k];
  return shuffled;
}

function randomFile(seed: number): string {
  const rnd = seededRandom(seed);
  const features = [
    {
      type: "Feature",
      properties: { role: "tissue" },
      geometry: {
        type: "Polygon",
        coordinates: [[[0, 0], [1e4, 0], [1e4, 1e4], [0, 1e4], [0, 0]]],
      },
    },
  ];
  const n = 1 + Math.floor(rnd() * 60);
  for (let i = 1; i <= n; i++) features.push(randomFeature(rnd, i) as typeof features[0]);
  const slide = { id: "QVT-24-099", mpp: rnd() < 0.5 ? 0.25 : [0.25, 0.5], width: 2e4 };
  const root: Record<string, unknown> = rnd() < 0.5
    ? { type: "FeatureCollection", slide, features }
    : { features, name: "QVT 99", slide, type: "FeatureCollection" };
  return (rnd() < 0.1 ? "\uFEFF" : "") + write(root, rnd) + (rnd() < 0.5 ? "\n" : "");
}

Deno.test("scanAnnotations() agrees with the ordinary reader on seeded random files", () => {
  let read = 0, scanned = 0;
  for (let seed = 1; seed <= 300; seed++) {
    const before = scannerUse.scanned;
    if (agree(new TextEncoder().encode(randomFile(seed))) === "read") read++;
    if (scannerUse.scanned > before) scanned++;
  }
  // Most are well-formed (a few carry a non-string reason or odd label and still read).
  assert.ok(read > 250, `${read} read`);
  assert.ok(scanned > 250, `${scanned} scanned`);
});

Deno.test("scanAnnotations() agrees with the ordinary reader on seeded corruptions", () => {
  const rnd = seededRandom(77);
  const tokens = [...'{}[],:"\\ 0123456789.-+eE', "null", "true", "1e400", "\u00a0"];
  let refused = 0;
  for (let t = 0; t < 600; t++) {
    const bytes = new TextEncoder().encode(randomFile(1000 + (t % 50)));
    const at = Math.floor(rnd() * bytes.length);
    let out: Uint8Array;
    const r = rnd();
    if (r < 0.3) {
      out = new Uint8Array([...bytes.subarray(0, at), ...bytes.subarray(at + 1)]);
    } else if (r < 0.6) {
      const tok = new TextEncoder().encode(tokens[Math.floor(rnd() * tokens.length)]);
      out = new Uint8Array([...bytes.subarray(0, at), ...tok, ...bytes.subarray(at + 1)]);
    } else if (r < 0.7) {
      out = bytes.subarray(0, at); // truncated
    } else if (r < 0.8) {
      // invalid UTF-8
      out = new Uint8Array([...bytes.subarray(0, at), 0xc3, 0x28, ...bytes.subarray(at)]);
    } else {
      // swap two bytes
      out = bytes.slice();
      const b = Math.floor(rnd() * bytes.length);
      [out[at], out[b]] = [out[b], out[at]];
    }
    if (agree(out) === "refused") refused++;
  }
  assert.ok(refused > 300, `${refused} refused`);
});

/** A file in the usual compact form: members in the usual order, no white space. */
function compactFile(seed: number): string {
  const rnd = seededRandom(seed);
  const pick = <T>(xs: T[]) => xs[Math.floor(rnd() * xs.length)];
  const features: unknown[] = [{
    type: "Feature",
    properties: { role: "tissue" },
    geometry: { type: "Polygon", coordinates: [[[0, 0], [1e4, 0], [1e4, 1e4], [0, 1e4], [0, 0]]] },
  }];
  for (let i = 0; i < 80; i++) {
    const properties: Record<string, unknown> = { role: "figure" };
    if (rnd() < 0.7) properties.label = pick(LABELS);
    if (rnd() < 0.7) properties.score = pick([0, 1, 0.5, Math.round(rnd() * 1000) / 1000, 1e-7]);
    // 17 significant digits near the largest plausible position (100 mm at 0.25 µm/px)
    const x = pick([Math.round(rnd() * 1e5) / 10, rnd() * 1e4, -0, 399999.99999999994]);
    features.push({
      type: "Feature",
      properties,
      geometry: { type: "Point", coordinates: [x, Math.round(rnd() * 1e5) / 10] },
    });
  }
  return JSON.stringify({ type: "FeatureCollection", slide: { mpp: 0.25 }, features });
}

Deno.test("scanAnnotations() agrees with the ordinary reader on compact files and their corruptions", () => {
  const rnd = seededRandom(79);
  const tokens = [...'{}[],:"\\ 0123456789.-eE', "null", "1e400", "\u00e9"];
  let scanned = 0;
  for (let seed = 1; seed <= 40; seed++) {
    const text = compactFile(seed);
    const before = scannerUse.scanned;
    assert.equal(agree(new TextEncoder().encode(text)), "read");
    if (scannerUse.scanned > before) scanned++;
    for (let t = 0; t < 15; t++) {
      const bytes = new TextEncoder().encode(text);
      const at = Math.floor(rnd() * bytes.length);
      const tok = new TextEncoder().encode(tokens[Math.floor(rnd() * tokens.length)]);
      agree(new Uint8Array([...bytes.subarray(0, at), ...tok, ...bytes.subarray(at + 1)]));
    }
  }
  assert.equal(scanned, 40);
});
