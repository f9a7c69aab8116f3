/**
 * Cook's distance.
 *
 * Method: Cook (1977), "Detection of influential observation in linear
 * regression", Technometrics 19:15–18: Dᵢ = rᵢ²·hᵢ / (p·(1 − hᵢ)), rᵢ the
 * internally studentized residual. NaN where rᵢ is (leverage 1).
 *
 * @module
 */
import { rowArray } from "../arrays.ts";

/**
 * Cook's distance per row.
 *
 * @param internal Internally studentized residuals (NaN where undefined).
 * @param hat hᵢ per row.
 * @param p Number of estimated mean parameters.
 * @returns Dᵢ per row, NaN where rᵢ is NaN.
 * @throws {RangeError} When the lengths differ.
 * @example
 * ```ts
 * import { cooksDistance } from "./cooks_distance.ts";
 * // r = 2, h = 0.5, p = 2: D = 4·0.5/(2·0.5) = 2 (hand computation).
 * if (cooksDistance(new Float64Array([2]), new Float64Array([0.5]), 2)[0] !== 2) throw new Error();
 * ```
 */
export function cooksDistance(
  internal: Float64Array,
  hat: Float64Array,
  p: number,
): Float64Array {
  if (internal.length !== hat.length) {
    throw new RangeError(
      `Cannot compute Cook's distance: ${internal.length} residuals, ${hat.length} hat values`,
    );
  }
  const out = rowArray(internal.length);
  for (let i = 0; i < internal.length; i++) {
    const r = internal[i];
    out[i] = r * r * hat[i] / (p * (1 - hat[i])); // NaN stays NaN
  }
  return out;
}
