/**
 * The grading schemes hotfield knows, looked up by id.
 *
 * @module
 */

import type { GradingScheme } from "./scheme_types.ts";
import { CANINE_MCT_2TIER } from "./schemes/canine_mct_2tier.ts";
import { BREAST_NOTTINGHAM } from "./schemes/breast_nottingham.ts";
import { NEN_WHO } from "./schemes/nen_who.ts";
import { GIST } from "./schemes/gist.ts";
import { MENINGIOMA_WHO } from "./schemes/meningioma_who.ts";
import { MELANOMA } from "./schemes/melanoma.ts";
import { CANINE_STS } from "./schemes/canine_sts.ts";
import { CANINE_MAMMARY } from "./schemes/canine_mammary.ts";
import { STS_FNCLCC } from "./schemes/sts_fnclcc.ts";

const SCHEMES: readonly GradingScheme[] = [
  CANINE_MCT_2TIER,
  CANINE_MAMMARY,
  CANINE_STS,
  BREAST_NOTTINGHAM,
  NEN_WHO,
  GIST,
  MENINGIOMA_WHO,
  MELANOMA,
  STS_FNCLCC,
];

/**
 * Lists every known grading scheme (copies; changing them changes nothing here).
 *
 * @returns The schemes, veterinary first.
 *
 * @example Every scheme has a distinct id
 * ```ts
 * import { listSchemes } from "hotfield";
 * const ids = listSchemes().map((s) => s.id);
 * if (new Set(ids).size !== ids.length) throw new Error(`scheme ids repeat: ${ids}`);
 * if (!ids.includes("canine-mct-2tier")) throw new Error(`canine-mct-2tier missing from ${ids}`);
 * ```
 */
export function listSchemes(): GradingScheme[] {
  return SCHEMES.map((s) => structuredClone(s));
}

/**
 * Looks up a grading scheme by id.
 *
 * @param id Scheme id, e.g. `"nen-who"`.
 * @returns A copy of the scheme.
 * @throws {RangeError} `Unknown scheme "x"; known: a, b, c` for an unknown id.
 *
 * @example
 * ```ts
 * import { getScheme } from "hotfield";
 * const basis = getScheme("gist").basis;
 * if (basis.kind !== "mm2") throw new Error(`the GIST scheme counts per mm², not per ${basis.kind}`);
 * ```
 */
export function getScheme(id: string): GradingScheme {
  const found = SCHEMES.find((s) => s.id === id);
  if (!found) {
    throw new RangeError(`Unknown scheme "${id}"; known: ${SCHEMES.map((s) => s.id).join(", ")}`);
  }
  return structuredClone(found);
}
