/**
 * Weighted least squares as a transform of the problem: with weights wᵢ,
 * min Σ wᵢ·rᵢ² is ordinary least squares on rows multiplied by √wᵢ
 * (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §9.2, from
 * memory for the section). Every solver applies the same scaling through
 * these helpers, as `FitProblem.weights` prescribes.
 *
 * @module
 */

/**
 * √wᵢ per row, or null for an unweighted problem.
 *
 * @param weights The problem's weights (null or absent: unweighted).
 * @returns The square roots, or null.
 * @example
 * ```ts
 * import { rootWeights } from "./_weights.ts";
 * if (rootWeights(new Float64Array([4, 9]))?.join() !== "2,3") throw new Error();
 * ```
 */
export function rootWeights(weights: Float64Array | null | undefined): Float64Array | null {
  return weights ? weights.map(Math.sqrt) : null;
}

/**
 * Each vector multiplied row by row by √w (new arrays; the inputs are kept).
 *
 * @param vectors Columns of the design or Jacobian, or a residual vector.
 * @param root √wᵢ per row (from {@link rootWeights}).
 * @returns The whitened copies.
 * @example
 * ```ts
 * import { whiten } from "./_weights.ts";
 * const [c] = whiten([new Float64Array([1, 1])], new Float64Array([2, 3]));
 * if (c.join() !== "2,3") throw new Error();
 * ```
 */
export function whiten(vectors: readonly Float64Array[], root: Float64Array): Float64Array[] {
  return vectors.map((v) => v.map((x, i) => x * root[i]));
}

/**
 * A whitened vector back on the original scale (divided by √w row by row).
 *
 * @param v The whitened vector (fitted values or residuals).
 * @param root √wᵢ per row, all positive.
 * @returns A new array.
 * @example
 * ```ts
 * import { unwhiten } from "./_weights.ts";
 * if (unwhiten(new Float64Array([2, 3]), new Float64Array([2, 3])).join() !== "1,1") throw new Error();
 * ```
 */
export function unwhiten(v: Float64Array, root: Float64Array): Float64Array {
  return v.map((x, i) => x / root[i]);
}
