/**
 * The check of a fit whose response has rows below a detection limit (issue
 * 20 item 2). A row below its limit has no residual: only that its response
 * lies below L. Judged as if L had been measured, those rows would pile up at
 * one end and fail every test of the residuals' shape. They enter instead with
 * randomized quantile residuals (Dunn & Smyth 1996, J. Comput. Graph. Stat.
 * 5:236–244): a draw from the fitted normal below the row's limit,
 *   u ~ U(0, Φ((L − ŷ)/σ)),   r = σ·Φ⁻¹(u),
 * which under the model is distributed as a measured row's residual, so the
 * normality, variance and independence tests keep their meaning. The draws are
 * seeded from the document's seed, so a rerun judges the same residuals.
 * Leverage depends on the design only and is as for any fit; Cook's distance
 * and the studentized residuals are the least-squares formulas applied to the
 * ML estimates, which the check says.
 *
 * A fit that substituted a fraction of the limit (`substitute`) is a
 * least-squares fit of the substituted values and is judged as such, with a
 * warning that those rows are judged as if measured.
 */

import type { Fit } from "../fit/fit.ts";
import { standardNormal } from "../../kernel/stats/mod.ts";
import { mulberry32 } from "../../kernel/random.ts";

/** How a censored fit's rows below their limits entered the check (RUN-JSON `censored`). */
export interface CensoredCheck {
  /** Rows whose response lies below its detection limit. */
  rows_below: number;
  /** "randomized quantile" (ML fits) or "substituted" (`substitute`: judged as if measured). */
  residuals: "randomized quantile" | "substituted";
  /** The seed of the draws (the document's), or null for substituted values. */
  seed: number | null;
}

/**
 * The fit as the check judges it: with randomized quantile residuals in the
 * rows below their limits (ML fits), or as it is (substitution).
 *
 * @param fit A fit with `censoring` and `below`.
 * @param seed The document's seed.
 * @returns The fit to judge and the record of how.
 */
export function censoredForCheck(
  fit: Fit & { below: Uint8Array },
  seed: number,
): { fit: Fit; record: CensoredCheck } {
  const c = fit.censoring!;
  if (c.method === "substitution") {
    return { fit, record: { rows_below: c.rows_below, residuals: "substituted", seed: null } };
  }
  const residuals = quantileResiduals(fit.y, fit.fitted, fit.below, c.sigma, seed);
  const y = Float64Array.from(fit.fitted, (f, i) => f + residuals[i]);
  return {
    fit: { ...fit, y, residuals },
    record: { rows_below: c.rows_below, residuals: "randomized quantile", seed },
  };
}

/**
 * Randomized quantile residuals of a left-censored normal model (Dunn & Smyth
 * 1996): measured rows keep y − ŷ; a row below its limit L gets σ·Φ⁻¹(u) with
 * u uniform on (0, Φ((L − ŷ)/σ)).
 *
 * @param y Responses; the limit on rows below it.
 * @param fitted ŷ.
 * @param below 1 where the row is below its limit.
 * @param sigma The fitted σ.
 * @param seed Seed of the uniform draws.
 * @returns The residuals.
 *
 * @example
 * ```ts
 * import { quantileResiduals } from "./censored.ts";
 * const r = quantileResiduals([1, 0.5], [1.2, 1], new Uint8Array([0, 1]), 0.3, 7);
 * if (Math.abs(r[0] + 0.2) > 1e-15 || !(r[1] < -0.5)) throw new Error();
 * ```
 */
export function quantileResiduals(
  y: ArrayLike<number>,
  fitted: ArrayLike<number>,
  below: Uint8Array,
  sigma: number,
  seed: number,
): Float64Array {
  const uniform = mulberry32(seed);
  const out = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) {
    const e = y[i] - fitted[i];
    if (below[i] !== 1) {
      out[i] = e;
      continue;
    }
    const top = standardNormal.cdf(e / sigma);
    // (0, 1] → (0, top]: u = 0 would give −∞.
    const u = (1 - uniform()) * top;
    out[i] = u > 0 ? sigma * standardNormal.quantile(u) : e;
  }
  return out;
}
