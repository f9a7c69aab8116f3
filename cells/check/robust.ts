/**
 * The check's robust inference (option `robust: hc0 … hc3`): the
 * heteroscedasticity-consistent covariance of the estimates and, from it,
 * standard errors, t statistics, two-sided p-values and intervals at the
 * document's confidence.
 *
 * Method: HC0 (White 1980, Econometrica 48:817–838) or HC1–HC3 (MacKinnon &
 * White 1985, J. Econometrics 29:305–325), computed through the fit's own
 * triangular factor (kernel/stats `robustCovarianceOfFactor`: no explicit
 * (XᵀX)⁻¹, double-double where the fit was solved in double-double; for a
 * nonlinear fit the Jacobian at the estimates, over the parameters not held
 * at a bound). t = θ̂ⱼ/seⱼ against Student's t on the fit's residual degrees
 * of freedom n − p, and θ̂ⱼ ± t(1 − α/2; n − p)·seⱼ, as R's
 * lmtest::coeftest with sandwich::vcovHC and Stata's `vce(robust)` do
 * (common practice; from memory). A parameter held at a bound has no robust
 * variance: its entries are null.
 *
 * @module
 */
import { type HCType, studentT } from "../../kernel/stats/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { fitRobust } from "../fit/mod.ts";
import type { CheckResult } from "./result.ts";

/**
 * The robust part of a check result.
 *
 * @param fit The fit.
 * @param type The estimator.
 * @param level The interval level (the document's confidence).
 * @returns `robust` of the RUN-JSON check result: `type`, `std_errors` and the
 *   additions `level`, `df`, `t`, `p_value`, `ci` (keyed by parameter) and
 *   `covariance` (p × p in the fit's parameter order, null where it does not exist).
 * @example
 * ```ts
 * import { robustOf } from "./robust.ts";
 * import type { Fit } from "../fit/mod.ts";
 * // Mean only, e = (1, −1, 2, −2) about 5: HC0 var = Σe²/n² = 10/16 (hand computation).
 * const fit = {
 *   design: [new Float64Array(4).fill(1)], weights: null, parameters: ["m"],
 *   estimates: Float64Array.of(5), residuals: Float64Array.of(1, -1, 2, -2),
 *   statistics: { dfResidual: 3 },
 * } as unknown as Fit;
 * const r = robustOf(fit, "hc0", 0.95);
 * if (Math.abs(r.std_errors.m! - Math.sqrt(10 / 16)) > 1e-15 || r.df !== 3) throw new Error();
 * ```
 */
export function robustOf(
  fit: Fit,
  type: HCType,
  level: number,
): NonNullable<CheckResult["robust"]> {
  const r = fitRobust(fit, type);
  const p = fit.parameters.length, df = fit.statistics.dfResidual;
  const ref = studentT(df), q = ref.upperQuantile((1 - level) / 2);
  const out: NonNullable<CheckResult["robust"]> = {
    type,
    std_errors: {},
    level,
    df,
    t: {},
    p_value: {},
    ci: {},
    covariance: Array.from(
      { length: p },
      (_, j) =>
        Array.from({ length: p }, (_, k) => {
          const v = r.covariance[j + k * p];
          return Number.isFinite(v) ? v : null;
        }),
    ),
  };
  fit.parameters.forEach((name, j) => {
    const se = r.stdErrors[j], est = fit.estimates[j];
    const t = se === null || !(se > 0) ? null : est / se;
    out.std_errors[name] = se;
    out.t[name] = t;
    out.p_value[name] = t === null ? null : Math.min(1, 2 * ref.upper(Math.abs(t)));
    out.ci[name] = se === null ? null : [est - q * se, est + q * se];
  });
  return out;
}
