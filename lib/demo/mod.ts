/** demo concern barrel: seeded generators of the demo cohort and the benchmark slide. @module */
export { normal, seededRandom } from "../random.ts";
export type { Random } from "../random.ts";
export { DEMO_SEED, generateDemoCohort } from "./demo_cohort.ts";
export type {
  DemoCase,
  DemoFeature,
  DemoFeatureCollection,
  DemoFigureRow,
  DemoGeometry,
  DemoMask,
  DemoSlide,
} from "./demo_cohort.ts";
export {
  caseFileObject,
  demoCohortFiles,
  demoFileNames,
  demoReadme,
  featureCollectionText,
  figuresCsvText,
  maskPngBytes,
} from "./demo_files.ts";
export type { DemoFile } from "./demo_files.ts";
export { writeDemoData } from "./write_demo_data.ts";
export { benchSlideGeoJson, generateBenchSlide } from "./bench_slide.ts";
export type { BenchSlide, BenchSlideOptions } from "./bench_slide.ts";
export { demoCaseInputs, runDemo, summaryLine } from "./run_demo.ts";
export type { RunDemoOptions } from "./run_demo.ts";
