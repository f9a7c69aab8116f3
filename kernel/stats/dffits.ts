/**
 * DFFITS, the scaled change in a row's fitted value when it is left out.
 *
 * Method: Belsley, Kuh & Welsch, *Regression Diagnostics* (1980), §2.1,
 * eq. 2.11 (from memory for the equation number):
 * DFFITSᵢ = tᵢ·√(hᵢ/(1 − hᵢ)), tᵢ the externally studentized residual.
 *
 * @module
 */
import { rowArray } from "../arrays.ts";

/**
 * DFFITS per row.
 *
 * @param external Externally studentized residuals (NaN where undefined).
 * @param hat hᵢ per row.
 * @returns DFFITSᵢ per row, NaN where tᵢ is NaN.
 * @throws {RangeError} When the lengths differ.
 * @example
 * ```ts
 * import { dffits } from "./dffits.ts";
 * // t = 3, h = 0.5: 3·√1 = 3 (hand computation).
 * if (dffits(new Float64Array([3]), new Float64Array([0.5]))[0] !== 3) throw new Error();
 * ```
 */
export function dffits(external: Float64Array, hat: Float64Array): Float64Array {
  if (external.length !== hat.length) {
    throw new RangeError(
      `Cannot compute DFFITS: ${external.length} residuals, ${hat.length} hat values`,
    );
  }
  const out = rowArray(external.length);
  for (let i = 0; i < external.length; i++) {
    out[i] = external[i] * Math.sqrt(hat[i] / (1 - hat[i])); // NaN stays NaN
  }
  return out;
}
