/**
 * Hashing a file of any size without reading it into memory at once.
 *
 * @module
 */

import { createHash } from "node:crypto";
import { closeSync, openSync, readSync } from "node:fs";

/**
 * The hex SHA-256 of a file's bytes, read in 4 MiB pieces (whole-slide files
 * can be several gigabytes).
 *
 * @param path The file.
 * @returns 64 lowercase hex digits.
 * @throws {Error} When the file cannot be read (the system's error).
 *
 * @example The hash of an empty file
 * ```ts
 * import { sha256File } from "./hash_file.ts";
 * if ((await Deno.permissions.query({ name: "write" })).state === "granted") {
 *   const path = Deno.makeTempFileSync();
 *   const h = sha256File(path);
 *   Deno.removeSync(path);
 *   // FIPS 180-4 test value: SHA-256 of the empty message
 *   if (h !== "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855") throw new Error(h);
 * }
 * ```
 */
export function sha256File(path: string): string {
  const hash = createHash("sha256");
  const fd = openSync(path, "r");
  try {
    const buf = new Uint8Array(4 * 1024 * 1024);
    for (;;) {
      const n = readSync(fd, buf, 0, buf.length, null);
      if (n <= 0) break;
      hash.update(buf.subarray(0, n));
    }
  } finally {
    closeSync(fd);
  }
  return hash.digest("hex");
}
