// readInputFile(): only regular files, never more than the limit. A FIFO must
// be refused without opening it: opening one for reading blocks until a writer
// comes, so a regression would hang the FIFO test (the CLI test of the same
// case in test/cli/hostile_files_test.ts runs under a time bound).

import { strict as assert } from "node:assert";
import { appendFileSync, symlinkSync, truncateSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { formatBytes, InputSizeError, readInputFile } from "../../lib/io/read_input.ts";

function mkfifo(path: string): boolean {
  try {
    return new Deno.Command("mkfifo", { args: [path] }).outputSync().success;
  } catch {
    return false;
  }
}

async function message(p: Promise<unknown>): Promise<Error> {
  try {
    await p;
  } catch (e) {
    return e as Error;
  }
  throw new Error("expected a refusal");
}

Deno.test("readInputFile() reads a regular file and a symbolic link to one", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    writeFileSync(join(dir, "a.txt"), "hello");
    symlinkSync(join(dir, "a.txt"), join(dir, "link.txt"));
    for (const name of ["a.txt", "link.txt"]) {
      const bytes = await readInputFile(join(dir, name), { what: "annotations", maxBytes: 5 });
      assert.equal(new TextDecoder().decode(bytes), "hello");
    }
    writeFileSync(join(dir, "empty.txt"), "");
    assert.equal(
      (await readInputFile(join(dir, "empty.txt"), { what: "x", maxBytes: 5 })).length,
      0,
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("readInputFile() refuses a folder, a device and a missing file, naming the path", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const cases: [string, string][] = [
      [dir, "it is a folder, not a file"],
      ["/dev/zero", "it is a device, not a regular file"],
      ["/dev/null", "it is a device, not a regular file"],
      [join(dir, "missing.geojson"), "file not found"],
    ];
    for (const [path, why] of cases) {
      const e = await message(readInputFile(path, { what: "annotations", maxBytes: 1e6 }));
      assert.equal(e.message, `Cannot read annotations "${path}": ${why}`);
    }
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("readInputFile() refuses a named pipe without opening it", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const fifo = join(dir, "QVT-24-061.geojson");
    if (!mkfifo(fifo)) {
      console.log("skipped: mkfifo is not available here");
      return;
    }
    // Opening the FIFO would block this test forever; a refusal comes at once.
    const e = await message(readInputFile(fifo, { what: "annotations", maxBytes: 1e6 }));
    assert.equal(
      e.message,
      `Cannot read annotations "${fifo}": it is a named pipe (FIFO), not a regular file`,
    );
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("readInputFile() refuses a file over the limit with its size and the limit", async () => {
  const dir = Deno.makeTempDirSync();
  try {
    const big = join(dir, "big.geojson");
    writeFileSync(big, "");
    truncateSync(big, 3_500_000); // sparse: nothing is written
    const e = await message(readInputFile(big, { what: "annotations", maxBytes: 2_000_000 }));
    assert.ok(e instanceof InputSizeError && e instanceof RangeError);
    assert.equal(
      e.message,
      `Cannot read annotations "${big}": the file is 3.5 MB, more than the limit of 2.0 MB for annotations (see "Input limits" in the README)`,
    );
    const exact = join(dir, "exact.csv");
    writeFileSync(exact, "x".repeat(100));
    assert.equal((await readInputFile(exact, { what: "figures CSV", maxBytes: 100 })).length, 100);
    appendFileSync(exact, "y");
    const e2 = await message(readInputFile(exact, { what: "figures CSV", maxBytes: 100 }));
    assert.match(e2.message, /the file is 101 bytes, more than the limit of 100 bytes/);
  } finally {
    Deno.removeSync(dir, { recursive: true });
  }
});

Deno.test("formatBytes() gives decimal units with one decimal", () => {
  assert.equal(formatBytes(0), "0 bytes");
  assert.equal(formatBytes(999), "999 bytes");
  assert.equal(formatBytes(1000), "1.0 kB");
  assert.equal(formatBytes(524_288_000), "524.3 MB");
  assert.equal(formatBytes(4.2e9), "4.2 GB");
});
