/**
 * Runs every diagnostic of kernel/stats on one fit and gathers the findings.
 *
 * ```
 *  Fit ─ design (or Jacobian), weights, residuals
 *   ├─ fitLeverage (once per fit) ─┬─ studentized (internal, external) ─ Cook's D, DFFITS
 *   │                              └─ PRESS
 *   ├─ fitFactor ─┬─ robust covariance, t, p, intervals (option; robust.ts)
 *   │             └─ VIF, condition number (R̃ only: no auxiliary regression)
 *   ├─ Durbin–Watson: moments from Q₁'s rows through the factor, or fitBasis
 *   │  for the exact law (up to 2,000 residual df; then the beta law)
 *   ├─ designQR (linear fits) ─ RESET, Breusch–Pagan (only the added vectors through Qᵀ)
 *   ├─ Breusch–Pagan on 1 and ŷ for a nonlinear fit
 *   ├─ Shapiro–Wilk, Jarque–Bera (on √w·e), runs (signs in x order), lack of fit (replicates)
 *   └─ findings (findings.ts)
 * ```
 *
 * Every step is linear in the rows n (issue 16: 1,000,000 × 10 in 12–15 s
 * before, see check_bench.ts): VIF and the condition number come from the
 * fit's p × p factor (kernel/stats `varianceInflationOfFactor`,
 * `conditionNumberOfFactor`; the auxiliary regressions of
 * `varianceInflation` and the QR of `conditionNumber` remain for a
 * rank-deficient Jacobian, where the factor covers fewer columns); RESET
 * and Breusch–Pagan carry only their added vectors through the fit's Qᵀ;
 * lack of fit groups rows by hashing (kernel/stats `lack_of_fit.ts`); the
 * runs test orders rows by x with a radix sort (kernel/stats `orderBy`).
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
import { rowArray } from "../../kernel/arrays.ts";
import {
  breuschPagan,
  breuschPaganOnFitted,
  conditionNumber,
  conditionNumberOfFactor,
  cooksDistance,
  type DesignTraces,
  dffits,
  DURBIN_WATSON_EXACT_DF,
  durbinWatsonTest,
  durbinWatsonTracesOfFactor,
  jarqueBera,
  lackOfFit,
  orderBy,
  press,
  ramseyReset,
  type RowTraces,
  shapiroWilk,
  signRuns,
  studentizedResiduals,
  varianceInflation,
  varianceInflationOfFactor,
  vifForm,
} from "../../kernel/stats/mod.ts";
import type { QRFactorization } from "../../kernel/linalg/mod.ts";
import {
  type Fit,
  fitBasis,
  fitFactor,
  fitLeverage,
  leverageKnown,
  rememberLeverage,
} from "../fit/mod.ts";
import type { CheckSpec } from "./spec.ts";
import type { CheckResult, CheckRows, CheckScalars } from "./result.ts";
import { findingsOf } from "./findings.ts";
import { robustOf } from "./robust.ts";

/**
 * All diagnostics of a fit as the RUN-JSON `check` object.
 *
 * @param fit The fit to judge.
 * @param spec The check's options.
 * @param level The level of robust intervals (the document's confidence).
 * @returns The result, findings included.
 */
