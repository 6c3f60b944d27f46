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

// Input limits: inputs beyond them are refused with a message giving the size
// and the limit (README, "Input limits"), so that no file makes a run take
// unbounded time or memory.

/**
 * Largest annotation GeoJSON or figures CSV read, bytes (500 MiB). A text of
 * more than about 512 Mi characters cannot be held as one string.
 */
export const MAX_TEXT_INPUT_BYTES = 500 * 1024 * 1024;

/** Largest case file read, bytes (1 MiB; a case file only names files and settings). */
export const MAX_CASE_FILE_BYTES = 1024 * 1024;

/** Largest PNG tissue mask file read, bytes (256 MiB). */
export const MAX_MASK_FILE_BYTES = 256 * 1024 * 1024;

/**
 * Largest decoded image, pixels (width × height): a PNG tissue mask or a
 * PNG/JPEG slide thumbnail. 100 megapixels is e.g. 12,500 × 8,000: a 75 ×
 * 25 mm slide at 6 µm per pixel, or a 30 × 20 mm tissue area at 2.4 µm. A
 * PNG's header is read first, so a larger image is refused before it is
 * decoded.
 */
export const MAX_IMAGE_PIXELS = 100_000_000;

/**
 * Most JSON objects and arrays in one annotation or case file (every
 * position is an array). Checked in one pass before the text is parsed.
 */
export const MAX_JSON_CONTAINERS = 12_000_000;

/**
 * Most polygon positions in a case's outlines: the annotation file's region
 * and field outlines together, and the traced tissue mask on top of them.
 * Beyond about this many the valid region needs more than a minute or some
 * gigabytes of memory.
 */
export const MAX_REGION_VERTICES = 3_000_000;

/** Most figure points read for one case (GeoJSON figure positions or figures CSV rows). */
export const MAX_FIGURE_POINTS = 5_000_000;

/**
 * Most figures counted in one report (after the score, label and region
 * filters); a report over this limit is refused before any grid is sized
 * (`inspect` still reads the case). The placement search's own limit,
 * {@linkcode MAX_SEARCH_WORK}, stops the cases that are slow for their
 * spread rather than their number.
 */
export const MAX_COUNTED_FIGURES = 1_000_000;

/**
 * Most work, in figure tests, of the exact placement searches on one count
 * grid (the hotspot with the top windows, or the best field set). Clustered
 * figures, even a million of them, need a small part of it; figures spread
 * evenly and densely (no window stands out) can need far more, and are
 * stopped here with a message rather than left running for minutes.
 */
export const MAX_SEARCH_WORK = 750_000_000;

/**
 * Farthest a position may lie from the slide origin, mm, along x or y (a
 * glass slide is 75 mm long; common practice). Positions beyond it are
 * refused as implausible before any grid is sized.
 */
export const MAX_SLIDE_EXTENT_MM = 100;
