// The figures CSV byte scanner against the ordinary reader (a differential
// check: the ordinary reader's rules are tested, with their RFC 4180
// sources, in read_figures_csv_test.ts, whose every input also goes
// through both readers). Fixtures, seeded random files written in many
// legal ways, and seeded random corruptions of them.
import { strict as assert } from "node:assert";
import { join } from "node:path";
import { compareCsvBytes, csvScannerUse } from "./_both_readers.ts";
import { seededRandom } from "../../lib/random.ts";
import type { ParseFiguresCsvOptions } from "../../lib/annotations/read_figures_csv.ts";

const ROOT = join(import.meta.dirname ?? ".", "..", "..");
const OPTIONS: ParseFiguresCsvOptions = { fileName: "random.figures.csv", mppX: 0.25, mppY: 0.5 };

function agree(bytes: Uint8Array, options = OPTIONS): "read" | "refused" {
  try {
    compareCsvBytes(bytes, options);
    return "read";
  } catch (e) {
    if ((e as Error).name === "AssertionError") throw e;
    return "refused";
  }
}

Deno.test("scanFiguresCsv() reads the fixture and demo CSVs as the ordinary reader does", () => {
  // The fixture quotes a label with a comma: the scanner leaves it to the ordinary reader.
  const fixture = join(ROOT, "test", "fixtures", "annotations", "QVT-24-011.figures.csv");
  assert.equal(agree(Deno.readFileSync(fixture), { ...OPTIONS, fileName: fixture }), "read");
  const demo = join(ROOT, "data", "demo", "QVT-24-008.figures.csv");
  const before = csvScannerUse.scanned;
  assert.equal(agree(Deno.readFileSync(demo), { ...OPTIONS, fileName: demo }), "read");
  assert.equal(csvScannerUse.scanned, before + 1, "the scanner reads the demo CSV itself");
});

function randomCsv(seed: number): string {
  const rnd = seededRandom(seed);
  const pick = <T>(xs: T[]) => xs[Math.floor(rnd() * xs.length)];
  const delimiter = pick([",", ",", ",", ";", "\t"]);
  const eol = pick(["\n", "\n", "\r\n"]);
  const cols = ["x", "y", "label", "score", "note"].filter((c) =>
    c === "x" || c === "y" || rnd() < 0.6
  )
    .sort(() => rnd() - 0.5);
  const head = cols.map((c) => pick([c, c.toUpperCase(), ` ${c} `]));
  const num = () => {
    const v = Math.round(rnd() * 1e6) / 10;
    const r = rnd();
    if (r < 0.1) return v.toExponential();
    if (r < 0.15) return `+${v}`;
    if (r < 0.2 && delimiter === ";") return String(v).replace(".", ",");
    if (r < 0.25) return `${Math.floor(v)}.`;
    if (r < 0.3) return (rnd() * 1e4).toString(); // many digits
    if (r < 0.32) return "31e0";
    return String(v);
  };
  const lines = [head.join(delimiter)];
  const n = 1 + Math.floor(rnd() * 40);
  for (let i = 0; i < n; i++) {
    if (rnd() < 0.05) {
      lines.push(pick(["", "  ", delimiter.repeat(cols.length - 1)]));
      continue;
    }
    const cells = cols.map((c) => {
      if (c === "x" || c === "y") return num();
      if (c === "label") {
        return pick(["mitotic figure", "", "mimic", "Mitose (ü)", " atypical ", "μ"]);
      }
      if (c === "score") {
        return pick(["", "0.5", "1", "0", String(Math.round(rnd() * 1000) / 1000)]);
      }
      return pick(["", "free text", "ä"]);
    });
    if (rnd() < 0.05) cells.pop(); // a short row
    lines.push(cells.map((c) => rnd() < 0.1 ? ` ${c}` : c).join(delimiter));
  }
  return (rnd() < 0.1 ? "\ufeff" : "") + (rnd() < 0.05 ? eol : "") + lines.join(eol) +
    (rnd() < 0.8 ? eol : "");
}

Deno.test("scanFiguresCsv() agrees with the ordinary reader on seeded random files", () => {
  let read = 0, scanned = 0;
  for (let seed = 1; seed <= 300; seed++) {
    const before = csvScannerUse.scanned;
    const units: "um" | "px" = seed % 7 === 0 ? "um" : "px";
    if (agree(new TextEncoder().encode(randomCsv(seed)), { ...OPTIONS, units }) === "read") read++;
    if (csvScannerUse.scanned > before) scanned++;
  }
  assert.ok(read > 150, `${read} read`);
  assert.ok(scanned > 0.8 * read, `${scanned} of ${read} scanned`);
});

Deno.test("scanFiguresCsv() agrees with the ordinary reader on seeded corruptions", () => {
  const rnd = seededRandom(78);
  const tokens = [...'",;\t\n\r .-+eE0123456789', "\u00a0", "\f", "NaN", "1e400"];
  let refused = 0;
  for (let t = 0; t < 600; t++) {
    const bytes = new TextEncoder().encode(randomCsv(2000 + (t % 60)));
    const at = Math.floor(rnd() * bytes.length);
    const r = rnd();
    let out: Uint8Array;
    if (r < 0.3) out = new Uint8Array([...bytes.subarray(0, at), ...bytes.subarray(at + 1)]);
    else if (r < 0.7) {
      const tok = new TextEncoder().encode(tokens[Math.floor(rnd() * tokens.length)]);
      out = new Uint8Array([...bytes.subarray(0, at), ...tok, ...bytes.subarray(at + 1)]);
    } else if (r < 0.8) out = bytes.subarray(0, at);
    else out = new Uint8Array([...bytes.subarray(0, at), 0xe2, 0x28, ...bytes.subarray(at)]);
    if (agree(out) === "refused") refused++;
  }
  assert.ok(refused > 100, `${refused} refused`);
});
