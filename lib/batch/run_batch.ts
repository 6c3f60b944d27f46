/**
 * Running many cases into one output folder: skip what is done, isolate
 * failures, run in parallel inside one process, record the run, rebuild the
 * cohort files.
 *
 * ## What a run does
 *
 * 1. An unsharded run first clears what a killed run left behind (temporary
 *    `.tmp-` entries; see `removeTemporaryEntries`).
 * 2. A case is **skipped** (unless `force`) when a case folder in the output
 *    folder holds a report.json whose `provenance` equals what a fresh run
 *    would write: the same input files (path as written and sha256), the same
 *    `settings_sha256`, the same hotfield version (and, when the case has an
 *    id of its own, that id).
 * 3. The other cases run, in `workers` Web Workers (or in the calling thread
 *    for one worker). Each reads its case, claims its case id, builds the
 *    result and writes its folder (staged, then renamed into place). A case
 *    that fails is recorded with its message and the others go on.
 * 4. Case ids are given out in source order: a case whose id an earlier case
 *    of the source already has fails, whichever finishes first, so a run's
 *    outcome does not depend on timing.
 * 5. Each outcome goes to `DIR/runs.sqlite` as it happens (with `history`).
 * 6. An unsharded run then rebuilds the cohort files from every case folder.
 *
 * Results do not depend on the number of workers: each case is computed by
 * the same code on the same inputs, and the files are rendered from the
 * result alone.
 *
 * @module
 */

import { existsSync, mkdirSync, statSync } from "node:fs";
import { join, resolve } from "node:path";
import { safeCaseId } from "../annotations/case_id.ts";
import { ALL_FORMATS, type OutputFormat, removeTemporaryEntries } from "../report/case_folder.ts";
import { readCaseReports, writeCohortFiles } from "../report/write_cohort.ts";
import { reportGenerationTime } from "../report/write_outputs.ts";
import type {
  BatchCase,
  CaseJob,
  CaseOutcome,
  CaseRunContext,
  CaseSummary,
} from "./batch_types.ts";
import { processCase, reportSummary } from "./process_case.ts";
import { expectedProvenance, provenanceKey } from "./provenance.ts";
import { RUN_HISTORY_FILE, RunHistory, type RunInfo } from "./run_history.ts";
import { selectShard, type Shard } from "./shard.ts";
import { settingsSha256 } from "./settings.ts";

/** Options of {@linkcode runBatch}. */
export interface RunBatchOptions {
  /** The output folder (created when a case is written). */
  outDir: string;
  /** Formats written. @default all */
  formats?: readonly OutputFormat[];
  /** Inline plotly.js into every page. @default false */
  standalone?: boolean;
  /** Colour scale of the count maps. @default "linear" */
  mapScale?: "linear" | "sqrt";
  /** Cases computed at once (Web Workers; 1 runs in the calling thread). @default the machine's cores */
  workers?: number;
  /** Run every case, skipping none. @default false */
  force?: boolean;
  /** Take only this share of the cases; a sharded run writes case folders only. */
  shard?: Shard;
  /** Rebuild the cohort files at the end. @default true unless sharded */
  cohort?: boolean;
  /**
   * First remove every temporary entry a killed run left in the output
   * folder; only safe when nothing else writes there meanwhile (each case's
   * own leftovers are always removed before it is written).
   * @default true unless sharded
   */
  clearTemporary?: boolean;
  /** Record the run in `DIR/runs.sqlite`. @default no history */
  history?: RunInfo;
  /** Generation time shown in the pages. @default from SOURCE_DATE_EPOCH, else now */
  generatedAt?: string | null;
  /** Called once the cases to skip are known: how many cases, how many skipped so far. */
  onPlan?: (plan: { total: number; toRun: number }) => void;
  /** Called as each case ends, in the order they end. */
  onOutcome?: (outcome: CaseOutcome, batchCase: BatchCase) => void;
}