export function diagnose(
  fit: Fit,
  spec: CheckSpec,
  level: number,
): { result: CheckScalars; perRow: CheckRows } {
  const { design, weights, residuals } = fit;
  const n = residuals.length, p = design.length;
  const traces = sharedRowsPass(fit);
  const h = fitLeverage(fit);
  const st = studentizedResiduals(residuals, h, p, weights);
  const we = weights ? residuals.map((e, i) => e * Math.sqrt(weights[i])) : residuals;
  const loo = press(residuals, h, weights);
  const dw = durbinWatsonTest(residuals, design, weights, () => fitBasis(fit), rowsOf(fit, traces));
  const free = freeColumns(fit);
  const qr = ownQR(fit);
  const perRow: CheckRows = {
    rows: fit.rows,
    fitted: fit.fitted,
    residuals,
    leverage: h,
    studentized_internal: st.internal,
    studentized_external: st.external,
    cooks_distance: cooksDistance(st.internal, h, p),
    dffits: dffits(st.external, h),
  };
  const base: Omit<CheckScalars, "findings"> = {
    fit: spec.fit,
    n,
    p,
    method: fit.method,
    weighted: fit.weighted,
    significance: spec.significance,
    sigma_unit: fit.units?.response ?? null,
    vif: vifOf(fit, free),
    vif_form: vifForm(free.design),
    condition_number: conditionOf(fit, free),
    durbin_watson: dw?.statistic ?? null,
    durbin_watson_test: dw && {
      expected: dw.expected,
      variance: dw.variance,
      z: dw.z,
      p_value: dw.p_value,
      p_value_negative: dw.p_value_negative,
      distribution: dw.distribution,
    },
    breusch_pagan: varianceTest(fit, spec, qr),
    shapiro_wilk: n >= 3 && n <= 5000 && spread(we) ? shapiroWilk(we) : null,
    jarque_bera: jarqueBera(we),
    reset: ramseyReset(residuals, fit.fitted, design, weights, qr),
    runs: runsOf(fit),
    lack_of_fit: lofOf(fit, p),
    press: loo.press,
    loo_rmse: loo.looRmse,
    robust: spec.robust === null ? null : robustOf(fit, spec.robust, level),
  };
  return { result: { ...base, findings: findingsOf({ ...base, ...perRow }) }, perRow };
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
  let order: Int32Array | undefined;
  if (byX) {
    const x = fit.columns[0];
    // Rows already in x order (a series read in time order) need no sort.
    let sorted = true;
    for (let i = 1; i < x.length && sorted; i++) sorted = x[i - 1] <= x[i];
    if (!sorted) order = orderBy(x);
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

/** The design (or Jacobian) columns, names and numbers of the parameters not held at a bound. */
interface Free {
  design: Float64Array[];
  names: string[];
  index: number[];
}

function freeColumns(fit: Fit): Free {
  const index = fit.parameters.map((_, j) => j).filter((j) => !(fit.atBound?.[j] ?? false));
  return {
    design: index.map((j) => fit.design[j]),
    names: index.map((j) => fit.parameters[j]),
    index,
  };
}

/** VIF through the fit's factor; by auxiliary regressions where it covers fewer columns. */
function vifOf(fit: Fit, free: Free): CheckResult["vif"] {
  return varianceInflationOfFactor(
    fitFactor(fit),
    fit.design,
    fit.parameters,
    fit.weights,
    free.index,
  ) ?? varianceInflation(free.design, free.names, fit.weights);
}

/** σ_max/σ_min through the fit's factor; by a QR of the design where it covers fewer columns. */
function conditionOf(fit: Fit, free: Free): number | null {
  const f = fitFactor(fit);
  return f.p === free.index.length
    ? conditionNumberOfFactor(f)
    : conditionNumber(free.design, fit.weights);
}

/** The linear solver's own QR of the (√w-scaled) design, when it is of these rows and full rank. */
function ownQR(fit: Fit): QRFactorization | null {
  const f = fit.designQR;
  return f !== undefined && f.m === fit.residuals.length && f.rank === fit.design.length &&
      f.n === fit.design.length
    ? f
    : null;
}

/**
 * The Durbin–Watson traces through the fit's factor (Q₁ row by row), when it
 * covers the whole design: beyond the exact law's df the basis is not formed.
 */
function rowsOf(fit: Fit, known: DesignTraces | undefined): RowTraces | undefined {
  const f = fitFactor(fit);
  if (f.p !== fit.design.length) return undefined;
  return {
    rank: f.p,
    traces: () => known ?? durbinWatsonTracesOfFactor(f, fit.design, fit.weights),
  };
}

/**
 * Durbin–Watson's traces and the leverages from one pass over Q₁'s rows, where the test will
 * read the traces (beyond its exact law's df) and the leverages would come from the same rows
 * (the factor in double: fit_leverage.ts): forming the rows is most of either's cost (about
 * 0.18 s each at 1,000,000 × 11). The leverages are remembered for fitLeverage.
 */
function sharedRowsPass(fit: Fit): DesignTraces | undefined {
  const f = fitFactor(fit);
  const n = fit.design[0]?.length ?? 0;
  if (
    f.rLo !== null || f.p !== fit.design.length || n - f.p <= DURBIN_WATSON_EXACT_DF ||
    leverageKnown(fit)
  ) return undefined;
  const h = rowArray(n);
  const traces = durbinWatsonTracesOfFactor(f, fit.design, fit.weights, h);
  rememberLeverage(fit, h);
  return traces;
}

/** Breusch–Pagan on the design (linear fits) or on 1 and ŷ (nonlinear fits). */
function varianceTest(
  fit: Fit,
  spec: CheckSpec,
  base: QRFactorization | null,
): CheckResult["breusch_pagan"] {
  const onFitted = fit.method === "nonlinear";
  const t = onFitted
    ? breuschPaganOnFitted(fit.residuals, fit.fitted, fit.weights, spec.varianceTest)
    : breuschPagan(fit.residuals, fit.design, fit.weights, spec.varianceTest, base);
  return t && { ...t, regressors: onFitted ? "fitted" : "design" };
}
