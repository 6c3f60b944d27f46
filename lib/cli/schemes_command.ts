/**
 * `hotfield schemes`: lists the grading schemes hotfield knows, with their
 * area basis, cut-offs and sources. Writes no files.
 *
 * @module
 */

import { UsageError } from "../errors.ts";
import { getScheme, listSchemes } from "../standards/list_schemes.ts";
import { basisAreaMm2, describeBasis } from "../standards/classify.ts";
import type { GradingScheme } from "../standards/scheme_types.ts";
import { parseOptions } from "./_args.ts";
import type { CommandIo } from "./_io.ts";

const HELP = `Usage: hotfield schemes [options]

Lists the grading schemes hotfield knows: id, tumour and species, the area
their counts refer to, the mitotic cut-offs as each source states them, and
the sources with their confidence marks (V verified, V2 verified through a
secondary copy, C computed, M unconfirmed against the primary publication, CP common
practice).

Options:
  --scheme ID    show one scheme in full
  --json         print JSON instead of text
  -h, --help     show this help

Use an id with \`hotfield report --scheme ID\`. A scheme's grade may rest on
more than the mitotic count; hotfield assesses the count only, in support of
a pathologist's diagnosis.
`;

/** The JSON shape of one scheme as `hotfield schemes --json` prints it. */
export function schemeToJson(s: GradingScheme): Record<string, unknown> {
  return {
    id: s.id,
    title: s.title,
    tumour: s.tumour,
    species: s.species,
    basis: s.basis,
    basis_text: describeBasis(s),
    basis_area_mm2: basisAreaMm2(s),
    counting: s.counting,
    cutoffs: s.tiers.map((t) => ({
      tier: t.label,
      from: t.from,
      source_text: t.sourceText,
      ...(t.meaning ? { meaning: t.meaning } : {}),
    })),
    primary_cutoff: { tier: s.tiers[s.primaryTier].label, reason: s.primaryReason },
    sources: s.sources,
    mark: s.mark,
    notes: s.notes,
  };
}

/**
 * Runs `hotfield schemes` with `args` and returns the exit code.
 *
 * @param args The arguments after `schemes`.
 * @param io Where to write text.
 * @returns 0 on success.
 * @throws {UsageError} For bad options or an unknown scheme id (exit 2).
 *
 * @example JSON lists every scheme
 * ```ts
 * import { run } from "./schemes_command.ts";
 * const out: string[] = [];
 * await run(["--json"], { stdout: (s) => out.push(s), stderr: () => {} });
 * const j = JSON.parse(out.join(""));
 * if (!j.schemes.some((s: { id: string }) => s.id === "nen-who")) throw new Error("nen-who is missing from --json");
 * ```
 */
export function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, {
    scheme: { type: "string" },
    json: { type: "boolean" },
    help: { type: "boolean", short: "h" },
  });
  if (values.help) {
    io.stdout(HELP);
    return Promise.resolve(0);
  }
  if (positionals.length > 0) {
    throw new UsageError(`hotfield schemes takes no file arguments: got ${positionals.join(" ")}`);
  }
  let schemes: GradingScheme[];
  if (typeof values.scheme === "string") {
    try {
      schemes = [getScheme(values.scheme)];
    } catch (e) {
      throw new UsageError(`Option --scheme: ${(e as Error).message}`, { cause: e });
    }
  } else {
    schemes = listSchemes();
  }
  if (values.json) {
    io.stdout(JSON.stringify({ schemes: schemes.map(schemeToJson) }, null, 2) + "\n");
    return Promise.resolve(0);
  }
  const full = typeof values.scheme === "string";
  const blocks = schemes.map((s) => {
    const cut = s.tiers.map((t) => `${t.label}: ${t.sourceText}`).join("; ");
    const lines = [
      `${s.id}  [${s.mark}]`,
      `  ${s.title}`,
      `  ${s.species}, ${s.tumour}`,
      `  counts ${describeBasis(s)}; count over: ${s.counting.text}`,
      `  cut-offs: ${cut}`,
      `  primary cut-off: ${s.tiers[s.primaryTier].label}: ${s.primaryReason}`,
      ...s.sources.map((src) => `  source [${src.mark}]: ${full ? src.citation : src.key}`),
    ];
    if (full) lines.push(...s.notes.map((n) => `  note: ${n}`));
    return lines.join("\n");
  });
  io.stdout(
    blocks.join("\n\n") +
      "\n\nMarks: V verified, V2 via a secondary copy, M unconfirmed (check against your local guideline). " +
      "Run with --scheme ID for citations and notes.\n",
  );
  return Promise.resolve(0);
}