/** What {@linkcode runBatch} did. */
export interface BatchResult {
  /** The cases of this run (the shard's share when sharded), in source order. */
  cases: BatchCase[];
  /** Their outcomes, in the same order. */
  outcomes: CaseOutcome[];
  /** Cases written. */
  ok: number;
  /** Cases done before with the same inputs, settings and version. */
  skipped: number;
  /** Cases that failed (each with its message in `outcomes`). */
  failed: number;
  /** Cohort files written (empty when sharded or no folder exists). */
  cohortFiles: string[];
  /** Things to tell the user that are not case failures (folders passed over, …). */
  notes: string[];
}

type Claim =
  | { kind: "pending" }
  | { kind: "waiting"; caseId: string; resolve: (denied: string | null) => void }
  | { kind: "decided" };

/**
 * Runs `cases` into `options.outDir` (see the module documentation).
 *
 * @param cases The cases of the source, in source order.
 * @param options Output folder, formats, workers, skipping, sharding, history.
 * @returns The outcomes and counts.
 * @throws {Error} When the output folder is a file or the history cannot be
 *   opened (before any case runs); case problems never throw.
 *
 * @example Two cases in the calling thread, one of them missing
 * ```ts
 * import { runBatch } from "hotfield";
 * import { fileURLToPath } from "node:url";
 * const outDir = Deno.makeTempDirSync();
 * const demo = fileURLToPath(new URL("../../data/demo/", import.meta.url));
 * const r = await runBatch([
 *   { index: 0, label: "a", input: { annotationsPath: "QVT-24-005.geojson", baseDir: demo },
 *     options: { bestN: 0, strideUm: 200 }, shardKey: "a" },
 *   { index: 1, label: "b", input: { annotationsPath: "missing.geojson", baseDir: demo },
 *     options: {}, shardKey: "b" },
 * ], { outDir, workers: 1, formats: ["json"], generatedAt: null });
 * Deno.removeSync(outDir, { recursive: true });
 * if (r.ok !== 1 || r.failed !== 1 || !r.outcomes[1].message?.includes("missing.geojson")) {
 *   throw new Error(JSON.stringify(r.outcomes));
 * }
 * ```
 */
