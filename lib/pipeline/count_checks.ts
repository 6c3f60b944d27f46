/**
 * Checks that tell a count of zero (or a count made meaningless) apart from a
 * real low count: labels that do not match, scores that all fall below the
 * minimum, figures that all lie outside the valid region, and coordinates
 * read in the wrong unit.
 *
 * A problem found here is both a warning and a reason to leave the case
 * unclassified (a case graded low because a label did not match is the worst
 * error the tool can make), unless the caller allows empty counts.
 *
 * @module
 */

import type { CaseData } from "../types.ts";
import type { FigureTally } from "../count/engine_types.ts";

/** What {@linkcode checkCounting} found. */
export interface CountingCheck {
  /** Oddities worth a warning that do not by themselves void the count. */
  warnings: string[];
  /**
   * Problems that make the count meaningless (figures present but none
   * counted, coordinates in another unit); each is also a warning.
   */
  problems: string[];
}

/** Labels compared without case, spacing or a plural "s". */
function squash(label: string): string {
  return label.trim().toLowerCase().replace(/\s+/g, " ").replace(/s$/, "");
}

/** Levenshtein distance, cut off above `limit` (labels are short). */
function editDistance(a: string, b: string, limit: number): number {
  if (Math.abs(a.length - b.length) > limit) return limit + 1;
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) {
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    prev = cur;
  }
  return prev[b.length];
}

/**
 * The counted label that `label` nearly matches (same but for case, spacing,
 * a plural "s", or up to two typing slips in labels of six or more
 * characters), or undefined.
 *
 * @param label A label found in the figures.
 * @param countLabels The labels that are counted.
 * @returns The near counted label, or undefined when none is near.
 *
 * @example A capital letter
 * ```ts
 * import { nearLabel } from "./count_checks.ts";
 * const near = nearLabel("Mitotic Figure", ["mitotic figure"]);
 * if (near !== "mitotic figure") throw new Error(`near label ${near}`);
 * ```
 */
export function nearLabel(label: string, countLabels: readonly string[]): string | undefined {
  if (countLabels.includes(label)) return undefined;
  const s = squash(label);
  const exact = countLabels.find((c) => squash(c) === s);
  if (exact !== undefined) return exact;
  return countLabels.find((c) => {
    const t = squash(c);
    return Math.min(s.length, t.length) >= 6 && editDistance(s, t, 2) <= 2;
  });
}

/**
 * Checks a case's figures against the counting settings.
 *
 * Warnings: labels that nearly match a counted label (with the option that
 * counts them), a minimum score with no scores to apply to. Problems (figures
 * present, none counted): no figure has a counted label; every figure with a
 * counted label scores below the minimum; every passing figure lies outside
 * the valid region. Problems found while reading (`caseData.countProblems`,
 * e.g. coordinates that fit the slide only in another unit) are passed on.
 *
 * @param caseData The case as read.
 * @param tally The figure tally of the prepared case.
 * @param settings The counted labels and the minimum score.
 * @returns Warnings and problems, in words.
 *
 * @example No figure has the counted label
 * ```ts
 * import { checkCounting } from "./count_checks.ts";
 * const figures = {
 *   xPx: new Float64Array([1, 2]), yPx: new Float64Array([1, 2]),
 *   labelIndex: new Uint32Array([0, 0]), labels: ["Mitotic Figure"],
 *   score: new Float64Array([NaN, NaN]), origin: new Int32Array([0, 1]),
 * };
 * const check = checkCounting(
 *   { figures, warnings: [] },
 *   { total: 2, counted: 0, outside_valid: 0, below_score: 0, by_label: { "Mitotic Figure": 2 } },
 *   { countLabels: ["mitotic figure"], minScore: 0 },
 * );
 * if (check.problems.length !== 1) throw new Error(`problems: ${check.problems.join("; ")}`);
 * ```
 */
export function checkCounting(
  caseData: Pick<CaseData, "figures" | "countProblems"> & { warnings?: string[] },
  tally: FigureTally,
  settings: { countLabels: readonly string[]; minScore: number },
): CountingCheck {
  const warnings: string[] = [];
  const problems: string[] = [...(caseData.countProblems ?? [])];
  const { figures } = caseData;
  const { countLabels, minScore } = settings;
  const quoted = (list: readonly string[]) => list.map((l) => `"${l}"`).join(", ");
  const hints: string[] = [];
  for (const label of figures.labels) {
    const near = nearLabel(label, countLabels);
    if (near === undefined) continue;
    hints.push(`--count-label "${label}"`);
    warnings.push(
      `Figure label "${label}" is close to the counted label "${near}" but differs, so its ` +
        `${tally.by_label[label] ?? 0} figure(s) are not counted (add --count-label "${label}", ` +
        `or "count_labels" in a case file, to count them)`,
    );
  }
  if (minScore > 0 && figures.xPx.length > 0 && figures.score.every((s) => Number.isNaN(s))) {
    warnings.push(`The minimum score ${minScore} has no effect: no figure has a score`);
  }
  if (tally.total > 0 && tally.counted === 0) {
    const labelled = countLabels.reduce((n, l) => n + (tally.by_label[l] ?? 0), 0);
    if (labelled === 0) {
      problems.push(
        `Nothing counted: none of the ${tally.total} figure points has a counted label ` +
          `(${quoted(countLabels)}); labels found: ${quoted(figures.labels)}` +
          (hints.length > 0 ? `. Did you mean ${hints.join(" or ")}?` : ""),
      );
    } else if (tally.below_score === labelled) {
      let top = -Infinity;
      for (let k = 0; k < figures.score.length; k++) {
        if (countLabels.includes(figures.labels[figures.labelIndex[k]])) {
          top = Math.max(top, figures.score[k]);
        }
      }
      problems.push(
        `Nothing counted: every one of the ${labelled} figures with a counted label scores ` +
          `below the minimum score ${minScore} (highest score ${top})`,
      );
    } else {
      problems.push(
        `Nothing counted: all ${tally.outside_valid} figures with a counted label and a passing ` +
          `score lie outside the valid region (tissue ∩ tumour − exclusions); check the ` +
          `outlines and the figures' coordinates`,
      );
    }
  }
  return { warnings, problems };
}
