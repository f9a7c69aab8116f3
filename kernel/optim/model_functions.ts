/**
 * From a model expression and data to what the optimizer calls: residuals
 * F(θ) = f(θ) − y and the exact Jacobian ∂f/∂θ from symbolic derivatives
 * (kernel/expr `derivative`, compiled to row loops), the accurate residuals
 * y − f(θ) in double-double for the final polishing (`compileDD`, from the
 * data as printed: value + decimal correction), and the projection of the
 * parameters that enter linearly (variable projection, Golub & Pereyra 1973,
 * "The differentiation of pseudo-inverses and nonlinear least squares
 * problems whose variables separate", SIAM J. Numer. Anal. 10) used by the
 * multi-start search.
 *
 * @module
 */
import { compile, type Expr, format, freeNames, type Model } from "../expr/mod.ts";
import { type CompiledModel, compiledModel } from "./_compiled_model.ts";
import type { LeastSquaresProblem } from "./lmder.ts";
import type { PolishProblem } from "./polish.ts";
import { lsqSolve, type LsqWork, lsqWork } from "./_lsq_solve.ts";
import { sumError } from "../dd.ts";

const EPS = 2.220446049250313e-16;

/** The data a model is fitted to (the fit cell's problem has this shape). */
export interface ModelData {
  model: Model;
  /** Rows used. */
  n: number;
  /** Values of `model.columns`, in order. */
  columns: Float64Array[];
  /** The response as written (transformed). */
  y: Float64Array;
  /** Decimal corrections for double-double residuals (optional). */
  lo?: {
    columns: (Float64Array | null)[];
    response: { hi: Float64Array; lo: Float64Array | null };
  } | null;
  /** Weights wᵢ > 0 (minimise Σwᵢrᵢ²); null or absent for none. */
  weights?: Float64Array | null;
}

/** Where the model, or else one of its derivatives, is not finite at θ (for messages). */
export interface NotFinite {
  /** The parameter whose derivative is not finite; absent when the model itself is not. */
  derivativeBy?: string;
  /** The innermost subexpression that is not finite there, as text (`log(t)`). */
  term: string;
  /** Its position in the model's text (meaningful when `derivativeBy` is absent). */
  start: number;
  /** Row indexes (0-based, ascending) where it is not finite. */
  rows: number[];
  /** The columns the subexpression uses. */
  columns: string[];
  /** Whether it uses a parameter (so other start values could help). */
  usesParameters: boolean;
}

/** What the optimizer and the polishing call. */
export interface ModelFunctions {
  /** F = √w·(f − y) and √w·∂f/∂θ (weighted rows; w = 1 without weights). */
  problem: LeastSquaresProblem;
  /** f(θ) in double. */
  f(x: Float64Array): Float64Array;
  /** ∂f/∂θ (n×p, column-major), unweighted, into `out`. */
  jac(x: Float64Array, out: Float64Array): void;
  /** √wᵢ per row (ones without weights). */
  sqrtW: Float64Array;
  /**
   * √w·(y − f) in double-double when the data carry corrections (else double,
   * with its rounding bound), and √w·J.
   */
  accurate: PolishProblem;
  /** Sets the linearly entering parameters by least squares; undefined when there are none. */
  project?: (x: Float64Array) => boolean;
  /** ‖Jᵀ(y − f)‖ at θ. */
  gradientNorm(x: Float64Array): number;
  /** Where f, or else ∂f/∂θ, is not finite at θ; null when both are finite at every row. */
  notFinite(x: Float64Array): NotFinite | null;
}

/**
 * Compiles the model, its derivatives and its double-double form.
 *
 * @param data The model and the rows used.
 * @returns The functions (see {@link ModelFunctions}).
 * @example
 * ```ts
 * import { parseModel } from "../expr/mod.ts";
 * import { modelFunctions } from "./model_functions.ts";
 * const model = parseModel("y = a*exp(-b*x)", ["x", "y"]);
 * const fns = modelFunctions({ model, n: 2, columns: [Float64Array.from([0, 1])], y: Float64Array.from([2, 1]) });
 * const J = new Float64Array(4);
 * fns.jac(Float64Array.from([2, 0]), J); // ∂/∂a = exp(-b x) = 1, ∂/∂b = -a x exp(-b x)
 * if (J.join() !== "1,1,0,-2") throw new Error(J.join());
 * ```
 */
