/**
 * hotfield: standardized-area mitotic counting on whole-slide annotations.
 *
 * Slide coordinates are level-0 pixels (x right, y down); areas are reported
 * in mm², lengths in µm.
 *
 * @module
 */

export * from "./types.ts";
export * from "./units.ts";
export * from "./errors.ts";
export { writeFileAtomic } from "./io/write_atomic.ts";
export { HOTFIELD_VERSION } from "./version.ts";
export * from "./report/report_types.ts";
// --- annotations (reader) ---
// --- geometry ---
// --- tissue masks ---
// --- count engine ---
// --- standards and statistics ---
// --- reports and display ---
