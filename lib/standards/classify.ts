/**
 * Case classes against a grading scheme's cut-off, for the report's window.
 *
 * A scheme's numbers are counts per its area basis (n fields, or an area in
 * mm²). For a counting window of another area the cut-off is converted by
 * area: cut-off × window area / basis area, and the least whole window count
 * that meets it is used (⌈x⌉ for "≥ x", ⌊x⌋ + 1 for "> x"). Window areas within
 * 0.5% of the basis area count as equal, so a 2.37 mm² basis and the exact
 * 2.3758 mm² of 10 fields at FN 22 give the same cut-off.
 *
 * Classes: `below` when the hotspot count does not meet the cut-off (no
 * window anywhere would); `above` when the lower quartile of all admissible
 * window counts meets it (most placements would); otherwise `field-dependent`.
 *
 * @module
 */

import type { ConfidenceMark, GradingScheme, LowerBound } from "./scheme_types.ts";
import { roundTo } from "../numbers.ts";

/** Relative tolerance when comparing rates with cut-offs (rounding of area products). */
const REL_TOL = 1e-9;
/** One tier boundary of a scheme, classified like the deciding one (`CaseClassification.tiers`). */
export interface TierClassification {
  /** Label of the tier this bound opens, e.g. "high" or "G2". */
  label: string;
  /** Index of the tier in the scheme, from 1 (tier 0 has no lower bound). */
  index: number;
  /** The bound as the source states it, a count per the scheme's basis. */
  cutoff: number;
  /** "≥" or ">", as the source states it. */
  cutoff_rule: "≥" | ">";
  /** The source's own words for the bound. */
  source_text: string;
  /** `cutoff` converted to the window by area, rounded to 6 decimals. */
  cutoff_for_window: number;
  /** Least whole window count that meets the bound (⌈x⌉ for "≥ x", ⌊x⌋ + 1 for "> x"). */
  min_count_for_window: number;
  /** `below`, `above` or `field-dependent` against this bound (see {@linkcode CaseClassification}). */
  class: "below" | "above" | "field-dependent";
  /** Share of admissible positions whose count meets this bound, 0–1; null without positions. */
  fraction_at_or_above: number | null;
}

/**
 * Classification against a scheme's cut-off (the `classification` block of
 * report.json). `below`: the hotspot count does not meet the cut-off, so no
 * window anywhere would; `above`: the lower quartile of admissible window
 * counts meets it, so most placements would; otherwise `field-dependent`.
 */
export interface CaseClassification {
  /** Scheme id. */
  scheme: string;
  /** The deciding bound as the source states it, a count per the scheme's basis. */
  cutoff: number;
  /** The class against the deciding bound. */
  class: "below" | "above" | "field-dependent";
  /** Share of admissible positions whose count meets the deciding bound, 0–1; null without positions. */
  fraction_at_or_above: number | null;
  /** Tier the hotspot's rate falls in (last tier whose bound it meets); null without a hotspot. */
  tier: string | null;
  /** "≥" or ">" of the deciding bound. */
  cutoff_rule?: "≥" | ">";
  /** Label of the tier the deciding bound opens. */
  cutoff_tier?: string;
  /** The scheme's basis in words, e.g. "per 10 HPF (2.37 mm²)". */
  cutoff_basis?: string;
  /** Area the scheme's counts refer to, mm²; null when the source fixes none. */
  basis_area_mm2?: number | null;
  /** Counting window area, mm². */
  window_area_mm2?: number;
  /** `cutoff` converted to the window by area, rounded to 6 decimals. */
  cutoff_for_window?: number;
  /** Least whole window count that meets the deciding bound. */
  min_count_for_window?: number;
  /** The hotspot count classified; null without a hotspot. */
  hotspot_count?: number | null;
  /** Hotspot count converted to the scheme's basis, rounded to 6 decimals; null without a hotspot. */
  hotspot_rate_per_basis?: number | null;
  /** Every tier boundary of the scheme, classified. */
  tiers?: TierClassification[];
  /** The class definitions in words. */
  definition?: string;
  /** How the cut-off was converted to the window's area, in words. */
  note?: string;
  /** Confidence mark of the scheme's values (see `GradingScheme.mark`). */
  mark?: ConfidenceMark;
  /** Room for keys added later. */
  [extra: string]: unknown;
}

