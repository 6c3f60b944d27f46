/**
 * One pass over a JSON text, before it is parsed: counts its objects and
 * arrays (so that a file of millions of tiny ones is refused before
 * `JSON.parse` builds them) and finds the first member name that appears
 * twice in one object (`JSON.parse` keeps the last value silently; RFC 8259
 * §4 only says names SHOULD be unique).
 *
 * The scan makes no object per value: it keeps the offsets of the names of
 * the objects being read on a stack, compares a new name with its siblings
 * by length and characters, and turns to a `Set` only for an object with
 * many members. It does not check the grammar: on text that is not JSON its
 * findings mean nothing, so callers parse the text as well and report a
 * syntax error first.
 *
 * @module
 */

/** What {@linkcode scanJsonText} found. */
export interface JsonTextScan {
  /** Objects and arrays counted (counting stops just past the limit). */
  containers: number;
  /** Offset of the container that passed the limit, or -1. */
  overLimitAt: number;
  /** The first member name repeated within one object, if any. */
  duplicate?: DuplicateKey;
}

/** A member name that appears twice in one object. */
export interface DuplicateKey {
  /** The name (escapes resolved). */
  key: string;
  /** Offset of the opening quote of its second appearance. */
  offset: number;
  /** Where the object lies: member names and array indices from the root. */
  path: (string | number)[];
}

const OBJ = 1, ARR = 2;
/** Members an object may have before its names go into a Set. */
const LINEAR_LIMIT = 24;

/** The name between the quotes at `[off, off + len)`, escapes resolved. */
function nameAt(text: string, off: number, len: number): string {
  const raw = text.slice(off, off + len);
  if (!raw.includes("\\")) return raw;
  try {
    return JSON.parse(`"${raw}"`) as string;
  } catch {
    return raw; // a broken escape: the text is no JSON, and the parser will say so
  }
}

/** Index of the closing quote of the string whose opening quote is at `i`, or -1. */
function closingQuote(text: string, i: number): number {
  let j = i + 1;
  for (;;) {
    j = text.indexOf('"', j);
    if (j < 0) return -1;
    let b = j - 1;
    while (text.charCodeAt(b) === 0x5c) b--;
    if ((j - 1 - b) % 2 === 0) return j;
    j++;
  }
}

/** Whether the string opening at `i` follows `{` or `,` (white space between), i.e. is a member name. */
function isMemberName(text: string, i: number): boolean {
  let b = i - 1;
  let c = text.charCodeAt(b);
  while (c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09) c = text.charCodeAt(--b);
  return c === 0x7b || c === 0x2c;
}

/**
 * Scans a JSON text once (see the module documentation).
 *
 * Only quotes, braces and brackets are looked at: a string inside an object
 * is a member name when `{` or `,` precedes it. Array positions are not
 * tracked; the path of a repeated name is worked out afterwards.
 *
 * @param text The text (a byte order mark is skipped like white space).
 * @param maxContainers Counting stops after this many objects and arrays.
 * @returns The count, where the limit was passed, and the first repeated name.
 *
 * @example A repeated mpp in the slide member
 * ```ts
 * import { scanJsonText } from "./_json_keys.ts";
 * const scan = scanJsonText('{"slide": {"mpp": 0.25, "mpp": 0.5}, "features": []}', 100);
 * if (scan.duplicate?.key !== "mpp" || scan.duplicate.path.join() !== "slide") {
 *   throw new Error(`found ${JSON.stringify(scan.duplicate)}`);
 * }
 * const clean = scanJsonText('{"slide": {"mpp": 0.25}, "features": [[1, 2]]}', 100);
 * if (clean.containers !== 4) throw new Error(`four objects and arrays, counted ${clean.containers}`);
 * ```
 */
