/**
 * Comparing a detector's figures with a reference case, from pairs of
 * figures up to the grade.
 *
 * @module
 */

import type { CaseData, CaseSource, FigureSet } from "../types.ts";
import type { CountMap, Placement, PreparedCase, WindowShape } from "../count/engine_types.ts";
import { prepareCase } from "../count/prepare_case.ts";
import { tallyFigures } from "../count/tally_figures.ts";
import { makeWindow } from "../count/make_window.ts";
import { computeCountMap } from "../count/compute_count_map.ts";
import { DEFAULT_MIN_COVERAGE, DEFAULT_STRIDE_UM } from "../defaults.ts";
import { findHotspot } from "../count/find_hotspot.ts";
import { newSearchBudget } from "../count/placement_search.ts";
import { SearchWorkError } from "../errors.ts";
import { stampWindowCounts } from "../count/stamp_window_counts.ts";
import { summarizeDistribution } from "../count/summarize_distribution.ts";
import { countInWindow } from "../count/window_contains.ts";
import { createRegionIndex } from "../geometry/region_index.ts";
import { createOverlapIndex } from "../geometry/window_overlap.ts";
import { getScheme } from "../standards/list_schemes.ts";
import { classifyCounts } from "../standards/classify.ts";
import type { GradingScheme } from "../standards/scheme_types.ts";
import { HOTFIELD_VERSION } from "../version.ts";
import {
  type FigureMatching,
  matchFigures,
  type MatchMode,
  type ScoredPointsUm,
} from "./match_figures.ts";
import { averagePrecision, detectionScores, type RankedPoint } from "./detection_scores.ts";
import {
  COMPARISON_SCHEMA,
  type ComparisonJson,
  type ComparisonPlacementJson,
  type CurvePointJson,
  type DetectionJson,
  type GradeJson,
} from "./comparison_types.ts";

/** Options of {@linkcode compareCase}. */
export interface CompareOptions {
  /** Matching radius, µm, in (0, 50]. @default 7.5 */
  radiusUm?: number;
  /** @default "optimal" */
  /** `optimal` or `greedy`. @default "optimal" */
  matching?: MatchMode;
  /** The operating threshold of the candidates (headline numbers). @default 0 */
  minScore?: number;
  /** Grading scheme id; no grade when absent. */
  scheme?: string;
  /** Figure labels that are counted, in both inputs. @default ["mitotic figure"] */
  countLabels?: string[];
  /** Window area, mm². @default 2.37 */
  areaMm2?: number;
  /** @default "rect" */
  /** Window shape. @default "rect" */
  shape?: "rect" | "circle";
  /** @default [4, 3] */
  /** Rectangle aspect W:H. @default [4, 3] */
  aspect?: [number, number];
  /** @default 25 */
  /** Grid stride, µm. @default 25 */
  strideUm?: number;
  /** @default 0.95 */
  /** Least fraction of a window inside the valid region. @default 0.95 */
  minCoverage?: number;
  /** Grid size limit (cells). @default 25_000_000 */
  maxGridCells?: number;
  /**
   * Work limit of all the comparison's hotspot searches together (the
   * reference's and one per distinct candidate set), in figure tests (see
   * `SearchBudget`). @default 750_000_000
   */
  maxSearchWork?: number;
  /** Case id of the comparison. @default the reference's case id */
  caseId?: string;
  /** Recorded in the output: the pair was declared the same slide despite differing ids or mpp. @default false */
  sameSlide?: boolean;
}

/** The candidate figures of a comparison, as read. */
export interface CandidateSet {
  /** Figure points in the reference slide's level-0 pixels. */
  figures: FigureSet;
  /** The file they came from (for provenance), if any. */
  source?: CaseSource;
  /** Problems found while reading. */
  warnings?: string[];
}

/** The thresholds of the curve: 0.00, 0.01, …, 1.00, each computed as i/100. */
export const CURVE_THRESHOLDS: readonly number[] = Array.from({ length: 101 }, (_, i) => i / 100);

