/**
 * Seeded sampling for the multi-start search: the project's generator
 * (kernel/random.ts) and a Latin hypercube.
 *
 * @module
 */
import { mulberry32 as base } from "../random.ts";

/**
 * Uniform numbers in [0, 1) from `seed`: the project's generator
 * (kernel/random.ts), with the seed mixed by the golden-ratio constant so
 * the multi-start stream differs from other streams of the same seed.
 */
export function mulberry32(seed: number): () => number {
  return base(Math.floor(seed) ^ 0x9e3779b9);
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
