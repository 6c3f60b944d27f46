/**
 * A byte scanner for annotation GeoJSON: figure features (Point and
 * MultiPoint) go straight from the file's bytes into the figure arrays,
 * without decoding the text or building an object per feature; every other
 * feature, and the collection's other members, are cut out of the bytes and
 * parsed as usual. The result and every message are those of
 * {@linkcode parseAnnotations}: whatever the scanner is not sure of (a
 * syntax error, an escape in a figure's label, a duplicate key, a bad
 * value), it leaves to the ordinary reader, for one feature or the whole file.
 *
 * Where checks live: every rule about a feature is the ordinary reader's
 * (`AnnotationCollector.feature` in read_annotations.ts); the scanner only
 * reads figure features that surely pass them all. A new rule for figure
 * features therefore needs a matching "give the feature back" (return
 * false) in `compact` and `figure` here. Repeated keys already send a
 * feature (or, at the top level, the whole file) to the ordinary reader,
 * so a check for them belongs to its parsing (`parseSpan` here parses the
 * features handed over, `parseAnnotations` whole files).
 *
 * @module
 */

import {
  AnnotationCollector,
  type ParseAnnotationsOptions,
  type ParsedAnnotations,
} from "./read_annotations.ts";
import { DEFAULT_FIGURE_LABEL, figureLabelText, FigureSetBuilder } from "./_figure_builder.ts";
import { parseAnnotations } from "./read_annotations.ts";
import { decodeText } from "./_decode_text.ts";
import { scanJsonText } from "./_json_keys.ts";
import { MAX_JSON_CONTAINERS } from "../defaults.ts";
import { POW10 } from "./_pow10.ts";

/** Thrown inside the scanner to leave the whole file to the ordinary reader. */
const GIVE_UP = new Error("scanner gives up");

/** Exact powers of ten (all representable as doubles). */

// Keys the scanner knows.
const K_OTHER = 0,
  K_TYPE = 1,
  K_PROPERTIES = 2,
  K_GEOMETRY = 3,
  K_ROLE = 4,
  K_LABEL = 5,
  K_SCORE = 6,
  K_COORDINATES = 7,
  K_FEATURES = 8;
const ascii = (w: string) => Uint8Array.from(w, (c) => c.charCodeAt(0));
const TYPE = ascii("type"),
  PROPERTIES = ascii("properties"),
  GEOMETRY = ascii("geometry"),
  ROLE = ascii("role"),
  LABEL = ascii("label"),
  SCORE = ascii("score"),
  COORDINATES = ascii("coordinates"),
  FEATURES = ascii("features");

// The usual compact form of a figure Point feature (see Scanner.compact).
const HEAD = ascii('{"type":"Feature","properties":{"role":"figure"');
const LABEL_MEMBER = ascii(',"label":"');
const SCORE_MEMBER = ascii(',"score":');
const POINT_MIDDLE = ascii('},"geometry":{"type":"Point","coordinates":[');
const POINT_TAIL = ascii("]}}");

const strictDecoder = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true });

/**
 * Reads an annotation GeoJSON from its bytes, as {@linkcode parseAnnotations}
 * reads its text (after UTF-8 decoding), or returns null when the file must
 * go to the ordinary reader instead (which then gives the message).
 *
 * @param bytes The file's bytes.
 * @param options As for {@linkcode parseAnnotations}.
 * @returns The parsed annotations, or null.
 * @throws {TypeError | RangeError} The ordinary reader's errors for a
 *   well-formed file whose content is wrong (the scanner only gets that far
 *   when the whole file is valid JSON and UTF-8).
 *
 * @example A tissue square and a figure
 * ```ts
 * import { scanAnnotations } from "./_scan_annotations.ts";
 * const text = '{"type":"FeatureCollection","slide":{"mpp":0.25},"features":[' +
 *   '{"type":"Feature","properties":{"role":"tissue"},"geometry":{"type":"Polygon",' +
 *   '"coordinates":[[[0,0],[9,0],[9,9],[0,0]]]}},' +
 *   '{"type":"Feature","properties":{"role":"figure","score":0.5},' +
 *   '"geometry":{"type":"Point","coordinates":[1.5,2]}}]}';
 * const a = scanAnnotations(new TextEncoder().encode(text), { fileName: "a.geojson" });
 * if (!a || a.figures.xPx[0] !== 1.5 || a.figures.score[0] !== 0.5 || a.tissue.length !== 1) {
 *   throw new Error("scanned");
 * }
 * ```
 */