/** Window and basis areas closer than this (relative) are treated as equal. */
export const SAME_AREA_TOLERANCE = 0.005;

/**
 * The area a scheme's counts refer to, in mm², or null when the source fixes none.
 *
 * @example 10 HPF of 0.237 mm²
 * ```ts
 * import { basisAreaMm2 } from "./classify.ts";
 * import { getScheme } from "hotfield";
 * const area = basisAreaMm2(getScheme("canine-mct-2tier"));
 * if (area === null || Math.abs(area - 2.37) > 1e-12) throw new Error(`basis area ${area} mm², expected 2.37`);
 * ```
 */
export function basisAreaMm2(scheme: GradingScheme): number | null {
  const b = scheme.basis;
  if (b.kind === "mm2") return b.areaMm2;
  if (b.kind === "fields" && b.fieldAreaMm2 !== undefined) return b.n * b.fieldAreaMm2;
  return null;
}

/** Plain-words name of a scheme's basis, e.g. `per 10 HPF (2.37 mm²)` or `per 2 mm²`. */
export function describeBasis(scheme: GradingScheme): string {
  const b = scheme.basis;
  if (b.kind === "mm2") return `per ${b.areaMm2} mm²`;
  if (b.kind === "fields") {
    return b.fieldAreaMm2 === undefined
      ? `per ${b.n} HPF (field area not fixed)`
      : `per ${b.n} HPF (${roundTo(b.n * b.fieldAreaMm2, 4)} mm²)`;
  }
  return "area undefined by the source";
}

/**
 * The factor from a scheme's basis area to a window area (window / basis),
 * 1 when they agree within 0.5% or the source fixes no area.
 *
 * @example A 2 mm² basis and a 10 mm² count
 * ```ts
 * import { areaFactor } from "./classify.ts";
 * import { getScheme } from "hotfield";
 * const { factor } = areaFactor(getScheme("nen-who"), 10);
 * if (factor !== 5) throw new Error(`10 mm² over a 2 mm² basis gave ${factor}, expected 5`);
 * ```
 */
export function areaFactor(
  scheme: GradingScheme,
  windowAreaMm2: number,
): { factor: number; note: string | null } {
  if (!(windowAreaMm2 > 0) || !Number.isFinite(windowAreaMm2)) {
    throw new RangeError(`Window area must be a number > 0 mm²: got ${windowAreaMm2}`);
  }
  const basis = basisAreaMm2(scheme);
  if (basis === null) {
    return {
      factor: 1,
      note: `Scheme "${scheme.id}" fixes no counting area (${describeBasis(scheme)}); its ` +
        `cut-offs are applied to the ${roundTo(windowAreaMm2, 4)} mm² window count unchanged`,
    };
  }
  const ratio = windowAreaMm2 / basis;
  if (Math.abs(ratio - 1) <= SAME_AREA_TOLERANCE) return { factor: 1, note: null };
  return {
    factor: ratio,
    note: `Scheme "${scheme.id}" counts ${describeBasis(scheme)}; its cut-offs were converted ` +
      `by area to the ${roundTo(windowAreaMm2, 4)} mm² window (× ${roundTo(ratio, 4)})`,
  };
}

/**
 * The least whole count meeting a lower bound scaled by `factor`:
 * ⌈v·f⌉ for `atLeast`, ⌊v·f⌋ + 1 for `above`.
 *
 * @example "> 5 per 5 mm²" in a 5 mm² window needs 6
 * ```ts
 * import { minCountFor } from "./classify.ts";
 * const above5 = minCountFor({ above: 5 }, 1), atLeast7 = minCountFor({ atLeast: 7 }, 1);
 * if (above5 !== 6 || atLeast7 !== 7) throw new Error(`"> 5" needs ${above5}, "≥ 7" needs ${atLeast7}`);
 * ```
 */
