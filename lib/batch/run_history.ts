/**
 * The run history `DIR/runs.sqlite`, through the SQLite built into Deno
 * (`node:sqlite`; no server, nothing to install).
 *
 * Tables (the first columns of each are the contract; the rest are beside it):
 *
 * ```sql
 * runs(run_id, started_at, finished_at, hotfield_version, ok, skipped, failed,
 *      source, shard, workers, forced, exit_code)
 * case_runs(run_id, case_id, status, seconds, message,
 *           label, finished_at, scheme, class, tier, hotspot_count)
 * ```
 *
 * Times are ISO 8601 UTC text (`2026-01-05T02:00:03Z`, the real clock: the
 * history is a log, not a report). `status` is `ok`, `skipped` or `failed`;
 * `case_id` is null for a case that failed before its id was known (`label`
 * names it then). A run with no `finished_at` was interrupted. Cases are
 * committed as they end, at most once a second, so the history of a killed
 * run is kept up to about its last second.
 *
 * @module
 */

import { DatabaseSync } from "node:sqlite";
import { HOTFIELD_VERSION } from "../version.ts";
import type { CaseOutcome } from "./batch_types.ts";

/** File name of the run history inside the output folder. */
export const RUN_HISTORY_FILE = "runs.sqlite";

const SCHEMA = `
CREATE TABLE IF NOT EXISTS runs (
  run_id INTEGER PRIMARY KEY,
  started_at TEXT NOT NULL,
  finished_at TEXT,
  hotfield_version TEXT NOT NULL,
  ok INTEGER NOT NULL DEFAULT 0,
  skipped INTEGER NOT NULL DEFAULT 0,
  failed INTEGER NOT NULL DEFAULT 0,
  source TEXT,
  shard TEXT,
  workers INTEGER,
  forced INTEGER,
  exit_code INTEGER
);
CREATE TABLE IF NOT EXISTS case_runs (
  run_id INTEGER NOT NULL REFERENCES runs(run_id),
  case_id TEXT,
  status TEXT NOT NULL CHECK (status IN ('ok', 'skipped', 'failed')),
  seconds REAL NOT NULL,
  message TEXT,
  label TEXT,
  finished_at TEXT,
  scheme TEXT,
  class TEXT,
  tier TEXT,
  hotspot_count INTEGER
);
CREATE INDEX IF NOT EXISTS case_runs_by_case ON case_runs(case_id);
CREATE INDEX IF NOT EXISTS case_runs_by_run ON case_runs(run_id);
`;

/** What a run records about itself at the start. */
export interface RunInfo {
  /** The SOURCE argument as given. */
  source: string;
  /** `K/N`, or null for an unsharded run. */
  shard: string | null;
  /** `--workers`. */
  workers: number;
  /** Whether `--force` was given. */
  forced: boolean;
}

/** ISO 8601 UTC to the second. */
export function isoSeconds(date: Date = new Date()): string {
  return date.toISOString().replace(/\.\d{3}Z$/, "Z");
}

/**
 * An open run history: one run's rows, written as the run goes.
 *
 * @example Recording a run with one case
 * ```ts
 * import { RunHistory } from "./run_history.ts";
 * const dir = Deno.makeTempDirSync();
 * const h = RunHistory.open(`${dir}/runs.sqlite`, { source: "m.csv", shard: null, workers: 1, forced: false });
 * h.record({ index: 0, status: "ok", caseId: "QVT-24-001", seconds: 1.5, message: null, summary: null }, "a.geojson");
 * h.finish(0);
 * const n = h.query("SELECT count(*) AS n FROM case_runs")[0].n;
 * h.close();
 * Deno.removeSync(dir, { recursive: true });
 * if (n !== 1) throw new Error(`one case recorded, found ${n}`);
 * ```
 */
