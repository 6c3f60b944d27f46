/**
 * Writes the invented demo cohort to a folder (default `data/demo/`):
 * `deno task demo:data`, or
 * `deno run --allow-read --allow-write lib/demo/write_demo_data.ts [--out DIR] [--seed N]`.
 *
 * @module
 */

import { join } from "node:path";
import { parseArgs } from "node:util";
import { writeFileAtomic } from "../io/write_atomic.ts";
import { DEMO_SEED, generateDemoCohort } from "./demo_cohort.ts";
import { demoCohortFiles } from "./demo_files.ts";

/**
 * Generates the cohort from `seed` and writes every file under `outDir`.
 *
 * @param outDir Target folder (created as needed).
 * @param seed Generator seed. @default DEMO_SEED
 * @returns The paths written.
 *
 * @example Writing into a temporary folder (needs write permission)
 * ```ts
 * import { writeDemoData } from "./write_demo_data.ts";
 * if ((await Deno.permissions.query({ name: "write" })).state === "granted") {
 *   const dir = Deno.makeTempDirSync();
 *   const paths = writeDemoData(dir);
 *   if (!paths.some((p) => p.endsWith("README.md"))) throw new Error(`no README among ${paths.length} files`);
 *   Deno.removeSync(dir, { recursive: true });
 * }
 * ```
 */
export function writeDemoData(outDir: string, seed: number = DEMO_SEED): string[] {
  const written: string[] = [];
  for (const file of demoCohortFiles(generateDemoCohort(seed), seed)) {
    const path = join(outDir, file.path);
    writeFileAtomic(path, file.bytes);
    written.push(path);
  }
  return written;
}

if (import.meta.main) {
  const { values } = parseArgs({
    args: Deno.args,
    options: { out: { type: "string" }, seed: { type: "string" } },
  });
  const outDir = values.out ?? join(import.meta.dirname ?? ".", "..", "..", "data", "demo");
  const seed = values.seed === undefined ? DEMO_SEED : Number(values.seed);
  if (!Number.isInteger(seed)) {
    console.error(`Option --seed needs an integer: got "${values.seed}"`);
    Deno.exit(2);
  }
  const paths = writeDemoData(outDir, seed);
  let bytes = 0;
  for (const p of paths) bytes += Deno.statSync(p).size;
  console.log(`Wrote ${paths.length} files (${(bytes / 1024).toFixed(0)} KiB) to ${outDir}`);
}
