/**
 * Nottingham mitotic score cut-offs for any field diameter, by the rule that
 * generates the published table: the reference-field cut-offs (10 and 20 per
 * 10 fields of 0.274 mm²) scaled by field area and rounded up.
 *
 * @module
 */

/** Area of the Nottingham reference field, mm² (Elston & Ellis 1991). */
export const NOTTINGHAM_REFERENCE_FIELD_MM2 = 0.274;

/** Score cut-offs per 10 fields of one field diameter. */
export interface NottinghamCutoffs {
  /** Field diameter, mm. */
  fieldDiameterMm: number;
  /** π(d/2)², mm². */
  fieldAreaMm2: number;
  /** Score 1: 0 to `score1Max` figures per 10 fields. */
  score1Max: number;
  /** Score 2 from this count: ⌈10·A/0.274⌉. */
  score2From: number;
  /** Score 2 up to this count. */
  score2Max: number;
  /** Score 3 from this count: ⌈20·A/0.274⌉. */
  score3From: number;
}

/**
 * Cut-offs of the Nottingham mitotic score per 10 fields of diameter d:
 * score 2 from ⌈10·A/0.274⌉ and score 3 from ⌈20·A/0.274⌉, A = π(d/2)².
 *
 * This rule reproduces every row of the field-diameter table (0.40–0.69 mm)
 * of the CAP breast protocol (Feb 2019, Table 1) and, at the reference field,
 * follows Elston & Ellis in putting 20 in score 3.
 *
 * @param fieldDiameterMm Field diameter, mm (> 0, ≤ 2).
 * @returns The cut-offs.
 * @throws {RangeError} When the diameter is not a number in (0, 2] mm.
 * @see Elston CW, Ellis IO. Histopathology 1991;19(5):403-410.
 *
 * @example A 0.55 mm field (FN 22, 40×)
 * ```ts
 * import { nottinghamCutoffs } from "./nottingham.ts";
 * const c = nottinghamCutoffs(0.55);
 * if (c.score1Max !== 8 || c.score2From !== 9 || c.score2Max !== 17 || c.score3From !== 18) {
 *   throw new Error(`cut-offs for 0.55 mm: ${JSON.stringify(c)}`);
 * }
 * ```
 */
export function nottinghamCutoffs(fieldDiameterMm: number): NottinghamCutoffs {
  if (!(fieldDiameterMm > 0 && fieldDiameterMm <= 2)) {
    throw new RangeError(`Field diameter must be a number in (0, 2] mm: got ${fieldDiameterMm}`);
  }
  const fieldAreaMm2 = Math.PI * (fieldDiameterMm / 2) ** 2;
  const up = (x: number) => Math.ceil(x - 1e-9 * Math.max(1, x));
  const score2From = up((10 * fieldAreaMm2) / NOTTINGHAM_REFERENCE_FIELD_MM2);
  const score3From = up((20 * fieldAreaMm2) / NOTTINGHAM_REFERENCE_FIELD_MM2);
  return {
    fieldDiameterMm,
    fieldAreaMm2,
    score1Max: score2From - 1,
    score2From,
    score2Max: score3From - 1,
    score3From,
  };
}

/**
 * Nottingham mitotic score (1, 2 or 3) of a count over 10 fields of diameter d.
 *
 * @example 20 in 10 reference fields (0.59 mm) is score 3 (Elston & Ellis)
 * ```ts
 * import { nottinghamScore } from "hotfield";
 * const at20 = nottinghamScore(20, 0.59), at19 = nottinghamScore(19, 0.59);
 * if (at20 !== 3 || at19 !== 2) throw new Error(`20 and 19 per 10 fields of 0.59 mm scored ${at20} and ${at19}`);
 * ```
 */
export function nottinghamScore(countPer10Fields: number, fieldDiameterMm: number): 1 | 2 | 3 {
  const c = nottinghamCutoffs(fieldDiameterMm);
  return countPer10Fields >= c.score3From ? 3 : countPer10Fields >= c.score2From ? 2 : 1;
}

/**
 * The table of cut-offs for diameters from `fromMm` to `toMm` in steps of
 * `stepMm` (as the published table: 0.40 to 0.69 by 0.01).
 *
 * @example 30 rows
 * ```ts
 * import { nottinghamTable } from "./nottingham.ts";
 * const rows = nottinghamTable().length;
 * if (rows !== 30) throw new Error(`${rows} rows for 0.40 to 0.69 mm, expected 30`);
 * ```
 */
export function nottinghamTable(fromMm = 0.4, toMm = 0.69, stepMm = 0.01): NottinghamCutoffs[] {
  const rows: NottinghamCutoffs[] = [];
  const n = Math.round((toMm - fromMm) / stepMm);
  // Diameters as from + i·step, rounded to the step's decimals.
  const digits = Math.max(0, Math.ceil(-Math.log10(stepMm)) + 2);
  for (let i = 0; i <= n; i++) {
    rows.push(nottinghamCutoffs(Number((fromMm + i * stepMm).toFixed(digits))));
  }
  return rows;
}
