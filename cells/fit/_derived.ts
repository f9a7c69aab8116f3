/**
 * Derived quantities of a fit (issue 19): an expression of the parameters
 * (a half-life log(2)/k, a ratio of rates, the x where a line crosses zero)
 * with its uncertainty by three methods, side by side.
 *
 * ```fit decay
 * derived:
 *   half_life: log(2)/k
 *   x0: -a/b
 * ```
 *
 * ```
 *  g(θ), ∇g exact (kernel/expr derivative) ─▶ delta method: se = √(∇gᵀ·Cov·∇g), ĝ ± q·se
 *  profile: S minimised with g(θ) = c held (θₖ solved from the others by Newton,
 *           k the parameter g leans on most) ─▶ |τ(c)| = q         (_profile.ts)
 *  bootstrap: g of every replicate ─▶ percentile and BCa          (_bootstrap.ts)
 *  methods that differ by more than DISAGREE of the delta half-width: said in a note
 * ```
 *
 * Sources: the delta method, e.g. Seber & Wild, *Nonlinear Regression*
 * (1989), §5.1 (from memory for the section); the profile of a function of
 * the parameters, Bates & Watts (1988) §6.1; for a ratio of coefficients of
 * a linear model the profile interval is Fieller's (Fieller, "Some problems
 * in interval estimation", JRSS B 16 (1954) 175–185), which the tests check
 * exactly.
 *
 * @module
 */
import { compile, derivative, type Expr } from "../../kernel/expr/mod.ts";
import {
  type Constraint,
  dropAt,
  type LabelledInterval,
  type ProfileInput,
  profileOf,
} from "./_profile.ts";
import { bootstrapIntervals, type BootstrapRun } from "./_bootstrap.ts";

/** Share of the delta method's half-width by which another method's limit may differ unremarked. */
export const DISAGREE = 0.1;

/** One derived quantity as parsed: its name, text and expression over the parameters. */
export interface DerivedQuantity {
  name: string;
  text: string;
  expr: Expr;
}

/** A derived quantity's result (RUN-JSON `derived[]`). */
export interface DerivedResult {
  name: string;
  expression: string;
  estimate: number | null;
  /** Delta-method standard error; null when ∇g or the covariance is not finite. */
  std_error: number | null;
  /** Wald (delta method) first, then profile and bootstrap as the fit computed them. */
  intervals: LabelledInterval[];
  /** Set when the methods disagree by more than DISAGREE of the delta half-width. */
  note?: string;
}

/** What the derived quantities need of the fit. */
export interface DerivedInput {
  profile: ProfileInput | null;
  /** Scaled covariance of the estimates, p×p column-major. */
  covariance: Float64Array | readonly number[];
  bootstrap: BootstrapRun | null;
  /** Rows (for the jackknife's length). */
  n: number;
}

/**
 * Evaluates each derived quantity with every method the fit used.
 *
 * @param quantities The parsed quantities.
 * @param parameters The fit's parameter names.
 * @param estimates θ̂.
 * @param input Profile inputs (null: no profile), covariance, bootstrap replicates.
 * @returns One result per quantity, in order.
 */
export function derivedResults(
  quantities: readonly DerivedQuantity[],
  parameters: readonly string[],
  estimates: Float64Array,
  input: DerivedInput & { q: number; level: number },
): DerivedResult[] {
  return quantities.map((dq) => one(dq, parameters, estimates, input));
}

function one(
  dq: DerivedQuantity,
  parameters: readonly string[],
  estimates: Float64Array,
  input: DerivedInput & { q: number; level: number },
): DerivedResult {
  const p = parameters.length;
  const g = valueOf(dq.expr, parameters);
  const grad = parameters.map((name) => valueOf(derivative(dq.expr, name), parameters));
  const est = g(estimates);
  const gradAt = (theta: Float64Array) => Float64Array.from(grad, (d) => d(theta));
  const g0 = gradAt(estimates);
  let v = 0;
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < p; b++) v += g0[a] * Number(input.covariance[a + b * p]) * g0[b];
  }
  const se = Number.isFinite(v) && v >= 0 ? Math.sqrt(v) : NaN;
  const level = input.level;
  const intervals: LabelledInterval[] = [
    Number.isFinite(se) && Number.isFinite(est)
      ? { method: "wald", level, lower: est - input.q * se, upper: est + input.q * se }
      : { method: "wald", level, lower: null, upper: null, note: "no delta-method standard error" },
  ];
  if (input.profile !== null && Number.isFinite(est)) {
    const con = derivedConstraint(input.profile, g, grad, g0, estimates);
    intervals.push(
      con === null
        ? {
          method: "profile",
          level,
          lower: null,
          upper: null,
          note: "not profiled: the quantity does not depend on the parameters",
        }
        : profileOf(input.profile, con, dq.name, est, se).interval,
    );
  }
  if (input.bootstrap !== null && input.bootstrap.b > 0) {
    const run = input.bootstrap;
    const values = new Float64Array(run.b);
    const theta = new Float64Array(p);
    for (let r = 0; r < run.b; r++) {
      for (let k = 0; k < p; k++) theta[k] = run.replicates[r * p + k];
      values[r] = g(theta);
    }
    const jack = run.jackknife === null
      ? null
      : Float64Array.from({ length: run.jackknifeRows }, (_, i) => {
        for (let k = 0; k < p; k++) theta[k] = run.jackknife![i * p + k];
        return g(theta);
      });
    intervals.push(...bootstrapIntervals(values, est, jack, level));
  }
  const note = disagreement(intervals, input.q * se);
  return {
    name: dq.name,
    expression: dq.text,
    estimate: Number.isFinite(est) ? est : null,
    std_error: Number.isFinite(se) ? se : null,
    intervals,
    ...(note === null ? {} : { note }),
  };
}

