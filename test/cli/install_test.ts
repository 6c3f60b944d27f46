import { strict as assert } from "node:assert";
import { existsSync, readFileSync, rmSync } from "node:fs";
import { delimiter, dirname, join } from "node:path";
import { caseGeoJson, ROOT } from "../batch/_cases.ts";

const env = () => ({
  NO_COLOR: "1",
  // The deno that runs the tests runs the tasks too.
  PATH: `${dirname(Deno.execPath())}${delimiter}${Deno.env.get("PATH") ?? ""}`,
});

async function output(
  cmd: string,
  args: string[],
  cwd: string,
  extra: Record<string, string> = {},
) {
  // deno task sets INIT_CWD only when it is unset: drop the one of the task running the tests.
  const inherited = Deno.env.toObject();
  delete inherited.INIT_CWD;
  delete inherited.HOTFIELD_CWD;
  const r = await new Deno.Command(cmd, {
    args,
    cwd,
    clearEnv: true,
    env: { ...inherited, ...env(), ...extra },
  }).output();
  const dec = new TextDecoder();
  return { code: r.code, out: dec.decode(r.stdout), err: dec.decode(r.stderr) };
}

Deno.test("deno task hotfield reads relative paths against the caller's folder (INIT_CWD)", async () => {
  const dir = Deno.makeTempDirSync({ prefix: "hotfield-caller-" });
  try {
    Deno.writeTextFileSync(join(dir, "QVT-24-301.geojson"), caseGeoJson("QVT-24-301", 3));
    const r = await output(Deno.execPath(), [
      "task",
      "--config",
      join(ROOT, "deno.json"),
      "hotfield",
      "report",
      "QVT-24-301.geojson",
      "--out",
      "reports",
      "--format",
      "json",
      "--best-n",
      "0",
      "--stride-um",
      "250",
    ], dir);
    assert.equal(r.code, 0, r.err);
    assert.ok(
      existsSync(join(dir, "reports", "QVT-24-301", "report.json")),
      "written in the caller's folder",
    );
    assert.ok(!existsSync(join(ROOT, "reports")), "not in the project's folder");
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

Deno.test("deno task install puts a working hotfield command in DENO_INSTALL_ROOT/bin", async () => {
  const dir = Deno.makeTempDirSync({ prefix: "hotfield-install-" });
  try {
    const root = join(dir, "root");
    const r = await output(
      Deno.execPath(),
      ["task", "--config", join(ROOT, "deno.json"), "install"],
      ROOT,
      {
        DENO_INSTALL_ROOT: root,
      },
    );
    assert.equal(r.code, 0, r.err);
    const shim = join(root, "bin", "hotfield");
    assert.ok(existsSync(shim), r.out + r.err);
    const text = readFileSync(shim, "utf8");
    for (const flag of ["--allow-read", "--allow-write", "--allow-env", "--config"]) {
      assert.ok(text.includes(flag), `the command runs with ${flag}`);
    }
    const v = await output(shim, ["--version"], dir);
    assert.equal(v.code, 0, v.err);
    assert.match(v.out, /^hotfield \d+\.\d+\.\d+\n$/);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