/** The candidate hotspot and class at one number of ranked candidates. */
interface LevelResult {
  hotspot: Placement | null;
  class: string | null;
  tier: string | null;
}

/** What the pages draw besides `comparison.json`. */
export interface ComparisonResult {
  /** `comparison.json`. */
  json: ComparisonJson;
  /** The reference case prepared for counting (valid region, figures in µm). */
  prepared: PreparedCase;
  /** The counting window. */
  window: WindowShape;
  /** Reference figures taking part, µm. */
  reference: { xUm: Float64Array; yUm: Float64Array };
  /** Candidates taking part (all scores), µm, with their scores. */
  candidates: ScoredPointsUm;
  /** The matching (pairs at the operating threshold, true positives by rank). */
  matching: FigureMatching;
  /** The reference's exact hotspot. */
  referenceHotspot: Placement | null;
  /** The candidate's exact hotspot at the operating threshold. */
  candidateHotspot: Placement | null;
}

const CLASS_DEFINITION = "Classes of the hotspot against the scheme's primary cut-off (as in " +
  "hotfield report): below, the hotspot count does not meet the cut-off; above, the lower " +
  "quartile of admissible window counts meets it; otherwise field-dependent";

/**
 * Compares candidate figures (a detector's, with scores) with the figures of
 * a reference case on the same slide: pairs within a radius, precision,
 * recall and F1, the curve over thresholds 0.00 … 1.00 with the exact
 * hotspot at each, average precision, both hotspots, and (with a scheme)
 * both classes and the thresholds at which they agree.
 *
 * **Which figures take part.** Only figures with a counted label that lie
 * inside the reference's valid region (tissue ∩ tumour − exclusions; a
 * point on its boundary is inside), in both inputs: what the mitotic count
 * counts. The candidate's own regions are not used.
 *
 * **Thresholds.** At threshold t the candidates with score ≥ t take part (a
 * candidate without a score takes part at every t). `min_score` is the
 * operating threshold of `detection`, `hotspot.candidate` and
 * `grade.candidate_class`; the curve always sweeps t = i/100, i = 0 … 100,
 * over all candidates. Thresholds with the same set of candidates share one
 * computation. Without any score the curve is one point (t = 0).
 *
 * **Hotspots.** Each is the exact hotspot of `findHotspot` (same window,
 * stride and minimum coverage as `hotfield report`), on one coverage map
 * shared by every threshold; only the counts are recomputed.
 *
 * **Settings.** A reference case file's own settings (scheme, counted
 * labels, window area and shape, stride, minimum coverage) win over
 * `options`, as in `hotfield report`; a reference with count problems
 * (e.g. coordinates in the wrong unit) is not graded.
 *
 * **Average precision**: see {@linkcode averagePrecision}; the operating
 * points are every distinct score, with true positives of the chosen
 * matching restricted to the candidates at or above that score.
 *
 * @param reference The reference case (regions and reference figures).
 * @param candidates The candidate figures, in the reference's pixels.
 * @param options Radius, matching, threshold, scheme, window and grid.
 * @returns `comparison.json` and what the pages draw.
 * @throws {RangeError} For options out of range or an unknown scheme id.
 * @throws {SearchWorkError} When the hotspot searches together pass their
 *   work limit (candidates spread so evenly and densely that no window stands out).
 *
 * @example A detector that finds two of three figures and adds one
 * ```ts
 * import { compareCase } from "hotfield";
 * const sq = [[[0, 0], [8000, 0], [8000, 8000], [0, 8000], [0, 0]]] as [number, number][][];
 * const fig = (x: number[], y: number[], s: number[]) => ({
 *   xPx: Float64Array.from(x), yPx: Float64Array.from(y), labelIndex: new Uint32Array(x.length),
 *   labels: ["mitotic figure"], score: Float64Array.from(s), origin: new Int32Array(x.length),
 * });
 * const reference = {
 *   caseId: "QVT-24-001", slide: { id: "QVT-24-001", mppX: 0.5, mppY: 0.5 },
 *   tissue: [{ polygons: [sq], source: "example" }], tumour: [], exclude: [],
 *   figures: fig([4000, 4100, 4200], [4000, 4000, 4000], [NaN, NaN, NaN]),
 *   fields: [], sources: [], warnings: [],
 * };
 * const r = compareCase(reference, { figures: fig([4002, 4100, 6000], [4000, 4004, 6000], [0.9, 0.8, 0.3]) }, {
 *   strideUm: 100,
 * });
 * const d = r.json.detection;
 * if (d.tp !== 2 || d.fp !== 1 || d.fn !== 1 || r.json.curve.length !== 101) throw new Error(JSON.stringify(d));
 * if (r.json.hotspot.reference?.count !== 3 || r.json.hotspot.reference_count_at_candidate !== 3) {
 *   throw new Error(`hotspots: ${JSON.stringify(r.json.hotspot)}`);
 * }
 * ```
 */
