/**
 * hotfield: standardized-area mitotic counting on whole-slide annotations.
 *
 * Slide coordinates are level-0 pixels (x right, y down); areas are reported
 * in mm², lengths in µm. Each concern has its own barrel file; this entry
 * re-exports them all.
 *
 * @module
 */

export * from "./types.ts";
export * from "./units.ts";
export * from "./errors.ts";
export { writeFileAtomic } from "./io/write_atomic.ts";
export { HOTFIELD_VERSION } from "./version.ts";
export * from "./report/report_types.ts";
export * from "./count/engine_types.ts";
export * from "./annotations/mod.ts";
export * from "./geometry/mod.ts";
export * from "./tissue/mod.ts";
export * from "./count/mod.ts";
export * from "./stats/mod.ts";
export * from "./standards/mod.ts";
export * from "./report/mod.ts";
export * from "./display/mod.ts";
export * from "./demo/mod.ts";