/** g as a function of θ (an expression with no columns: one row). */
function valueOf(e: Expr, parameters: readonly string[]): (theta: Float64Array) => number {
  const f = compile(e, [], parameters);
  const out = new Float64Array(1);
  return (theta) => f([], theta, 1, out)[0];
}

/**
 * g(θ) = c held by solving θₖ from the others (Newton on g), k the
 * parameter whose change moves g most at θ̂ (|∂g/∂θₖ|·scale); null when g
 * does not move with any parameter there. Also predict's mean response at a
 * point (cells/predict/_point_intervals.ts).
 */
export function derivedConstraint(
  input: ProfileInput,
  g: (t: Float64Array) => number,
  grad: ((t: Float64Array) => number)[],
  g0: Float64Array,
  estimates: Float64Array,
): Constraint | null {
  const p = estimates.length;
  let k = -1, best = 0;
  for (let j = 0; j < p; j++) {
    const se = input.stdErrors[j] ?? NaN;
    const w = Math.abs(g0[j]) * (Number.isFinite(se) && se > 0 ? se : 1);
    if (w > best) {
      best = w;
      k = j;
    }
  }
  if (k < 0) return null;
  let lastK = estimates[k];
  const gk = grad[k];
  const solve = (full: Float64Array, c: number): boolean => {
    let t = lastK;
    for (let it = 0; it < 60; it++) {
      full[k] = t;
      const r = g(full) - c;
      if (!Number.isFinite(r)) return false;
      if (Math.abs(r) <= 4e-16 * Math.max(Math.abs(c), 1e-300) * 8 || r === 0) break;
      const d = gk(full);
      if (!(Math.abs(d) > 0) || !Number.isFinite(d)) return false;
      const step = r / d;
      t -= step;
      if (Math.abs(step) <= 1e-15 * Math.max(Math.abs(t), 1e-300)) break;
      if (it === 59) return false;
    }
    full[k] = t;
    if (!(t >= input.lower[k] && t <= input.upper[k])) return false;
    lastK = t;
    return true;
  };
  return {
    expand(z, c, full) {
      for (let j = 0, i = 0; j < p; j++) if (j !== k) full[j] = z[i++];
      return solve(full, c);
    },
    reduce(fullJac, full, out, m) {
      const dk = gk(full);
      const colK = fullJac.subarray(k * m, (k + 1) * m);
      for (let j = 0, i = 0; j < p; j++) {
        if (j === k) continue;
        const ratio = grad[j](full) / dk;
        const col = fullJac.subarray(j * m, (j + 1) * m);
        const o = i * m;
        for (let r = 0; r < m; r++) out[o + r] = col[r] - colK[r] * ratio;
        i++;
      }
    },
    shrink: (full) => dropAt(full, k),
    lower: dropAt(input.lower, k),
    upper: dropAt(input.upper, k),
    range: [-Infinity, Infinity],
  };
}

/** Each method in the note's words. */
const METHOD_WORDS: Record<string, string> = {
  profile: "the profile interval",
  "bootstrap-percentile": "the bootstrap percentile interval",
  "bootstrap-bca": "the bootstrap BCa interval",
};

/** A sentence when some method's limit is more than DISAGREE of the delta half-width from delta's. */
function disagreement(intervals: LabelledInterval[], half: number): string | null {
  const delta = intervals[0];
  if (delta.lower === null || delta.upper === null || !(half > 0)) return null;
  const apart: string[] = [];
  for (const iv of intervals.slice(1)) {
    const off = [
      iv.lower === null ? Infinity : Math.abs(iv.lower - delta.lower),
      iv.upper === null ? Infinity : Math.abs(iv.upper - delta.upper),
    ];
    const worst = Math.max(...off);
    if (worst > DISAGREE * half) {
      apart.push(
        worst === Infinity
          ? `${METHOD_WORDS[iv.method]} (open on one side)`
          : `${METHOD_WORDS[iv.method]} (by ${
            Math.round((worst / half) * 100)
          }% of the half-width)`,
      );
    }
  }
  if (apart.length === 0) return null;
  return `the methods disagree: ${apart.join(", ")} ${
    apart.length === 1 ? "differs" : "differ"
  } from the delta method by more than ${
    DISAGREE * 100
  }% of its half-width; the delta method's symmetric interval is then the least trustworthy`;
}