export function minCountFor(bound: LowerBound, factor: number): number {
  const { value, strict } = boundParts(bound);
  const x = value * factor;
  const tol = REL_TOL * Math.max(1, Math.abs(x));
  return strict ? Math.floor(x + tol) + 1 : Math.max(0, Math.ceil(x - tol));
}

/** Whether a rate (count per the basis area) meets a lower bound. */
export function meetsBound(rate: number, bound: LowerBound): boolean {
  const { value, strict } = boundParts(bound);
  const tol = REL_TOL * Math.max(1, Math.abs(value));
  return strict ? rate > value + tol : rate >= value - tol;
}

/**
 * The tier label a rate (count per the scheme's basis) falls in: the last
 * tier whose lower bound the rate meets.
 *
 * @example WHO neuroendocrine grade per 2 mm²
 * ```ts
 * import { getScheme, tierForRate } from "hotfield";
 * const nen = getScheme("nen-who");
 * const at20 = tierForRate(nen, 20), above20 = tierForRate(nen, 20.2);
 * if (at20 !== "G2" || above20 !== "G3") throw new Error(`20 per 2 mm² is ${at20}, 20.2 is ${above20}`);
 * ```
 */
export function tierForRate(scheme: GradingScheme, rate: number): string {
  let label = scheme.tiers[0].label;
  for (const t of scheme.tiers) if (meetsBound(rate, t.from)) label = t.label;
  return label;
}

/**
 * Converts a count over an area to the scheme's basis (count × basis area / area).
 * Areas within 0.5% of the basis count as equal.
 *
 * @example 11 mitoses in 10 mm² are 2.2 per 2 mm²
 * ```ts
 * import { getScheme, rateForBasis } from "hotfield";
 * const rate = rateForBasis(getScheme("nen-who"), 11, 10);
 * if (Math.abs(rate - 2.2) > 1e-12) throw new Error(`11 in 10 mm² is ${rate} per 2 mm², expected 2.2`);
 * ```
 */
export function rateForBasis(scheme: GradingScheme, count: number, areaMm2: number): number {
  return count / areaFactor(scheme, areaMm2).factor;
}

/** What {@linkcode classifyCounts} needs: plain numbers and the map arrays. */
export interface ClassifyCountsInput {
  /** Hotspot (maximum admissible) window count, null when no position is admissible. */
  hotspotCount: number | null;
  /** Lower quartile of admissible window counts, null when none. */
  q1: number | null;
  /** Counting window area, mm². */
  windowAreaMm2: number;
  /** Window counts at grid positions (CountMap.counts). */
  counts: ArrayLike<number>;
  /** 1 where a position is admissible (CountMap.admissible). */
  admissible: ArrayLike<number>;
}

/** Options of {@linkcode classifyCounts}. */
export interface ClassifyOptions {
  /**
   * Index of the tier whose lower bound decides `class`.
   * @default scheme.primaryTier
   */
  tier?: number;
}

/**
 * Classifies a case against a scheme: `below`, `above` or `field-dependent`,
 * with the fraction of admissible window positions meeting the cut-off and
 * the tier the hotspot falls in. Every tier boundary is classified too
 * (`tiers`).
 *
 * @param input Hotspot count, lower quartile, window area and the map arrays.
 * @param scheme The grading scheme.
 * @param options Which tier's lower bound decides `class`.
 * @returns The report's `classification` block and warnings.
 *
 * @example Kiupel: 7 in the hotspot meets "≥ 7 in 10 HPF"
 * ```ts
 * import { classifyCounts, getScheme } from "hotfield";
 * const { classification } = classifyCounts({
 *   hotspotCount: 7, q1: 1, windowAreaMm2: 2.37,
 *   counts: [1, 2, 7, 0], admissible: [1, 1, 1, 1],
 * }, getScheme("canine-mct-2tier"));
 * if (classification.class !== "field-dependent" || classification.tier !== "high") {
 *   throw new Error(`class ${classification.class}, tier ${classification.tier}`);
 * }
 * // One of the four positions holds 7 or more.
 * const share = classification.fraction_at_or_above;
 * if (share !== 0.25) throw new Error(`share at or above the cut-off ${share}, expected 0.25`);
 * ```
 */