export function scanJsonText(text: string, maxContainers: number): JsonTextScan {
  const n = text.length;
  let cap = 64;
  let kind = new Uint8Array(cap);
  let first = new Int32Array(cap); // objects: index in the name stack of their first name
  let escaped = new Uint8Array(cap); // objects: 1 once a name holds an escape
  const sets: (Set<string> | undefined)[] = [];
  let keyCap = 256;
  let keyOff = new Int32Array(keyCap); // offset of the first character of a name
  let keyLen = new Int32Array(keyCap); // length of the raw name between the quotes
  let top = 0; // names on the stack
  let depth = -1;
  let containers = 0;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === 0x22) {
      const j = closingQuote(text, i);
      if (j < 0) break;
      if (depth >= 0 && kind[depth] === OBJ && isMemberName(text, i)) {
        if (top === keyCap) {
          keyCap *= 2;
          const o = new Int32Array(keyCap), l = new Int32Array(keyCap);
          o.set(keyOff), l.set(keyLen);
          keyOff = o, keyLen = l;
        }
        const k = top++;
        const off = i + 1, len = j - i - 1;
        keyOff[k] = off, keyLen[k] = len;
        const lo = first[depth];
        let dup = false;
        for (let t = off; t < j; t++) {
          if (text.charCodeAt(t) === 0x5c) {
            escaped[depth] = 1;
            break;
          }
        }
        const set = sets[depth];
        if (set !== undefined) {
          const name = nameAt(text, off, len);
          dup = set.has(name);
          set.add(name);
        } else if (escaped[depth] === 1) {
          // an escape among this object's names: compare resolved names (rare)
          const name = nameAt(text, off, len);
          for (let q = lo; q < k && !dup; q++) dup = nameAt(text, keyOff[q], keyLen[q]) === name;
        } else {
          for (let q = lo; q < k && !dup; q++) {
            if (keyLen[q] === len) {
              let same = true;
              const oq = keyOff[q];
              for (let t = 0; t < len && same; t++) {
                same = text.charCodeAt(oq + t) === text.charCodeAt(off + t);
              }
              dup = same;
            }
          }
        }
        if (!dup && set === undefined && k - lo >= LINEAR_LIMIT) {
          // many members: compare resolved names through a Set from now on
          const s = new Set<string>();
          for (let q = lo; q <= k; q++) s.add(nameAt(text, keyOff[q], keyLen[q]));
          sets[depth] = s;
        }
        if (dup) {
          return {
            containers,
            overLimitAt: -1,
            duplicate: { key: nameAt(text, off, len), offset: i, path: pathAt(text, i) },
          };
        }
      }
      i = j;
    } else if (c === 0x7b || c === 0x5b) {
      if (++containers > maxContainers) return { containers, overLimitAt: i };
      if (++depth === cap) {
        cap *= 2;
        const k = new Uint8Array(cap), f = new Int32Array(cap), e = new Uint8Array(cap);
        k.set(kind), f.set(first), e.set(escaped);
        kind = k, first = f, escaped = e;
      }
      if (c === 0x7b) {
        kind[depth] = OBJ;
        first[depth] = top;
        escaped[depth] = 0;
        sets[depth] = undefined;
      } else kind[depth] = ARR;
    } else if (c === 0x7d || c === 0x5d) {
      if (depth < 0) break;
      if (kind[depth] === OBJ) {
        top = first[depth];
        sets[depth] = undefined;
      }
      depth--;
    }
  }
  return { containers, overLimitAt: -1 };
}

/**
 * The member names and array indices leading to the object that holds the
 * member name at `offset` (a second, slower pass, run only for a message).
 */
function pathAt(text: string, offset: number): (string | number)[] {
  const kinds: number[] = [], names: string[] = [], index: number[] = [];
  for (let i = 0; i < offset; i++) {
    const c = text.charCodeAt(i);
    const d = kinds.length - 1;
    if (c === 0x22) {
      const j = closingQuote(text, i);
      if (d >= 0 && kinds[d] === OBJ && isMemberName(text, i)) {
        names[d] = nameAt(text, i + 1, j - i - 1);
      }
      i = j;
    } else if (c === 0x7b || c === 0x5b) {
      kinds.push(c === 0x7b ? OBJ : ARR);
      names.push("");
      index.push(0);
    } else if (c === 0x7d || c === 0x5d) {
      kinds.pop(), names.pop(), index.pop();
    } else if (c === 0x2c && d >= 0 && kinds[d] === ARR) index[d]++;
  }
  const path: (string | number)[] = [];
  for (let d = 0; d < kinds.length - 1; d++) path.push(kinds[d] === OBJ ? names[d] : index[d]);
  return path;
}

