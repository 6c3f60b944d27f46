export { normal, seededRandom } from "./random.ts";
export type { Random } from "./random.ts";
