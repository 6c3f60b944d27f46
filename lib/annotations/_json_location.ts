/**
 * Finding where a JSON text stops being valid, for messages that name a line
 * and column. Only run after `JSON.parse` has failed, so speed is secondary.
 *
 * @module
 */

/** Where and why a JSON text is invalid. */
export interface JsonProblem {
  /** 1-based line. */
  line: number;
  /** 1-based column (UTF-16 code units). */
  column: number;
  /** What was wrong, e.g. `expected "," or "}"`. */
  problem: string;
}

/**
 * Scans `text` as strict JSON (RFC 8259) and returns the first problem, or
 * `undefined` when the text is valid.
 */
export function locateJsonProblem(text: string): JsonProblem | undefined {
  let i = 0;
  const n = text.length;
  class Stop extends Error {
    constructor(readonly at: number, readonly problem: string) {
      super(problem);
    }
  }
  const ws = () => {
    while (i < n && (text[i] === " " || text[i] === "\t" || text[i] === "\n" || text[i] === "\r")) {
      i++;
    }
  };
  // quoted as JSON, so a control character shows as an escape, not as itself
  const found = () => i >= n ? "the end of the file" : JSON.stringify(text[i]);
  const value = (depth: number): void => {
    if (depth > 2000) throw new Stop(i, "nesting is too deep");
    ws();
    const c = text[i];
    if (c === "{") {
      i++;
      ws();
      if (text[i] === "}") {
        i++;
        return;
      }
      for (;;) {
        ws();
        if (text[i] !== '"') {
          throw new Stop(i, `expected a property name in double quotes, found ${found()}`);
        }
        string();
        ws();
        if (text[i] !== ":") {
          throw new Stop(i, `expected ":" after a property name, found ${found()}`);
        }
        i++;
        value(depth + 1);
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "}") {
          i++;
          return;
        }
        throw new Stop(i, `expected "," or "}" in an object, found ${found()}`);
      }
    }
    if (c === "[") {
      i++;
      ws();
      if (text[i] === "]") {
        i++;
        return;
      }
      for (;;) {
        value(depth + 1);
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "]") {
          i++;
          return;
        }
        throw new Stop(i, `expected "," or "]" in an array, found ${found()}`);
      }
    }
    if (c === '"') return string();
    if (c === "-" || (c >= "0" && c <= "9")) return number();
    for (const word of ["true", "false", "null"]) {
      if (text.startsWith(word, i)) {
        i += word.length;
        return;
      }
    }
    throw new Stop(i, `expected a value, found ${found()}`);
  };
  const string = () => {
    i++;
    while (i < n) {
      const c = text[i];
      if (c === '"') {
        i++;
        return;
      }
      if (c === "\\") {
        const e = text[i + 1];
        if (e === "u") {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) {
            throw new Stop(i, "bad \\u escape in a string");
          }
          i += 6;
          continue;
        }
        if (e === undefined || !'"\\/bfnrt'.includes(e)) {
          throw new Stop(i, "bad escape in a string");
        }
        i += 2;
        continue;
      }
      if (c < " ") throw new Stop(i, "unescaped control character (e.g. a line break) in a string");
      i++;
    }
    throw new Stop(i, "a string is not closed");
  };
  const number = () => {
    const m = /^-?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][+-]?[0-9]+)?/.exec(text.slice(i, i + 400));
    if (!m) throw new Stop(i, `malformed number`);
    i += m[0].length;
  };
  try {
    value(0);
    ws();
    if (i < n) throw new Stop(i, `unexpected ${found()} after the end of the JSON value`);
    return undefined;
  } catch (e) {
    if (!(e instanceof Stop)) throw e;
    let line = 1;
    let lineStart = 0;
    for (let k = 0; k < e.at && k < n; k++) {
      if (text[k] === "\n") {
        line++;
        lineStart = k + 1;
      }
    }
    return { line, column: e.at - lineStart + 1, problem: e.problem };
  }
}