export async function runBatch(
  cases: readonly BatchCase[],
  options: RunBatchOptions,
): Promise<BatchResult> {
  const outDir = resolve(options.outDir);
  if (existsSync(outDir) && !statSync(outDir).isDirectory()) {
    throw new Error(`Cannot write reports to "${options.outDir}": it is a file, not a folder`);
  }
  const formats = [...new Set(options.formats ?? ALL_FORMATS)];
  const standalone = options.standalone ?? false;
  const context: CaseRunContext = {
    outDir,
    formats,
    standalone,
    generatedAt: options.generatedAt !== undefined ? options.generatedAt : reportGenerationTime(),
    ...(options.mapScale ? { mapScale: options.mapScale } : {}),
  };
  const selected = options.shard ? selectShard(cases, options.shard) : [...cases];
  const notes: string[] = [];
  if (options.clearTemporary ?? !options.shard) removeTemporaryEntries(outDir);

  // What is done already: provenance key → case folders holding it.
  const done = new Map<string, { caseId: string; summary: CaseSummary }[]>();
  if (!options.force) {
    for (const report of readCaseReports(outDir).reports) {
      const key = provenanceKey(report.provenance);
      if (key === null) continue;
      const list = done.get(key) ?? [];
      list.push({ caseId: report.case, summary: reportSummary(report) });
      done.set(key, list);
    }
  }

  const n = selected.length;
  const at = new Map(selected.map((c, i) => [c.index, i]));
  const outcomes: (CaseOutcome | undefined)[] = new Array(n);
  const claims: Claim[] = selected.map(() => ({ kind: "pending" }));
  const skipAs: ({ caseId: string; summary: CaseSummary } | null)[] = new Array(n).fill(null);
  const jobs: CaseJob[] = [];
  for (const [i, c] of selected.entries()) {
    const sha = settingsSha256(
      c.options,
      { formats, standalone, mapScale: options.mapScale },
      c.input?.settings,
    );
    if (c.input !== null && !options.force) {
      const expected = await expectedProvenance(c.input, sha);
      const key = expected && provenanceKey(expected);
      const want = c.input.idOverride !== undefined ? safeCaseId(c.input.idOverride) : undefined;
      const match = key
        ? done.get(key)?.find((d) => want === undefined || d.caseId === want)
        : undefined;
      if (match) {
        skipAs[i] = match;
        continue;
      }
    }
    jobs.push({ case: c, settingsSha256: sha });
  }
  options.onPlan?.({ total: n, toRun: jobs.length });

  let history: RunHistory | undefined;
  if (options.history) {
    try {
      mkdirSync(outDir, { recursive: true });
    } catch (e) {
      throw new Error(
        `Cannot create the output folder "${options.outDir}": ${(e as Error).message}`,
      );
    }
    history = RunHistory.open(join(outDir, RUN_HISTORY_FILE), options.history);
  }
  const toRecord: { outcome: CaseOutcome; label: string }[] = [];
  // A commit waits for the disk (about 10 ms); commit at most once a second.
  let lastFlush = -Infinity;
  const flush = (final = false) => {
    if (!history || toRecord.length === 0) return;
    if (!final && performance.now() - lastFlush < 1000) return;
    lastFlush = performance.now();
    try {
      history.recordMany(toRecord.splice(0));
    } catch (e) {
      notes.push((e as Error).message);
      history = undefined;
    }
  };
  const emit = (outcome: CaseOutcome) => {
    const i = at.get(outcome.index)!;
    outcomes[i] = outcome;
    toRecord.push({ outcome, label: selected[i].label });
    options.onOutcome?.(outcome, selected[i]);
  };

  // Case ids are decided in source order (see the module documentation).
  // keyed without regard to case: ids that differ only by case would share
  // one folder on a case-insensitive file system
  const takenBy = new Map<string, { id: string; label: string }>();
  let cursor = 0;
  const settle = () => {
    while (cursor < n) {
      const claim = claims[cursor];
      if (claim.kind === "pending") break;
      if (claim.kind === "waiting") {
        const key = claim.caseId.toLowerCase();
        const earlier = takenBy.get(key);
        claims[cursor] = { kind: "decided" };
        if (earlier === undefined) {
          takenBy.set(key, { id: claim.caseId, label: selected[cursor].label });
        }
        claim.resolve(
          earlier === undefined
            ? null
            : earlier.id === claim.caseId
            ? `Case id "${claim.caseId}" is already the id of ${earlier.label}: give each case its own id`
            : `Case id "${claim.caseId}" differs only by case from "${earlier.id}", the id of ${earlier.label} (one folder on a case-insensitive file system): give each case its own id`,
        );
      }
      cursor++;
    }
    flush();
  };
  for (let i = 0; i < n; i++) {
    const c = selected[i], skip = skipAs[i];
    if (skip) {
      claims[i] = {
        kind: "waiting",
        caseId: skip.caseId,
        resolve: (denied) =>
          emit({
            index: c.index,
            status: denied === null ? "skipped" : "failed",
            caseId: skip.caseId,
            seconds: 0,
            message: denied,
            summary: denied === null ? skip.summary : null,
          }),
      };
    }
  }
  const claimFor = (index: number) => (caseId: string): Promise<string | null> =>
    new Promise((resolve) => {
      claims[at.get(index)!] = { kind: "waiting", caseId, resolve };
      settle();
    });
  const finished = (outcome: CaseOutcome) => {
    const i = at.get(outcome.index)!;
    if (claims[i].kind === "pending") claims[i] = { kind: "decided" };
    emit(outcome);
    settle();
  };
  settle();

  const workers = Math.max(
    1,
    Math.min(options.workers ?? navigator.hardwareConcurrency ?? 1, jobs.length),
  );
  if (workers <= 1) {
    for (const job of jobs) finished(await processCase(job, context, claimFor(job.case.index)));
  } else {
    await runInWorkers(jobs, context, workers, claimFor, finished);
  }
  settle();

  let cohortFiles: string[] = [];
  // With no case written and no folder yet there is nothing to list (and nothing is made).
  const anyReport = outcomes.some((o) => o?.report !== undefined);
  if ((options.cohort ?? !options.shard) && (existsSync(outDir) || anyReport)) {
    const found = readCaseReports(outDir);
    notes.push(...found.skipped.map((s) => `Passed over ${s}`));
    // This run's reports count even when report.json is not among the formats.
    const byCase = new Map(found.reports.map((r) => [r.case, r]));
    for (const o of outcomes) if (o?.report) byCase.set(o.report.case, o.report);
    const reports = [...byCase.values()].sort((a, b) =>
      a.case < b.case ? -1 : a.case > b.case ? 1 : 0
    );
    const wantHtml = formats.includes("html"), wantCsv = formats.includes("csv");
    if (wantHtml || wantCsv) {
      cohortFiles = writeCohortFiles(outDir, reports, {
        csv: wantCsv,
        html: wantHtml,
        standalone,
        generatedAt: context.generatedAt,
      });
    }
  }

  const final = outcomes as CaseOutcome[];
  const count = (s: CaseOutcome["status"]) => final.filter((o) => o.status === s).length;
  const result: BatchResult = {
    cases: selected,
    outcomes: final,
    ok: count("ok"),
    skipped: count("skipped"),
    failed: count("failed"),
    cohortFiles,
    notes,
  };
  flush(true);
  if (history) {
    try {
      history.finish(result.failed > 0 ? 1 : 0);
    } catch (e) {
      notes.push((e as Error).message);
    }
    history.close();
  }
  return result;
}

