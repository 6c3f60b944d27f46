/**
 * Every default of hotfield in one place: the library, the command line's
 * help text and the docs all read these constants.
 *
 * @module
 */

/** Counting window area, mm²: the veterinary standard of 10 fields of FN 22 at 40× (Meuten et al. 2016). */
export const DEFAULT_WINDOW_AREA_MM2 = 2.37;

/** Rectangle window aspect, width : height (a 4:3 screen field). */
export const DEFAULT_ASPECT: readonly [number, number] = [4, 3];

/** Spacing of the grid of window centres, µm. */
export const DEFAULT_STRIDE_UM = 25;

/** Least fraction of a window inside the valid region for a placement to count. */
export const DEFAULT_MIN_COVERAGE = 0.95;

/** Least figure score that is counted (figures without a score always pass). */
export const DEFAULT_MIN_SCORE = 0;

/** The figure label that is counted, and the label of a figure given none. */
export const DEFAULT_COUNT_LABEL = "mitotic figure";

/** The figure labels that are counted. */
export const DEFAULT_COUNT_LABELS: readonly string[] = [DEFAULT_COUNT_LABEL];

/** Separate top windows reported. */
export const DEFAULT_TOP = 3;

/** Single fields in the best field set (0 skips it). */
export const DEFAULT_BEST_N = 10;

/** Area of one single field, mm²: FN 22 at 40×, π·0.275² = 0.23758 rounded. */
export const DEFAULT_FIELD_AREA_MM2 = 0.2376;

/** Monte Carlo simulations of the scan test. */
export const DEFAULT_SIMULATIONS = 999;

/** Seed of the scan test's simulations. */
export const DEFAULT_SEED = 1;

/** Largest count grid, in cells, before a run is refused as too fine. */
export const DEFAULT_MAX_GRID_CELLS = 25_000_000;
