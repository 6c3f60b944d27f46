/**
 * A byte scanner for figures CSV files: rows go straight from the bytes into
 * the figure arrays, without decoding the text or building a record per
 * row. It reads the plain files (no quotes, one kind of line ending, plain
 * cells); for anything else, and for any problem, it leaves the file to
 * {@linkcode parseFiguresCsv}, which gives the same result and messages.
 *
 * @module
 */

import type { FigureSet } from "../types.ts";
import {
  csvColumns,
  csvDelimiter,
  csvEndWarnings,
  csvNumber,
  parseFiguresCsv,
  type ParseFiguresCsvOptions,
} from "./read_figures_csv.ts";
import { DEFAULT_FIGURE_LABEL, FigureSetBuilder } from "./_figure_builder.ts";
import { decodeText } from "./_decode_text.ts";
import { checkFigureCount, checkFigureMagnitudes } from "./_plausibility.ts";
import { POW10 } from "./_pow10.ts";

const strictDecoder = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true });

/** Exact powers of ten (all representable as doubles). */

/** Thrown inside the scanner to leave the file to the ordinary reader. */
const GIVE_UP = new Error("scanner gives up");

/**
 * Reads a figures CSV from its bytes: the scanner when it can, else
 * {@linkcode parseFiguresCsv} on the decoded text. Same result, same messages.
 *
 * @param bytes The file's bytes.
 * @param options As for {@linkcode parseFiguresCsv}.
 * @returns The points and any warnings.
 * @throws {SyntaxError | TypeError | RangeError} As {@linkcode parseFiguresCsv},
 *   and a SyntaxError when the bytes are not UTF-8.
 *
 * @example Two rows, the second with a score
 * ```ts
 * import { readFiguresCsvBytes } from "./_scan_figures_csv.ts";
 * const bytes = new TextEncoder().encode("x,y,score\n10,20,\n30.5,40,0.9\n");
 * const { figures } = readFiguresCsvBytes(bytes, { fileName: "f.csv", mppX: 0.25, mppY: 0.25 });
 * if (figures.xPx[1] !== 30.5 || figures.score[1] !== 0.9 || figures.origin[1] !== 3) {
 *   throw new Error("read");
 * }
 * ```
 */
export function readFiguresCsvBytes(
  bytes: Uint8Array,
  options: ParseFiguresCsvOptions,
): { figures: FigureSet; warnings: string[] } {
  return scanFiguresCsv(bytes, options) ??
    parseFiguresCsv(decodeText(bytes, "figures CSV", options.fileName), options);
}

/**
 * Reads a plain figures CSV from its bytes, as {@linkcode parseFiguresCsv}
 * reads its text, or returns null when the file must go to the ordinary
 * reader (quotes, mixed line endings, unusual white space, or any problem).
 *
 * @param bytes The file's bytes.
 * @param options As for {@linkcode parseFiguresCsv}.
 * @returns The points and warnings, or null.
 *
 * @example A file with quotes is left to the ordinary reader
 * ```ts
 * import { scanFiguresCsv } from "./_scan_figures_csv.ts";
 * const opts = { fileName: "f.csv", mppX: 1, mppY: 1 };
 * if (scanFiguresCsv(new TextEncoder().encode('x,y,label\n1,2,"a, b"\n'), opts) !== null) {
 *   throw new Error("quotes go to the ordinary reader");
 * }
 * if (scanFiguresCsv(new TextEncoder().encode("x,y\n1,2\n"), opts)?.figures.xPx[0] !== 1) {
 *   throw new Error("plain files are scanned");
 * }
 * ```
 */
export function scanFiguresCsv(
  bytes: Uint8Array,
  options: ParseFiguresCsvOptions,
): { figures: FigureSet; warnings: string[] } | null {
  try {
    return scan(bytes, options);
  } catch {
    // Any problem, or anything unusual: the ordinary reader decides and words it.
    return null;
  }
}

