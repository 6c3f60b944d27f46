// Numbers in options are plain decimals: hexadecimal, Infinity, NaN and values
// beyond a double's range are usage errors (exit 2) naming the option, although
// JavaScript's Number() reads most of them.

import { strict as assert } from "node:assert";
import { join } from "node:path";
import { writeFileSync } from "node:fs";
import { main } from "../../lib/cli.ts";

async function run(args: string[]) {
  const out: string[] = [], err: string[] = [];
  const code = await main(args, { stdout: (s) => out.push(s), stderr: (s) => err.push(s) });
  return { code, stdout: out.join(""), stderr: err.join("") };
}

const NOT_DECIMAL = ["0x10", "0X1F", "0o7", "0b1", "1e400", "-1e400", "Infinity", "NaN", "1_000"];

Deno.test("hotfield report refuses non-decimal numbers in every numeric option with exit 2", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const file = join(dir, "QVT-24-060.geojson");
    writeFileSync(
      file,
      JSON.stringify({
        type: "FeatureCollection",
        slide: { id: "QVT-24-060", mpp: 0.5 },
        features: [{
          type: "Feature",
          properties: { role: "tissue" },
          geometry: { type: "Polygon", coordinates: [[[0, 0], [9000, 0], [9000, 9000], [0, 0]]] },
        }],
      }),
    );
    const out = join(dir, "out");
    const options = [
      "area",
      "stride-um",
      "min-coverage",
      "top",
      "best-n",
      "field-area",
      "simulations",
      "seed",
      "min-score",
    ];
    for (const name of options) {
      for (const bad of NOT_DECIMAL) {
        const r = await run(["report", file, "--out", out, `--${name}=${bad}`]);
        assert.equal(r.code, 2, `--${name} ${bad}: exit ${r.code}: ${r.stderr}`);
        assert.ok(r.stderr.includes(`--${name}`), `names the option: ${r.stderr}`);
        assert.ok(r.stderr.includes(bad), `quotes the value: ${r.stderr}`);
        assert.equal(r.stderr.trim().split("\n").length, 1, "one line, no stack trace");
      }
    }
    for (const bad of ["0x4:3", "4:Infinity", "1e400:3", "NaN:1"]) {
      const r = await run(["report", file, "--out", out, "--aspect", bad]);
      assert.equal(r.code, 2, `--aspect ${bad}: ${r.stderr}`);
      assert.match(r.stderr, /--aspect/);
    }
    for (const bad of ["0x10", "8,Infinity", "1e400"]) {
      const r = await run([
        "report",
        file,
        "--out",
        out,
        "--tissue-mask",
        "m.png",
        "--mask-mpp",
        bad,
      ]);
      assert.equal(r.code, 2, `--mask-mpp ${bad}: ${r.stderr}`);
      assert.match(r.stderr, /--mask-mpp/);
    }
    assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name), ["QVT-24-060.geojson"]);
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("hotfield fov and grade refuse non-decimal numbers with exit 2", async () => {
  for (const bad of NOT_DECIMAL) {
    for (
      const args of [
        ["fov", `--fn=${bad}`, "--objective", "40"],
        ["fov", "--fn", "22", `--objective=${bad}`],
        ["grade", `--count=${bad}`, "--area-mm2", "2.37", "--scheme", "canine-mct-2tier"],
        ["grade", "--count", "7", `--area-mm2=${bad}`, "--scheme", "canine-mct-2tier"],
      ]
    ) {
      const r = await run(args);
      assert.equal(r.code, 2, `${args.join(" ")}: exit ${r.code}: ${r.stderr}`);
      assert.ok(r.stderr.includes(bad), r.stderr);
    }
  }
});

Deno.test("hotfield report still reads plain decimals with signs, points and exponents", async () => {
  const { parseDecimal } = await import("../../lib/numbers.ts");
  for (
    const [text, v] of [["2.37", 2.37], ["+5", 5], ["-0.5", -0.5], [".5", 0.5], ["5.", 5], [
      "1e-3",
      0.001,
    ], ["2E2", 200]] as const
  ) {
    assert.equal(parseDecimal(text), v, text);
  }
});
