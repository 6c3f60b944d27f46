/**
 * Case ids that are safe as a folder name on any common file system.
 *
 * @module
 */

import { createHash } from "node:crypto";

/** Longest id {@linkcode safeCaseId} returns. */
export const MAX_CASE_ID_LENGTH = 100;

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
 *    `LPT1`–`LPT9`, with or without an extension) get a leading `_`.
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
 * ```
 */
export function safeCaseId(raw: string): string {
  let id = "";
  for (const ch of raw.trim()) id += /^[A-Za-z0-9._-]$/.test(ch) ? ch : "_";
  id = id.replace(/^\.+/, (m) => "_".repeat(m.length));
  id = id.replace(/\.+$/, (m) => "_".repeat(m.length));
  if (/^(con|prn|aux|nul|com[1-9]|lpt[1-9])(\..*)?$/i.test(id)) id = "_" + id;
  if (id === "") id = "case";
  if (id.length > MAX_CASE_ID_LENGTH) {
    const hash = createHash("sha256").update(raw).digest("hex").slice(0, 8);
    id = id.slice(0, MAX_CASE_ID_LENGTH - 9) + "-" + hash;
  }
  return id;
}
