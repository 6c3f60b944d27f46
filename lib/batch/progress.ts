/**
 * Progress of a batch run: on a terminal one live bar (cases done of the
 * total, failures, time left); elsewhere (cron, a log file) one timestamped
 * line per case. Times here are the real clock: logs are not reports.
 *
 * @module
 */

import type { BatchCase, CaseOutcome } from "./batch_types.ts";

/** What a run tells its progress display. */
export interface ProgressReporter {
  /** The run knows its cases: `total` in all, `toRun` to compute (the rest are skipped). */
  plan(plan: { total: number; toRun: number }): void;
  /** A case ended. */
  outcome(outcome: CaseOutcome, batchCase: BatchCase): void;
  /** The run ended: clear the bar, stop timers. */
  finish(): void;
}

/** ISO 8601 UTC to the second. */
function stamp(date: Date): string {
  return date.toISOString().replace(/\.\d{3}Z$/, "Z");
}

/**
 * One line of the per-case log (no line break).
 *
 * @param outcome What became of the case.
 * @param batchCase The case.
 * @param now The time to stamp.
 * @returns E.g. `2026-01-05T02:00:03Z ok      QVT-24-001  1.23 s  hotspot 12 (5.0633 /mm²)`.
 *
 * @example A skipped case
 * ```ts
 * import { caseLine } from "./progress.ts";
 * const line = caseLine(
 *   { index: 0, status: "skipped", caseId: "QVT-24-001", seconds: 0, message: null, summary: null },
 *   { index: 0, label: "row 2 (a.geojson)", input: null, options: {}, shardKey: "" },
 *   new Date(0),
 * );
 * if (line !== "1970-01-01T00:00:00Z skipped QVT-24-001  unchanged") throw new Error(line);
 * ```
 */
export function caseLine(outcome: CaseOutcome, batchCase: BatchCase, now: Date): string {
  const head = `${stamp(now)} ${outcome.status.padEnd(7)}`;
  if (outcome.status === "failed") {
    return `${head} ${batchCase.label}: ${oneLine(outcome.message ?? "failed")}`;
  }
  if (outcome.status === "skipped") return `${head} ${outcome.caseId}  unchanged`;
  const s = outcome.summary;
  const hotspot = s?.hotspotCount == null
    ? "no admissible window"
    : `hotspot ${s.hotspotCount} (${s.perMm2} /mm²)`;
  const cls = s?.class ? `  ${s.class}${s.tier ? ` (${s.tier})` : ""}` : "";
  return `${head} ${outcome.caseId}  ${outcome.seconds.toFixed(2)} s  ${hotspot}${cls}`;
}

function oneLine(text: string): string {
  return text.replace(/\s*\n\s*/g, " | ");
}

/**
 * A reporter writing one timestamped line per case, and one line when the
 * run knows its cases.
 *
 * @param write Where lines go (each ends in a line break).
 * @param now The clock.
 * @returns The reporter.
 *
 * @example The line a run starts with
 * ```ts
 * import { lineProgress } from "./progress.ts";
 * const out: string[] = [];
 * const p = lineProgress((s) => out.push(s), () => new Date(0));
 * p.plan({ total: 3, toRun: 1 });
 * if (out[0] !== "1970-01-01T00:00:00Z batch: 3 cases, 1 to run, 2 unchanged\n") throw new Error(out[0]);
 * ```
 */
export function lineProgress(
  write: (text: string) => void,
  now: () => Date = () => new Date(),
): ProgressReporter {
  return {
    plan: ({ total, toRun }) =>
      write(
        `${stamp(now())} batch: ${total} case${total === 1 ? "" : "s"}, ${toRun} to run, ${
          total - toRun
        } unchanged\n`,
      ),
    outcome: (o, c) => write(caseLine(o, c, now()) + "\n"),
    finish: () => {},
  };
}

/**
 * The live bar's text: `[██████······] 12/24  1 failed  ETA 0:42`.
 *
 * @param state Cases done and in all, failures, seconds left (null: not known yet).
 * @param width Bar width in characters.
 * @returns One line without a line break.
 *
 * @example Half done, one failure
 * ```ts
 * import { formatBar } from "./progress.ts";
 * const bar = formatBar({ done: 5, total: 10, failed: 1, etaSeconds: 75 }, 10);
 * if (bar !== "batch [█████·····] 5/10  1 failed  ETA 1:15") throw new Error(bar);
 * ```
 */
export function formatBar(
  state: { done: number; total: number; failed: number; etaSeconds: number | null },
  width = 30,
): string {
  const frac = state.total === 0 ? 1 : state.done / state.total;
  const full = Math.round(frac * width);
  const eta = state.etaSeconds === null ? "…" : clock(state.etaSeconds);
  const failed = state.failed > 0 ? `  ${state.failed} failed` : "";
  return `batch [${"█".repeat(full)}${
    "·".repeat(width - full)
  }] ${state.done}/${state.total}${failed}  ETA ${eta}`;
}

function clock(seconds: number): string {
  const s = Math.max(0, Math.round(seconds));
  const h = Math.floor(s / 3600), m = Math.floor((s % 3600) / 60), r = s % 60;
  const mm = h > 0 ? String(m).padStart(2, "0") : String(m);
  return `${h > 0 ? `${h}:` : ""}${mm}:${String(r).padStart(2, "0")}`;
}

/**
 * A reporter drawing one live bar on a terminal (redrawn as cases end and
 * once a second); failures are printed above it as they happen.
 *
 * @param write Where the bar goes (a terminal).
 * @param now The clock, in ms.
 * @param tick Redraw once a second (for the time left) besides when cases end.
 * @returns The reporter.
 *
 * @example A bar drawn into a collector
 * ```ts
 * import { barProgress } from "./progress.ts";
 * const out: string[] = [];
 * const p = barProgress((s) => out.push(s), () => 0, false);
 * p.plan({ total: 2, toRun: 2 });
 * p.finish();
 * if (!out.join("").includes("0/2")) throw new Error(`the bar shows 0 of 2 done: ${JSON.stringify(out)}`);
 * ```
 */
export function barProgress(
  write: (text: string) => void,
  now: () => number = () => performance.now(),
  tick = true,
): ProgressReporter {
  let total = 0, toRun = 0, done = 0, computed = 0, failed = 0;
  let started = now();
  let timer: ReturnType<typeof setInterval> | undefined;
  const draw = () => {
    const elapsed = (now() - started) / 1000;
    const eta = computed === 0 ? null : (elapsed / computed) * (toRun - computed);
    write(`\r\x1b[2K${formatBar({ done, total, failed, etaSeconds: eta })}`);
  };
  return {
    plan: (p) => {
      total = p.total;
      toRun = p.toRun;
      done = total - toRun;
      started = now();
      draw();
      if (tick) timer = setInterval(draw, 1000);
    },
    outcome: (o, c) => {
      if (o.status === "skipped") return; // counted in the plan
      done = Math.min(total, done + 1);
      computed = Math.min(toRun, computed + 1);
      if (o.status === "failed") {
        failed++;
        write(`\r\x1b[2K${caseLine(o, c, new Date())}\n`);
      }
      draw();
    },
    finish: () => {
      if (timer !== undefined) clearInterval(timer);
      write("\r\x1b[2K");
    },
  };
}
