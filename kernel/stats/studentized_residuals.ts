/**
 * Internally and externally studentized residuals.
 *
 * Method: Belsley, Kuh & Welsch, *Regression Diagnostics* (1980), §2.1, and
 * Cook & Weisberg, *Residuals and Influence in Regression* (1982), §2.2:
 *
 * - internal rᵢ = ẽᵢ / (s·√(1 − hᵢ)), s² = Σẽ²/(n − p);
 * - external tᵢ = ẽᵢ / (s₍ᵢ₎·√(1 − hᵢ)), with the leave-one-out variance
 *   s₍ᵢ₎² = ((n − p)·s² − ẽᵢ²/(1 − hᵢ)) / (n − p − 1), no refit needed.
 *
 * ẽᵢ = √wᵢ·eᵢ for a weighted fit (hᵢ then from √W·X). A leverage of 1
 * (1 − hᵢ < 1e-10) leaves the residual undefined: NaN. With n − p − 1 ≤ 0
 * (or s₍ᵢ₎ = 0) the external residual is NaN too. Float64Arrays, not plain
 * arrays with nulls: a million rows of those were two million heap numbers,
 * and every later collection in the worker walked them (RUN-JSON writes NaN
 * as null).
 *
 * @module
 */
import { rowArray } from "../arrays.ts";
import { LEVERAGE_ONE_TOLERANCE } from "./leverage.ts";

/** Both kinds of studentized residual, per row; NaN where undefined. */
export interface StudentizedResiduals {
  internal: Float64Array;
  external: Float64Array;
  /** s = √(Σẽ²/(n − p)). */
  sigma: number;
}

/**
 * Studentized residuals from residuals and hat values.
 *
 * @param residuals eᵢ = yᵢ − ŷᵢ per row (unweighted).
 * @param hat hᵢ per row (from `hatValues` with the same weights).
 * @param p Number of estimated mean parameters.
 * @param weights wᵢ per row, or null.
 * @returns Internal and external residuals and s.
 * @throws {RangeError} When lengths differ or n ≤ p.
 * @example
 * ```ts
 * import { studentizedResiduals } from "./studentized_residuals.ts";
 * // e = (1, −2, 1, 0), h = 0.5 each, p = 2: s² = 6/2 = 3, r₁ = 1/(√3·√0.5) (hand computation).
 * const r = studentizedResiduals(new Float64Array([1, -2, 1, 0]), new Float64Array(4).fill(0.5), 2, null);
 * if (Math.abs(r.internal[0] - 1 / Math.sqrt(1.5)) > 1e-14) throw new Error();
 * ```
 */
export function studentizedResiduals(
  residuals: Float64Array,
  hat: Float64Array,
  p: number,
  weights: Float64Array | null,
): StudentizedResiduals {
  const n = residuals.length;
  if (hat.length !== n || (weights && weights.length !== n)) {
    throw new RangeError(
      `Cannot studentize residuals: ${n} residuals, ${hat.length} hat values`,
    );
  }
  if (n <= p) {
    throw new RangeError(`Cannot studentize residuals: ${n} rows for ${p} parameters`);
  }
  // One pass for s, one for both residuals, into arrays of their final length (no per-row growth).
  const e = weights === null ? residuals : new Float64Array(n);
  let rss = 0;
  for (let i = 0; i < n; i++) {
    if (weights !== null) e[i] = residuals[i] * Math.sqrt(weights[i]);
    rss += e[i] * e[i];
  }
  const df = n - p;
  const sigma = Math.sqrt(rss / df);
  const internal = rowArray(n), external = rowArray(n);
  for (let i = 0; i < n; i++) {
    const gap = 1 - hat[i];
    if (gap < LEVERAGE_ONE_TOLERANCE) {
      internal[i] = NaN;
      external[i] = NaN;
      continue;
    }
    internal[i] = sigma > 0 ? e[i] / (sigma * Math.sqrt(gap)) : NaN;
    const loo = df > 1 ? (rss - e[i] * e[i] / gap) / (df - 1) : NaN;
    external[i] = loo > 0 ? e[i] / Math.sqrt(loo * gap) : NaN;
  }
  return { internal, external, sigma };
}
