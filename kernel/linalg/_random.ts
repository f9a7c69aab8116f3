/**
 * Test and benchmark support: a small seeded generator so inputs are
 * reproducible. Mulberry32 (Tommy Ettinger, public domain; common practice, no
 * published source) for uniforms, Box–Muller (Box & Muller 1958, Ann. Math.
 * Statist. 29) for normals. Not for statistics, only for making inputs.
 *
 * @module
 */

/** A seeded uniform generator on [0, 1) with a `normal()` companion. */
export interface SeededRandom {
  (): number;
  normal(): number;
}

/** Makes a generator from a 32-bit seed. */
export function seededRandom(seed: number): SeededRandom {
  let s = seed >>> 0;
  const uniform = (() => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }) as SeededRandom;
  uniform.normal = () => {
    const u = 1 - uniform(), v = uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
  return uniform;
}
