/**
 * Runs every worked notebook from top to bottom on the `hotfield` Deno kernel
 * with `jupyter nbconvert --execute` (Debian packages jupyter-nbconvert,
 * python3-nbclient, jupyter-client) and checks that no cell fails and the
 * key outputs are there.
 */

import { strict as assert } from "node:assert";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";

const NOTEBOOKS = resolve("notebooks");
const KERNEL = "hotfield";
const inCi = Deno.env.get("CI") === "true";
const INSTALL_HINT = "apt-get install -y --no-install-recommends jupyter-nbconvert " +
  "python3-nbclient jupyter-client, then deno task kernel";

interface Output {
  output_type: string;
  text?: string | string[];
  data?: Record<string, unknown>;
  ename?: string;
  evalue?: string;
}
interface Cell {
  cell_type: string;
  source: string | string[];
  outputs?: Output[];
  execution_count?: number | null;
}
interface Notebook {
  nbformat: number;
  metadata: { kernelspec?: { name: string; display_name: string; language: string } };
  cells: Cell[];
}

async function run(cmd: string, args: string[], cwd?: string) {
  try {
    const out = await new Deno.Command(cmd, { args, cwd, stdout: "piped", stderr: "piped" })
      .output();
    return {
      ok: out.success,
      stdout: new TextDecoder().decode(out.stdout),
      stderr: new TextDecoder().decode(out.stderr),
    };
  } catch (e) {
    return { ok: false, stdout: "", stderr: (e as Error).message };
  }
}

const hasJupyter = (await run("jupyter", ["nbconvert", "--version"])).ok;
if (!hasJupyter && !inCi) {
  console.log(
    `notebooks_test.ts: Jupyter not found, notebook runs ignored. Install: ${INSTALL_HINT}`,
  );
}

/** Makes sure the kernelspec exists and points at a deno binary that exists. */
async function ensureKernel(): Promise<void> {
  const list = await run("jupyter", ["kernelspec", "list", "--json"]);
  let ok = false;
  if (list.ok) {
    const specs = JSON.parse(list.stdout).kernelspecs ?? {};
    const argv0 = specs[KERNEL]?.spec?.argv?.[0];
    ok = typeof argv0 === "string" && existsSync(argv0);
  }
  if (!ok) {
    const install = await run(Deno.execPath(), [
      "jupyter",
      "--install",
      "--name",
      KERNEL,
      "--display",
      "hotfield (Deno)",
      "--force",
    ]);
    assert.ok(install.ok, `cannot install the hotfield kernel: ${install.stderr}`);
  }
}

function text(v: string | string[] | undefined): string {
  return Array.isArray(v) ? v.join("") : v ?? "";
}

const files = readdirSync(NOTEBOOKS).filter((n) => n.endsWith(".ipynb")).sort();

