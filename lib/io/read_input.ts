/**
 * Reading an input file safely: only regular files, never more than a stated
 * number of bytes.
 *
 * A named pipe (FIFO) would block the reader until some other process writes
 * to it, and a device such as `/dev/zero` never ends, so the path is looked up
 * (`stat`) before it is opened and anything but a regular file is refused.
 * The size is checked from that lookup and again while reading, so a file
 * that grows meanwhile is refused too.
 *
 * @module
 */

import { open, stat } from "node:fs/promises";

/** Options of {@linkcode readInputFile}. */
export interface ReadInputOptions {
  /** What is read, for messages: `annotations`, `figures CSV`, `tissue mask`, … */
  what: string;
  /** The largest file accepted, in bytes. */
  maxBytes: number;
  /**
   * The path to open when it differs from the one named in messages (e.g. a
   * relative path resolved against another folder).
   * @default the path given
   */
  openPath?: string;
}

/** An input file is larger than its limit; the message gives both sizes. */
export class InputSizeError extends RangeError {
  /** Always "InputSizeError". */
  override name = "InputSizeError";
}

/**
 * Bytes as a short size for messages: `812 bytes`, `3.4 MB`, `1.2 GB`
 * (decimal units, 1 MB = 10⁶ bytes, one decimal).
 *
 * @param bytes A size in bytes.
 * @returns The size in words.
 *
 * @example Sizes in messages
 * ```ts
 * import { formatBytes } from "./read_input.ts";
 * if (formatBytes(812) !== "812 bytes") throw new Error(formatBytes(812));
 * if (formatBytes(524_288_000) !== "524.3 MB") throw new Error(formatBytes(524_288_000));
 * ```
 */
export function formatBytes(bytes: number): string {
  if (bytes < 1e3) return `${bytes} bytes`;
  for (const [unit, size] of [["GB", 1e9], ["MB", 1e6], ["kB", 1e3]] as const) {
    if (bytes >= size) return `${(Math.round((bytes / size) * 10) / 10).toFixed(1)} ${unit}`;
  }
  return `${bytes} bytes`;
}

/** What a non-regular file is, in words. */
function kindOf(s: Awaited<ReturnType<typeof stat>>): string {
  if (s.isDirectory()) return "a folder, not a file";
  if (s.isFIFO()) return "a named pipe (FIFO), not a regular file";
  if (s.isCharacterDevice() || s.isBlockDevice()) return "a device, not a regular file";
  if (s.isSocket()) return "a socket, not a regular file";
  return "not a regular file";
}

function osProblem(e: unknown): string {
  const code = (e as { code?: string }).code;
  return code === "ENOENT"
    ? "file not found"
    : code === "ENOTDIR"
    ? "file not found (a folder on the path is a file)"
    : code === "EISDIR"
    ? "it is a folder, not a file"
    : code === "EACCES" || code === "EPERM"
    ? "permission denied"
    : code === "ELOOP"
    ? "too many symbolic links (a loop?)"
    : `the file cannot be read (${(e as Error).message})`;
}

/**
 * Reads a whole input file, refusing anything that is not a regular file and
 * any file larger than `maxBytes`.
 *
 * Symbolic links are followed. The file is not opened unless the lookup
 * found a regular file, so a FIFO or a device never blocks or floods the
 * reader; after opening, the handle is checked again.
 *
 * @param path The file's path as the user gave it (named in messages).
 * @param options What is read and the size limit.
 * @returns The file's bytes.
 * @throws {Error} `Cannot read <what> "<path>": <problem>` when the file is
 *   missing, unreadable, a folder, a FIFO, a device or a socket.
 * @throws {InputSizeError} (a RangeError) When the file is larger than
 *   `maxBytes`; the message gives the size and the limit.
 *
 * @example A folder is refused, not read
 * ```ts
 * import { readInputFile } from "./read_input.ts";
 * const dir = Deno.makeTempDirSync();
 * let message = "";
 * try { await readInputFile(dir, { what: "annotations", maxBytes: 1e6 }); } catch (e) { message = (e as Error).message; }
 * if (!message.endsWith("it is a folder, not a file")) throw new Error(`a folder must be refused: ${message}`);
 * Deno.removeSync(dir);
 * ```
 */
export async function readInputFile(path: string, options: ReadInputOptions): Promise<Uint8Array> {
  const { what, maxBytes } = options;
  const at = options.openPath ?? path;
  const fail = (problem: string, cause?: unknown) =>
    new Error(`Cannot read ${what} "${path}": ${problem}`, cause === undefined ? {} : { cause });
  const tooLarge = (size: string) =>
    new InputSizeError(
      `Cannot read ${what} "${path}": the file is ${size}, more than the limit of ${
        formatBytes(maxBytes)
      } for ${what} (see "Input limits" in the README)`,
    );
  let info;
  try {
    info = await stat(at);
  } catch (e) {
    throw fail(osProblem(e), e);
  }
  if (!info.isFile()) throw fail(`it is ${kindOf(info)}`);
  if (info.size > maxBytes) throw tooLarge(formatBytes(info.size));
  let handle;
  try {
    handle = await open(at, "r");
  } catch (e) {
    throw fail(osProblem(e), e);
  }
  try {
    const again = await handle.stat();
    if (!again.isFile()) throw fail(`it is ${kindOf(again)}`);
    // One byte more than allowed tells a file that grew past the limit.
    const cap = Math.min(maxBytes + 1, Math.max(again.size, info.size) + 1);
    let buf = new Uint8Array(Math.max(cap, 1));
    let n = 0;
    for (;;) {
      if (n === buf.length) {
        if (buf.length > maxBytes) throw tooLarge(`more than ${formatBytes(maxBytes)}`);
        const bigger = new Uint8Array(Math.min(maxBytes + 1, buf.length * 2));
        bigger.set(buf);
        buf = bigger;
      }
      let got: number;
      try {
        ({ bytesRead: got } = await handle.read(buf, n, buf.length - n, null));
      } catch (e) {
        throw fail(osProblem(e), e);
      }
      if (got === 0) break;
      n += got;
    }
    if (n > maxBytes) throw tooLarge(`more than ${formatBytes(maxBytes)}`);
    return buf.subarray(0, n);
  } finally {
    await handle.close();
  }
}