export function scanAnnotations(
  bytes: Uint8Array,
  options: ParseAnnotationsOptions,
): ParsedAnnotations | null {
  let scanned: Scanned;
  try {
    scanned = new Scanner(bytes).document();
  } catch (e) {
    if (e === GIVE_UP) return null;
    throw e;
  }
  const collector = new AnnotationCollector(scanned.root, options);
  for (const [i, value] of scanned.others) collector.feature(value, i);
  return collector.finish({
    figures: scanned.figures.build(),
    emptyGeometries: scanned.emptyGeometries,
  });
}

/**
 * Reads an annotation GeoJSON from its bytes: the scanner when it can, else
 * the ordinary reader on the decoded text. Same result, same messages.
 *
 * @param bytes The file's bytes.
 * @param options As for {@linkcode parseAnnotations}.
 * @returns The parsed annotations.
 * @throws {SyntaxError | TypeError | RangeError} As {@linkcode parseAnnotations},
 *   and a SyntaxError when the bytes are not UTF-8.
 *
 * @example
 * ```ts
 * import { readAnnotationsBytes } from "./_scan_annotations.ts";
 * let message = "";
 * try {
 *   readAnnotationsBytes(new TextEncoder().encode("{"), { fileName: "a.geojson" });
 * } catch (e) {
 *   message = (e as Error).message;
 * }
 * if (!message.startsWith('Cannot read annotations "a.geojson": not valid JSON')) throw new Error(message);
 * ```
 */
export function readAnnotationsBytes(
  bytes: Uint8Array,
  options: ParseAnnotationsOptions,
): ParsedAnnotations {
  return scanAnnotations(bytes, options) ??
    parseAnnotations(decodeText(bytes, "annotations", options.fileName), options);
}

/** What the scanner found. */
interface Scanned {
  /** The collection's members; `features` stands in as an array of the right length. */
  root: Record<string, unknown>;
  /** Features left to the ordinary checks: index and parsed value, in order. */
  others: [number, unknown][];
  figures: FigureSetBuilder;
  emptyGeometries: number[];
}

class Scanner {
  readonly b: Uint8Array;
  readonly n: number;
  p = 0;
  figures = new FigureSetBuilder();
  emptyGeometries: number[] = [];
  /** Coordinates of the feature being read: x, y pairs. */
  xy = new Float64Array(64);
  /** What `coordinates()` read. */
  shape = 0;
  count = 0;
  /** Objects and arrays passed by `skip` (the file is left to the ordinary reader past the limit). */
  containers = 0;
  /** Labels' bytes as written, and their indices, to skip decoding repeats. */
  labelBytes: Uint8Array[] = [];
  labelIndices: number[] = [];
  defaultLabelIndex = -1;

  constructor(bytes: Uint8Array) {
    this.b = bytes;
    this.n = bytes.length;
  }