/** Runs `jobs` in `count` Web Workers, handing out the next job as each ends. */
function runInWorkers(
  jobs: readonly CaseJob[],
  context: CaseRunContext,
  count: number,
  claimFor: (index: number) => (caseId: string) => Promise<string | null>,
  finished: (outcome: CaseOutcome) => void,
): Promise<void> {
  return new Promise((resolveAll) => {
    let next = 0, left = jobs.length;
    const url = new URL("./_case_worker.ts", import.meta.url);
    const start = () => {
      const worker = new Worker(url, { type: "module" });
      let current: CaseJob | null = null;
      const handOut = () => {
        if (next < jobs.length) {
          current = jobs[next++];
          worker.postMessage({ type: "case", job: current, context });
        } else {
          current = null;
          worker.terminate();
        }
      };
      const end = (outcome: CaseOutcome) => {
        finished(outcome);
        if (--left === 0) resolveAll();
      };
      worker.onmessage = (event: MessageEvent) => {
        const msg = event.data as
          | { type: "claim"; index: number; caseId: string }
          | { type: "done"; outcome: CaseOutcome };
        if (msg.type === "claim") {
          claimFor(msg.index)(msg.caseId).then((denied) =>
            worker.postMessage({ type: "claimed", index: msg.index, denied })
          );
        } else {
          end(msg.outcome);
          handOut();
        }
      };
      worker.onerror = (event: ErrorEvent) => {
        // A worker that dies (out of memory, say) fails its case; a new one takes over.
        event.preventDefault();
        worker.terminate();
        const job = current;
        current = null;
        if (job) {
          end({
            index: job.case.index,
            status: "failed",
            caseId: null,
            seconds: 0,
            message: `The worker running this case stopped: ${event.message}`,
            summary: null,
          });
        }
        if (next < jobs.length) start();
      };
      handOut();
    };
    for (let k = 0; k < count; k++) start();
  });
}