export function compareCase(
  reference: CaseData,
  candidates: CandidateSet,
  options: CompareOptions = {},
): ComparisonResult {
  const radiusUm = options.radiusUm ?? 7.5;
  const mode = options.matching ?? "optimal";
  const minScore = options.minScore ?? 0;
  if (!(minScore >= 0 && minScore <= 1)) {
    throw new RangeError(`Minimum score must lie in [0, 1]: got ${minScore}`);
  }
  // The reference case file's own settings win, as in hotfield report (its
  // minimum score is the reference's, not the candidates' threshold).
  const own = reference.settings ?? {};
  const schemeId = own.scheme ?? options.scheme;
  const countProblems = reference.countProblems ?? [];
  const scheme: GradingScheme | null = schemeId && countProblems.length === 0
    ? getScheme(schemeId)
    : null;
  const labels = own.countLabels ?? options.countLabels;
  const countLabels = labels && labels.length > 0 ? [...labels] : ["mitotic figure"];
  const window = makeWindow({
    areaMm2: own.areaMm2 ?? options.areaMm2,
    shape: own.shape ?? options.shape,
    aspect: options.aspect,
  });
  const strideUm = own.strideUm ?? options.strideUm ?? DEFAULT_STRIDE_UM;
  const minCoverage = own.minCoverage ?? options.minCoverage ?? DEFAULT_MIN_COVERAGE;
  const warnings: string[] = [];
  if (schemeId && countProblems.length > 0) {
    warnings.push(
      `Not graded against "${schemeId}": the reference has problems that make its count meaningless: ` +
        countProblems.join("; "),
    );
  }

  // 1. The reference: valid region and counted figures (no score threshold).
  const prepared = prepareCase(reference, { minScore: 0, countLabels });
  warnings.push(...prepared.warnings);
  const { mppX, mppY } = prepared.slide;

  // 2. The candidates: counted label, inside the reference's valid region.
  const cf = candidates.figures;
  warnings.push(...(candidates.warnings ?? []));
  const inside = createRegionIndex(prepared.validPx).containsPoints(cf.xPx, cf.yPx);
  const { tally: candTally, counted } = tallyFigures(cf, inside, { minScore: 0, countLabels });
  const n = candTally.counted;
  const cand: ScoredPointsUm = {
    xUm: new Float64Array(n),
    yUm: new Float64Array(n),
    score: new Float64Array(n),
  };
  let withoutScore = 0;
  for (let k = 0, m = 0; k < counted.length; k++) {
    if (!counted[k]) continue;
    cand.xUm[m] = cf.xPx[k] * mppX;
    cand.yUm[m] = cf.yPx[k] * mppY;
    cand.score[m] = cf.score[k];
    if (Number.isNaN(cf.score[k])) withoutScore++;
    m++;
  }
  const scored = n > 0 && withoutScore === 0;
  if (n === 0) {
    warnings.push(
      "The candidate set is empty (no candidate with a counted label inside the valid region): " +
        "every reference figure is a false negative and F1 is 0",
    );
  } else if (withoutScore === n) {
    warnings.push(
      "The candidates have no scores: the curve is one point (every candidate at every threshold) " +
        "and average precision is not defined",
    );
  } else if (withoutScore > 0) {
    warnings.push(
      `${withoutScore} of ${n} candidates have no score; they take part at every threshold`,
    );
  }
  if (candTally.outside_valid > 0) {
    warnings.push(
      `${candTally.outside_valid} candidate(s) with a counted label lie outside the valid region and take no part`,
    );
  }

  // 3. Pairs.
  const refPts = { xUm: prepared.xUm, yUm: prepared.yUm };
  const matching = matchFigures(refPts, cand, { radiusUm, mode, minScore });
  const nRef = refPts.xUm.length;

  // 4. One coverage map for every threshold; reference hotspot.
  const refMap = computeCountMap(prepared, window, {
    strideUm,
    minCoverage,
    maxGridCells: options.maxGridCells,
  });
  const overlap = createOverlapIndex(prepared.validUm);
  // One budget for every search of the comparison, so many thresholds cannot add up to hours.
  const budget = newSearchBudget(options.maxSearchWork);
  const caseName = options.caseId ?? reference.caseId;
  const hotspotOf = (
    p: Pick<PreparedCase, "xUm" | "yUm" | "slide" | "validUm">,
    map: CountMap,
    what: string,
  ): Placement | null => {
    try {
      return findHotspot(p, map, { overlap, budget });
    } catch (e) {
      if (!(e instanceof SearchWorkError)) throw e;
      const m = e.message;
      throw new SearchWorkError(
        `Cannot compare case "${caseName}": ${what}: ${m.charAt(0).toLowerCase()}${m.slice(1)}`,
        { cause: e },
      );
    }
  };
  const refHotspot = hotspotOf(prepared, refMap, "the reference's hotspot");
  const refGrade = scheme ? classify(refMap, refHotspot, window, scheme) : null;

  // 5. Candidates in rank order; the first k are those at or above a threshold.
  const order = matching.order;
  const sx = new Float64Array(n), sy = new Float64Array(n), ss = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    sx[k] = cand.xUm[order[k]];
    sy[k] = cand.yUm[order[k]];
    ss[k] = cand.score[order[k]];
  }
  const kOf = (t: number) => {
    // scores descend along the rank order (no score first): count those ≥ t
    let lo = 0, hi = n;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (!(ss[mid] < t)) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const levels = new Map<number, LevelResult>();
  const level = (k: number): LevelResult => {
    let r = levels.get(k);
    if (r) return r;
    const xs = sx.subarray(0, k), ys = sy.subarray(0, k);
    const map: CountMap = { ...refMap, counts: stampWindowCounts(xs, ys, window, refMap.grid) };
    const hotspot = hotspotOf(
      { xUm: xs, yUm: ys, slide: prepared.slide, validUm: prepared.validUm },
      map,
      `the hotspot of the ${k.toLocaleString("en-US")} best-scored candidates`,
    );
    const g = scheme ? classify(map, hotspot, window, scheme) : null;
    r = { hotspot, class: g?.class ?? null, tier: g?.tier ?? null };
    levels.set(k, r);
    return r;
  };

  // 6. The curve.
  const thresholds = scored ? CURVE_THRESHOLDS : [0];
  const curve: CurvePointJson[] = thresholds.map((t) => {
    const k = kOf(t);
    const tp = matching.tpAt[k];
    const s = detectionScores(tp, k - tp, nRef - tp);
    const lv = level(k);
    const point: CurvePointJson = {
      threshold: t,
      tp,
      fp: k - tp,
      fn: nRef - tp,
      precision: round(s.precision, 6),
      recall: round(s.recall, 6),
      f1: round(s.f1, 6),
      hotspot_count: lv.hotspot ? lv.hotspot.count : null,
      candidate: k,
    };
    if (scheme) {
      point.class = lv.class;
      point.tier = lv.tier;
    }
    return point;
  });

  // 7. Average precision over every distinct score.
  let ap: number | null = null;
  if (scored) {
    const points: RankedPoint[] = [];
    for (let k = 1; k <= n; k++) {
      if (k === n || ss[k] !== ss[k - 1]) points.push({ predictions: k, tp: matching.tpAt[k] });
    }
    ap = round(averagePrecision(points, nRef), 6);
  }
  let best: { threshold: number | null; f1: number | null } = { threshold: null, f1: null };
  for (const p of curve) {
    if (p.f1 !== null && (best.f1 === null || p.f1 > best.f1)) {
      best = { threshold: p.threshold, f1: p.f1 };
    }
  }

  // 8. The operating point.
  const kMin = matching.candidates;
  const op = level(kMin);
  const candHotspot = op.hotspot;
  const ds = detectionScores(matching.tp, matching.fp, matching.fn);
  const detection: DetectionJson = {
    reference: nRef,
    candidate: kMin,
    tp: matching.tp,
    fp: matching.fp,
    fn: matching.fn,
    precision: round(ds.precision, 6),
    recall: round(ds.recall, 6),
    f1: round(ds.f1, 6),
  };
  const place = (p: Placement | null): ComparisonPlacementJson | null =>
    p === null ? null : {
      center_px: [round2(p.centerPx[0]), round2(p.centerPx[1])],
      count: p.count,
      center_um: [round2(p.centerUm[0]), round2(p.centerUm[1])],
      coverage: round(p.coverage, 6)!,
      per_mm2: round(p.perMm2, 4)!,
    };
  const both = refHotspot !== null && candHotspot !== null;

  // 9. The grade.
  let grade: GradeJson | null = null;
  if (scheme && refGrade) {
    const agreeing: [number, number][] = [];
    let lo: number | null = null;
    curve.forEach((p, i) => {
      const ok = p.class !== null && p.class === refGrade.class;
      if (ok && lo === null) lo = p.threshold;
      const next = curve[i + 1];
      const nextOk = next !== undefined && next.class !== null && next.class === refGrade.class;
      if (ok && !nextOk && lo !== null) {
        // Without scores the one point stands for every threshold.
        agreeing.push([lo, scored ? p.threshold : 1]);
        lo = null;
      }
    });
    grade = {
      scheme: scheme.id,
      cutoff: refGrade.cutoff,
      reference_class: refGrade.class,
      candidate_class: op.class,
      agreeing_thresholds: agreeing,
      cutoff_rule: refGrade.cutoffRule,
      min_count_for_window: refGrade.minCount,
      reference_tier: refGrade.tier,
      candidate_tier: op.tier,
      definition: CLASS_DEFINITION,
    };
    warnings.push(...refGrade.warnings);
  }

  const sources = [
    ...reference.sources.map((s) => ({
      role: "reference",
      kind: s.kind,
      path: s.path,
      sha256: s.sha256,
    })),
    ...(candidates.source
      ? [{
        role: "candidate",
        kind: candidates.source.kind,
        path: candidates.source.path,
        sha256: candidates.source.sha256,
      }]
      : []),
  ];
  const json: ComparisonJson = {
    schema: COMPARISON_SCHEMA,
    case: options.caseId ?? reference.caseId,
    radius_um: radiusUm,
    matching: mode,
    min_score: minScore,
    detection,
    curve,
    average_precision: ap,
    best_f1: best,
    hotspot: {
      reference: place(refHotspot),
      candidate: place(candHotspot),
      distance_um: both
        ? round2(Math.hypot(
          refHotspot.centerUm[0] - candHotspot.centerUm[0],
          refHotspot.centerUm[1] - candHotspot.centerUm[1],
        ))
        : null,
      reference_count_at_candidate: candHotspot
        ? countInWindow(
          refPts.xUm,
          refPts.yUm,
          window,
          candHotspot.centerUm[0],
          candHotspot.centerUm[1],
        )
        : null,
      candidate_count_at_reference: refHotspot
        ? countInWindow(
          sx.subarray(0, kMin),
          sy.subarray(0, kMin),
          window,
          refHotspot.centerUm[0],
          refHotspot.centerUm[1],
        )
        : null,
    },
    grade,
    warnings: dedupe(warnings),
    scope: "Figures with a counted label (" + countLabels.map((l) => `"${l}"`).join(", ") +
      ") inside the reference's valid region (tissue ∩ tumour − exclusions), in both inputs; " +
      "everything else takes no part in the matching, the curve or the hotspots",
    methods: {
      matching: mode === "optimal"
        ? "One-to-one pairs within radius_um (centre distance in µm, ≤ radius): the most pairs, then the least total distance (exact min-cost matching per connected component)"
        : "One-to-one pairs within radius_um: candidates by descending score (equal scores by y, then x, then input order) each take the nearest unpaired reference figure",
      precision: "tp / (tp + fp); null when no candidate takes part",
      recall: "tp / (tp + fn); null when there is no reference figure",
      f1: "2·tp / (2·tp + fp + fn); null only when both sets are empty",
      curve:
        "Thresholds i/100, i = 0 … 100: candidates with score ≥ threshold (no score: always) " +
        "take part; hotspot_count is their exact hotspot (same window and grid as the reference)",
      average_precision: "All-point interpolated average precision (PASCAL VOC from 2010; " +
        "Everingham et al. 2010, IJCV): precision made non-increasing from the right over the " +
        "operating points at every distinct score (tied scores enter together), summed over recall steps",
      best_f1: "Highest F1 over the curve's thresholds; ties go to the lowest threshold",
      reference_count_at_candidate:
        "Reference figures inside the closed window of the candidate's hotspot",
    },
    settings: {
      window: windowJson(window),
      stride_um: strideUm,
      min_coverage: minCoverage,
      count_labels: countLabels,
      same_slide: options.sameSlide ?? false,
    },
    figures: {
      reference: { ...prepared.tally },
      candidate: { ...candTally, without_score: withoutScore },
    },
    mpp: [mppX, mppY],
    valid_area_mm2: round(prepared.validAreaMm2, 6)!,
    inputs: sources,
    hotfield_version: HOTFIELD_VERSION,
  };
  return {
    json,
    prepared,
    window,
    reference: refPts,
    candidates: cand,
    matching,
    referenceHotspot: refHotspot,
    candidateHotspot: candHotspot,
  };
}

