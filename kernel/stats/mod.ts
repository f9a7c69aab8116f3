/**
 * Probability distributions for inference: normal, Student's t, F and χ²,
 * with densities, both tails, and quantiles. Upper tails are computed
 * directly (never as 1 − cdf), so p-values as small as 1e-300 come out as
 * numbers with nearly full relative accuracy.
 *
 * ```
 *  lnGamma ─┬─ regularizedGamma (series / Lentz fraction) ── chiSquared, standardNormal
 *           └─ regularizedBeta  (Lentz fraction)          ── studentT, fisherF
 *                        every quantile: invertTail (bracket + safeguarded Newton)
 * ```
 *
 * Why our own and not the npm package `jstat` (1.9.6, checked by hand before
 * this was written): it has no upper-tail functions, so a p-value is
 * 1 − cdf and rounds to 0 below about 1e-16 (t = 99.3 with 18 df gives 0, not
 * 2.05e-26); its normal cdf at −37 is 0; and its t and F quantiles agree
 * with tables only to about 4e-9 relative.
 *
 * @example
 * ```ts
 * import { studentT } from "./mod.ts";
 * const p = 2 * studentT(18).upper(99.30644704798509);
 * // statsmodels 0.13.5 / scipy 1.10.1 (../shared/reference/checks/ols_simple_sensor_calibration.json).
 * if (Math.abs(p / 4.105464082237903e-26 - 1) > 1e-12) throw new Error(String(p));
 * ```
 *
 * @module
 */
export type { Distribution } from "./distribution.ts";
export { standardNormal } from "./normal.ts";
export { studentT } from "./student_t.ts";
export { fisherF } from "./fisher_f.ts";
export { chiSquared } from "./chi_squared.ts";
export { type GammaTails, regularizedGamma } from "./incomplete_gamma.ts";
export { type BetaTails, regularizedBeta } from "./incomplete_beta.ts";
export { lnGamma } from "./log_gamma.ts";
export { hatValues, hatValuesOf, LEVERAGE_ONE_TOLERANCE, type Press, press } from "./leverage.ts";
export { orthonormalBasis } from "./_orthonormal_basis.ts";
export { type StudentizedResiduals, studentizedResiduals } from "./studentized_residuals.ts";
export { cooksDistance } from "./cooks_distance.ts";
export { dffits } from "./dffits.ts";
export {
  varianceInflation,
  varianceInflationOfFactor,
  type VifForm,
  vifForm,
} from "./variance_inflation.ts";
export { conditionNumber, conditionNumberOfFactor } from "./condition_number.ts";
export {
  betaCdf as durbinWatsonBetaCdf,
  type DesignTraces,
  durbinWatson,
  type DurbinWatsonTest,
  durbinWatsonTest,
  EXACT_DF as DURBIN_WATSON_EXACT_DF,
  type RowTraces,
  tracesOfFactor as durbinWatsonTracesOfFactor,
} from "./durbin_watson.ts";
export { durbinWatsonCdf } from "./durbin_watson_exact.ts";
export {
  type BreuschPagan,
  breuschPagan,
  breuschPaganOnFitted,
  type BreuschPaganVariant,
} from "./breusch_pagan.ts";
export { type ShapiroWilk, shapiroWilk } from "./shapiro_wilk.ts";
export { type JarqueBera, jarqueBera } from "./jarque_bera.ts";
export { orderBy, type SignRuns, signRuns } from "./sign_runs.ts";
export { ramseyReset, type Reset } from "./ramsey_reset.ts";
export { type LackOfFit, lackOfFit } from "./lack_of_fit.ts";
export {
  type FactorSandwich,
  type HCType,
  type RobustCovariance,
  robustCovarianceOfFactor,
} from "./robust_covariance.ts";
