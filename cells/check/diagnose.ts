/**
 * Runs every diagnostic of kernel/stats on one fit and gathers the findings.
 *
 * ```
 *  Fit ─ design (or Jacobian), weights, residuals
 *   ├─ fitLeverage (once per fit) ─┬─ studentized (internal, external) ─ Cook's D, DFFITS
 *   │                              └─ PRESS
 *   ├─ fitFactor ─ robust covariance, t, p, intervals (option; robust.ts)
 *   ├─ VIF, condition number, Durbin–Watson, RESET (on the design)
 *   ├─ Breusch–Pagan (on the design; on 1 and ŷ for a nonlinear fit)
 *   ├─ Shapiro–Wilk, Jarque–Bera (on √w·e), runs (signs in x order), lack of fit (replicates)
 *   └─ findings (findings.ts)
 * ```
 *
 * Weighted fits use √wᵢ-scaled residuals and design throughout. Nonlinear
 * fits use the Jacobian at the solution (Fit.design holds it) over the
 * parameters not held at a bound, so leverage, VIF (uncentred unless a
 * Jacobian column is constant) and the condition number are those of the
 * problem linearised at the estimates: local quantities. Breusch–Pagan
 * regresses their squared residuals on the fitted values instead (Cook &
 * Weisberg 1983; kernel/stats `breuschPaganOnFitted`): the Jacobian's
 * columns are derivatives, not predictors the variance might follow.
 *
 * @module
 */
import {
  breuschPagan,
  breuschPaganOnFitted,
  conditionNumber,
  cooksDistance,
  dffits,
  durbinWatsonTest,
  jarqueBera,
  lackOfFit,
  press,
  ramseyReset,
  shapiroWilk,
  signRuns,
  studentizedResiduals,
  varianceInflation,
  vifForm,
} from "../../kernel/stats/mod.ts";
import { type Fit, fitBasis, fitLeverage } from "../fit/mod.ts";
import type { CheckSpec } from "./spec.ts";
import type { CheckResult } from "./result.ts";
import { findingsOf } from "./findings.ts";
import { robustOf } from "./robust.ts";
import { plainArray } from "../../kernel/arrays.ts";

/**
 * All diagnostics of a fit as the RUN-JSON `check` object.
 *
 * @param fit The fit to judge.
 * @param spec The check's options.
 * @param level The level of robust intervals (the document's confidence).
 * @returns The result, findings included.
 */
export function diagnose(fit: Fit, spec: CheckSpec, level: number): CheckResult {
  const { design, weights, residuals } = fit;
  const n = residuals.length, p = design.length;
  const h = fitLeverage(fit);
  const st = studentizedResiduals(residuals, h, p, weights);
  const we = weights ? residuals.map((e, i) => e * Math.sqrt(weights[i])) : residuals;
  const loo = press(residuals, h, weights);
  const dw = durbinWatsonTest(residuals, design, weights, fitBasis(fit));
  const free = freeColumns(fit);
  const base: Omit<CheckResult, "findings"> = {
    fit: spec.fit,
    n,
    p,
    method: fit.method,
    weighted: fit.weighted,
    significance: spec.significance,
    sigma_unit: fit.units?.response ?? null,
    rows: plainArray(fit.rows),
    fitted: plainArray(fit.fitted),
    residuals: plainArray(residuals),
    leverage: plainArray(h),
    studentized_internal: st.internal,
    studentized_external: st.external,
    cooks_distance: cooksDistance(st.internal, h, p),
    dffits: dffits(st.external, h),
    vif: varianceInflation(free.design, free.names, weights),
    vif_form: vifForm(free.design),
    condition_number: conditionNumber(free.design, weights),
    durbin_watson: dw?.statistic ?? null,
    durbin_watson_test: dw && {
      expected: dw.expected,
      variance: dw.variance,
      z: dw.z,
      p_value: dw.p_value,
      p_value_negative: dw.p_value_negative,
      distribution: dw.distribution,
    },
    breusch_pagan: varianceTest(fit, spec),
    shapiro_wilk: n >= 3 && n <= 5000 && spread(we) ? shapiroWilk(we) : null,
    jarque_bera: jarqueBera(we),
    reset: ramseyReset(residuals, fit.fitted, design, weights),
    runs: runsOf(fit),
    lack_of_fit: lofOf(fit, p),
    press: loo.press,
    loo_rmse: loo.looRmse,
    robust: spec.robust === null ? null : robustOf(fit, spec.robust, level),
  };
  return { ...base, findings: findingsOf(base) };
}

function spread(x: Float64Array): boolean {
  let lo = Infinity, hi = -Infinity;
  for (const v of x) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return hi - lo > 1e-19 * Math.max(1, Math.abs(lo));
}

/** Signs in order of the one predictor column (ties in row order), else row order. */
function runsOf(fit: Fit): CheckResult["runs"] {
  const byX = fit.columns.length === 1;
  const n = fit.residuals.length;
  const order = new Array<number>(n);
  for (let i = 0; i < n; i++) order[i] = i;
  if (byX) {
    const x = fit.columns[0];
    // Rows already in x order (a series read in time order) need no sort.
    let sorted = true;
    for (let i = 1; i < n && sorted; i++) sorted = x[i - 1] <= x[i];
    if (!sorted) order.sort((a, b) => x[a] - x[b] || a - b);
  }
  const r = signRuns(fit.residuals, order);
  return r &&
    { runs: r.runs, expected: r.expected, z: r.z, p_value: r.p_value, order: byX ? "x" : "rows" };
}

function lofOf(fit: Fit, p: number): CheckResult["lack_of_fit"] {
  if (fit.columns.length === 0) return null;
  const t = lackOfFit(fit.columns, fit.y, fit.residuals, p, fit.weights);
  return t && {
    f: t.f,
    df1: t.df1,
    df2: t.df2,
    p_value: t.p_value,
    ss_lack_of_fit: t.ss_lack_of_fit,
    ss_pure_error: t.ss_pure_error,
  };
}

/** The design (or Jacobian) columns and names of the parameters not held at a bound. */
function freeColumns(fit: Fit): { design: Float64Array[]; names: string[] } {
  const keep = fit.parameters.map((_, j) => !(fit.atBound?.[j] ?? false));
  return {
    design: fit.design.filter((_, j) => keep[j]),
    names: fit.parameters.filter((_, j) => keep[j]),
  };
}

/** Breusch–Pagan on the design (linear fits) or on 1 and ŷ (nonlinear fits). */
function varianceTest(fit: Fit, spec: CheckSpec): CheckResult["breusch_pagan"] {
  const onFitted = fit.method === "nonlinear";
  const t = onFitted
    ? breuschPaganOnFitted(fit.residuals, fit.fitted, fit.weights, spec.varianceTest)
    : breuschPagan(fit.residuals, fit.design, fit.weights, spec.varianceTest);
  return t && { ...t, regressors: onFitted ? "fitted" : "design" };
}
