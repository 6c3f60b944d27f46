/**
 * Types of grading schemes held as data (one file per scheme under
 * `lib/standards/schemes/`).
 *
 * A scheme states its cut-offs exactly as its source does: a lower bound is
 * either `{ atLeast: x }` (≥ x) or `{ above: x }` (> x), and every number is
 * a count per the scheme's area basis (for example per 10 high-power fields,
 * or per 2 mm²).
 *
 * @module
 */

/** Confidence mark of a value, as in the project's reference list. */
export type ConfidenceMark = "V" | "V2" | "C" | "M" | "CP";

/**
 * The area a scheme's counts refer to.
 *
 * - `mm2`: a count per `areaMm2` square millimetres.
 * - `fields`: a count per `n` high-power fields; `fieldAreaMm2` is the area
 *   of one field when the source (or a stated standard) fixes it.
 * - `undefined-by-source`: the source gives no area at all.
 */
export type AreaBasis =
  | { kind: "mm2"; areaMm2: number; note?: string }
  | { kind: "fields"; n: number; fieldAreaMm2?: number; note: string }
  | { kind: "undefined-by-source"; note: string };

/** A lower bound, copied as the source states it: ≥ (`atLeast`) or > (`above`). */
export type LowerBound = { atLeast: number } | { above: number };

/** One tier (grade, score or category) of a scheme. */
export interface SchemeTier {
  /** Label, e.g. `"G2"`, `"score 3"`, `"high"`. */
  label: string;
  /** The tier starts here (count per the area basis); the first tier starts at `{ atLeast: 0 }`. */
  from: LowerBound;
  /** The range exactly as the source writes it, e.g. `"2–20 per 2 mm²"`. */
  sourceText: string;
  /** What the tier means for the case, briefly. */
  meaning?: string;
}

/** A published source of a scheme. */
export interface SchemeSource {
  /** Short key, e.g. `kiupel2011`. */
  key: string;
  /** Full citation (authors, year, title or venue, volume, pages, DOI when known). */
  citation: string;
  /** Confidence mark of what was taken from it. */
  mark: ConfidenceMark;
  /** What was taken from it. */
  usedFor: string;
}

/** How the source says to count. */
export interface CountingInstruction {
  /** Total area to count over, mm² (e.g. 10 for neuroendocrine neoplasms). */
  areaMm2?: number;
  /** Number of fields to count, when the source speaks in fields. */
  fields?: number;
  /** Where and how, in words. */
  text: string;
}

/** A grading scheme held as data. */
export interface GradingScheme {
  /** Short id used on the command line, e.g. `canine-mct-2tier`. */
  id: string;
  /** Full title: tumour, scheme and what is counted. */
  title: string;
  /** A short name for a sentence, e.g. `"two-tier canine mast cell scheme"`. */
  shortName: string;
  /** Tumour type, e.g. `"cutaneous mast cell tumour"`. */
  tumour: string;
  /** The species the scheme was published for. */
  species: "dog" | "cat" | "human";
  /** The area the scheme's counts refer to. */
  basis: AreaBasis;
  /** How the source says to count. */
  counting: CountingInstruction;
  /** Tiers in increasing order of their lower bounds. */
  tiers: SchemeTier[];
  /**
   * Index into `tiers` of the tier whose lower bound is the scheme's primary
   * decision cut-off (used for the report's `class`).
   */
  primaryTier: number;
  /** Why that cut-off was chosen as primary. */
  primaryReason: string;
  /** The publications the cut-offs come from. */
  sources: SchemeSource[];
  /** Overall confidence mark of the cut-offs and area basis (the weakest that matters). */
  mark: ConfidenceMark;
  /** Notes: unconfirmed values, discrepancies between sources, what is not assessed. */
  notes: string[];
}
