/**
 * Writing files so that a reader never sees half of one.
 *
 * @module
 */

import { mkdirSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { dirname } from "node:path";

let counter = 0;

/**
 * Writes `data` to `path` through a temporary file in the same folder and a
 * rename, so the target is either the old file or the complete new one.
 * Parent folders are created as needed.
 *
 * @param path Target file.
 * @param data Text (written as UTF-8) or bytes.
 *
 * @example Writing a small file
 * ```ts
 * import { writeFileAtomic } from "./write_atomic.ts";
 * import { readFileSync, rmSync } from "node:fs";
 * const dir = Deno.makeTempDirSync();
 * writeFileAtomic(`${dir}/a/b.txt`, "hello");
 * const text = readFileSync(`${dir}/a/b.txt`, "utf8");
 * if (text !== "hello") throw new Error(`read back ${JSON.stringify(text)}`);
 * rmSync(dir, { recursive: true });
 * ```
 */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  mkdirSync(dirname(path), { recursive: true });
  const tmp = `${path}.tmp-${Deno.pid}-${counter++}`;
  try {
    writeFileSync(tmp, data);
    renameSync(tmp, path);
  } catch (e) {
    rmSync(tmp, { force: true });
    throw e;
  }
}
