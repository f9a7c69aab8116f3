/**
 * The project's one seeded generator, for everything that must be
 * reproducible from a seed: multi-start samples, cross-validation folds,
 * benchmark and test inputs.
 *
 * Mulberry32 (Tommy Ettinger's 32-bit generator, public domain; common
 * practice, no published source) for uniforms: period 2^32, fine for a few
 * million draws, not for statistics that need long streams. Box–Muller
 * (Box & Muller 1958, Ann. Math. Statist. 29) for normals.
 *
 * @module
 */

/**
 * Uniform 32-bit integers in [0, 2^32) from a seed.
 *
 * @param seed Any number; its low 32 bits are used.
 * @returns The generator.
 */
export function mulberry32Uint(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (t ^ (t >>> 14)) >>> 0;
  };
}

/**
 * Uniform doubles in [0, 1) from a seed.
 *
 * @param seed Any number; its low 32 bits are used.
 * @returns The generator.
 * @example
 * ```ts
 * import { mulberry32 } from "./random.ts";
 * const a = mulberry32(7), b = mulberry32(7);
 * if (a() !== b() || a() >= 1) throw new Error("same seed, same stream, in [0, 1)");
 * ```
 */
export function mulberry32(seed: number): () => number {
  const next = mulberry32Uint(seed);
  return () => next() / 4294967296;
}

/** A seeded uniform generator on [0, 1) with a `normal()` companion. */
export interface SeededRandom {
  (): number;
  normal(): number;
}

/**
 * A uniform generator with standard normal draws by Box–Muller.
 *
 * @param seed Any number; its low 32 bits are used.
 * @returns The generator; `normal()` gives N(0, 1) draws.
 */
export function seededRandom(seed: number): SeededRandom {
  const uniform = mulberry32(seed) as SeededRandom;
  uniform.normal = () => {
    const u = 1 - uniform(), v = uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
  return uniform;
}
