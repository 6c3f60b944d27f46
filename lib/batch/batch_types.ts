/**
 * Plain data shared by the batch runner, its workers and the commands: a
 * case to run, and what became of it.
 *
 * @module
 */

import type { CaseInput } from "../annotations/read_case.ts";
import type { ReportOptions } from "../pipeline/case_result.ts";
import type { ReportJson } from "../pipeline/report_types.ts";
import type { OutputFormat } from "../report/case_folder.ts";

/** One case of a batch source (a manifest row, a file of a folder, a FILE argument). */
export interface BatchCase {
  /** Position in the source, from 0: the order in which case ids are given out. */
  index: number;
  /** How messages name the case: `manifest.csv row 4`, or the file as given. */
  label: string;
  /**
   * The case to read: paths as written, read against `input.baseDir`. Null
   * when the case cannot even be described (see `problem`).
   */
  input: CaseInput | null;
  /** Why the case fails before it is read (an unreadable case file, say). */
  problem?: string;
  /** Report options of this case: the command line's, with the row's own `scheme` and `min_score`. */
  options: ReportOptions;
  /** What orders cases for `--shard`: the case's main file as written, then its id cell. */
  shardKey: string;
}

/** How a run writes each case folder (the same for every case of a run). */
export interface CaseRunContext {
  /** The output folder, absolute. */
  outDir: string;
  /** Formats written per case (and for the cohort). */
  formats: OutputFormat[];
  /** Inline plotly.js into every page instead of sharing `assets/plotly.min.js`. */
  standalone: boolean;
  /** Generation time shown in the pages, or null. */
  generatedAt: string | null;
  /** Colour scale of the count maps. @default "linear" */
  mapScale?: "linear" | "sqrt";
}

/** A case with what the runner worked out for it, as sent to a worker. */
export interface CaseJob {
  case: BatchCase;
  /** Hex sha256 of the case's canonical settings. */
  settingsSha256: string;
}

/** What a report says, in a few numbers for logs and the run history. */
export interface CaseSummary {
  /** Figures in the hotspot window, or null when no window is admissible. */
  hotspotCount: number | null;
  /** Hotspot density, figures per mm², or null. */
  perMm2: number | null;
  /** Admissible grid positions. */
  positions: number;
  /** The scheme classified against, or null. */
  scheme: string | null;
  /** The class under that scheme, or null. */
  class: string | null;
  /** The tier, when the scheme has tiers. */
  tier: string | null;
}

/** What became of one case. */
export interface CaseOutcome {
  /** {@linkcode BatchCase.index}. */
  index: number;
  /** Written (`ok`), done before with the same inputs (`skipped`), or `failed`. */
  status: "ok" | "skipped" | "failed";
  /** The case id (the folder name), when it got that far. */
  caseId: string | null;
  /** Wall time of the case, seconds (0 for skipped). */
  seconds: number;
  /** Why it failed (null unless failed). */
  message: string | null;
  /** True when it failed because of an option (e.g. a stride too fine for this case). */
  usage?: boolean;
  /** The report's headline, for ok and skipped cases. */
  summary: CaseSummary | null;
  /** The report written (ok cases only). */
  report?: ReportJson;
}
