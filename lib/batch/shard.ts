/**
 * `--shard K/N`: a deterministic share of a batch's cases.
 *
 * The cases are put in order of their shard key (the case's main file as
 * written in the source, then its `id` cell, then its position in the
 * source; UTF-16 code-unit order), and the case at position i (from 0) of
 * that order goes to shard `(i mod N) + 1`. So the N shards together take
 * every case exactly once, their sizes differ by at most one, and the share
 * does not depend on the order of the manifest's rows.
 *
 * @module
 */

import { UsageError } from "../errors.ts";
import type { BatchCase } from "./batch_types.ts";

/** A shard: the K-th of N, 1 ≤ K ≤ N. */
export interface Shard {
  /** Which share, from 1. */
  k: number;
  /** How many shares. */
  n: number;
}

/**
 * Reads `K/N`.
 *
 * @param text The option's value.
 * @returns The shard.
 * @throws {UsageError} Unless K and N are whole numbers with 1 ≤ K ≤ N.
 *
 * @example Good and bad shards
 * ```ts
 * import { parseShard } from "./shard.ts";
 * if (parseShard("2/3").k !== 2) throw new Error("2/3 is the second of three shares");
 * for (const bad of ["0/3", "4/3", "a/b"]) {
 *   let failed = false;
 *   try { parseShard(bad); } catch { failed = true; }
 *   if (!failed) throw new Error(bad);
 * }
 * ```
 */
export function parseShard(text: string): Shard {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  if (!m) {
    throw new UsageError(
      `Option --shard needs K/N with whole numbers 1 ≤ K ≤ N, e.g. 2/3: got "${text}"`,
    );
  }
  const k = Number(m[1]), n = Number(m[2]);
  if (!Number.isSafeInteger(n) || n < 1) {
    throw new UsageError(`Option --shard needs N ≥ 1 shards: got "${text}"`);
  }
  if (!Number.isSafeInteger(k) || k < 1 || k > n) {
    throw new UsageError(`Option --shard needs 1 ≤ K ≤ N (K from 1 to ${n}): got "${text}"`);
  }
  return { k, n };
}

/**
 * The cases of shard `shard`, in source order (see the module documentation).
 *
 * @param cases Every case of the source.
 * @param shard Which share.
 * @returns The share.
 *
 * @example Three shards take every case once
 * ```ts
 * import { selectShard } from "./shard.ts";
 * const cases = ["c", "a", "b", "d"].map((key, index) =>
 *   ({ index, shardKey: key, label: key, input: null, options: {} }));
 * const shares = [1, 2, 3].map((k) => selectShard(cases, { k, n: 3 }).map((c) => c.shardKey));
 * if (shares.map((s) => s.join("")).join("|") !== "ad|b|c") throw new Error(shares.join("|"));
 * ```
 */
export function selectShard<T extends Pick<BatchCase, "index" | "shardKey">>(
  cases: readonly T[],
  shard: Shard,
): T[] {
  const order = [...cases].sort((a, b) =>
    a.shardKey < b.shardKey ? -1 : a.shardKey > b.shardKey ? 1 : a.index - b.index
  );
  const mine = new Set(order.filter((_, i) => i % shard.n === shard.k - 1));
  return cases.filter((c) => mine.has(c));
}
