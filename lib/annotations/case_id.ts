/**
 * Case ids that are safe as a folder name on any common file system.
 *
 * @module
 */

import { createHash } from "node:crypto";

/** Longest id {@linkcode safeCaseId} returns. */
export const MAX_CASE_ID_LENGTH = 100;

/**
 * Names of the files and folders hotfield writes beside the case folders of
 * an output folder (the cohort's own), which no case folder may take. Compared
 * without regard to case, as on case-insensitive file systems.
 */
export const RESERVED_CASE_IDS: readonly string[] = [
  "assets",
  "index.html",
  "readers.html",
  "cases.csv",
  "fields.csv",
  "readers.csv",
  "runs.sqlite",
  "runs.sqlite-journal",
  "runs.sqlite-wal",
  "runs.sqlite-shm",
];

/**
 * Whether `id` is the name of one of the cohort's own files or folders
 * ({@linkcode RESERVED_CASE_IDS}), compared without regard to case.
 *
 * @param id A case id.
 * @returns True when a case folder of that name would collide.
 *
 * @example
 * ```ts
 * import { isReservedCaseId } from "hotfield";
 * if (!isReservedCaseId("Index.HTML")) throw new Error("the cohort page's name is reserved in any case");
 * if (isReservedCaseId("QVT-24-001")) throw new Error("an ordinary id is free");
 * ```
 */
export function isReservedCaseId(id: string): boolean {
  return RESERVED_CASE_IDS.includes(id.toLowerCase());
}

/**
 * The first two ids that differ only by case (ASCII letters), which one
 * folder would hold on a case-insensitive file system; `undefined` when there
 * are none. Equal ids are not a clash here.
 *
 * @param ids Case ids, e.g. those of a run followed by the folders already there.
 * @returns The two ids, in the order given, or `undefined`.
 *
 * @example
 * ```ts
 * import { caseIdClash } from "./case_id.ts";
 * const clash = caseIdClash(["QVT-24-001", "QVT-24-002", "qvt-24-001"]);
 * if (clash?.join() !== "QVT-24-001,qvt-24-001") throw new Error(`found ${clash}`);
 * if (caseIdClash(["QVT-24-001", "QVT-24-001"]) !== undefined) throw new Error("equal ids are no clash");
 * ```
 */
export function caseIdClash(ids: readonly string[]): [string, string] | undefined {
  const byFolded = new Map<string, string>();
  for (const id of ids) {
    const folded = id.toLowerCase();
    const earlier = byFolded.get(folded);
    if (earlier === undefined) byFolded.set(folded, id);
    else if (earlier !== id) return [earlier, id];
  }
  return undefined;
}

/**
 * Makes a raw case id (a slide id, a case-file id or a file stem) safe to use
 * as a folder name.
 *
 * Rules, applied in order:
 * 1. Surrounding white space is trimmed.
 * 2. Every character other than `A–Z a–z 0–9 . _ -` becomes `_` (one `_` per
 *    Unicode code point, so `"QVT 24/003"` becomes `"QVT_24_003"`).
 * 3. Leading dots become `_` (no hidden folders, no `.` or `..`), and so do
 *    trailing dots (some file systems drop them).
 * 4. Names reserved on some systems (`CON`, `PRN`, `AUX`, `NUL`, `COM1`–`COM9`,
 *    `LPT1`–`LPT9`, with or without an extension) get a leading `_`, and so
 *    do the names of the cohort's own files and folders
 *    ({@linkcode RESERVED_CASE_IDS}: `assets`, `index.html`, `cases.csv`, …),
 *    in any mix of case.
 * 5. An empty result becomes `"case"`.
 * 6. Ids longer than {@linkcode MAX_CASE_ID_LENGTH} characters are cut and end
 *    in `-` plus the first 8 hex digits of the sha256 of the raw id, so two
 *    long ids that differ only at the end stay distinct.
 *
 * The function is idempotent: a safe id is returned unchanged.
 *
 * @param raw The id as found.
 * @returns A non-empty id of at most 100 characters from `[A-Za-z0-9._-]`.
 *
 * @example Cleaning ids
 * ```ts
 * import { safeCaseId } from "./case_id.ts";
 * if (safeCaseId("QVT-24-003") !== "QVT-24-003") throw new Error("kept");
 * if (safeCaseId(" QVT 24/003 ") !== "QVT_24_003") throw new Error("replaced");
 * if (safeCaseId("../x") !== "___x") throw new Error("no leading dot");
 * if (safeCaseId("") !== "case") throw new Error("not empty");
 * if (safeCaseId("assets") !== "_assets") throw new Error("the cohort's own names are not taken");
 * ```
 */
export function safeCaseId(raw: string): string {
  let id = "";
  for (const ch of raw.trim()) id += /^[A-Za-z0-9._-]$/.test(ch) ? ch : "_";
  id = id.replace(/^\.+/, (m) => "_".repeat(m.length));
  id = id.replace(/\.+$/, (m) => "_".repeat(m.length));
  if (/^(con|prn|aux|nul|com[1-9]|lpt[1-9])(\..*)?$/i.test(id) || isReservedCaseId(id)) {
    id = "_" + id;
  }
  if (id === "") id = "case";
  if (id.length > MAX_CASE_ID_LENGTH) {
    const hash = createHash("sha256").update(raw).digest("hex").slice(0, 8);
    id = id.slice(0, MAX_CASE_ID_LENGTH - 9) + "-" + hash;
  }
  return id;
}