export class RunHistory {
  #db: DatabaseSync;
  #path: string;
  /** This run's id. */
  readonly runId: number;
  /** Cases recorded so far, by status. */
  readonly counts = { ok: 0, skipped: 0, failed: 0 };

  private constructor(db: DatabaseSync, path: string, runId: number) {
    this.#db = db;
    this.#path = path;
    this.runId = runId;
  }

  /**
   * Opens (creating when missing) the history at `path` and starts a run.
   *
   * @param path The sqlite file.
   * @param info What the run records about itself.
   * @returns The open history.
   * @throws {Error} Naming the file when it cannot be opened or is not a run history.
   */
  static open(path: string, info: RunInfo): RunHistory {
    let db: DatabaseSync | undefined;
    try {
      db = new DatabaseSync(path);
      // Shards of one run may write at once; wait for each other's commits.
      db.exec("PRAGMA busy_timeout = 30000");
      db.exec(SCHEMA);
      const r = db.prepare(
        "INSERT INTO runs (started_at, hotfield_version, source, shard, workers, forced) " +
          "VALUES (?, ?, ?, ?, ?, ?)",
      ).run(
        isoSeconds(),
        HOTFIELD_VERSION,
        info.source,
        info.shard,
        info.workers,
        info.forced ? 1 : 0,
      );
      return new RunHistory(db, path, Number(r.lastInsertRowid));
    } catch (e) {
      db?.close();
      throw new Error(`Cannot open the run history "${path}": ${(e as Error).message}`);
    }
  }

  /**
   * Records one case (committed at once) and the run's running counts.
   *
   * @param outcome What became of the case.
   * @param label How the source names the case.
   */
  record(outcome: CaseOutcome, label: string): void {
    this.recordMany([{ outcome, label }]);
  }

  /**
   * Records several cases in one transaction.
   *
   * @param items Outcomes with their labels.
   */
  recordMany(items: readonly { outcome: CaseOutcome; label: string }[]): void {
    if (items.length === 0) return;
    const insert = this.#db.prepare(
      "INSERT INTO case_runs (run_id, case_id, status, seconds, message, label, finished_at, " +
        "scheme, class, tier, hotspot_count) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
    );
    const now = isoSeconds();
    this.#write(() => {
      this.#db.exec("BEGIN IMMEDIATE");
      try {
        for (const { outcome: o, label } of items) {
          const s = o.summary;
          insert.run(
            this.runId,
            o.caseId,
            o.status,
            o.seconds,
            o.message,
            label,
            now,
            s?.scheme ?? null,
            s?.class ?? null,
            s?.tier ?? null,
            s?.hotspotCount ?? null,
          );
          this.counts[o.status]++;
        }
        this.#db.prepare("UPDATE runs SET ok = ?, skipped = ?, failed = ? WHERE run_id = ?")
          .run(this.counts.ok, this.counts.skipped, this.counts.failed, this.runId);
        this.#db.exec("COMMIT");
      } catch (e) {
        this.#db.exec("ROLLBACK");
        throw e;
      }
    });
  }

  /**
   * Marks the run finished.
   *
   * @param exitCode The command's exit code.
   */
  finish(exitCode: number): void {
    this.#write(() =>
      this.#db.prepare("UPDATE runs SET finished_at = ?, exit_code = ? WHERE run_id = ?")
        .run(isoSeconds(), exitCode, this.runId)
    );
  }

  /**
   * Runs a read-only query (for tests and tools).
   *
   * @param sql The query.
   * @param params Its parameters.
   * @returns The rows as plain objects.
   */
  query(sql: string, ...params: (string | number | null)[]): Record<string, unknown>[] {
    return this.#db.prepare(sql).all(...params) as Record<string, unknown>[];
  }

  /** Closes the file. */
  close(): void {
    this.#db.close();
  }

  #write(fn: () => void): void {
    try {
      fn();
    } catch (e) {
      throw new Error(`Cannot write the run history "${this.#path}": ${(e as Error).message}`);
    }
  }
}