export function modelFunctions(data: ModelData): ModelFunctions {
  const { model, n, columns, y } = data;
  const p = model.parameters.length;
  const cm = compiledModel(model);
  const fc = cm.f;
  const jac = (x: Float64Array, out: Float64Array) => void cm.jac(columns, x, n, out);
  const w = data.weights ?? null;
  const sqrtW = w === null ? new Float64Array(n).fill(1) : w.map(Math.sqrt);
  // Without weights √w = 1 and the products below would change nothing: they are skipped.
  const weighRows = (out: Float64Array, cols: number) => {
    if (w === null) return;
    for (let j = 0; j < cols; j++) for (let i = 0; i < n; i++) out[i + j * n] *= sqrtW[i];
  };
  const wjac = (x: Float64Array, out: Float64Array) => (jac(x, out), weighRows(out, p));
  const problem: LeastSquaresProblem = {
    m: n,
    n: p,
    fcn: w === null
      ? (x, out) => {
        fc(columns, x, n, out);
        for (let i = 0; i < n; i++) out[i] = out[i] - y[i];
      }
      : (x, out) => {
        fc(columns, x, n, out);
        for (let i = 0; i < n; i++) out[i] = sqrtW[i] * (out[i] - y[i]);
      },
    jac: wjac,
  };
  const unweighted = accurateResiduals(data, cm);
  let wmax = 0;
  for (let i = 0; i < n; i++) wmax = Math.max(wmax, sqrtW[i]);
  const residuals = (x: Float64Array, r: Float64Array, xlo?: Float64Array) => {
    const noise = unweighted(x, r, xlo);
    weighRows(r, 1);
    return noise * wmax * wmax;
  };
  const f = (x: Float64Array) => fc(columns, x, n);
  return {
    problem,
    f,
    jac,
    sqrtW,
    accurate: { m: n, n: p, residuals, jac: wjac },
    project: linearProjection(data, cm, sqrtW),
    gradientNorm(x) {
      const r = new Float64Array(n), J = new Float64Array(n * p);
      residuals(x, r);
      wjac(x, J);
      let s = 0;
      for (let j = 0; j < p; j++) {
        let g = 0;
        for (let i = 0; i < n; i++) g += J[i + j * n] * r[i];
        s += g * g;
      }
      return Math.sqrt(s);
    },
    notFinite: (x) => allFinite(data, cm, x) ? null : whereNotFinite(data, cm.trees, x),
  };
}

/** Whether f and every ∂f/∂θ_j are finite at every row (the usual case, by the compiled forms). */
function allFinite(data: ModelData, cm: CompiledModel, x: Float64Array): boolean {
  const { n, columns, model } = data;
  const v = new Float64Array(n * Math.max(1, model.parameters.length));
  cm.f(columns, x, n, v);
  for (let i = 0; i < n; i++) if (!Number.isFinite(v[i])) return false;
  cm.jac(columns, x, n, v);
  for (let i = 0; i < v.length; i++) if (!Number.isFinite(v[i])) return false;
  return true;
}

/**
 * The innermost subexpression of `e` that is not finite at rows where `e` is not: descend into
 * the first operand not finite at some of those rows, keeping only them, and stop at the node
 * whose operands are all finite there (it made the NaN or infinity: `log(0)`, `exp(1000)`).
 * Common practice, no source. The error path only: each node visited is compiled once.
 */
function innermostNotFinite(
  e: Expr,
  columns: readonly string[],
  params: readonly string[],
  cols: readonly ArrayLike<number>[],
  values: ArrayLike<number>,
  n: number,
): { term: Expr; rows: number[]; names: Set<string> } | null {
  const at = (node: Expr) => compile(node, columns, params)(cols, values, n);
  const bad = (v: Float64Array, rows: readonly number[]) =>
    rows.filter((i) => !Number.isFinite(v[i]));
  const rows = bad(at(e), Array.from({ length: n }, (_, i) => i));
  if (rows.length === 0) return null;
  let node = e, where = rows;
  for (;;) {
    const next = operands(node).map((o) => ({ o, rows: bad(at(o), where) }))
      .find((c) => c.rows.length > 0);
    if (next === undefined) break;
    node = next.o;
    where = next.rows;
  }
  return { term: node, rows: where, names: freeNames(node) };
}

