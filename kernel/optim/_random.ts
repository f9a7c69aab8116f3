/**
 * A small seeded generator for the multi-start search: mulberry32 (Tommy
 * Ettinger's 32-bit generator, public domain; from memory). Not for
 * statistics that need long periods; enough for a few thousand draws.
 *
 * @module
 */

/** Returns a function giving uniform numbers in [0, 1) from `seed`. */
export function mulberry32(seed: number): () => number {
  let a = (Math.floor(seed) ^ 0x9e3779b9) >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * A Latin hypercube of `count` points in [0, 1)^dims (McKay, Beckman &
 * Conover 1979, Technometrics 21): each axis cut into `count` equal strata,
 * one point per stratum, strata paired at random.
 */
export function latinHypercube(count: number, dims: number, rand: () => number): Float64Array[] {
  const pts = Array.from({ length: count }, () => new Float64Array(dims));
  const perm = Int32Array.from({ length: count }, (_, i) => i);
  for (let d = 0; d < dims; d++) {
    for (let i = count - 1; i > 0; i--) {
      const k = Math.floor(rand() * (i + 1));
      [perm[i], perm[k]] = [perm[k], perm[i]];
    }
    for (let i = 0; i < count; i++) pts[i][d] = (perm[i] + rand()) / count;
  }
  return pts;
}
