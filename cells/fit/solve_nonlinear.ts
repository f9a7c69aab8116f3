/**
 * Nonlinear least squares for the `fit` cell.
 *
 * ```
 *  model ─compile, derivative─▶ F(θ) = f(θ) − y, J = ∂f/∂θ (exact, symbolic)
 *  start complete? ─ yes ─▶ lmder (Levenberg–Marquardt, trust region, scaling)
 *                  └─ no ──▶ multiStart (seeded; linear parameters projected out)
 *        ─▶ polish (Gauss–Newton, residuals in double-double from the data as printed)
 *        ─▶ covar ((JᵀJ)⁻¹ from the pivoted QR of J; rank → unidentifiable parameters)
 * ```
 *
 * Methods and sources are in kernel/optim (MINPACK-1, Moré, Garbow &
 * Hillstrom 1980, ANL-80-74; Moré 1978). Bounds (`within`) are handled by
 * projection inside `lmder`; a parameter that ends on a bound gets NaN
 * covariance (no standard error) and a warning. Failures are explained: the
 * model not finite at the start (rows), no convergence (iterations, last RSS,
 * gradient norm, parameters running away), a singular Jacobian at the
 * solution (which parameters are not identifiable). A model or derivative
 * that is not finite is explained by its innermost term that is not, with the
 * rows and the values of its columns there (`log(t) is not finite at rows 1,
 * 12 (t = 0)`); start values are blamed only when that term uses a parameter.
 * Derivatives keep their limits at a predictor's zero (kernel/expr
 * derivative.ts), so `exp(-k*t^n)` fits rows with t = 0.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import {
  householderQR,
  inColumnSpace,
  quotedList,
  singularValues,
} from "../../kernel/linalg/mod.ts";
import {
  covar,
  lmder,
  type LmderResult,
  type ModelFunctions,
  modelFunctions,
  multiStart,
  polish,
} from "../../kernel/optim/mod.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { notFiniteError, notFinitePhrase, singularError } from "./_offsets.ts";

/** Correlation above which a pair of estimates is named in a warning (common practice, no source). */
export const CORRELATION_WARNING = 0.95;

/**
 * Fits a model that is nonlinear in its parameters.
 *
 * @param problem The rows used, the transformed response, the model, start values and limits.
 * @returns Estimates, (JᵀJ)⁻¹, fitted values and residuals (from double-double residuals
 *   when the table kept decimal corrections), the Jacobian as `design`.
 * @throws {CellError} For a start value of an unknown parameter or outside its limits,
 *   a model not finite at the start, no convergence, or a singular Jacobian at the solution.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { solveNonlinear } from "./solve_nonlinear.ts";
 * const model = parseModel("y = a*exp(-b*x)", ["x", "y"]);
 * const x = Float64Array.from([0, 1, 2, 3, 4]), y = x.map((v) => 2 * Math.exp(-0.5 * v) + 0.01 * Math.sin(7 * v));
 * const s = solveNonlinear({
 *   name: "decay", model, n: 5, columns: [x], y, rows: Int32Array.from([1, 2, 3, 4, 5]),
 *   start: { a: 1, b: 1 },
 * });
 * if (!s.converged || Math.abs(s.estimates[1] - 0.5) > 0.01) throw new Error(String(s.estimates));
 * ```
 */