  document(): Scanned {
    const b = this.b;
    if (this.n >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) this.p = 3;
    this.ws();
    if (b[this.p] !== 0x7b) throw GIVE_UP;
    this.p++;
    const root: Record<string, unknown> = {};
    const others: [number, unknown][] = [];
    let count = -1;
    this.ws();
    if (b[this.p] !== 0x7d) {
      for (;;) {
        this.ws();
        const keyStart = this.p;
        if (b[keyStart] !== 0x22) throw GIVE_UP;
        let name: string;
        if (this.key() >= 0) name = this.keyText(keyStart);
        else {
          // A key with escapes: read it as JSON.
          this.p = skipString(b, keyStart);
          const v = parseSpan(b, keyStart, this.p);
          if (typeof v !== "string") throw GIVE_UP;
          name = v;
        }
        const k = name === "features" ? K_FEATURES : K_OTHER;
        if (name === "__proto__" || Object.hasOwn(root, name)) throw GIVE_UP;
        this.ws();
        if (b[this.p] !== 0x3a) throw GIVE_UP;
        this.p++;
        this.ws();
        if (k === K_FEATURES) {
          count = this.features(others);
          root.features = new Array(count);
        } else {
          const start = this.p;
          this.skip();
          root[name] = parseSpan(b, start, this.p);
        }
        this.ws();
        const c = b[this.p++];
        if (c === 0x2c) continue;
        if (c === 0x7d) break;
        throw GIVE_UP;
      }
    } else this.p++;
    this.ws();
    if (this.p !== this.n || count < 0) throw GIVE_UP;
    return { root, others, figures: this.figures, emptyGeometries: this.emptyGeometries };
  }

  /** The features array: figures read here, the others parsed into `others`. */
  features(others: [number, unknown][]): number {
    const b = this.b;
    if (b[this.p] !== 0x5b) throw GIVE_UP;
    this.p++;
    this.ws();
    if (b[this.p] === 0x5d) {
      this.p++;
      return 0;
    }
    // The features handed over are parsed together at the end: one decode
    // and one parse, whatever their number.
    const spans: number[] = [];
    for (let i = 0;; i++) {
      this.ws();
      const start = this.p;
      if (!(b[start] === 0x7b && (this.compact(i) || ((this.p = start), this.figure(i))))) {
        this.p = start;
        this.skip();
        spans.push(i, start, this.p);
      }
      this.ws();
      const c = b[this.p++];
      if (c === 0x2c) continue;
      if (c === 0x5d) {
        const values = parseSpans(b, spans);
        for (let t = 0; t < values.length; t++) others.push([spans[3 * t], values[t]]);
        return i + 1;
      }
      throw GIVE_UP;
    }
  }

  /**
   * Reads feature i when it is written in the usual compact form, members
   * in the usual order and no white space —
   * `{"type":"Feature","properties":{"role":"figure"[,"label":"…"][,"score":n]},"geometry":{"type":"Point","coordinates":[x,y]}}`
   * — by comparing it with that form byte for byte; false (nothing added)
   * for anything else, which `figure` then reads member by member.
   */
  compact(i: number): boolean {
    const b = this.b, n = this.n;
    let p = this.p;
    const match = (t: Uint8Array) => {
      if (p + t.length > n) return false;
      for (let k = 0; k < t.length; k++) if (b[p + k] !== t[k]) return false;
      p += t.length;
      return true;
    };
    if (!match(HEAD)) return false;
    let labelStart = -1, labelEnd = -1, ascii = true, score = NaN;
    if (match(LABEL_MEMBER)) {
      labelStart = p;
      for (;;) {
        if (p >= n) return false;
        const c = b[p];
        if (c === 0x22) break;
        if (c === 0x5c || c < 0x20) return false;
        if (c >= 0x80) ascii = false;
        p++;
      }
      labelEnd = p++;
      if (!ascii) {
        try {
          strictDecoder.decode(b.subarray(labelStart, labelEnd));
        } catch {
          return false;
        }
      }
    }
    if (match(SCORE_MEMBER)) {
      const c = b[p];
      if (!(c === 0x2d || (c >= 0x30 && c <= 0x39))) return false;
      this.p = p;
      score = this.number();
      p = this.p;
      if (!(score >= 0 && score <= 1)) return false;
    }
    if (!match(POINT_MIDDLE)) return false;
    let c = b[p];
    if (!(c === 0x2d || (c >= 0x30 && c <= 0x39))) return false;
    this.p = p;
    const x = this.number();
    p = this.p;
    if (b[p++] !== 0x2c) return false;
    c = b[p];
    if (!(c === 0x2d || (c >= 0x30 && c <= 0x39))) return false;
    this.p = p;
    const y = this.number();
    p = this.p;
    if (!match(POINT_TAIL) || !Number.isFinite(x) || !Number.isFinite(y)) return false;
    const li = labelStart < 0 ? this.defaultLabel() : this.labelIndex(labelStart, labelEnd, ascii);
    this.figures.addIndexed(x, y, li, score, i);
    this.p = p;
    return true;
  }