Deno.test("notebooks are stored without outputs, on the hotfield kernel (nbformat 4)", () => {
  assert.deepEqual(files, [
    "01-explore-a-case.ipynb",
    "02-cohort-report.ipynb",
    "03-check-my-field.ipynb",
    "04-is-my-detector-good-enough.ipynb",
    "05-tissue-from-a-slide.ipynb",
  ]);
  for (const name of files) {
    const nb = JSON.parse(readFileSync(join(NOTEBOOKS, name), "utf8")) as Notebook;
    assert.equal(nb.nbformat, 4, name);
    assert.deepEqual(nb.metadata.kernelspec, {
      name: "hotfield",
      display_name: "hotfield (Deno)",
      language: "typescript",
    });
    assert.equal(nb.cells[0].cell_type, "markdown", `${name} opens with its title`);
    for (const cell of nb.cells.filter((c) => c.cell_type === "code")) {
      assert.deepEqual(cell.outputs, [], `${name} stored with outputs`);
      assert.equal(cell.execution_count, null);
      assert.ok(!/https?:\/\//.test(text(cell.source)), `${name}: no network in code`);
    }
    const code = nb.cells.map((c) => text(c.source)).join("\n");
    assert.ok(code.includes('import * as hf from "hotfield";'));
  }
});

/** Key outputs each notebook must produce (text in a stream, and a plotly figure). */
const EXPECT: Record<string, RegExp[]> = {
  "01-explore-a-case.ipynb": [/^hotspot: \d+ figures in 2\.37 mm²/m, /^positions \d+: min/m],
  "02-cohort-report.ipynb": [/^8 cases in \.\.\/data\/demo/m, /^\d+ files written under /m],
  "03-check-my-field.ipynb": [
    /^one field: 0\.550 mm across, 0\.2376 mm²/m,
    /^grade: 8 in 10 fields \(2\.3758 mm²\) is above the cut-off ≥ 7, tier high/m,
    /^your field: \d+ figures? in 10 fields/m,
    /^trainee-1: \d+ fields in \d+ cases/m,
  ],
  "04-is-my-detector-good-enough.ipynb": [
    /^QVT-24-003: F1 [\d.]+ at threshold 0\.5/m,
    /^QVT-24-006: reference hotspot \d+, detector hotspot \d+/m,
    /^cohort of 4 pairs: pooled F1 [\d.]+/m,
  ],
  "05-tissue-from-a-slide.ipynb": [
    /^slide QVT-24-009: 4000 × 3000 px at 2 µm\/px \(from tiff\.XResolution/m,
    /^tissue: [\d.]+ mm² in 2 pieces/m,
    /^hotspot: \d+ figures in 2\.37 mm²/m,
  ],
};

for (const name of files) {
  Deno.test({
    name: `notebook ${name} runs top to bottom on the hotfield kernel`,
    ignore: !hasJupyter && !inCi,
    sanitizeResources: false,
    sanitizeOps: false,
    async fn() {
      assert.ok(hasJupyter, `CI needs Jupyter: ${INSTALL_HINT}`);
      await ensureKernel();
      const out = mkdtempSync(join(tmpdir(), "hotfield-nb-"));
      try {
        const r = await run("jupyter", [
          "nbconvert",
          "--to",
          "notebook",
          "--execute",
          `--ExecutePreprocessor.kernel_name=${KERNEL}`,
          "--ExecutePreprocessor.timeout=900",
          "--output-dir",
          out,
          name,
        ], NOTEBOOKS);
        assert.ok(r.ok, `nbconvert failed on ${name}:\n${r.stderr.slice(-3000)}`);
        const nb = JSON.parse(readFileSync(join(out, name), "utf8")) as Notebook;
        const outputs = nb.cells.flatMap((c) => c.outputs ?? []);
        const errors = outputs.filter((o) =>
          o.output_type === "error" || (o.output_type === "stream" && /error/i.test(text(o.text)))
        );
        assert.deepEqual(
          errors.map((o) => `${o.ename ?? ""} ${o.evalue ?? text(o.text)}`),
          [],
          `errors in ${name}`,
        );
        const streams = outputs.filter((o) => o.output_type === "stream").map((o) => text(o.text))
          .join("");
        for (const re of EXPECT[name]) assert.match(streams, re, `${name}: ${re}`);
        const plots = outputs.filter((o) => o.data && "application/vnd.plotly.v1+json" in o.data);
        assert.ok(plots.length >= 1, `${name}: a plotly figure`);
        for (const p of plots) {
          const fig = p.data!["application/vnd.plotly.v1+json"] as { data: unknown[] };
          assert.ok(Array.isArray(fig.data) && fig.data.length > 0);
          // nbformat stores multi-line text as a list of lines.
          assert.ok(
            text(p.data!["text/html"] as string | string[]).includes("Plotly.newPlot"),
            "offline HTML fallback",
          );
        }
        // plotly.js is inlined once per kernel session, not once per plot.
        const inlined = plots.filter((p) =>
          text(p.data!["text/html"] as string | string[]).length > 1_000_000
        );
        assert.equal(inlined.length, 1, `${name}: plotly.js inlined once`);
      } finally {
        rmSync(out, { recursive: true, force: true });
      }
    },
  });
}
