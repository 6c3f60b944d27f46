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
import {
  parseFiguresCsv,
  type ParseFiguresCsvOptions,
} from "../../lib/annotations/read_figures_csv.ts";
import { readFiguresCsvBytes, scanFiguresCsv } from "../../lib/annotations/_scan_figures_csv.ts";
import type { FigureSet } from "../../lib/types.ts";
import { decodeText } from "../../lib/annotations/_decode_text.ts";

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
      ordinary = parseAnnotations(decodeText(bytes, "annotations", options.fileName), options);
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

/** Counts of CSV inputs the scanner read itself, and all compared. */
export const csvScannerUse = { scanned: 0, compared: 0 };

type CsvResult = { figures: FigureSet; warnings: string[] };

/**
 * Parses a figures CSV `text` with both readers (parseFiguresCsv on the
 * text; the byte reader on its UTF-8 bytes), asserts they agree, and returns
 * the ordinary reader's result (or throws its error).
 */
export function parseCsvBoth(text: string, options: ParseFiguresCsvOptions): CsvResult {
  let ordinary: CsvResult | undefined, ordinaryError: Error | undefined;
  try {
    ordinary = parseFiguresCsv(text, options);
  } catch (e) {
    ordinaryError = e as Error;
  }
  return compareCsvBytes(new TextEncoder().encode(text), options, ordinary, ordinaryError);
}

/** As {@linkcode parseCsvBoth}, from bytes. */
export function compareCsvBytes(
  bytes: Uint8Array,
  options: ParseFiguresCsvOptions,
  ordinary?: CsvResult,
  ordinaryError?: Error,
): CsvResult {
  if (!ordinary && !ordinaryError) {
    try {
      ordinary = parseFiguresCsv(decodeText(bytes, "figures CSV", options.fileName), options);
    } catch (e) {
      ordinaryError = e as Error;
    }
  }
  csvScannerUse.compared++;
  const scanned = scanFiguresCsv(bytes, options);
  if (scanned) csvScannerUse.scanned++;
  let fast: CsvResult | undefined, fastError: Error | undefined;
  try {
    fast = readFiguresCsvBytes(bytes, options);
  } catch (e) {
    fastError = e as Error;
  }
  if (ordinaryError) {
    assert.ok(
      fastError,
      `the byte reader accepted what the ordinary one refused: ${ordinaryError.message}`,
    );
    assert.ok(!scanned, "the scanner read a file the ordinary reader refuses");
    assert.equal(fastError.constructor, ordinaryError.constructor);
    assert.equal(fastError.message, ordinaryError.message);
    throw ordinaryError;
  }
  assert.ok(
    !fastError,
    `the byte reader refused what the ordinary one read: ${fastError?.message}`,
  );
  const plainCsv = (r: CsvResult) => ({ warnings: r.warnings, figures: plainFigures(r.figures) });
  assert.deepStrictEqual(plainCsv(fast!), plainCsv(ordinary!));
  if (scanned) assert.deepStrictEqual(plainCsv(scanned), plainCsv(ordinary!));
  return ordinary!;
}
