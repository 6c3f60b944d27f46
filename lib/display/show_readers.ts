/**
 * Rich display of a reader's fields across a cohort in Jupyter notebooks
 * (the readers page's plots, as plotly mime bundles).
 *
 * @module
 */

import type { ReaderAuditRow } from "../cohort/reader_audit.ts";
import { readerPercentileFigure, readerTimeFigure } from "../report/reader_plots.ts";
import {
  type Displayable,
  JUPYTER_DISPLAY,
  plotlyMimeBundle,
  type ShowPlotOptions,
} from "./show.ts";

/**
 * Shows one reader's fields across cases (percentile of each field in its
 * case) and, when the reader has dated fields, their percentile over time.
 *
 * @param row One row of `readerAudit(reports)`.
 * @param options plotly.js inlining.
 * @returns A displayable object; its bundle holds the plot over time when
 *   there are dated fields, else the plot across cases.
 *
 * @example A reader with one dated field
 * ```ts
 * import { JUPYTER_DISPLAY, readerAudit } from "hotfield";
 * import type { AuditReport } from "../cohort/reader_audit.ts";
 * import { showReaderFields } from "./show_readers.ts";
 * const report = (id: string, count: number, date?: string): AuditReport => ({
 *   case: id, window: { area_mm2: 2.37 }, hotspot: { count: 9 },
 *   distribution: { positions: 100, median: 2, q3: 4 },
 *   fields: [{ reader: "trainee-1", count, percentile: count * 10, ...(date ? { date } : {}) }],
 *   classification: null,
 * });
 * const [row] = readerAudit([report("QVT-24-001", 3, "2024-01-15")]);
 * const shown = showReaderFields(row, { inlinePlotly: "never" });
 * const json = shown[JUPYTER_DISPLAY]()["application/vnd.plotly.v1+json"] as { layout: { xaxis: { type: string } } };
 * if (json.layout.xaxis.type !== "date") throw new Error(`a dated field is plotted over time, not on a ${json.layout.xaxis.type} axis`);
 * ```
 */
export function showReaderFields(
  row: Pick<ReaderAuditRow, "entries">,
  options: ShowPlotOptions = {},
): Displayable {
  const figure = readerTimeFigure(row) ?? readerPercentileFigure(row);
  return { [JUPYTER_DISPLAY]: () => plotlyMimeBundle(figure, options) } as Displayable;
}
