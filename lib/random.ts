/**
 * Seeded pseudo-random numbers (mulberry32), so every generated case and
 * every simulation is reproducible from its seed.
 *
 * @module
 */

/** A function returning uniform numbers in [0, 1). */
export type Random = () => number;

/**
 * Creates a seeded uniform generator (mulberry32, 32-bit state).
 *
 * @param seed Any integer; equal seeds give equal sequences.
 * @returns A function returning numbers in [0, 1).
 *
 * @example Same seed, same numbers
 * ```ts
 * import { seededRandom } from "./random.ts";
 * const a = seededRandom(42), b = seededRandom(42);
 * if (a() !== b()) throw new Error("one seed must give one sequence");
 * ```
 */
export function seededRandom(seed: number): Random {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Draws a standard normal variate (Box–Muller) from a uniform generator.
 *
 * @example
 * ```ts
 * import { normal, seededRandom } from "./random.ts";
 * const z = normal(seededRandom(1));
 * if (!Number.isFinite(z)) throw new Error(`a standard normal draw gave ${z}`);
 * ```
 */
export function normal(random: Random): number {
  const u = 1 - random();
  const v = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}
