/**
 * Standards concern: field optics, grading schemes as data, case classes and
 * counting uncertainty (exact Poisson limits, scan test).
 *
 * @module
 */
export type * from "./scheme_types.ts";
export { getScheme, listSchemes } from "./list_schemes.ts";
export {
  convertCount,
  digitalFieldArea,
  type DigitalFieldOptions,
  type FieldOfView,
  fieldOfView,
  type FieldOfViewOptions,
  fieldsForArea,
  MAX_FIELD_DIAMETER_MM,
} from "./field_of_view.ts";
export {
  NOTTINGHAM_REFERENCE_FIELD_MM2,
  type NottinghamCutoffs,
  nottinghamCutoffs,
  nottinghamScore,
  nottinghamTable,
} from "./nottingham.ts";
export {
  areaFactor,
  basisAreaMm2,
  classifyCounts,
  type ClassifyCountsInput,
  type ClassifyOptions,
  classifyReport,
  describeBasis,
  meetsBound,
  minCountFor,
  rateForBasis,
  SAME_AREA_TOLERANCE,
  tierForRate,
} from "./classify.ts";
export { countUncertainty, type CountUncertaintyOptions } from "./uncertainty.ts";
export {
  applyStandards,
  type ApplyStandardsInput,
  type ApplyStandardsOptions,
} from "./apply_standards.ts";
export { garwoodInterval, poissonCdf, pOtherSide } from "../stats/garwood.ts";
export { chiSquareCdf, chiSquareQuantile, regularizedGammaP } from "../stats/chi_square.ts";
export {
  SCAN_SIMULATIONS_MAX,
  SCAN_SIMULATIONS_MIN,
  scanTest,
  type ScanTestInput,
  type ScanTestOptions,
  type ScanTestResult,
} from "../stats/scan_test.ts";
