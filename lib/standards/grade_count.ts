/**
 * Grading one count made over a known area (at the microscope, or a
 * reader's field on a slide) against a grading scheme's cut-off.
 *
 * @module
 */

import { getScheme } from "./list_schemes.ts";
import { areaFactor, describeBasis, minCountFor, tierForRate } from "./classify.ts";
import { countUncertainty } from "./uncertainty.ts";
import type { GradingScheme } from "./scheme_types.ts";

/** The caution every grade carries. */
export const GRADE_CAUTION: string =
  "This grade supports, never replaces, a pathologist: a pathologist " +
  "reviews the slide and confirms every count and grade. Follow local grading guidelines and " +
  "licensed practice; where they differ from the scheme here, they win.";

/** Options of {@linkcode gradeCount}. */
export interface GradeCountOptions {
  /** Area the figures were counted over, mm² (> 0). */
  areaMm2: number;
  /** Grading scheme id (see `listSchemes()`), or the scheme itself. */
  scheme: string | GradingScheme;
  /**
   * Index of the tier whose lower bound is the cut-off.
   * @default the scheme's primary tier
   */
  tier?: number;
}

/** A count graded against a scheme (what `hotfield grade --json` prints). */
export interface CountGrade {
  /** Figures counted. */
  count: number;
  /** Area counted over, mm². */
  area_mm2: number;
  /** Figures per mm². */
  per_mm2: number;
  /** The count converted to the scheme's area basis (count × basis area / area). */
  count_per_scheme_basis: number;
  /** Scheme id. */
  scheme: string;
  /** The cut-off as the scheme states it, per its basis. */
  cutoff: number;
  /** `above`: the count meets the cut-off (≥ or >, as the scheme states it); else `below`. */
  class: "above" | "below";
  /** The tier the count falls in. */
  tier: string;
  /** Exact two-sided 95% Poisson interval of the count (Garwood 1936). */
  interval_95: [number, number];
  /** Beside the contract: `≥` or `>`, as the scheme states the cut-off. */
  cutoff_rule: "≥" | ">";
  /** Beside the contract: the tier the cut-off starts. */
  cutoff_tier: string;
  /** Beside the contract: the scheme's basis in words. */
  cutoff_basis: string;
  /** Beside the contract: the least whole count over this area that meets the cut-off. */
  min_count_for_area: number;
  /** Beside the contract: `interval_95` divided by the area. */
  interval_95_per_mm2: [number, number];
  /** Beside the contract: `interval_95` converted to the scheme's basis. */
  interval_95_per_scheme_basis: [number, number];
  /**
   * Beside the contract: chance that a recount lands on the other side of the
   * cut-off, Y ~ Poisson(mean = count): P(Y < k) when the count meets it, else
   * P(Y ≥ k), with k = `min_count_for_area`.
   */
  p_other_side: number;
  /** Beside the contract: how the area was converted, values from memory, and the like. */
  notes: string[];
  /** Beside the contract: the usual caution. */
  caution: string;
}

/**
 * Grades a count made over a known area against a scheme's cut-off.
 *
 * The count is converted to the scheme's area basis by area (count × basis
 * area / area; areas within 0.5% of the basis count as equal, so 10 fields of
 * FN 22 at 40×, 2.3758 mm², are the 2.37 mm² of "10 HPF"). Class and
 * tier follow from that rate and the bounds exactly as the scheme states them
 * (≥ or >). The interval is the exact Poisson 95% interval of the count
 * (Garwood 1936), and `p_other_side` the chance a recount of the same area
 * falls on the other side of the cut-off.
 *
 * @param count Figures counted: a whole number ≥ 0.
 * @param options Area counted (mm²), scheme id, optional tier.
 * @returns The grade (snake_case keys, as printed by `hotfield grade --json`).
 * @throws {RangeError} When the count is not a whole number ≥ 0, the area is
 *   not a number > 0, the scheme is unknown or the tier is out of range.
 *
 * @example 8 figures in 10 fields of FN 22 at 40×
 * ```ts
 * import { fieldOfView, gradeCount } from "hotfield";
 * const areaMm2 = 10 * fieldOfView({ fieldNumberMm: 22, objective: 40 }).areaMm2;
 * const g = gradeCount(8, { areaMm2, scheme: "canine-mct-2tier" });
 * if (g.class !== "above" || g.tier !== "high" || g.cutoff !== 7) throw new Error(JSON.stringify(g));
 * if (Math.abs(g.interval_95[0] - 3.4538) > 1e-4) throw new Error(`lower ${g.interval_95[0]}`);
 * ```
 */
export function gradeCount(count: number, options: GradeCountOptions): CountGrade {
  if (!Number.isInteger(count) || count < 0) {
    throw new RangeError(`Count must be a whole number ≥ 0: got ${count}`);
  }
  const areaMm2 = options.areaMm2;
  if (typeof areaMm2 !== "number" || !Number.isFinite(areaMm2) || areaMm2 <= 0) {
    throw new RangeError(`Area must be a number > 0 mm²: got ${areaMm2}`);
  }
  const scheme = typeof options.scheme === "string" ? getScheme(options.scheme) : options.scheme;
  const tierIndex = options.tier ?? scheme.primaryTier;
  if (!Number.isInteger(tierIndex) || tierIndex < 1 || tierIndex >= scheme.tiers.length) {
    throw new RangeError(
      `Tier must be a whole number from 1 to ${scheme.tiers.length - 1}: got ${tierIndex}`,
    );
  }
  const bound = scheme.tiers[tierIndex].from;
  const strict = "above" in bound;
  const cutoff = strict ? bound.above : bound.atLeast;
  const { factor, note } = areaFactor(scheme, areaMm2);
  const minCount = minCountFor(bound, factor);
  const rate = count / factor;
  const u = countUncertainty(count, areaMm2, { minCount });
  const notes: string[] = [];
  if (note) notes.push(note);
  if (scheme.mark === "M") {
    notes.push(
      `Scheme "${scheme.id}" rests on values from memory (unverified): ${scheme.notes[0]}`,
    );
  }
  return {
    count,
    area_mm2: areaMm2,
    per_mm2: count / areaMm2,
    count_per_scheme_basis: rate,
    scheme: scheme.id,
    cutoff,
    class: count >= minCount ? "above" : "below",
    tier: tierForRate(scheme, rate),
    interval_95: u.count_ci95,
    cutoff_rule: strict ? ">" : "≥",
    cutoff_tier: scheme.tiers[tierIndex].label,
    cutoff_basis: describeBasis(scheme),
    min_count_for_area: minCount,
    interval_95_per_mm2: u.per_mm2_ci95,
    interval_95_per_scheme_basis: [u.count_ci95[0] / factor, u.count_ci95[1] / factor],
    p_other_side: u.p_other_side as number,
    notes,
    caution: GRADE_CAUTION,
  };
}
