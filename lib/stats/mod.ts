/** stats concern barrel: re-exports only. @module */
export * from "./quantiles.ts";
export * from "./garwood.ts";
export * from "./chi_square.ts";
export * from "./scan_test.ts";
export * from "./kappa.ts";