function operands(e: Expr): Expr[] {
  if (e.op === "num" || e.op === "id") return [];
  if (e.op === "neg") return [e.arg];
  if (e.op === "call") return e.args;
  return [e.left, e.right];
}

/** The model, then each derivative in parameter order: the first not finite somewhere. */
function whereNotFinite(data: ModelData, trees: Expr[], x: Float64Array): NotFinite | null {
  const { model, n, columns } = data;
  const params = model.parameters;
  const look = [model.rhs, ...trees];
  for (let k = 0; k < look.length; k++) {
    const bad = innermostNotFinite(look[k], model.columns, params, columns, x, n);
    if (bad === null) continue;
    return {
      ...(k > 0 ? { derivativeBy: params[k - 1] } : {}),
      term: format(bad.term),
      start: bad.term.start,
      rows: bad.rows,
      columns: model.columns.filter((c) => bad.names.has(c)),
      usesParameters: params.some((p) => bad.names.has(p)),
    };
  }
  return null;
}

/** y − f(θ): in double-double from the printed data when corrections exist, else in double. */
function accurateResiduals(
  data: ModelData,
  cm: CompiledModel,
): (x: Float64Array, r: Float64Array, xlo?: Float64Array) => number {
  const { n, columns, y, lo } = data;
  if (lo === undefined || lo === null) {
    // In double each r_i carries an error of about ε·|f_i|, so Σr² one of 2ε·Σ|f_i·r_i|.
    return (x, r) => {
      cm.f(columns, x, n, r);
      let noise = 0;
      for (let i = 0; i < n; i++) {
        const f = r[i];
        r[i] = y[i] - f;
        noise += Math.abs(f * r[i]);
      }
      return 4 * EPS * noise;
    };
  }
  const yd = cm.responseDD()([lo.response.hi], [lo.response.lo], [], null, n);
  const fd = cm.fDD();
  const hi = new Float64Array(n), lw = new Float64Array(n);
  return (x, r, xlo) => {
    fd(columns, lo.columns, x, xlo ?? null, n, hi, lw);
    for (let i = 0; i < n; i++) {
      const a = yd.hi[i], b = -hi[i], s = a + b; // TwoSum: s + e = a + b exactly
      r[i] = s + (sumError(a, b, s) + (yd.lo[i] - lw[i]));
    }
    return 0;
  };
}

/**
 * The map that sets the linearly entering parameters θ_L (kernel `linear` of
 * the compiled model) by least squares given the others:
 * f = f(θ with θ_L = 0) + Σ θ_l ∂f/∂θ_l.
 */
function linearProjection(
  data: ModelData,
  cm: CompiledModel,
  sqrtW: Float64Array,
): ((x: Float64Array) => boolean) | undefined {
  const { n, columns, y } = data;
  const idx = cm.linear, p = data.model.parameters.length;
  if (idx.length === 0) return undefined;
  const q = idx.length;
  let J: Float64Array, G: Float64Array, f0: Float64Array, b: Float64Array, work: LsqWork;
  return (x) => {
    // Made on the first call (only the multi-start search projects), then reused.
    J ??= new Float64Array(n * p);
    G ??= new Float64Array(n * q);
    f0 ??= new Float64Array(n);
    b ??= new Float64Array(n);
    work ??= lsqWork(n, q);
    for (const j of idx) x[j] = 0;
    cm.f(columns, x, n, f0);
    cm.jac(columns, x, n, J);
    let finite = true;
    for (let k = 0; k < q; k++) {
      const j = idx[k];
      for (let i = 0; i < n; i++) {
        const g = sqrtW[i] * J[i + j * n];
        G[i + k * n] = g;
        if (!Number.isFinite(g)) finite = false;
      }
    }
    for (let i = 0; i < n; i++) {
      b[i] = sqrtW[i] * (y[i] - f0[i]);
      if (!Number.isFinite(b[i])) finite = false;
    }
    if (!finite) return false;
    const theta = lsqSolve(n, q, G, b, work);
    if (theta === null) return false;
    for (let k = 0; k < q; k++) x[idx[k]] = theta[k];
    return true;
  };
}
