// `hotfield grade`: the JSON contract keys and values for 8 figures in 10
// fields of FN 22 at 40× (Renne, Pathologica 2023, V: d = 0.55 mm; ten fields
// 2.3758 mm², C), the two-tier cut-off of 7 (Kiupel et al., Vet Pathol 2011,
// V), the exact Poisson interval of 8 (Garwood 1936; REFERENCES.md §9, C:
// 3.4538–15.7632, tolerance 1e-4 for the table's 4 decimals), and option
// errors with exit 2 naming the option.

import { strict as assert } from "node:assert";
import { main } from "../../lib/cli.ts";

async function grade(args: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const code = await main(["grade", ...args], {
    stdout: (s) => out.push(s),
    stderr: (s) => err.push(s),
  });
  return { code, stdout: out.join(""), stderr: err.join("") };
}

const TEN_FIELDS = ["--fields", "10", "--fn", "22", "--objective", "40"];
const MCT = ["--scheme", "canine-mct-2tier"];

Deno.test("hotfield grade --json: 8 in 10 fields of FN 22 at 40× is at/above the cut-off of 7", async () => {
  const r = await grade(["--count", "8", ...TEN_FIELDS, ...MCT, "--json"]);
  assert.equal(r.code, 0, r.stderr);
  const j = JSON.parse(r.stdout);
  const contract = [
    "count",
    "area_mm2",
    "per_mm2",
    "count_per_scheme_basis",
    "scheme",
    "cutoff",
    "class",
    "tier",
    "interval_95",
  ];
  assert.deepEqual(Object.keys(j).slice(0, contract.length), contract);
  assert.equal(j.count, 8);
  assert.ok(Math.abs(j.area_mm2 - 2.3758) < 5e-5, `area ${j.area_mm2}`);
  assert.ok(Math.abs(j.per_mm2 - 8 / 2.37583) < 1e-4);
  assert.equal(j.count_per_scheme_basis, 8);
  assert.equal(j.scheme, "canine-mct-2tier");
  assert.equal(j.cutoff, 7);
  assert.equal(j.class, "above");
  assert.equal(j.tier, "high");
  assert.ok(Math.abs(j.interval_95[0] - 3.4538) <= 1e-4);
  assert.ok(Math.abs(j.interval_95[1] - 15.7632) <= 1e-4);
  assert.ok(j.p_other_side > 0 && j.p_other_side < 1);
  assert.match(j.caution, /never replaces, a pathologist/);
  assert.equal(j.fields.fields, 10);
  assert.ok(Math.abs(j.fields.field_diameter_mm - 0.55) < 1e-12);
});

Deno.test("hotfield grade prints text with the grade and the caution", async () => {
  const r = await grade(["--count", "8", ...TEN_FIELDS, ...MCT]);
  assert.equal(r.code, 0, r.stderr);
  assert.match(r.stdout, /^Count 8 in 10 fields of 0\.550 mm .* = 2\.3758 mm²/);
  assert.match(r.stdout, /class +above the cut-off \(needs 7 in this area\)/);
  assert.match(r.stdout, /95% interval +3\.45–15\.76 figures/);
  assert.match(r.stdout, /local grading guidelines/);
  const area = await grade(["--count", "3", "--area-mm2", "2.37", ...MCT, "--json"]);
  assert.equal(area.code, 0, area.stderr);
  assert.equal(JSON.parse(area.stdout).class, "below");
});

Deno.test("hotfield grade names the option at fault, exit 2", async () => {
  const cases: [string[], string][] = [
    [
      ["--count", "-1", "--area-mm2", "2", ...MCT],
      "Option --count must be a whole number ≥ 0: got -1",
    ],
    [["--count", "1.5", "--area-mm2", "2", ...MCT], "Option --count must be a whole number ≥ 0"],
    [["--area-mm2", "2", ...MCT], "Option --count is required"],
    [
      ["--count", "3", "--area-mm2", "2", "--fields", "10", ...MCT],
      "Options --fields and --area-mm2 exclude each other",
    ],
    [
      ["--count", "3", ...MCT],
      "Give the area counted: --fields K with --fn and --objective, or --area-mm2 A",
    ],
    [
      ["--count", "3", "--area-mm2", "2", "--scheme", "nope"],
      'Option --scheme: Unknown scheme "nope"',
    ],
    [["--count", "3", "--area-mm2", "2"], "Option --scheme is required"],
    [
      ["--count", "3", "--fields", "10", "--objective", "40", ...MCT],
      "Option --fn is required with --fields",
    ],
    [
      ["--count", "3", "--fields", "0", "--fn", "22", "--objective", "40", ...MCT],
      "Option --fields must be a whole number ≥ 1",
    ],
    [["--count", "3", "--area-mm2", "-2", ...MCT], "Option --area-mm2 must be > 0: got -2"],
    [["--count", "3", "--area-mm2", "2", "--fn", "22", ...MCT], "Option --fn goes with --fields"],
  ];
  for (const [args, message] of cases) {
    const r = await grade(args);
    assert.equal(r.code, 2, `${args.join(" ")}: ${r.stderr}`);
    assert.ok(r.stderr.includes(message), `${args.join(" ")}: ${r.stderr}`);
    assert.equal(r.stdout, "");
  }
});
