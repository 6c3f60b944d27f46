/**
 * One plain sentence per case: the hotspot count, the cut-off it meets or
 * misses, the grade, and whether a reader's field choice could change it.
 *
 * @module
 */

import { getScheme } from "../standards/list_schemes.ts";
import type { ReportJson } from "./report_types.ts";

/** A number in words-friendly form: up to `digits` decimals, no trailing zeros. */
function num(v: number, digits = 2): string {
  const r = Number(v.toFixed(digits));
  return String(Object.is(r, -0) ? 0 : r);
}

/** "1 figure", "3 figures". */
function figures(n: number): string {
  return `${n} figure${n === 1 ? "" : "s"}`;
}

/** A share of placements as a percentage in words. */
function percent(share: number): string {
  if (share === 0) return "none";
  if (share < 0.001) return "less than 0.1%";
  if (share === 1) return "all";
  return `${num(share * 100, 1)}%`;
}

/**
 * The verdict sentence of a report (its `verdict` member).
 *
 * Reads the hotspot, the classification, the count problems and the
 * whole-area count of a small sample; never computes anything new.
 *
 * @param report The report (with `classification`, `count_problems` and
 *   `whole_area` filled in as the pipeline does).
 * @returns One or two sentences, plain text.
 *
 * @example A hotspot that meets the two-tier mast cell cut-off in few places
 * ```ts
 * import { buildCaseResult, parseAnnotations } from "hotfield";
 * import { caseVerdict } from "./verdict.ts";
 * // A 6 × 4 mm tissue piece at 1 µm/px with eight figures in one tight cluster.
 * const cluster = Array.from({ length: 8 }, (_, i) => [2000 + 100 * (i % 4), 1500 + 100 * Math.floor(i / 4)]);
 * const parsed = parseAnnotations(JSON.stringify({
 *   type: "FeatureCollection", slide: { id: "QVT-24-001", mpp: 1 },
 *   features: [
 *     { type: "Feature", properties: { role: "tissue" }, geometry: { type: "Polygon", coordinates: [[[0, 0], [6000, 0], [6000, 4000], [0, 4000], [0, 0]]] } },
 *     { type: "Feature", properties: { role: "figure" }, geometry: { type: "MultiPoint", coordinates: cluster } },
 *   ],
 * }), { fileName: "QVT-24-001.geojson" });
 * const { report } = buildCaseResult({ caseId: "QVT-24-001", ...parsed, sources: [] }, {
 *   strideUm: 100, bestN: 0, scheme: "canine-mct-2tier", simulations: 0,
 * });
 * const v = caseVerdict(report);
 * if (!v.includes("reaches the cut-off of ≥ 7") || !v.includes("12.9% of placements")) {
 *   throw new Error(`verdict: ${v}`);
 * }
 * ```
 */
export function caseVerdict(report: ReportJson): string {
  const problems = (report.count_problems as string[] | undefined) ?? [];
  const area = report.window.area_mm2;
  const hotspot = report.hotspot;
  const c = report.classification;
  if (problems.length > 0 && c === null) {
    const p = problems[0];
    return `Not graded. ${p}${/[.?!]$/.test(p) ? "" : "."}`;
  }
  if (hotspot === null) {
    const whole = report.whole_area as
      | { count: number; area_mm2: number; per_mm2: number; count_per_window_area: number }
      | null
      | undefined;
    if (whole && whole.area_mm2 > 0) {
      return `No standard window of ${num(area)} mm² fits the valid area of ` +
        `${num(whole.area_mm2, 3)} mm², so there is no hotspot count: the whole valid area holds ` +
        `${figures(whole.count)} (${num(whole.per_mm2)}/mm², about ` +
        `${num(whole.count_per_window_area, 1)} per ${num(area)} mm²). This is not graded.`;
    }
    return `No standard window of ${
      num(area)
    } mm² fits the valid area: nothing was counted or graded.`;
  }
  const head = `Hotspot ${figures(hotspot.count)} in ${num(area)} mm²`;
  if (c === null) {
    return `${head} (${num(hotspot.per_mm2)}/mm²); no grading scheme was chosen.`;
  }
  const scheme = (() => {
    try {
      return getScheme(c.scheme);
    } catch {
      return null;
    }
  })();
  const name = scheme ? scheme.shortName : c.scheme;
  const basis = String(c.cutoff_basis ?? "");
  const rate = c.hotspot_rate_per_basis as number | null | undefined;
  const sameArea = c.window_area_mm2 === c.basis_area_mm2;
  const converted = !sameArea && typeof rate === "number" ? ` (${num(rate, 1)} ${basis})` : "";
  const rule = `${c.cutoff_rule ?? "≥"} ${c.cutoff}${sameArea ? "" : ` ${basis}`}`;
  const share = c.fraction_at_or_above;
  const multiTier = (scheme?.tiers.length ?? 2) > 2;

  if (c.class === "below") {
    const first = multiTier
      ? `${head}${converted} gives ${c.tier} (${name}); it stays below the cut-off into ` +
        `${c.cutoff_tier} (${rule}).`
      : `${head}${converted} stays below the cut-off of ${rule} (${name}): ${c.tier}.`;
    return `${first} No placement reaches that cut-off, so the field chosen does not change this.`;
  }
  const first = multiTier
    ? `${head}${converted} gives ${c.tier} (${name}); it reaches the cut-off into ` +
      `${c.cutoff_tier} (${rule}).`
    : `${head}${converted} reaches the cut-off of ${rule} (${name}): ${c.tier}.`;
  if (c.class === "above") {
    return `${first} At least three quarters of placements reach it (${
      percent(share ?? 1)
    }), so the grade does not hang on the field chosen.`;
  }
  if (!share) {
    return `${first} No grid placement reaches it, only windows close to the exact hotspot, so ` +
      `a reader's field choice decides the grade.`;
  }
  return `${first} Only ${
    percent(share)
  } of placements reach it, so a reader's field choice can decide the grade.`;
}