function scan(
  b: Uint8Array,
  options: ParseFiguresCsvOptions,
): { figures: FigureSet; warnings: string[] } {
  const file = options.fileName;
  const units = options.units ?? "px";
  if (units !== "px" && units !== "um") throw GIVE_UP;
  if (units === "um" && !(options.mppX > 0 && options.mppY > 0)) throw GIVE_UP;
  const n = b.length;
  let p = 0;
  if (n >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) p = 3;
  // One kind of line ending, as the first line has it.
  let crlf = false;
  for (let t = p; t < n; t++) {
    if (b[t] === 0x0a) break;
    if (b[t] === 0x0d) {
      if (b[t + 1] !== 0x0a) throw GIVE_UP;
      crlf = true;
      break;
    }
  }
  // Only empty lines before the header.
  let line = 1;
  const lineEnd = (from: number): number => {
    let t = from;
    while (t < n && b[t] !== 0x0a) t++;
    return crlf ? (t > from && b[t - 1] === 0x0d ? t - 1 : t) : t;
  };
  let end = lineEnd(p);
  while (end === p && p < n) {
    p = end + (crlf ? 2 : 1);
    line++;
    end = lineEnd(p);
  }
  if (p >= n) throw GIVE_UP;
  const firstLine = strictDecoder.decode(b.subarray(p, end));
  if (
    firstLine.trim() === "" || /["\r\n]/.test(firstLine) || hasControl(firstLine)
  ) {
    throw GIVE_UP;
  }
  const delimiter = csvDelimiter(firstLine);
  const record = firstLine.split(delimiter).map((c) => plainCell(c, delimiter));
  const { col, warnings } = csvColumns(record, firstLine, delimiter, file);
  const D = delimiter.charCodeAt(0);
  const cx = col.x!, cy = col.y!, cl = col.label ?? -1, cs = col.score ?? -1;
  const last = Math.max(cx, cy, cl, cs);
  const decimalComma = delimiter === ";";
  let commaUsed = 0, firstComma = 0;
  const um = units === "um";
  const figures = new FigureSetBuilder();
  const labels = new LabelCache(figures);
  // Cell bounds of the current row: [starts[k], ends[k]) after trimming.
  const starts = new Int32Array(last + 1), ends = new Int32Array(last + 1);
  const cellNumber = (k: number): number => {
    const s = starts[k], e = ends[k];
    const v = plainNumber(b, s, e);
    if (v === v) return v; // not NaN: a plain decimal, read exactly
    const raw = cellText(b, s, e);
    const r = csvNumber(raw, decimalComma);
    if (!Number.isFinite(r.value)) throw GIVE_UP;
    if (r.comma && commaUsed++ === 0) firstComma = line;
    return r.value;
  };
  p = end + (crlf ? 2 : 1);
  while (p < n) {
    line++;
    // Find the line's end, checking its bytes and cutting its cells.
    let k = 0, cellStart = p, t = p, wide = false, blank = true;
    for (; t < n; t++) {
      const c = b[t];
      if (c === D) {
        if (k <= last) cut(k, cellStart, t);
        k++;
        cellStart = t + 1;
        continue;
      }
      if (c === 0x0a) break;
      if (c === 0x22) throw GIVE_UP;
      if (c < 0x20) {
        if (c === 0x0d) {
          if (!crlf || b[t + 1] !== 0x0a) throw GIVE_UP;
          break;
        }
        if (c !== 0x09) throw GIVE_UP;
        continue;
      }
      if (c !== 0x20) blank = false;
      if (c >= 0x80) wide = true;
    }
    if (t < n && b[t] === 0x0a && crlf) throw GIVE_UP; // a bare LF in a CRLF file
    if (k <= last) cut(k, cellStart, t);
    for (let q = k + 1; q <= last; q++) starts[q] = ends[q] = 0;
    const next = t < n ? t + (b[t] === 0x0d ? 2 : 1) : n;
    if (wide) strictDecoder.decode(b.subarray(p, t)); // throws on bad UTF-8
    p = next;
    // Empty, or white space and separators only: skipped. Any other row is
    // read (an empty x is then an error, left to the ordinary reader).
    if (blank) continue;
    const x = cellNumber(cx), y = cellNumber(cy);
    const li = cl < 0 || ends[cl] === starts[cl]
      ? labels.default()
      : labels.of(b, starts[cl], ends[cl]);
    let score = NaN;
    if (cs >= 0 && ends[cs] > starts[cs]) {
      score = cellNumber(cs);
      if (!(score >= 0 && score <= 1)) throw GIVE_UP;
    }
    if (um) figures.addIndexed(x / options.mppX, y / options.mppY, li, score, line);
    else figures.addIndexed(x, y, li, score, line);
  }
  warnings.push(...csvEndWarnings(file, commaUsed, firstComma, figures.length));
  const built = figures.build();
  // the ordinary reader's plausibility checks; a refusal leaves the file to it, which words it
  checkFigureCount(built.xPx.length, "figures CSV", file);
  checkFigureMagnitudes(built, options, "figures CSV", file, "line");
  return { figures: built, warnings };

  /** Records cell k as [s, e) trimmed of spaces (and tabs, unless they separate). */
  function cut(k: number, s: number, e: number): void {
    while (s < e && (b[s] === 0x20 || (b[s] === 0x09 && D !== 0x09))) s++;
    while (e > s && (b[e - 1] === 0x20 || (b[e - 1] === 0x09 && D !== 0x09))) e--;
    // A cell starting or ending beyond ASCII may start or end with other white space.
    if (e > s && (b[s] >= 0x80 || b[e - 1] >= 0x80)) {
      const text = cellText(b, s, e);
      if (/^[\s\u180e\u200b]|[\s\u180e\u200b]$/.test(text)) throw GIVE_UP;
    }
    starts[k] = s;
    ends[k] = e;
  }
}

/** A header cell as csv-parse's trim gives it, when only spaces and tabs are trimmed. */
function plainCell(c: string, delimiter: string): string {
  const t = delimiter === "\t" ? c.replace(/^ +| +$/g, "") : c.replace(/^[ \t]+|[ \t]+$/g, "");
  if (/^[\s\u180e\u200b]|[\s\u180e\u200b]$/.test(t)) throw GIVE_UP;
  return t;
}

/** Whether a line holds a control character other than a tab. */
function hasControl(line: string): boolean {
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c < 0x20 && c !== 0x09) return true;
  }
  return false;
}