  /**
   * Reads feature i when it is a well-formed figure feature whose checks all
   * pass, adding its points; false (nothing added) for anything else.
   */
  figure(i: number): boolean {
    const b = this.b;
    this.p++;
    let seen = 0; // bits: 1 type, 2 properties, 4 geometry
    let isFigure = false;
    let labelStart = -1, labelEnd = -1, labelAscii = true;
    let score = NaN;
    let geometry = 0; // 1 Point, 2 MultiPoint
    let shape = 0; // as this.shape; 0 no coordinates
    this.ws();
    if (b[this.p] === 0x7d) return false;
    for (;;) {
      this.ws();
      const k = this.key();
      if (k < 0) return false;
      this.ws();
      if (b[this.p] !== 0x3a) return false;
      this.p++;
      this.ws();
      if (k === K_TYPE) {
        if (seen & 1) return false;
        seen |= 1;
        if (!this.word("Feature")) return false;
      } else if (k === K_PROPERTIES) {
        if (seen & 2) return false;
        seen |= 2;
        if (b[this.p] !== 0x7b) return false;
        this.p++;
        let seenProp = 0;
        this.ws();
        if (b[this.p] === 0x7d) return false; // no role
        for (;;) {
          this.ws();
          const q = this.key();
          if (q < 0) return false;
          this.ws();
          if (b[this.p] !== 0x3a) return false;
          this.p++;
          this.ws();
          if (q === K_ROLE) {
            if (seenProp & 1) return false;
            seenProp |= 1;
            if (!this.word("figure")) return false;
            isFigure = true;
          } else if (q === K_LABEL) {
            if (seenProp & 2) return false;
            seenProp |= 2;
            if (b[this.p] === 0x22) {
              labelStart = this.p + 1;
              const flags = this.plainString();
              if (flags < 0) return false;
              labelEnd = this.p - 1;
              labelAscii = flags === 0;
            } else if (!this.literal("null")) return false;
          } else if (q === K_SCORE) {
            if (seenProp & 4) return false;
            seenProp |= 4;
            const c = b[this.p];
            if (c === 0x2d || (c >= 0x30 && c <= 0x39)) {
              score = this.number();
              if (!(score >= 0 && score <= 1)) return false;
            } else if (!this.literal("null")) return false;
          } else if (!this.value()) return false;
          this.ws();
          const c = b[this.p++];
          if (c === 0x2c) continue;
          if (c === 0x7d) break;
          return false;
        }
        if (!isFigure) return false;
      } else if (k === K_GEOMETRY) {
        if (seen & 4) return false;
        seen |= 4;
        if (b[this.p] !== 0x7b) return false;
        this.p++;
        let seenGeom = 0;
        this.ws();
        if (b[this.p] === 0x7d) return false;
        for (;;) {
          this.ws();
          const q = this.key();
          if (q < 0) return false;
          this.ws();
          if (b[this.p] !== 0x3a) return false;
          this.p++;
          this.ws();
          if (q === K_TYPE) {
            if (seenGeom & 1) return false;
            seenGeom |= 1;
            if (this.word("Point")) geometry = 1;
            else if (this.word("MultiPoint")) geometry = 2;
            else return false;
          } else if (q === K_COORDINATES) {
            if (seenGeom & 2) return false;
            seenGeom |= 2;
            if (!this.coordinates()) return false;
            shape = this.shape;
          } else if (!this.value()) return false;
          this.ws();
          const c = b[this.p++];
          if (c === 0x2c) continue;
          if (c === 0x7d) break;
          return false;
        }
      } else if (!this.value()) return false;
      this.ws();
      const c = b[this.p++];
      if (c === 0x2c) continue;
      if (c === 0x7d) break;
      return false;
    }
    if (seen !== 7 || !isFigure || geometry === 0) return false;
    let n: number;
    if (geometry === 1) {
      if (shape !== 1 || this.count < 2) return false;
      n = 1;
    } else if (shape === 2) n = this.count;
    else if (shape === 3) n = 0;
    else return false;
    const xy = this.xy;
    for (let t = 0; t < 2 * n; t++) if (!Number.isFinite(xy[t])) return false;
    if (n === 0) {
      this.emptyGeometries.push(i);
      return true;
    }
    const li = labelStart < 0
      ? this.defaultLabel()
      : this.labelIndex(labelStart, labelEnd, labelAscii);
    for (let t = 0; t < n; t++) this.figures.addIndexed(xy[2 * t], xy[2 * t + 1], li, score, i);
    return true;
  }