export function classifyCounts(
  input: ClassifyCountsInput,
  scheme: GradingScheme,
  options: ClassifyOptions = {},
): { classification: CaseClassification; warnings: string[] } {
  const tierIndex = options.tier ?? scheme.primaryTier;
  if (!Number.isInteger(tierIndex) || tierIndex < 1 || tierIndex >= scheme.tiers.length) {
    throw new RangeError(
      `Tier must be a whole number from 1 to ${scheme.tiers.length - 1}: got ${tierIndex}`,
    );
  }
  if (input.counts.length !== input.admissible.length) {
    throw new RangeError(
      `Counts and admissible flags must have equal lengths: got ${input.counts.length} and ` +
        `${input.admissible.length}`,
    );
  }
  const warnings: string[] = [];
  const { factor, note } = areaFactor(scheme, input.windowAreaMm2);
  if (note) warnings.push(note);
  if (scheme.mark === "M") {
    warnings.push(
      `Scheme "${scheme.id}" rests on values unconfirmed against the primary publication: check them against your local guideline (${
        scheme.notes[0]
      })`,
    );
  }
  let positions = 0;
  for (let i = 0; i < input.admissible.length; i++) if (input.admissible[i]) positions++;
  if (input.hotspotCount === null || positions === 0) {
    warnings.push("No admissible window position: the case could not be classified");
  }

  const tiers = scheme.tiers.slice(1).map((t, k): TierClassification => {
    const minCount = minCountFor(t.from, factor);
    const { value, strict } = boundParts(t.from);
    return {
      label: t.label,
      index: k + 1,
      cutoff: value,
      cutoff_rule: strict ? ">" : "≥",
      source_text: t.sourceText,
      cutoff_for_window: roundTo(value * factor, 6),
      min_count_for_window: minCount,
      class: decide(input.hotspotCount, input.q1, minCount),
      fraction_at_or_above: positions === 0
        ? null
        : fractionAtLeast(input.counts, input.admissible, minCount) / positions,
    };
  });
  const primary = tiers[tierIndex - 1];
  const rate = input.hotspotCount === null ? null : input.hotspotCount / factor;
  const classification: CaseClassification = {
    scheme: scheme.id,
    cutoff: primary.cutoff,
    class: primary.class,
    fraction_at_or_above: primary.fraction_at_or_above,
    tier: rate === null ? null : tierForRate(scheme, rate),
    cutoff_rule: primary.cutoff_rule,
    cutoff_tier: primary.label,
    cutoff_basis: describeBasis(scheme),
    basis_area_mm2: basisAreaMm2(scheme),
    window_area_mm2: input.windowAreaMm2,
    cutoff_for_window: primary.cutoff_for_window,
    min_count_for_window: primary.min_count_for_window,
    hotspot_count: input.hotspotCount,
    hotspot_rate_per_basis: rate === null ? null : roundTo(rate, 6),
    tiers,
    definition: "below: the hotspot count does not meet the cut-off; above: the lower " +
      "quartile of admissible window counts meets it; otherwise field-dependent. " +
      "fraction_at_or_above: share of admissible positions whose count meets the cut-off",
    note: note ??
      "The window area equals the scheme's basis area (within 0.5%); cut-offs unchanged",
    mark: scheme.mark,
  };
  return { classification, warnings };
}

function decide(
  hotspot: number | null,
  q1: number | null,
  minCount: number,
): CaseClassification["class"] {
  if (hotspot === null) return "field-dependent";
  if (hotspot < minCount) return "below";
  if (q1 !== null && q1 >= minCount) return "above";
  return "field-dependent";
}

function fractionAtLeast(
  counts: ArrayLike<number>,
  admissible: ArrayLike<number>,
  minCount: number,
): number {
  let n = 0;
  for (let i = 0; i < counts.length; i++) if (admissible[i] && counts[i] >= minCount) n++;
  return n;
}

function boundParts(bound: LowerBound): { value: number; strict: boolean } {
  return "above" in bound
    ? { value: bound.above, strict: true }
    : { value: bound.atLeast, strict: false };
}