function cellText(b: Uint8Array, s: number, e: number): string {
  return strictDecoder.decode(b.subarray(s, e));
}

/**
 * A cell holding a plain decimal ([+-]digits[.digits][e[+-]digits], or
 * with the point first or last), as `Number` reads it; NaN for any other
 * cell (then read through `Number` of its text).
 */
function plainNumber(b: Uint8Array, s: number, e: number): number {
  let p = s, neg = false;
  if (b[p] === 0x2d || b[p] === 0x2b) {
    neg = b[p] === 0x2d;
    p++;
  }
  let m = 0, sig = 0, exp = 0, digits = 0;
  let c = b[p];
  while (p < e && c >= 0x30 && c <= 0x39) {
    if (m !== 0 || c !== 0x30) {
      if (sig === 15) return NaN;
      m = m * 10 + (c - 0x30);
      sig++;
    }
    digits++;
    c = b[++p];
  }
  if (p < e && c === 0x2e) {
    c = b[++p];
    while (p < e && c >= 0x30 && c <= 0x39) {
      exp--;
      if (m !== 0 || c !== 0x30) {
        if (sig === 15) return NaN;
        m = m * 10 + (c - 0x30);
        sig++;
      }
      digits++;
      c = b[++p];
    }
  }
  if (digits === 0) return NaN;
  if (p < e && (c === 0x65 || c === 0x45)) {
    c = b[++p];
    let sign = 1;
    if (c === 0x2b || c === 0x2d) {
      if (c === 0x2d) sign = -1;
      c = b[++p];
    }
    if (!(p < e && c >= 0x30 && c <= 0x39)) return NaN;
    let x = 0;
    while (p < e && c >= 0x30 && c <= 0x39) {
      if (x < 1000) x = x * 10 + (c - 0x30);
      c = b[++p];
    }
    exp += sign * x;
  }
  if (p !== e || exp < -22 || exp > 22) return NaN;
  const v = exp >= 0 ? m * POW10[exp] : m / POW10[-exp];
  return neg ? -v : v;
}

/** Label indices by the label's bytes, decoding each distinct label once. */
class LabelCache {
  #figures: FigureSetBuilder;
  #bytes: Uint8Array[] = [];
  #index: number[] = [];
  #default = -1;

  constructor(figures: FigureSetBuilder) {
    this.#figures = figures;
  }

  default(): number {
    if (this.#default < 0) this.#default = this.#figures.labelIndexOf(DEFAULT_FIGURE_LABEL);
    return this.#default;
  }

  of(b: Uint8Array, s: number, e: number): number {
    const len = e - s, known = this.#bytes;
    for (let q = 0; q < known.length; q++) {
      const kb = known[q];
      if (kb.length !== len) continue;
      let t = 0;
      while (t < len && kb[t] === b[s + t]) t++;
      if (t === len) return this.#index[q];
    }
    const label = strictDecoder.decode(b.subarray(s, e));
    const li = label === DEFAULT_FIGURE_LABEL ? this.default() : this.#figures.labelIndexOf(label);
    if (known.length < 64) {
      known.push(b.slice(s, e));
      this.#index.push(li);
    }
    return li;
  }
}
