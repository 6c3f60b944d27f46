/**
 * One case of a batch, start to end: read it, claim its case id, build the
 * result, add the provenance, render and write its folder. Runs in a worker
 * or in the calling thread; never throws (a failure is an outcome).
 *
 * @module
 */

import { GridSizeError } from "../errors.ts";
import { loadCase } from "../annotations/read_case.ts";
import { buildCaseResult } from "../pipeline/build_case_result.ts";
import type { ReportJson } from "../pipeline/report_types.ts";
import { renderCaseFiles, writeCaseFolder } from "../report/case_folder.ts";
import { readPlotlyJs } from "../report/plotly_asset.ts";
import type { CaseJob, CaseOutcome, CaseRunContext, CaseSummary } from "./batch_types.ts";
import { caseProvenance } from "./provenance.ts";

/**
 * Asks the runner for a case id before anything is written: resolves to
 * null when the id is free for this case, else to why not.
 */
export type ClaimCaseId = (caseId: string) => Promise<string | null>;

let plotlyCache: string | undefined;

/**
 * Runs one case (see the module documentation).
 *
 * @param job The case and its settings sha256.
 * @param context Output folder, formats, generation time.
 * @param claim Asks for the case id once it is known.
 * @returns The outcome: ok with the report's headline, or failed with the message.
 *
 * @example A case that cannot be read fails with the reader's message
 * ```ts
 * import { processCase } from "./process_case.ts";
 * const outcome = await processCase({
 *   case: { index: 0, label: "x.geojson", input: { annotationsPath: "/no/such/x.geojson" },
 *     options: {}, shardKey: "x.geojson" },
 *   settingsSha256: "0",
 * }, { outDir: "/tmp/unused", formats: ["json"], standalone: false, generatedAt: null },
 *   () => Promise.resolve(null));
 * if (outcome.status !== "failed" || !outcome.message?.includes("file not found")) throw new Error(`a missing file fails the case: ${JSON.stringify(outcome)}`);
 * ```
 */
export async function processCase(
  job: CaseJob,
  context: CaseRunContext,
  claim: ClaimCaseId,
): Promise<CaseOutcome> {
  const t0 = performance.now();
  const c = job.case;
  let caseId: string | null = null;
  const fail = (message: string, usage = false): CaseOutcome => ({
    index: c.index,
    status: "failed",
    caseId,
    seconds: elapsed(t0),
    message,
    ...(usage ? { usage } : {}),
    summary: null,
  });
  if (c.input === null) return fail(c.problem ?? "The case cannot be read");
  try {
    const caseData = await loadCase(c.input);
    caseId = caseData.caseId;
    const denied = await claim(caseId);
    if (denied !== null) return fail(denied);
    let result;
    try {
      result = buildCaseResult(caseData, c.options);
    } catch (e) {
      if (e instanceof GridSizeError) {
        return fail(`Option --stride-um is too small for case "${caseId}": ${e.message}`, true);
      }
      throw e;
    }
    result.report.provenance = caseProvenance(caseData.sources, job.settingsSha256);
    if (context.standalone && context.formats.includes("html")) plotlyCache ??= readPlotlyJs();
    const files = renderCaseFiles(result, {
      formats: context.formats,
      standalone: context.standalone,
      plotlyJs: plotlyCache,
      generatedAt: context.generatedAt,
      mapScale: context.mapScale,
    });
    // A format list with nothing per case (csv only) makes no empty folder.
    if (files.length > 0) writeCaseFolder(context.outDir, caseId, files);
    return {
      index: c.index,
      status: "ok",
      caseId,
      seconds: elapsed(t0),
      message: null,
      summary: reportSummary(result.report),
      report: result.report,
    };
  } catch (e) {
    return fail(e instanceof Error ? e.message : String(e));
  }
}

/**
 * The headline of a report for logs and the run history.
 *
 * @param report A report.json object.
 * @returns Hotspot count and density, positions, scheme, class and tier.
 *
 * @example A report without a hotspot or a scheme
 * ```ts
 * import { reportSummary } from "./process_case.ts";
 * import type { ReportJson } from "../pipeline/report_types.ts";
 * const report: Pick<ReportJson, "hotspot" | "distribution" | "classification"> = {
 *   hotspot: null, classification: null,
 *   distribution: { positions: 0, min: null, q1: null, median: null, q3: null, max: null, mean: null },
 * };
 * const s = reportSummary(report);
 * if (s.hotspotCount !== null || s.class !== null) throw new Error(`no hotspot, no class: ${JSON.stringify(s)}`);
 * ```
 */
export function reportSummary(
  report: Pick<ReportJson, "hotspot" | "distribution" | "classification">,
): CaseSummary {
  const c = report.classification;
  return {
    hotspotCount: report.hotspot?.count ?? null,
    perMm2: report.hotspot?.per_mm2 ?? null,
    positions: report.distribution?.positions ?? 0,
    scheme: c?.scheme ?? null,
    class: c?.class ?? null,
    tier: c?.tier ?? null,
  };
}

function elapsed(t0: number): number {
  return Math.round(performance.now() - t0) / 1000;
}