  /**
   * Reads a coordinates array into `xy`, setting `shape`: 1 a flat array of
   * numbers (a position; `count` numbers, x and y kept), 2 an array of
   * positions of two or more numbers each (`count` positions), 3 `[]`;
   * false for anything else.
   */
  coordinates(): boolean {
    const b = this.b;
    if (b[this.p] !== 0x5b) return false;
    this.p++;
    this.ws();
    if (b[this.p] === 0x5d) {
      this.p++;
      this.shape = 3;
      this.count = 0;
      return true;
    }
    if (b[this.p] === 0x5b) {
      let m = 0;
      for (;;) {
        this.ws();
        if (this.position(2 * m) < 2) return false;
        m++;
        this.ws();
        const c = b[this.p++];
        if (c === 0x2c) continue;
        if (c === 0x5d) break;
        return false;
      }
      this.shape = 2;
      this.count = m;
      return true;
    }
    this.p--;
    const k = this.position(0);
    if (k < 0) return false;
    this.shape = 1;
    this.count = k;
    return true;
  }

  /** Reads `[number, …]` putting the first two at xy[at], xy[at + 1]; the count, or −1. */
  position(at: number): number {
    const b = this.b;
    if (b[this.p] !== 0x5b) return -1;
    this.p++;
    if (at + 2 > this.xy.length) {
      const grown = new Float64Array(this.xy.length * 2);
      grown.set(this.xy);
      this.xy = grown;
    }
    let k = 0;
    this.ws();
    if (b[this.p] === 0x5d) {
      this.p++;
      return 0;
    }
    for (;;) {
      this.ws();
      const c = b[this.p];
      if (!(c === 0x2d || (c >= 0x30 && c <= 0x39))) return -1;
      const v = this.number();
      if (k < 2) this.xy[at + k] = v;
      k++;
      this.ws();
      const d = b[this.p++];
      if (d === 0x2c) continue;
      if (d === 0x5d) return k;
      return -1;
    }
  }

  defaultLabel(): number {
    if (this.defaultLabelIndex < 0) {
      this.defaultLabelIndex = this.figures.labelIndexOf(DEFAULT_FIGURE_LABEL);
    }
    return this.defaultLabelIndex;
  }

  /** The label index of the string bytes [start, end), decoding only new labels. */
  labelIndex(start: number, end: number, ascii: boolean): number {
    const b = this.b, len = end - start;
    // Few distinct labels in a file: compare bytes with those seen so far.
    const known = this.labelBytes;
    for (let e = 0; e < known.length; e++) {
      const kb = known[e];
      if (kb.length !== len) continue;
      let t = 0;
      while (t < len && kb[t] === b[start + t]) t++;
      if (t === len) return this.labelIndices[e];
    }
    const raw = ascii
      ? String.fromCharCode.apply(null, b.subarray(start, end) as unknown as number[])
      : strictDecoder.decode(b.subarray(start, end));
    const label = figureLabelText(raw);
    const li = label === DEFAULT_FIGURE_LABEL
      ? this.defaultLabel()
      : this.figures.labelIndexOf(label);
    if (known.length < 64) {
      known.push(b.slice(start, end));
      this.labelIndices.push(li);
    }
    return li;
  }

