// `hotfield schemes`: lists every scheme with basis, cut-offs and sources.

import { strict as assert } from "node:assert";
import { main } from "../../lib/cli.ts";
import { listSchemes } from "../../lib/standards/list_schemes.ts";

async function inProcess(args: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const code = await main(["schemes", ...args], {
    stdout: (s) => out.push(s),
    stderr: (s) => err.push(s),
  });
  return { code, stdout: out.join(""), stderr: err.join("") };
}

Deno.test("hotfield schemes --json lists every scheme with basis, cut-offs and sources", async () => {
  const r = await inProcess(["--json"]);
  assert.equal(r.code, 0, r.stderr);
  const j = JSON.parse(r.stdout);
  assert.deepEqual(j.schemes.map((s: { id: string }) => s.id), listSchemes().map((s) => s.id));
  for (const s of j.schemes) {
    for (const key of ["id", "title", "species", "tumour", "basis", "cutoffs", "sources", "mark"]) {
      assert.ok(key in s, `${s.id} ${key}`);
    }
  }
  const mct = j.schemes.find((s: { id: string }) => s.id === "canine-mct-2tier");
  // Kiupel 2011 (V): ≥ 7 in 10 HPF.
  assert.deepEqual(mct.cutoffs[1].from, { atLeast: 7 });
  assert.equal(mct.basis_area_mm2, 2.37);
  const nen = j.schemes.find((s: { id: string }) => s.id === "nen-who");
  // WHO 2019 (V2): G3 > 20 per 2 mm².
  assert.deepEqual(nen.cutoffs[2].from, { above: 20 });
  assert.equal(nen.basis_text, "per 2 mm²");
});

Deno.test("hotfield schemes prints each id, its basis and cut-offs as text", async () => {
  const r = await inProcess([]);
  assert.equal(r.code, 0);
  for (const s of listSchemes()) assert.ok(r.stdout.includes(s.id), s.id);
  assert.ok(r.stdout.includes("G3: > 20 per 2 mm²"), r.stdout);
  assert.ok(r.stdout.includes("grade 3 (anaplastic): 20 or more per 10 HPF"));
});

Deno.test("hotfield schemes --scheme shows one scheme with citations and notes", async () => {
  const r = await inProcess(["--scheme", "meningioma-who"]);
  assert.equal(r.code, 0);
  assert.ok(r.stdout.includes("Perry A et al."), r.stdout);
  assert.ok(r.stdout.includes("unconfirmed"), r.stdout);
  assert.ok(!r.stdout.includes("from memory"), r.stdout);
});

Deno.test("hotfield schemes --scheme with an unknown id exits 2 listing the known ids", async () => {
  const r = await inProcess(["--scheme", "feline-xyz"]);
  assert.equal(r.code, 2);
  assert.ok(r.stderr.includes('Unknown scheme "feline-xyz"; known: canine-mct-2tier'), r.stderr);
});
