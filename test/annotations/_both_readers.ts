// Runs the ordinary annotation reader (text) and the byte reader (scanner,
// else the ordinary reader on the decoded bytes) on the same input and
// checks that they agree: the same result, or the same error class and
// message. Used by the reader tests, so every input they hold, well-formed
// or not, is a differential case.
import { strict as assert } from "node:assert";
import {
  parseAnnotations,
  type ParseAnnotationsOptions,
  type ParsedAnnotations,
} from "../../lib/annotations/read_annotations.ts";
import { readAnnotationsBytes, scanAnnotations } from "../../lib/annotations/_scan_annotations.ts";
import type { FigureSet } from "../../lib/types.ts";

/** Counts of inputs the scanner read itself, and all inputs compared. */
export const scannerUse = { scanned: 0, compared: 0 };

/** Figures as plain arrays, with NaN and −0 kept apart (for deepStrictEqual). */
function plainFigures(f: FigureSet) {
  const bits = (a: Float64Array) => Array.from(a, (v) => Object.is(v, -0) ? "-0" : String(v));
  return {
    x: bits(f.xPx),
    y: bits(f.yPx),
    label: Array.from(f.labelIndex),
    labels: f.labels,
    score: bits(f.score),
    origin: Array.from(f.origin),
  };
}

function plain(a: ParsedAnnotations) {
  return { ...a, figures: plainFigures(a.figures) };
}

/**
 * Parses `text` with both readers, asserts they agree, and returns the
 * ordinary reader's result (or throws its error).
 */
export function parseBoth(text: string, options: ParseAnnotationsOptions): ParsedAnnotations {
  let ordinary: ParsedAnnotations | undefined, ordinaryError: Error | undefined;
  try {
    ordinary = parseAnnotations(text, options);
  } catch (e) {
    ordinaryError = e as Error;
  }
  return compareBytes(new TextEncoder().encode(text), options, ordinary, ordinaryError);
}

/** As {@linkcode parseBoth}, from bytes (the ordinary reader gets them decoded as loadCase does). */
export function compareBytes(
  bytes: Uint8Array,
  options: ParseAnnotationsOptions,
  ordinary?: ParsedAnnotations,
  ordinaryError?: Error,
): ParsedAnnotations {
  if (!ordinary && !ordinaryError) {
    try {
      ordinary = parseAnnotations(decodeLikeLoadCase(bytes, options.fileName), options);
    } catch (e) {
      ordinaryError = e as Error;
    }
  }
  scannerUse.compared++;
  let scanned: ParsedAnnotations | null = null;
  try {
    scanned = scanAnnotations(bytes, options);
  } catch {
    // an error from the scanner's collector: compared below through readAnnotationsBytes
  }
  if (scanned) scannerUse.scanned++;
  let fast: ParsedAnnotations | undefined, fastError: Error | undefined;
  try {
    fast = readAnnotationsBytes(bytes, options);
  } catch (e) {
    fastError = e as Error;
  }
  if (ordinaryError) {
    assert.ok(
      fastError,
      `the byte reader accepted what the ordinary one refused: ${ordinaryError.message}`,
    );
    assert.equal(fastError.constructor, ordinaryError.constructor);
    assert.equal(fastError.message, ordinaryError.message);
    throw ordinaryError;
  }
  assert.ok(
    !fastError,
    `the byte reader refused what the ordinary one read: ${fastError?.message}`,
  );
  assert.deepStrictEqual(plain(fast!), plain(ordinary!));
  if (scanned) assert.deepStrictEqual(plain(scanned), plain(ordinary!));
  return ordinary!;
}

function decodeLikeLoadCase(bytes: Uint8Array, file: string): string {
  const text = new TextDecoder("utf-8").decode(bytes);
  if (!text.includes("\uFFFD")) return text;
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new SyntaxError(
      `Cannot read annotations "${file}": not UTF-8 text (is it a binary file, such as an image?)`,
    );
  }
}
