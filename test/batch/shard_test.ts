import { strict as assert } from "node:assert";
import fc from "fast-check";
import { parseShard, selectShard } from "../../lib/batch/shard.ts";
import { UsageError } from "../../lib/errors.ts";

Deno.test("parseShard() reads K/N and refuses 0/3, 4/3, a/b with the option named", () => {
  assert.deepEqual(parseShard("1/3"), { k: 1, n: 3 });
  assert.deepEqual(parseShard(" 3 / 3 "), { k: 3, n: 3 });
  assert.throws(
    () => parseShard("0/3"),
    UsageError,
    'Option --shard needs 1 ≤ K ≤ N (K from 1 to 3): got "0/3"',
  );
  assert.throws(
    () => parseShard("4/3"),
    UsageError,
    'Option --shard needs 1 ≤ K ≤ N (K from 1 to 3): got "4/3"',
  );
  assert.throws(
    () => parseShard("a/b"),
    UsageError,
    'Option --shard needs K/N with whole numbers 1 ≤ K ≤ N, e.g. 2/3: got "a/b"',
  );
  assert.throws(
    () => parseShard("1/0"),
    UsageError,
    'Option --shard needs N ≥ 1 shards: got "1/0"',
  );
});

Deno.test("selectShard() takes every case exactly once over the N shards, in any source order", () => {
  fc.assert(
    fc.property(
      fc.array(fc.string({ maxLength: 6 }), { maxLength: 40 }),
      fc.integer({ min: 1, max: 7 }),
      fc.integer(),
      (keys, n, salt) => {
        const cases = keys.map((shardKey, index) => ({ index, shardKey }));
        const shares = Array.from({ length: n }, (_, k) => selectShard(cases, { k: k + 1, n }));
        const taken = shares.flat().map((c) => c.index).sort((a, b) => a - b);
        assert.deepEqual(taken, cases.map((c) => c.index), "each case once");
        const sizes = shares.map((s) => s.length);
        assert.ok(Math.max(...sizes) - Math.min(...sizes) <= 1, "sizes differ by at most one");
        for (const s of shares) {
          assert.deepEqual(s, [...s].sort((a, b) => a.index - b.index), "source order kept");
        }
        // Shuffle the source (same keys, same indices): each shard keeps the same cases.
        const shuffled = [...cases].sort((a, b) =>
          ((a.index * 7919 + salt) % 13) - ((b.index * 7919 + salt) % 13)
        );
        for (let k = 1; k <= n; k++) {
          const again = selectShard(shuffled, { k, n }).map((c) => c.index).sort((a, b) => a - b);
          assert.deepEqual(again, shares[k - 1].map((c) => c.index));
        }
      },
    ),
    { seed: 11, numRuns: 200 },
  );
});