/**
 * The 1-based line and column (UTF-16 code units) of an offset in a text.
 *
 * @param text The text.
 * @param offset A code unit offset.
 * @returns Line and column.
 *
 * @example
 * ```ts
 * import { lineColumnAt } from "./_json_keys.ts";
 * const at = lineColumnAt("ab\ncd", 4);
 * if (at.line !== 2 || at.column !== 2) throw new Error(`line 2, column 2; got ${JSON.stringify(at)}`);
 * ```
 */
export function lineColumnAt(text: string, offset: number): { line: number; column: number } {
  let line = 1, start = 0;
  for (let i = text.indexOf("\n"); i >= 0 && i < offset; i = text.indexOf("\n", i + 1)) {
    line++;
    start = i + 1;
  }
  return { line, column: offset - start + 1 };
}

/**
 * Names the object at `path` in words: `the top-level object`, `"slide"`,
 * `feature 3 "properties"` (GeoJSON features by their index), or
 * `"figures"."path"`-style member chains with `[i]` for array elements.
 *
 * @param path Member names and array indices from the root.
 * @returns The description.
 *
 * @example A feature's properties
 * ```ts
 * import { describeJsonPath } from "./_json_keys.ts";
 * const words = describeJsonPath(["features", 3, "properties"]);
 * if (words !== 'feature 3 "properties"') throw new Error(words);
 * ```
 */
export function describeJsonPath(path: (string | number)[]): string {
  if (path.length === 0) return "the top-level object";
  const parts: string[] = [];
  let k = 0;
  if (path[0] === "features" && typeof path[1] === "number") {
    parts.push(`feature ${path[1]}`);
    k = 2;
  }
  let chain = "";
  for (; k < path.length; k++) {
    const p = path[k];
    chain += typeof p === "number" ? `[${p}]` : (chain === "" ? "" : ".") + JSON.stringify(p);
  }
  if (chain !== "") parts.push(chain);
  return parts.join(" ");
}

/**
 * The message detail for a repeated name: place, name and why it matters.
 *
 * @param text The text scanned.
 * @param d The repeated name.
 * @returns E.g. `line 1, column 60: the key "mpp" appears twice in "slide"; …`.
 *
 * @example
 * ```ts
 * import { duplicateKeyDetail, scanJsonText } from "./_json_keys.ts";
 * const text = '{"a": 1, "a": 2}';
 * const detail = duplicateKeyDetail(text, scanJsonText(text, 10).duplicate!);
 * if (!detail.startsWith('line 1, column 10: the key "a" appears twice')) throw new Error(detail);
 * ```
 */
export function duplicateKeyDetail(text: string, d: DuplicateKey): string {
  const { line, column } = lineColumnAt(text, d.offset);
  return `line ${line}, column ${column}: the key ${JSON.stringify(d.key)} appears twice in ${
    describeJsonPath(d.path)
  }; member names must be unique (RFC 8259 §4), otherwise one value silently replaces the other`;
}

/**
 * The message detail for a text with too many objects and arrays.
 *
 * @param text The text scanned.
 * @param scan The scan that passed the limit.
 * @param limit The limit.
 * @returns E.g. `more than 12,000,000 JSON objects and arrays (the limit; …)`.
 *
 * @example
 * ```ts
 * import { containerLimitDetail, scanJsonText } from "./_json_keys.ts";
 * const text = "[[], [], []]";
 * const detail = containerLimitDetail(text, scanJsonText(text, 2), 2);
 * if (!detail.includes("more than 2 JSON objects and arrays")) throw new Error(detail);
 * ```
 */
export function containerLimitDetail(text: string, scan: JsonTextScan, limit: number): string {
  const { line, column } = lineColumnAt(text, scan.overLimitAt);
  return `the file holds more than ${
    limit.toLocaleString("en-US")
  } JSON objects and arrays (the limit; passed at line ${line}, column ${column}), more than any slide's annotations need (see "Input limits" in the README)`;
}
