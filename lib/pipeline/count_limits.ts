/**
 * The limit on the number of figures one report counts, checked before any
 * count grid is sized (README, "Input limits").
 *
 * @module
 */

import type { PreparedCase } from "../count/engine_types.ts";
import { MAX_COUNTED_FIGURES } from "../defaults.ts";
import { SearchWorkError } from "../errors.ts";
import type { CaseData } from "../types.ts";

/**
 * Refuses a case that counts more figures than `MAX_COUNTED_FIGURES`: the
 * placement search slows down sharply with millions of figures spread evenly,
 * so such a run would go on for minutes without a word.
 *
 * @param prepared The prepared case (its counted figures).
 * @param caseData The case (its files, for the message).
 * @param limit The limit. @default MAX_COUNTED_FIGURES
 * @throws {RangeError} Naming the case, the file the figures came from, the
 *   count and the limit.
 *
 * @example A case with three counted figures passes a limit of three
 * ```ts
 * import { checkCountedFigures } from "./count_limits.ts";
 * const prepared = { xUm: new Float64Array(3) } as Parameters<typeof checkCountedFigures>[0];
 * const caseData = { caseId: "QVT-24-001", sources: [] } as unknown as Parameters<typeof checkCountedFigures>[1];
 * checkCountedFigures(prepared, caseData, 3);
 * let refused = false;
 * try { checkCountedFigures(prepared, caseData, 2); } catch { refused = true; }
 * if (!refused) throw new Error("three figures over a limit of two must be refused");
 * ```
 */
export function checkCountedFigures(
  prepared: Pick<PreparedCase, "xUm">,
  caseData: Pick<CaseData, "caseId" | "sources">,
  limit: number = MAX_COUNTED_FIGURES,
): void {
  const n = prepared.xUm.length;
  if (n <= limit) return;
  throw new RangeError(
    `${cannotCount(caseData)}: ${
      n.toLocaleString("en-US")
    } figures are counted, more than the limit of ${
      limit.toLocaleString("en-US")
    } (see "Input limits" in the README); count fewer, e.g. with a higher minimum score or fewer labels`,
  );
}

/** "Cannot count case "ID" (figures from "FILE")": the start of a refusal. */
function cannotCount(caseData: Pick<CaseData, "caseId" | "sources">): string {
  const from = caseData.sources.find((s) => s.kind === "figures") ??
    caseData.sources.find((s) => s.kind === "annotations");
  return `Cannot count case "${caseData.caseId}"${from ? ` (figures from "${from.path}")` : ""}`;
}

/**
 * Runs a placement search of a case; a {@linkcode SearchWorkError} comes out
 * naming the case, its figures file and the step (`what`).
 *
 * @param caseData The case.
 * @param what The step, e.g. "the hotspot".
 * @param search The search.
 * @returns What the search returns.
 *
 * @example
 * ```ts
 * import { SearchWorkError } from "../errors.ts";
 * import { explainSearchStop } from "./count_limits.ts";
 * const caseData = { caseId: "QVT-24-001", sources: [] };
 * let message = "";
 * try {
 *   explainSearchStop(caseData, "the hotspot", () => {
 *     throw new SearchWorkError("The exact search stopped at its work limit");
 *   });
 * } catch (e) {
 *   message = (e as Error).message;
 * }
 * if (!message.startsWith('Cannot count case "QVT-24-001": the hotspot: the exact search')) {
 *   throw new Error(message);
 * }
 * ```
 */
export function explainSearchStop<T>(
  caseData: Pick<CaseData, "caseId" | "sources">,
  what: string,
  search: () => T,
): T {
  try {
    return search();
  } catch (e) {
    if (!(e instanceof SearchWorkError)) throw e;
    const m = e.message;
    throw new SearchWorkError(
      `${cannotCount(caseData)}: ${what}: ${m.charAt(0).toLowerCase()}${m.slice(1)}`,
      { cause: e },
    );
  }
}
