/**
 * Cook's distance.
 *
 * Method: Cook (1977), "Detection of influential observation in linear
 * regression", Technometrics 19:15–18: Dᵢ = rᵢ²·hᵢ / (p·(1 − hᵢ)), rᵢ the
 * internally studentized residual. Null where rᵢ is (leverage 1).
 *
 * @module
 */

/**
 * Cook's distance per row.
 *
 * @param internal Internally studentized residuals (null where undefined).
 * @param hat hᵢ per row.
 * @param p Number of estimated mean parameters.
 * @returns Dᵢ per row, null where rᵢ is null.
 * @throws {RangeError} When the lengths differ.
 * @example
 * ```ts
 * import { cooksDistance } from "./cooks_distance.ts";
 * // r = 2, h = 0.5, p = 2: D = 4·0.5/(2·0.5) = 2 (hand computation).
 * if (cooksDistance([2], new Float64Array([0.5]), 2)[0] !== 2) throw new Error();
 * ```
 */
export function cooksDistance(
  internal: readonly (number | null)[],
  hat: Float64Array,
  p: number,
): (number | null)[] {
  if (internal.length !== hat.length) {
    throw new RangeError(
      `Cannot compute Cook's distance: ${internal.length} residuals, ${hat.length} hat values`,
    );
  }
  const out = new Array<number | null>(internal.length);
  for (let i = 0; i < internal.length; i++) {
    const r = internal[i];
    out[i] = r === null ? null : r * r * hat[i] / (p * (1 - hat[i]));
  }
  return out;
}
