/**
 * Import rules of lib/: layers point down, no file cycles.
 *
 * Every file of lib/ belongs to a layer (by folder, or by name for the base
 * files). A file may import files of a lower layer and files of its own
 * folder; anything else is an upward or sideways import. A private file
 * (`_name.ts`) is imported only from its own folder. Cycles between files
 * are refused too, type-only imports included, because a type cycle still
 * ties two modules together.
 *
 * Usage:
 *   deno task layers          print the layer graph (folder → folders it imports)
 *   deno task layers --check  exit 1 listing each violation
 *
 * @module
 */

import { readdirSync, readFileSync, statSync } from "node:fs";
import { basename, dirname, join, normalize, relative } from "node:path";
import { fileURLToPath } from "node:url";

/** Layers, lowest first. A key is a folder of lib/ or a base file. */
export const LAYERS: readonly (readonly string[])[] = [
  ["types.ts", "errors.ts", "version.ts", "random.ts", "numbers.ts"],
  ["units.ts", "defaults.ts", "io"],
  ["geometry", "stats"],
  ["tissue", "slide"],
  ["annotations"],
  ["count"],
  ["standards"],
  ["pipeline", "compare", "cohort"],
  ["report"],
  ["batch", "display"],
  ["demo"],
  ["cli"],
  ["cli.ts", "mod.ts"],
];

const LIB = normalize(join(dirname(fileURLToPath(import.meta.url)), "..", "lib"));

/** The layer key of a path relative to lib/ (its first folder, or the file name). */
export function layerKey(rel: string): string {
  return rel.split("/")[0];
}

/** Rank of a layer key; throws for a folder or base file that is in no layer. */
export function rankOf(key: string): number {
  const rank = LAYERS.findIndex((keys) => keys.includes(key));
  if (rank < 0) {
    throw new Error(`lib/${key} is in no layer: add it to LAYERS in tools/layers.ts`);
  }
  return rank;
}

function listTs(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir).sort()) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) out.push(...listTs(path));
    else if (name.endsWith(".ts")) out.push(path);
  }
  return out;
}

const SPEC =
  /(?:^|[\s;}])(?:import|export)\s[^;]*?from\s*["'](\.{1,2}\/[^"']+)["']|import\(\s*["'](\.{1,2}\/[^"']+)["']\s*\)/g;

/** Relative imports of one file's source, as paths relative to lib/. */
export function importsOf(file: string, source: string): string[] {
  // Drop comments first so JSDoc examples (which import by path) do not count.
  const code = source.replace(/\/\*[\s\S]*?\*\//g, "").replace(/^\s*\/\/.*$/gm, "");
  const out = new Set<string>();
  for (const m of code.matchAll(SPEC)) {
    const spec = m[1] ?? m[2];
    out.add(relative(LIB, normalize(join(dirname(file), spec))));
  }
  return [...out].sort();
}

interface Graph {
  files: string[];
  edges: Map<string, string[]>;
}

function readGraph(): Graph {
  const files = listTs(LIB).map((f) => relative(LIB, f));
  const edges = new Map<string, string[]>();
  for (const f of files) edges.set(f, importsOf(join(LIB, f), readFileSync(join(LIB, f), "utf8")));
  return { files, edges };
}

/** Every violation of the rules, in words. */
export function violations(graph: Graph): string[] {
  const out: string[] = [];
  for (const [from, tos] of graph.edges) {
    for (const to of tos) {
      if (to.startsWith("..")) {
        out.push(`${from} imports ${to}, outside lib/`);
        continue;
      }
      const a = layerKey(from), b = layerKey(to);
      const ownFolder = dirname(to) === dirname(from) || dirname(to) === from.replace(/\.ts$/, "");
      if (basename(to).startsWith("_") && !ownFolder) {
        out.push(`lib/${from} imports lib/${to}, a private file of another folder`);
      }
      if (a === b) continue;
      const ra = rankOf(a), rb = rankOf(b);
      if (rb >= ra) {
        out.push(
          `lib/${from} (layer ${ra}, ${a}) imports lib/${to} (layer ${rb}, ${b}): ` +
            (rb === ra ? "sideways" : "upward"),
        );
      }
    }
  }
  out.push(...cycles(graph).map((c) => `cycle: ${c.map((f) => `lib/${f}`).join(" → ")}`));
  return out;
}

/** File cycles (Tarjan's strongly connected components of more than one file, or a self-import). */
function cycles(graph: Graph): string[][] {
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const found: string[][] = [];
  const visit = (v: string) => {
    index.set(v, counter);
    low.set(v, counter++);
    stack.push(v);
    onStack.add(v);
    for (const w of graph.edges.get(v) ?? []) {
      if (!graph.edges.has(w)) continue;
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v)!, index.get(w)!));
    }
    if (low.get(v) === index.get(v)) {
      const comp: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        comp.push(w);
      } while (w !== v);
      const selfLoop = (graph.edges.get(v) ?? []).includes(v);
      if (comp.length > 1 || selfLoop) found.push([...comp.sort(), comp[0]]);
    }
  };
  for (const f of graph.files) if (!index.has(f)) visit(f);
  return found;
}

/** The folder graph as text: each layer with the layers its files import. */
export function describe(graph: Graph): string {
  const uses = new Map<string, Set<string>>();
  for (const [from, tos] of graph.edges) {
    const a = layerKey(from);
    for (const to of tos) {
      const b = layerKey(to);
      if (a !== b) (uses.get(a) ?? uses.set(a, new Set()).get(a)!).add(b);
    }
  }
  const lines = ["lib/ layers, top first (a layer imports only from layers below it):", ""];
  for (let r = LAYERS.length - 1; r >= 0; r--) {
    for (const key of LAYERS[r]) {
      const used = [...(uses.get(key) ?? [])].sort((x, y) =>
        rankOf(y) - rankOf(x) || (x < y ? -1 : 1)
      );
      lines.push(`${String(r).padStart(2)}  ${key.padEnd(12)} → ${used.join(", ") || "—"}`);
    }
  }
  return lines.join("\n");
}

if (import.meta.main) {
  const graph = readGraph();
  for (const f of graph.files) rankOf(layerKey(f));
  if (Deno.args.includes("--check")) {
    const found = violations(graph);
    if (found.length > 0) {
      console.error(`Import rules: ${found.length} violation(s)\n${found.join("\n")}`);
      Deno.exit(1);
    }
    console.log(`Import rules: ${graph.files.length} files of lib/, layers point down, no cycles`);
  } else {
    console.log(describe(graph));
  }
}