  ws(): void {
    const b = this.b;
    let p = this.p;
    if (b[p] > 0x20) return;
    for (;;) {
      const c = b[p];
      if (c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09) p++;
      else break;
    }
    this.p = p;
  }

  /**
   * Reads an object key with no escapes, returning which known key it is
   * (K_OTHER for any other), or −1 when it is not a plain string.
   */
  key(): number {
    const b = this.b;
    const start = this.p + 1;
    if (b[this.p] !== 0x22 || this.plainString() < 0) return -1;
    const len = this.p - 1 - start;
    const c = b[start];
    let name: Uint8Array, id: number;
    if (len === 4 && c === 0x74) (name = TYPE), (id = K_TYPE);
    else if (len === 4 && c === 0x72) (name = ROLE), (id = K_ROLE);
    else if (len === 5 && c === 0x6c) (name = LABEL), (id = K_LABEL);
    else if (len === 5 && c === 0x73) (name = SCORE), (id = K_SCORE);
    else if (len === 8 && c === 0x67) (name = GEOMETRY), (id = K_GEOMETRY);
    else if (len === 8 && c === 0x66) (name = FEATURES), (id = K_FEATURES);
    else if (len === 10 && c === 0x70) (name = PROPERTIES), (id = K_PROPERTIES);
    else if (len === 11 && c === 0x63) (name = COORDINATES), (id = K_COORDINATES);
    else return K_OTHER;
    for (let t = 1; t < len; t++) if (b[start + t] !== name[t]) return K_OTHER;
    return id;
  }

  /** The text of the key that started at `start` (an opening quote). */
  keyText(start: number): string {
    return strictDecoder.decode(this.b.subarray(start + 1, this.p - 1));
  }

  /**
   * Reads a string with no escapes: 0 when ASCII, 1 when it holds valid
   * UTF-8 beyond ASCII, −1 (position undefined) for an escape, a control
   * character, invalid UTF-8 or no closing quote.
   */
  plainString(): number {
    const b = this.b, n = this.n;
    let p = this.p + 1, wide = 0;
    for (;;) {
      if (p >= n) return -1;
      const c = b[p];
      if (c === 0x22) break;
      if (c === 0x5c || c < 0x20) return -1;
      if (c >= 0x80) wide = 1;
      p++;
    }
    if (wide) {
      try {
        strictDecoder.decode(b.subarray(this.p + 1, p));
      } catch {
        return -1;
      }
    }
    this.p = p + 1;
    return wide;
  }

  /** True, having read it, when the next value is the plain string `w`. */
  word(w: string): boolean {
    const b = this.b, p = this.p;
    if (b[p] !== 0x22 || b[p + w.length + 1] !== 0x22) return false;
    for (let t = 0; t < w.length; t++) if (b[p + 1 + t] !== w.charCodeAt(t)) return false;
    this.p = p + w.length + 2;
    return true;
  }

  /** True, having read it, when the next token is the literal `w`. */
  literal(w: string): boolean {
    const b = this.b, p = this.p;
    for (let t = 0; t < w.length; t++) if (b[p + t] !== w.charCodeAt(t)) return false;
    const c = b[p + w.length];
    // A literal must end at a delimiter (so "nullx" is not read as null).
    if (
      !(c === undefined || c === 0x2c || c === 0x7d || c === 0x5d || c === 0x20 || c === 0x0a ||
        c === 0x0d || c === 0x09)
    ) return false;
    this.p = p + w.length;
    return true;
  }

