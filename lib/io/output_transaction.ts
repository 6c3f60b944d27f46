/**
 * Writing a set of outputs all or nothing.
 *
 * Everything is first written under temporary names beside its target (a
 * folder as `DIR/.tmp-<name>-<pid>`, a file as `<path>.tmp-<pid>-<n>`); only
 * when all of it is on disk are the temporary names renamed into place, each
 * old target first moved aside (`….old`) and removed at the end. A failure
 * while writing (a full disk, a file system that refuses, a folder where a
 * file should go) removes what was staged; a failure while renaming puts
 * every target moved so far back. Either way the output folder is left as it
 * was, and the error names it and the path at fault.
 *
 * Renames within one folder need no free space, so a full disk can only
 * strike while staging, when nothing visible has changed yet.
 *
 * @module
 */

import {
  existsSync,
  lstatSync,
  mkdirSync,
  renameSync,
  rmdirSync,
  rmSync,
  writeFileSync,
} from "node:fs";
import { dirname, join } from "node:path";

/**
 * Why an operating-system error happened, in words, with its code.
 *
 * @param e The error (a Node-style error with `code`, or anything).
 * @returns E.g. `no space left on the device (ENOSPC)`.
 *
 * @example
 * ```ts
 * import { describeWriteError } from "./output_transaction.ts";
 * const why = describeWriteError(Object.assign(new Error("write"), { code: "ENOSPC" }));
 * if (why !== "no space left on the device (ENOSPC)") throw new Error(why);
 * ```
 */
export function describeWriteError(e: unknown): string {
  const code = (e as { code?: string }).code;
  switch (code) {
    case "ENOSPC":
      return "no space left on the device (ENOSPC)";
    case "EDQUOT":
      return "the disk quota is used up (EDQUOT)";
    case "EACCES":
    case "EPERM":
      return `permission denied (${code})`;
    case "EROFS":
      return "the file system is read-only (EROFS)";
    case "EISDIR":
      return "a folder is in the way of a file (EISDIR)";
    case "ENOTDIR":
      return "a file is in the way of a folder (ENOTDIR)";
    case "EBUSY":
      return "a file or folder is in use, e.g. a mount point (EBUSY)";
    case "ENAMETOOLONG":
      return "a name is too long for the file system (ENAMETOOLONG)";
    default:
      return (e as Error)?.message ?? String(e);
  }
}

/** A write to the output folder failed; nothing was changed. The message names the folder. */
export class OutputWriteError extends Error {
  /** Always "OutputWriteError". */
  override name = "OutputWriteError";
}

type Data = string | Uint8Array;

interface Staged {
  /** True for a folder. */
  folder: boolean;
  /** The final path. */
  target: string;
  /** The temporary path holding the new content. */
  temp: string;
  /** Where the old target was moved while committing, once it was. */
  old?: string;
  /** True once the temporary path was renamed to the target. */
  placed?: boolean;
}

let counter = 0;

function kindAt(path: string): "none" | "folder" | "other" {
  try {
    return lstatSync(path).isDirectory() ? "folder" : "other";
  } catch {
    return "none";
  }
}