export function solveNonlinear(problem: FitProblem): FitSolution {
  const { model } = problem;
  const params = model.parameters, p = params.length;
  const fns = modelFunctions(problem);
  const { lower, upper } = limitVectors(problem);
  const x0 = startVector(problem, lower, upper);
  const run = Number.isNaN(x0.reduce((a, v) => a + v, 0))
    ? searchStarts(problem, fns, x0, lower, upper)
    : fromStart(problem, fns, x0, lower, upper);
  if (!run.converged) throw notConverged(problem, fns, run, x0);
  const atBound = params.map((_, j) => run.x[j] === lower[j] || run.x[j] === upper[j]);
  const pol = polish(fns.accurate, run.x, atBound);
  const x = pol.x;
  const jac = new Float64Array(problem.n * p);
  fns.jac(x, jac);
  // Without weights √w = 1: J itself (the products would change nothing).
  const weighted = problem.weights !== undefined && problem.weights !== null;
  const wjac = weighted ? jac.map((v, k) => v * fns.sqrtW[k % problem.n]) : jac;
  const free = params.map((_, j) => j).filter((j) => !atBound[j]);
  const cov = freeCovariance(problem.n, p, wjac, free);
  if (cov.unidentifiable.length > 0) throw singularError(problem, cov.unidentifiable, wjac);
  warnCorrelated(problem, cov.unscaled);
  warnAtBound(problem, atBound, x, lower);
  const design = params.map((_, j) => jac.slice(j * problem.n, (j + 1) * problem.n));
  const qr = householderQR(jac, problem.n, p);
  return {
    method: "nonlinear",
    estimates: x,
    unscaledCovariance: cov.unscaled,
    fitted: fns.f(x),
    residuals: weighted ? pol.r.map((v, i) => v / fns.sqrtW[i]) : pol.r,
    rss: pol.rss,
    hasIntercept: inColumnSpace(qr, new Float64Array(problem.n).fill(1)),
    conditionNumber: conditionNumber(wjac, problem.n, p),
    converged: true,
    iterations: run.iterations + pol.steps,
    design,
    offset: null,
    atBound,
  };
}

/** σ_max/σ_min of J (NaN when the singular values cannot be had). */
function conditionNumber(jac: Float64Array, n: number, p: number): number {
  try {
    const sv = singularValues(jac, n, p);
    return sv[0] / sv[sv.length - 1];
  } catch {
    return NaN;
  }
}

/** Lower and upper bound vectors from `problem.limits` (±Infinity for none). */
function limitVectors(problem: FitProblem): { lower: Float64Array; upper: Float64Array } {
  const params = problem.model.parameters;
  const lower = new Float64Array(params.length).fill(-Infinity);
  const upper = new Float64Array(params.length).fill(Infinity);
  for (const [k, [lo, hi]] of Object.entries(problem.limits ?? {})) {
    const j = params.indexOf(k);
    if (j < 0) {
      throw new CellError(
        `Limits of "${k}" in fit "${problem.name}": "${k}" is not a parameter of the model${
          didYouMean(k, params) || `: its parameters are ${quotedList(params)}`
        }`,
        ["within", k],
      );
    }
    if (lo !== null) lower[j] = lo;
    if (hi !== null) upper[j] = hi;
  }
  return { lower, upper };
}

/** Start values in parameter order, NaN where not given. */
function startVector(problem: FitProblem, lower: Float64Array, upper: Float64Array): Float64Array {
  const params = problem.model.parameters;
  for (const k of Object.keys(problem.start)) {
    if (!params.includes(k)) {
      throw new CellError(
        `Start value of "${k}" in fit "${problem.name}": "${k}" is not a parameter of the model${
          didYouMean(k, params) || `: its parameters are ${quotedList(params)}`
        }`,
        ["start", k],
      );
    }
  }
  return Float64Array.from(params, (k, j) => {
    const v = problem.start[k] ?? NaN;
    if (v < lower[j] || v > upper[j]) {
      throw new CellError(
        `Start value of "${k}" in fit "${problem.name}" is ${v}: outside its limits [${lower[j]}, ${
          upper[j]
        }]`,
        ["start", k],
      );
    }
    return v;
  });
}

function fromStart(
  problem: FitProblem,
  fns: ModelFunctions,
  x0: Float64Array,
  lower: Float64Array,
  upper: Float64Array,
): LmderResult {
  const nf = fns.notFinite(x0);
  if (nf !== null) throw notFiniteError(problem, nf, startText(problem, x0));
  return lmder(fns.problem, x0, { lower, upper });
}

function searchStarts(
  problem: FitProblem,
  fns: ModelFunctions,
  x0: Float64Array,
  lower: Float64Array,
  upper: Float64Array,
): LmderResult {
  const params = problem.model.parameters;
  const seed = problem.seed ?? 1;
  const r = multiStart(fns.problem, x0, { seed, lower, upper, project: fns.project });
  const missing = params.filter((_, j) => Number.isNaN(x0[j]));
  if (r === null) {
    const nf = fns.notFinite(x0.map((v, j) => Number.isNaN(v) ? clamp(1, lower[j], upper[j]) : v));
    if (nf !== null && !nf.usesParameters) throw notFiniteError(problem, nf, null);
    throw new CellError(
      `Cannot fit "${problem.name}": no start values found for ${
        quotedList(missing)
      }: the model is not finite at any of the multi-start samples; give "start" values`,
      ["start"],
    );
  }
  problem.warn?.(
    `Start values of "${problem.name}" for ${
      quotedList(missing)
    } were found by a multi-start search (seed ${seed}): give "start" values to choose the solution yourself`,
  );
  return r;
}

