/**
 * Finding the plotly.js bundle (npm `plotly.js-dist-min`, pinned in
 * deno.json) on disk, so reports and notebooks can embed or copy it without
 * any network at run time.
 *
 * Deno keeps npm packages in its cache (`$DENO_DIR/npm/<registry>/<name>/<version>/`)
 * unless the project uses a `node_modules` folder; both places are searched.
 *
 * @module
 */

import { existsSync, readdirSync, readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

/** The pinned version of `plotly.js-dist-min` (keep in step with deno.json). */
export const PLOTLY_VERSION = "4.1.2";

/** The npm package that provides plotly.js. */
export const PLOTLY_PACKAGE = "plotly.js-dist-min";

/** File name of the bundle inside the package. */
const BUNDLE = "plotly.min.js";

/**
 * The version of the installed `plotly.js-dist-min`, read from its
 * `package.json`. The literal import also makes Deno put the package in the
 * module graph, so `deno run`, `deno test`, `deno jupyter` and `deno install`
 * cache it on a fresh machine; importing only `package.json` avoids running
 * plotly.js, which needs a browser window.
 *
 * @returns The version string, e.g. "4.1.2".
 *
 * @example The installed package is the pinned one
 * ```ts
 * import { PLOTLY_VERSION, plotlyPackageVersion } from "./plotly_asset.ts";
 * const version = await plotlyPackageVersion();
 * if (version !== PLOTLY_VERSION) throw new Error(`installed plotly.js ${version}, pinned ${PLOTLY_VERSION}`);
 * ```
 */
export async function plotlyPackageVersion(): Promise<string> {
  const pkg = await import("plotly.js-dist-min/package.json", { with: { type: "json" } });
  return (pkg.default as { version: string }).version;
}

function envGet(name: string): string | undefined {
  try {
    const state = Deno.permissions.querySync({ name: "env", variable: name }).state;
    return state === "granted" ? Deno.env.get(name) : undefined;
  } catch {
    return undefined;
  }
}

/** Deno's cache folder, following Deno's own rules (DENO_DIR, then the OS cache folder). */
function denoDirCandidates(): string[] {
  const out: string[] = [];
  const denoDir = envGet("DENO_DIR");
  if (denoDir) out.push(denoDir);
  const xdg = envGet("XDG_CACHE_HOME");
  if (xdg) out.push(join(xdg, "deno"));
  const home = envGet("HOME") ?? envGet("USERPROFILE");
  if (home) {
    out.push(join(home, ".cache", "deno"));
    out.push(join(home, "Library", "Caches", "deno"));
  }
  const local = envGet("LOCALAPPDATA");
  if (local) out.push(join(local, "deno"));
  return out;
}

function nodeModulesCandidates(start: string): string[] {
  const out: string[] = [];
  let dir = start;
  for (let k = 0; k < 32; k++) {
    out.push(join(dir, "node_modules", PLOTLY_PACKAGE, BUNDLE));
    out.push(
      join(
        dir,
        "node_modules",
        ".deno",
        `${PLOTLY_PACKAGE}@${PLOTLY_VERSION}`,
        "node_modules",
        PLOTLY_PACKAGE,
        BUNDLE,
      ),
    );
    const up = dirname(dir);
    if (up === dir) break;
    dir = up;
  }
  return out;
}

function isReadable(path: string): boolean {
  try {
    return existsSync(path);
  } catch {
    return false;
  }
}

/**
 * Finds the path of `plotly.min.js` of the pinned `plotly.js-dist-min`.
 *
 * Searches `node_modules` folders above this module and the working folder,
 * then Deno's npm cache under `$DENO_DIR`, `$XDG_CACHE_HOME/deno`,
 * `~/.cache/deno`, `~/Library/Caches/deno` and `%LOCALAPPDATA%\deno` (any
 * registry host).
 *
 * @returns The path, or `null` when the package is not on this machine.
 *
 * @example Looking for the bundle
 * ```ts
 * import { findPlotlyPath } from "./plotly_asset.ts";
 * const path = findPlotlyPath();
 * if (path !== null && !path.endsWith("plotly.min.js")) throw new Error(path);
 * ```
 */
export function findPlotlyPath(): string | null {
  const starts: string[] = [];
  if (import.meta.url.startsWith("file:")) starts.push(dirname(fileURLToPath(import.meta.url)));
  try {
    starts.push(Deno.cwd());
  } catch { /* no read permission on the working folder */ }
  for (const s of starts) {
    for (const p of nodeModulesCandidates(s)) if (isReadable(p)) return p;
  }
  for (const d of denoDirCandidates()) {
    const npm = join(d, "npm");
    let hosts: string[] = [];
    try {
      hosts = readdirSync(npm).sort();
    } catch {
      continue;
    }
    // The default registry first, then any other registry host Deno used.
    hosts.sort((a, b) =>
      Number(b === "registry.npmjs.org") - Number(a === "registry.npmjs.org") || (a < b ? -1 : 1)
    );
    for (const h of hosts) {
      const p = join(npm, h, PLOTLY_PACKAGE, PLOTLY_VERSION, BUNDLE);
      if (isReadable(p)) return p;
    }
  }
  return null;
}

/**
 * Reads the plotly.js bundle as text.
 *
 * @returns The JavaScript source of `plotly.min.js`.
 * @throws Error naming the package and how to cache it when it is not found.
 *
 * @example Reading the bundle when it is cached
 * ```ts
 * import { findPlotlyPath, readPlotlyJs } from "./plotly_asset.ts";
 * if (findPlotlyPath() !== null && !readPlotlyJs().includes("plotly")) {
 *   throw new Error("the bundle found does not look like plotly.js");
 * }
 * ```
 */
export function readPlotlyJs(): string {
  return new TextDecoder().decode(readPlotlyBytes());
}

/**
 * Reads the plotly.js bundle as bytes, for copying it unchanged.
 *
 * @returns The bytes of `plotly.min.js`.
 * @throws Error naming the package and how to cache it when it is not found.
 *
 * @example Bytes and text agree
 * ```ts
 * import { findPlotlyPath, readPlotlyBytes, readPlotlyJs } from "./plotly_asset.ts";
 * if (findPlotlyPath() !== null && new TextDecoder().decode(readPlotlyBytes()) !== readPlotlyJs()) {
 *   throw new Error("the bytes and the text of the bundle differ");
 * }
 * ```
 */
export function readPlotlyBytes(): Uint8Array {
  const path = findPlotlyPath();
  if (path === null) {
    throw new Error(
      `Cannot find plotly.js (npm:${PLOTLY_PACKAGE}@${PLOTLY_VERSION}) in Deno's cache: ` +
        `run "deno cache npm:${PLOTLY_PACKAGE}@${PLOTLY_VERSION}" once with network`,
    );
  }
  return new Uint8Array(readFileSync(path));
}