/** Class and tier of a map's hotspot against a scheme (as `hotfield report` classifies). */
function classify(
  map: CountMap,
  hotspot: Placement | null,
  window: WindowShape,
  scheme: GradingScheme,
): {
  class: string | null;
  tier: string | null;
  cutoff: number;
  cutoffRule: string;
  minCount: number;
  warnings: string[];
} {
  const dist = summarizeDistribution(map);
  const { classification, warnings } = classifyCounts({
    hotspotCount: hotspot ? hotspot.count : null,
    q1: dist.q1,
    windowAreaMm2: window.areaMm2,
    counts: map.counts,
    admissible: map.admissible,
  }, scheme);
  return {
    class: hotspot ? classification.class : null,
    tier: classification.tier,
    cutoff: classification.cutoff,
    cutoffRule: String(classification.cutoff_rule),
    minCount: Number(classification.min_count_for_window),
    warnings,
  };
}

function windowJson(w: WindowShape): Record<string, unknown> {
  return w.shape === "rect"
    ? {
      shape: "rect",
      area_mm2: w.areaMm2,
      width_um: round2(w.widthUm),
      height_um: round2(w.heightUm),
      aspect: w.aspect,
    }
    : { shape: "circle", area_mm2: w.areaMm2, diameter_um: round2(w.diameterUm) };
}

function round(v: number | null, d: number): number | null {
  if (v === null) return null;
  const f = 10 ** d;
  const r = Math.round(v * f) / f;
  return Object.is(r, -0) ? 0 : r;
}

function round2(v: number): number {
  return round(v, 2)!;
}

function dedupe(list: string[]): string[] {
  return [...new Set(list)];
}
