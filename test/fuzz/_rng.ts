/**
 * The fuzz suite's random source: every input has its own generator, seeded
 * from (run seed, target, index), so input 73,412 of a run can be made again
 * without making the 73,411 before it.
 *
 * @module
 */
import { mulberry32Uint } from "../../kernel/random.ts";

/** A seeded generator with the draws the generators need. */
export interface Rng {
  /** A uniform draw in [0, 1). */
  next(): number;
  /** A whole number in [0, n). */
  int(n: number): number;
  /** A whole number in [lo, hi]. */
  between(lo: number, hi: number): number;
  /** True with probability p. */
  chance(p: number): boolean;
  /** One element of a non-empty list. */
  pick<T>(items: readonly T[]): T;
  /** A size from 1 to max, small sizes far more often (log-uniform). */
  size(max: number): number;
}

/** FNV-1a over the text, for mixing the target's name into the seed. */
function fnv(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/**
 * The generator of one input.
 *
 * @param seed The run's seed.
 * @param target The target's name.
 * @param index The input's index in the run.
 * @returns A generator that depends on the three alone.
 */
export function inputRng(seed: number, target: string, index: number): Rng {
  const mixed = (Math.imul(seed >>> 0, 0x9e3779b1) ^ fnv(target) ^ Math.imul(index, 0x85ebca6b)) >>>
    0;
  const u = mulberry32Uint(mixed);
  const next = () => u() / 4294967296;
  const int = (n: number) => Math.floor(next() * n);
  return {
    next,
    int,
    between: (lo, hi) => lo + int(hi - lo + 1),
    chance: (p) => next() < p,
    pick: (items) => items[int(items.length)],
    size: (max) => Math.max(1, Math.min(max, Math.floor(Math.exp(next() * Math.log(max + 1))))),
  };
}
