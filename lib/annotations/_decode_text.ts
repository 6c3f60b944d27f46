/**
 * Decoding a file's bytes as UTF-8 text, with a clear message when they are not.
 *
 * @module
 */

import { inputError } from "../errors.ts";

/**
 * The bytes as UTF-8 text (a byte order mark dropped), or an input error
 * naming the file when they are not UTF-8.
 *
 * @param bytes The file's bytes.
 * @param what What the file is, for the message (e.g. `"annotations"`).
 * @param path The file's path as the user gave it.
 * @returns The text.
 * @throws {SyntaxError} When the bytes are not UTF-8.
 *
 * @example
 * ```ts
 * import { decodeText } from "./_decode_text.ts";
 * if (decodeText(new Uint8Array([0x68, 0x69]), "annotations", "a.geojson") !== "hi") {
 *   throw new Error("decoded");
 * }
 * ```
 */
export function decodeText(bytes: Uint8Array, what: string, path: string): string {
  // The lenient decoder is several times faster; only text holding U+FFFD
  // (a bad byte, or a genuine replacement character) is decoded again strictly.
  const text = new TextDecoder("utf-8").decode(bytes);
  if (!text.includes("\uFFFD")) return text;
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw inputError(
      SyntaxError,
      what,
      path,
      "not UTF-8 text (is it a binary file, such as an image?)",
    );
  }
}