  /**
   * Reads a JSON number (RFC 8259 §6, strictly), as `JSON.parse` would:
   * up to 15 significant digits and a power of ten up to 22 exactly in one
   * rounding (a single IEEE operation on exact operands); longer ones
   * through `Number`. Gives up the file on a malformed number.
   */
  number(): number {
    const b = this.b;
    let p = this.p;
    const start = p;
    let neg = false;
    if (b[p] === 0x2d) {
      neg = true;
      p++;
    }
    let c = b[p];
    // m: the significant digits (at most 15, so exact), value m·10^exp.
    let m = 0, sig = 0, exp = 0, exact = true;
    if (c === 0x30) {
      p++;
      c = b[p];
      if (c >= 0x30 && c <= 0x39) throw GIVE_UP;
    } else if (c >= 0x31 && c <= 0x39) {
      do {
        if (sig < 15) {
          m = m * 10 + (c - 0x30);
          sig++;
        } else exact = false;
        p++;
        c = b[p];
      } while (c >= 0x30 && c <= 0x39);
    } else throw GIVE_UP;
    if (c === 0x2e) {
      p++;
      c = b[p];
      if (!(c >= 0x30 && c <= 0x39)) throw GIVE_UP;
      do {
        exp--;
        if (m === 0 && c === 0x30) {
          // a leading zero: m stays 0
        } else if (sig < 15) {
          m = m * 10 + (c - 0x30);
          sig++;
        } else exact = false;
        p++;
        c = b[p];
      } while (c >= 0x30 && c <= 0x39);
    }
    if (c === 0x65 || c === 0x45) {
      p++;
      c = b[p];
      let sign = 1;
      if (c === 0x2b || c === 0x2d) {
        if (c === 0x2d) sign = -1;
        p++;
        c = b[p];
      }
      if (!(c >= 0x30 && c <= 0x39)) throw GIVE_UP;
      let e = 0;
      do {
        if (e < 100000) e = e * 10 + (c - 0x30);
        p++;
        c = b[p];
      } while (c >= 0x30 && c <= 0x39);
      exp += sign * e;
    }
    this.p = p;
    if (exact && exp >= -22 && exp <= 22) {
      const v = exp >= 0 ? m * POW10[exp] : m / POW10[-exp];
      return neg ? -v : v;
    }
    return Number(String.fromCharCode.apply(null, b.subarray(start, p) as unknown as number[]));
  }

  /**
   * Reads any JSON value strictly (for members the scanner ignores), true
   * when it is well-formed; false leaves the feature to the ordinary reader.
   */
  value(depth = 0): boolean {
    const b = this.b;
    const c = b[this.p];
    if (c === 0x22) return this.anyString();
    if (c === 0x2d || (c >= 0x30 && c <= 0x39)) {
      this.number();
      return true;
    }
    if (c === 0x7b || c === 0x5b) {
      if (depth > 64) return false;
      const close = c === 0x7b ? 0x7d : 0x5d;
      this.p++;
      this.ws();
      if (b[this.p] === close) {
        this.p++;
        return true;
      }
      for (;;) {
        this.ws();
        if (c === 0x7b) {
          if (b[this.p] !== 0x22 || !this.anyString()) return false;
          this.ws();
          if (b[this.p] !== 0x3a) return false;
          this.p++;
          this.ws();
        }
        if (!this.value(depth + 1)) return false;
        this.ws();
        const d = b[this.p++];
        if (d === 0x2c) continue;
        if (d === close) return true;
        return false;
      }
    }
    return this.literal("true") || this.literal("false") || this.literal("null");
  }

  /** Reads a string with any valid escapes (RFC 8259 §7), true when well-formed. */
  anyString(): boolean {
    const b = this.b, n = this.n;
    let p = this.p + 1, wide = false;
    for (;;) {
      if (p >= n) return false;
      const c = b[p];
      if (c === 0x22) break;
      if (c < 0x20) return false;
      if (c >= 0x80) wide = true;
      if (c === 0x5c) {
        const e = b[p + 1];
        if (e === 0x75) {
          for (let t = 2; t < 6; t++) {
            const h = b[p + t];
            if (
              !((h >= 0x30 && h <= 0x39) || (h >= 0x41 && h <= 0x46) || (h >= 0x61 && h <= 0x66))
            ) return false;
          }
          p += 6;
          continue;
        }
        if (
          !(e === 0x22 || e === 0x5c || e === 0x2f || e === 0x62 || e === 0x66 || e === 0x6e ||
            e === 0x72 || e === 0x74)
        ) return false;
        p += 2;
        continue;
      }
      p++;
    }
    if (wide) {
      try {
        strictDecoder.decode(b.subarray(this.p + 1, p));
      } catch {
        return false;
      }
    }
    this.p = p + 1;
    return true;
  }