/**
 * A set of outputs under one folder, staged first and renamed into place
 * together (see the module documentation).
 *
 * @example Two files and a folder, all or nothing
 * ```ts
 * import { OutputTransaction } from "./output_transaction.ts";
 * import { readdirSync, readFileSync } from "node:fs";
 * const dir = Deno.makeTempDirSync();
 * const tx = new OutputTransaction(dir);
 * tx.file("cases.csv", "case\nQVT-24-001\n");
 * tx.folder("QVT-24-001", [["report.json", "{}\n"]]);
 * if (readdirSync(dir).includes("cases.csv")) throw new Error("nothing is in place before commit()");
 * tx.commit();
 * if (readFileSync(`${dir}/QVT-24-001/report.json`, "utf8") !== "{}\n") throw new Error("the folder is in place");
 * if (readdirSync(dir).sort().join() !== "QVT-24-001,cases.csv") throw new Error(`no temporary names left: ${readdirSync(dir)}`);
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export class OutputTransaction {
  readonly #staged: Staged[] = [];
  readonly #createdFolders: string[] = [];
  readonly #what: string;
  #done = false;

  /**
   * Starts a transaction; `outDir` is created when missing (and removed again
   * when nothing is committed into it).
   *
   * @param outDir The output folder.
   * @param what What is written, for messages: `Cannot write <what>: …`.
   *   @default `reports to "<outDir>"`
   * @throws {OutputWriteError} When the folder cannot be created or is a file.
   */
  constructor(readonly outDir: string, what = `reports to "${outDir}"`) {
    this.#what = what;
    const kind = kindAt(outDir);
    if (kind === "other") {
      throw new OutputWriteError(`Cannot write ${what}: "${outDir}" is a file, not a folder`);
    }
    if (kind === "none") {
      try {
        this.#mkdirs(outDir);
      } catch (e) {
        this.abort();
        throw new OutputWriteError(
          `Cannot create the output folder "${outDir}": ${describeWriteError(e)}`,
          { cause: e },
        );
      }
    }
  }

  /** Creates `dir` and its missing parents, remembering which were new. */
  #mkdirs(dir: string): void {
    const missing: string[] = [];
    for (let d = dir; kindAt(d) === "none"; d = dirname(d)) {
      missing.push(d);
      if (dirname(d) === d) break;
    }
    for (const d of missing.reverse()) {
      mkdirSync(d);
      this.#createdFolders.push(d);
    }
  }

  #fail(path: string, e: unknown): never {
    this.abort();
    throw new OutputWriteError(
      `Cannot write ${this.#what}: ${describeWriteError(e)} while writing "${path}"; ` +
        "the folder was left as it was",
      { cause: e },
    );
  }

  /**
   * Stages one file at `relPath` under the output folder (parent folders are
   * created as needed).
   *
   * @param relPath The file's path relative to the output folder, e.g. `assets/plotly.min.js`.
   * @param data Text (UTF-8) or bytes.
   * @throws {OutputWriteError} Naming the folder; the transaction is then aborted.
   */
  file(relPath: string, data: Data): void {
    const target = join(this.outDir, relPath);
    if (kindAt(target) === "folder") {
      this.#fail(target, Object.assign(new Error("a folder is in the way"), { code: "EISDIR" }));
    }
    const temp = `${target}.tmp-${Deno.pid}-${counter++}`;
    try {
      this.#mkdirs(dirname(target));
      this.#staged.push({ folder: false, target, temp });
      writeFileSync(temp, data);
    } catch (e) {
      this.#fail(target, e);
    }
  }

  /**
   * Stages a folder `name` directly under the output folder holding exactly
   * `files` (it replaces an existing folder of that name as a whole).
   *
   * @param name The folder's name.
   * @param files `[file name, text or bytes]` pairs.
   * @throws {OutputWriteError} Naming the folder; the transaction is then aborted.
   */
  folder(name: string, files: readonly [string, Data][]): void {
    const target = join(this.outDir, name);
    const kind = kindAt(target);
    if (kind === "other") {
      this.#fail(target, Object.assign(new Error("a file is in the way"), { code: "ENOTDIR" }));
    }
    const temp = join(this.outDir, `.tmp-${name}-${Deno.pid}`);
    try {
      rmSync(temp, { recursive: true, force: true });
      mkdirSync(temp);
      this.#staged.push({ folder: true, target, temp });
      for (const [file, data] of files) writeFileSync(join(temp, file), data);
    } catch (e) {
      this.#fail(target, e);
    }
  }

  /**
   * Renames everything staged into place, in staging order.
   *
   * @returns The targets, in staging order.
   * @throws {OutputWriteError} Naming the folder, when a rename fails; every
   *   target is then as before.
   */
  commit(): string[] {
    if (this.#done) throw new Error("OutputTransaction: already finished");
    const done: Staged[] = [];
    let current: Staged | undefined;
    try {
      for (const s of this.#staged) {
        current = s;
        if (kindAt(s.target) !== "none") {
          // temporary names as staged ones, so a clean-up after a crash knows them
          s.old = s.folder ? `${s.temp}.old` : `${s.target}.tmp-${Deno.pid}-${counter++}`;
          rmSync(s.old, { recursive: true, force: true });
          renameSync(s.target, s.old);
        }
        done.push(s);
        renameSync(s.temp, s.target);
        s.placed = true;
      }
    } catch (e) {
      // put back every target moved so far, newest first
      for (const s of done.reverse()) {
        try {
          if (s.placed) rmSync(s.target, { recursive: true, force: true });
          if (s.old !== undefined) renameSync(s.old, s.target);
        } catch {
          // keep undoing the others
        }
      }
      const at = current?.target ?? this.outDir;
      this.#fail(at, e);
    }
    this.#done = true;
    for (const s of this.#staged) {
      if (s.old !== undefined) rmSync(s.old, { recursive: true, force: true });
    }
    return this.#staged.map((s) => s.target);
  }

  /** Removes everything staged and the folders this transaction created. */
  abort(): void {
    if (this.#done) return;
    this.#done = true;
    for (const s of this.#staged) {
      try {
        if (!s.placed) rmSync(s.temp, { recursive: true, force: true });
      } catch {
        // best effort: leave the rest clean
      }
    }
    for (const d of this.#createdFolders.reverse()) {
      try {
        if (existsSync(d)) rmdirSync(d);
      } catch {
        // not empty: something else is in it
      }
    }
  }
}
