/**
 * The `hotfield` command line: a thin shell over the library.
 *
 * Each command lives in `lib/cli/<name>_command.ts` and exports `run`.
 * Exit codes: 0 success, 1 bad input or failure, 2 bad options.
 * Messages go to stderr without a stack trace (set `HOTFIELD_DEBUG=1` for one).
 *
 * Relative paths are read against the working directory, or against
 * `HOTFIELD_CWD` when it is set: the `hotfield` task of deno.json sets it to
 * `INIT_CWD`, the folder `deno task` was called from, because tasks run in
 * the project's folder.
 *
 * @module
 */

import { UsageError } from "./errors.ts";
import type { CommandIo } from "./cli/_io.ts";

type CommandModule = { run(args: string[], io: CommandIo): Promise<number> };

const COMMANDS: Record<string, { summary: string; load: () => Promise<CommandModule> }> = {
  inspect: {
    summary: "show what hotfield read from a case (areas, figure tallies, fields)",
    load: () => import("./cli/inspect_command.ts"),
  },
  report: {
    summary: "count map, exact hotspot, distribution and field check; writes reports",
    load: () => import("./cli/report_command.ts"),
  },
  batch: {
    summary: "every case of a manifest or folder: skips what is done, isolates failures",
    load: () => import("./cli/batch_command.ts"),
  },
  cohort: {
    summary: "rebuild index.html, cases.csv and fields.csv from every case folder in DIR",
    load: () => import("./cli/cohort_command.ts"),
  },
  tissue: {
    summary: "find the tissue on a slide file or thumbnail; writes it as GeoJSON",
    load: () => import("./cli/tissue_command.ts"),
  },
  fov: {
    summary: "microscope field of view: diameter, area, fields for a target area",
    load: () => import("./cli/fov_command.ts"),
  },
  grade: {
    summary: "grade a count made at the microscope against a scheme's cut-off",
    load: () => import("./cli/grade_command.ts"),
  },
  compare: {
    summary: "a detector's figures against a reference: pairs, F1, hotspots and grade",
    load: () => import("./cli/compare_command.ts"),
  },
  schemes: {
    summary: "list the grading schemes hotfield knows",
    load: () => import("./cli/schemes_command.ts"),
  },
};

/** Usage text for `hotfield --help`. */
export function usage(): string {
  const lines = ["Usage: hotfield <command> [options]", "", "Commands:"];
  for (const [name, c] of Object.entries(COMMANDS)) {
    lines.push(`  ${name.padEnd(9)} ${c.summary}`);
  }
  lines.push("", "Run `hotfield <command> --help` for the options of one command.");
  return lines.join("\n");
}

/**
 * Runs the CLI with `args` and returns the exit code.
 *
 * @example Asking for help
 * ```ts
 * import { main } from "./cli.ts";
 * const out: string[] = [];
 * const code = await main(["--help"], { stdout: (s) => out.push(s), stderr: () => {} });
 * if (code !== 0 || !out.join("").includes("inspect")) throw new Error(`exit ${code}: ${out.join("")}`);
 * ```
 */
export async function main(args: string[], io: CommandIo = defaultIo()): Promise<number> {
  const [name, ...rest] = args;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    (name === undefined ? io.stderr : io.stdout)(usage() + "\n");
    return name === undefined ? 2 : 0;
  }
  if (name === "--version") {
    const { HOTFIELD_VERSION } = await import("./version.ts");
    io.stdout(`hotfield ${HOTFIELD_VERSION}\n`);
    return 0;
  }
  const command = COMMANDS[name];
  if (!command) {
    io.stderr(`Unknown command "${name}"; known: ${Object.keys(COMMANDS).join(", ")}\n`);
    return 2;
  }
  try {
    const mod = await command.load();
    return await mod.run(rest, io);
  } catch (e) {
    const err = e instanceof Error ? e : new Error(String(e));
    io.stderr(`hotfield ${name}: ${err.message}\n`);
    if (Deno.env.get("HOTFIELD_DEBUG") === "1" && err.stack) io.stderr(err.stack + "\n");
    return err instanceof UsageError ? 2 : 1;
  }
}

function defaultIo(): CommandIo {
  const enc = new TextEncoder();
  const write = (file: typeof Deno.stdout, s: string) => {
    const bytes = enc.encode(s);
    for (let k = 0; k < bytes.length;) k += file.writeSync(bytes.subarray(k));
  };
  return {
    stdout: (s) => write(Deno.stdout, s),
    stderr: (s) => write(Deno.stderr, s),
    isTerminal: () => Deno.stdout.isTerminal(),
  };
}

/**
 * Moves to the folder relative paths are meant against: `HOTFIELD_CWD` when
 * set (see the module documentation). Returns a message when that fails.
 */
function enterCallerFolder(): string | null {
  let dir: string | undefined;
  try {
    dir = Deno.env.get("HOTFIELD_CWD");
  } catch {
    return null; // no env permission: stay where we are
  }
  if (dir === undefined || dir === "") return null;
  try {
    Deno.chdir(dir);
    return null;
  } catch (e) {
    return `hotfield: cannot work in HOTFIELD_CWD "${dir}": ${(e as Error).message}\n`;
  }
}

if (import.meta.main) {
  const problem = enterCallerFolder();
  if (problem) {
    defaultIo().stderr(problem);
    Deno.exit(1);
  }
  Deno.exit(await main(Deno.args));
}
