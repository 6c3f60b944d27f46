// `hotfield fov`: JSON keys and values against the field-of-view references
// (Renne, Pathologica 2023, V; Meuten et al., Vet Pathol 2016, V; REFERENCES.md
// §1 derived table, C), option errors with exit 2.

import { strict as assert } from "node:assert";
import { join } from "node:path";
import { main } from "../../lib/cli.ts";

const ROOT = new URL("../../", import.meta.url).pathname;

async function inProcess(args: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const code = await main(["fov", ...args], {
    stdout: (s) => out.push(s),
    stderr: (s) => err.push(s),
  });
  return { code, stdout: out.join(""), stderr: err.join("") };
}

Deno.test("hotfield fov --json has the contract keys for FN 22 at 40×", async () => {
  const r = await inProcess(["--fn", "22", "--objective", "40", "--target-mm2", "2.37", "--json"]);
  assert.equal(r.code, 0, r.stderr);
  const j = JSON.parse(r.stdout);
  for (const key of ["diameter_mm", "area_mm2", "fields_for_target", "fields_for_target_rounded"]) {
    assert.ok(key in j, key);
  }
  // Renne 2023 (V): 0.55 mm; area 0.2376 mm² to 4 d.p. (C).
  assert.ok(Math.abs(j.diameter_mm - 0.55) < 1e-12);
  assert.ok(Math.abs(j.area_mm2 - 0.2376) < 5e-5);
  // Meuten et al. 2016 (V): 10 fields ≈ 2.37 mm²; exact ratio 9.975 (C).
  assert.equal(j.fields_for_target_rounded, 10);
  assert.ok(Math.abs(j.fields_for_target - 9.975) < 1e-3);
  assert.equal(j.target_mm2, 2.37);
  // Common targets 1, 2, 2.37, 5, 10 mm²: fields 4.209, 8.42, 9.975, 21.05, 42.09 (C, §1).
  const common = j.fields_for_common_targets as { target_mm2: number; fields: number }[];
  assert.deepEqual(common.map((c) => c.target_mm2), [1, 2, 2.37, 5, 10]);
  const expected = [4.209, 8.42, 9.975, 21.05, 42.09];
  common.forEach((c, i) => assert.ok(Math.abs(c.fields - expected[i]) < 5e-3, `${c.target_mm2}`));
});

Deno.test("hotfield fov --tube 1.25 gives 0.44 mm and 0.152 mm²", async () => {
  // Tube factor (V2, forum quoting a maker's primer); area arithmetic (C).
  const r = await inProcess(["--fn", "22", "--objective", "40", "--tube", "1.25", "--json"]);
  const j = JSON.parse(r.stdout);
  assert.ok(Math.abs(j.diameter_mm - 0.44) < 1e-12);
  assert.ok(Math.abs(j.area_mm2 - 0.152) < 5e-4);
  assert.equal(j.tube, 1.25);
});

Deno.test("hotfield fov prints text without --json", async () => {
  const r = await inProcess(["--fn", "22", "--objective", "40"]);
  assert.equal(r.code, 0);
  assert.ok(r.stdout.includes("diameter   0.5500 mm"), r.stdout);
  assert.ok(r.stdout.includes("area       0.2376 mm²"), r.stdout);
  assert.ok(r.stdout.includes("count 10 fields"), r.stdout);
});

Deno.test("hotfield fov option errors exit 2 and name the option", async () => {
  const cases: [string[], string][] = [
    [["--objective", "40"], "--fn"],
    [["--fn", "22"], "--objective"],
    [["--fn", "0", "--objective", "40"], "--fn"],
    [["--fn", "22", "--objective", "-40"], "--objective"],
    [["--fn", "abc", "--objective", "40"], "--fn"],
    [["--fn", "22", "--objective", "40", "--tube", "0"], "--tube"],
    [["--fn", "22", "--objective", "40", "--target-mm2", "0"], "--target-mm2"],
    [["--fn", "22", "--objective", "10"], "--objective"],
    [["--fn", "22", "--objective", "40", "--frobnicate"], "frobnicate"],
  ];
  for (const [args, option] of cases) {
    const r = await inProcess(args);
    assert.equal(r.code, 2, `${args.join(" ")}: ${r.stderr}`);
    assert.ok(r.stderr.includes(option), `${args.join(" ")}: ${r.stderr}`);
    assert.equal(r.stdout, "");
  }
  const wide = await inProcess(["--fn", "22", "--objective", "10"]);
  assert.ok(wide.stderr.includes("2.2 mm, over 2 mm"), wide.stderr);
});

Deno.test("hotfield fov runs as a subprocess (exit codes 0 and 2)", async () => {
  const run = (args: string[]) =>
    new Deno.Command(Deno.execPath(), {
      args: ["run", "-A", join(ROOT, "lib/cli.ts"), "fov", ...args],
      stdout: "piped",
      stderr: "piped",
      env: { NO_COLOR: "1" },
    }).output();
  const ok = await run(["--fn", "22", "--objective", "40", "--json"]);
  assert.equal(ok.code, 0);
  assert.ok(JSON.parse(new TextDecoder().decode(ok.stdout)).area_mm2 > 0.2375);
  const bad = await run(["--fn", "-1", "--objective", "40"]);
  assert.equal(bad.code, 2);
  const err = new TextDecoder().decode(bad.stderr);
  assert.ok(err.includes("--fn") && !/^\s+at /m.test(err), err);
});
