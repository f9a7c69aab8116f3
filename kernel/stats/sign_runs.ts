/**
 * Runs test on the signs of residuals.
 *
 * Method: Wald & Wolfowitz (1940), "On a test whether two samples are from
 * the same population", Ann. Math. Statist. 11:147–162, normal
 * approximation: with n₁ positive and n₂ negative signs (zeros dropped),
 * n = n₁ + n₂, the number of runs R has
 * E R = 2n₁n₂/n + 1 and Var R = 2n₁n₂(2n₁n₂ − n)/(n²(n − 1));
 * z = (R − E R)/√Var R, two-sided p from the normal, no continuity
 * correction. Too few runs in x order means the residuals have a pattern
 * (curvature); too many, alternation.
 *
 * @module
 */
import { standardNormal } from "./normal.ts";

/** Runs, their expectation, z and the two-sided p-value. */
export interface SignRuns {
  runs: number;
  expected: number;
  z: number;
  p_value: number;
  positive: number;
  negative: number;
}

/**
 * Runs test on residual signs, in the order given by `order`.
 *
 * @param residuals Residuals per row.
 * @param order Row indices in the order to read the signs (default: as given).
 * @returns The test; null without at least one positive and one negative sign (or n = 2).
 * @example
 * ```ts
 * import { signRuns } from "./sign_runs.ts";
 * // + + − − + +: R = 3, n₁ = 4, n₂ = 2, E R = 16/6 + 1 (hand computation).
 * const t = signRuns(new Float64Array([1, 2, -1, -2, 1, 2]));
 * if (t === null || t.runs !== 3 || Math.abs(t.expected - 11 / 3) > 1e-15) throw new Error();
 * ```
 */
export function signRuns(residuals: ArrayLike<number>, order?: ArrayLike<number>): SignRuns | null {
  const idx = order ?? Array.from({ length: residuals.length }, (_, i) => i);
  let runs = 0, positive = 0, negative = 0, last = 0;
  for (let k = 0; k < idx.length; k++) {
    const s = Math.sign(residuals[idx[k]]);
    if (s === 0) continue;
    if (s > 0) positive++;
    else negative++;
    if (s !== last) runs++;
    last = s;
  }
  const n = positive + negative;
  if (positive === 0 || negative === 0 || n < 3) return null;
  const nn = 2 * positive * negative;
  const expected = nn / n + 1;
  const variance = nn * (nn - n) / (n * n * (n - 1));
  const z = variance > 0 ? (runs - expected) / Math.sqrt(variance) : 0;
  return {
    runs,
    expected,
    z,
    p_value: Math.min(1, 2 * standardNormal.upper(Math.abs(z))),
    positive,
    negative,
  };
}