const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));

function startText(problem: FitProblem, x: Float64Array): string {
  return problem.model.parameters.map((k, j) => `${k} = ${x[j]}`).join(", ");
}

/** (JᵀJ)⁻¹ over the free parameters, NaN for held ones. */
function freeCovariance(n: number, p: number, jac: Float64Array, free: number[]) {
  const q = free.length;
  if (q === p) return covar(n, p, jac); // every parameter free: J as it is (covar copies it)
  const sub = new Float64Array(n * q);
  free.forEach((j, k) => sub.set(jac.subarray(j * n, (j + 1) * n), k * n));
  const c = covar(n, q, sub);
  const unscaled = new Float64Array(p * p).fill(NaN);
  for (let a = 0; a < q; a++) {
    for (let b = 0; b < q; b++) unscaled[free[a] + free[b] * p] = c.unscaled[a + b * q];
  }
  return { unscaled, unidentifiable: c.unidentifiable.map((k) => free[k]) };
}

function notConverged(
  problem: FitProblem,
  fns: ModelFunctions,
  run: LmderResult,
  x0: Float64Array,
): CellError {
  const params = problem.model.parameters;
  const g = fns.gradientNorm(run.x);
  const away = params.filter((_, j) =>
    Math.abs(run.x[j]) > 1e6 ||
    (Number.isFinite(x0[j]) && x0[j] !== 0 && Math.abs(run.x[j] / x0[j]) >= 1e3)
  );
  const nf = run.info === "jacobian-not-finite" ? fns.notFinite(run.x) : null;
  const why = nf !== null
    ? `the model's derivative by "${nf.derivativeBy}" became non-finite: ${
      notFinitePhrase(nf, problem)
    }`
    : run.info === "jacobian-not-finite"
    ? "the model's derivatives became non-finite"
    : run.info === "maxfev"
    ? `the limit of ${run.nfev} model evaluations was reached`
    : `the limit of ${run.iterations} iterations was reached`;
  const runaway = away.length === 0
    ? ""
    : `; ${quotedList(away)} ${away.length === 1 ? "is" : "are"} running away (${
      away.map((k) => `${k} = ${fmt(run.x[params.indexOf(k)])}`).join(", ")
    })`;
  return new CellError(
    `Cannot fit "${problem.name}": no convergence after ${run.iterations} iterations: ${why}; last RSS ${
      fmt(run.fnorm ** 2)
    }, gradient norm ${fmt(g)}${runaway}`,
    Object.keys(problem.start).length > 0 ? ["start"] : ["model"],
  );
}

function warnCorrelated(problem: FitProblem, u: Float64Array): void {
  const params = problem.model.parameters, p = params.length;
  for (let a = 0; a < p; a++) {
    for (let b = a + 1; b < p; b++) {
      const r = u[a + b * p] / Math.sqrt(u[a + a * p] * u[b + b * p]);
      if (Math.abs(r) > CORRELATION_WARNING) {
        problem.warn?.(
          `Estimates of "${params[a]}" and "${
            params[b]
          }" in "${problem.name}" are strongly correlated (r = ${
            r.toFixed(4)
          }): the data hardly separate them`,
        );
      }
    }
  }
}

function warnAtBound(
  problem: FitProblem,
  atBound: boolean[],
  x: Float64Array,
  lower: Float64Array,
): void {
  atBound.forEach((b, j) => {
    if (!b) return;
    const which = x[j] === lower[j] ? "lower" : "upper";
    problem.warn?.(
      `"${problem.model.parameters[j]}" of "${problem.name}" ended at its ${which} limit ${
        x[j]
      }: its standard error, t and interval are not given, since (JᵀJ)⁻¹ does not describe the uncertainty of an estimate held on a bound`,
    );
  });
}

function fmt(v: number): string {
  return Number.isFinite(v) ? Number(v.toPrecision(5)).toString() : String(v);
}