  /**
   * Skips one value leniently (strings with escapes, nested brackets),
   * for values that are parsed from their bytes afterwards anyway.
   */
  skip(): void {
    const b = this.b, n = this.n;
    let p = this.p;
    const c = b[p];
    if (c === 0x22) p = skipString(b, p);
    else if (c === 0x7b || c === 0x5b) {
      // Bytes other than quotes and brackets are passed in a tight loop.
      let depth = 0;
      for (;;) {
        while (p < n && SKIP_CLASS[b[p]] === 0) p++;
        if (p >= n) throw GIVE_UP;
        const k = SKIP_CLASS[b[p]];
        if (k === 1) {
          p = skipString(b, p);
          continue;
        }
        if (k === 2) {
          depth++;
          if (++this.containers > MAX_JSON_CONTAINERS) throw GIVE_UP;
        } else depth--;
        p++;
        if (depth === 0) break;
      }
    } else {
      while (p < n && !isDelimiter(b[p])) p++;
      if (p === this.p) throw GIVE_UP;
    }
    this.p = p;
  }
}

/** Bytes that matter when skipping a value: 1 quote, 2 an opening bracket, 3 a closing one. */
const SKIP_CLASS = (() => {
  const c = new Uint8Array(256);
  c[0x22] = 1;
  c[0x7b] = c[0x5b] = 2;
  c[0x7d] = c[0x5d] = 3;
  return c;
})();

/** The position after the string starting at p (an opening quote). */
function skipString(b: Uint8Array, p: number): number {
  const n = b.length;
  p++;
  for (;;) {
    if (p >= n) throw GIVE_UP;
    const d = b[p++];
    if (d === 0x22) return p;
    if (d === 0x5c) p++;
  }
}

function isDelimiter(c: number): boolean {
  return c === 0x2c || c === 0x7d || c === 0x5d || c === 0x20 || c === 0x0a || c === 0x0d ||
    c === 0x09;
}

/**
 * Parses the bytes [start, end) as JSON (strict UTF-8), giving up the file on
 * any error, and also on a member named twice in one object or more objects
 * and arrays than `MAX_JSON_CONTAINERS` (the ordinary reader then refuses the
 * file, naming the line and column).
 */
function parseSpan(b: Uint8Array, start: number, end: number): unknown {
  return parseSpans(b, [0, start, end])[0];
}

/**
 * Parses the byte spans `spans` (triples: any number, start, end) as JSON
 * values, as {@linkcode parseSpan} does one, in a single decode and parse of
 * the array they make.
 */
function parseSpans(b: Uint8Array, spans: number[]): unknown[] {
  if (spans.length === 0) return [];
  let total = 1;
  for (let t = 0; t < spans.length; t += 3) total += spans[t + 2] - spans[t + 1] + 1;
  const joined = new Uint8Array(total);
  let at = 0;
  for (let t = 0; t < spans.length; t += 3) {
    joined[at++] = t === 0 ? 0x5b : 0x2c;
    joined.set(b.subarray(spans[t + 1], spans[t + 2]), at);
    at += spans[t + 2] - spans[t + 1];
  }
  joined[at] = 0x5d;
  try {
    const text = strictDecoder.decode(joined);
    const scan = scanJsonText(text, MAX_JSON_CONTAINERS);
    if (scan.duplicate !== undefined || scan.overLimitAt >= 0) throw GIVE_UP;
    const values = JSON.parse(text) as unknown[];
    if (values.length !== spans.length / 3) throw GIVE_UP;
    return values;
  } catch {
    throw GIVE_UP;
  }
}
