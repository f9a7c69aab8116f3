/**
 * Profile-likelihood intervals of a fit's parameters (issue 19): the values
 * of θⱼ where the least-squares criterion, minimised over the other
 * parameters, has risen by the threshold of the confidence level.
 *
 * ```
 *  S(θ) = ‖√w·(f(θ) − y)‖²,  S₀ = S(θ̂)
 *  P(c) = min S(θ) over θ₋ⱼ with θⱼ = c        (Levenberg–Marquardt, warm-started)
 *  τ(c) = sign(c − θ̂ⱼ)·√(P(c) − S₀)/s          (profile t; Bates & Watts 1988, §6.1)
 *  limits: τ(c) = ±q,  q = t_{(1+level)/2; n−p}  (normal quantile and s = 1 with known σ)
 *  each side: steps from the Wald limit, doubled until τ passes q (bracket),
 *             then the crossing by safeguarded secant (Illinois) steps
 * ```
 *
 * Sources: Bates & Watts, *Nonlinear Regression Analysis and Its
 * Applications* (1988), ch. 6 (profile t, its likelihood-ratio form and the
 * interval |τ| ≤ t); Venzon & Moolgavkar, "A method for computing
 * profile-likelihood-based confidence intervals", Applied Statistics 37
 * (1988) 87–94, which finds each limit directly rather than over a full grid
 * — done here by bracketing and root finding on τ, each evaluation one
 * constrained fit. For a model linear in its parameters P is quadratic in c
 * and the interval is the Wald t interval exactly.
 *
 * A side that does not close is said, never made up: τ levelling off below q
 * (the data do not bound the parameter on that side), or a `within` limit
 * reached first (the limit is the range's end, flagged), or the constrained
 * fit failing (no number, with the reason).
 *
 * @module
 */
import { lmder, type ModelFunctions } from "../../kernel/optim/mod.ts";

/** One labelled interval of a parameter or a derived quantity (RUN-JSON `intervals`). */
export interface LabelledInterval {
  method: "wald" | "profile" | "bootstrap-percentile" | "bootstrap-bca";
  level: number;
  /** Null when that side is unbounded or could not be had (see `note`). */
  lower: number | null;
  upper: number | null;
  /** Why a side is null or is a range's end; absent when both sides are plain numbers. */
  note?: string;
  /** Bootstrap: the Monte Carlo standard error of each limit (order statistics). */
  mc_error?: { lower: number | null; upper: number | null };
}

/** A profile trace: the constrained fits evaluated along one parameter. */
export interface ProfileTrace {
  parameter: string;
  /** Values of the parameter, ascending. */
  at: number[];
  /** Profile t at each. */
  tau: number[];
}

/** What profiling needs of a fit. */
export interface ProfileInput {
  fns: ModelFunctions;
  parameters: readonly string[];
  estimates: Float64Array;
  /** Standard errors (NaN where none, e.g. a parameter on a bound). */
  stdErrors: Float64Array | readonly (number | null)[];
  /** Residual degrees of freedom n − p. */
  dfResidual: number;
  /** "t" (σ estimated) or "normal" (known σ: S is already χ²). */
  inference: "t" | "normal";
  /** The quantile q of the level (t or normal). */
  q: number;
  level: number;
  lower: Float64Array;
  upper: Float64Array;
}

/** Doublings of the step before a side is declared open (2¹⁰ Wald widths). */
const MAX_DOUBLINGS = 10;
/** Root-finding steps on τ (each a constrained fit). */
const MAX_ROOT_STEPS = 40;
/** Relative tolerance of a limit. */
const LIMIT_TOL = 1e-9;

/** Tolerances of each constrained fit: a limit needs P to about 1e-12 relative. */
const CONSTRAINED = { ftol: 1e-13, xtol: 1e-12, gtol: 1e-13, maxIterations: 200 };

/**
 * How values of the profiled quantity are held while the others move: the
 * free coordinates z (one fewer than the parameters) and the full θ they
 * give at level c.
 */
export interface Constraint {
  /** Writes θ from z at level c into `full`; false when no θ has that level there. */
  expand(z: Float64Array, c: number, full: Float64Array): boolean;
  /** The Jacobian in z (m × (p − 1), column-major) from ∂F/∂θ at `full`. */
  reduce(fullJac: Float64Array, full: Float64Array, out: Float64Array, m: number): void;
  /** z of a full θ (warm starts). */
  shrink(full: Float64Array): Float64Array;
  /** Bounds of z. */
  lower: Float64Array;
  upper: Float64Array;
  /** The profiled quantity's range ends (a parameter's `within`), else ±Infinity. */
  range: [number, number];
}

/** θⱼ held at c: z is θ without θⱼ. */
export function parameterConstraint(input: ProfileInput, j: number): Constraint {
  const p = input.parameters.length;
  return {
    expand(z, c, full) {
      for (let k = 0, i = 0; k < p; k++) full[k] = k === j ? c : z[i++];
      return true;
    },
    reduce(fullJac, _full, out, m) {
      for (let k = 0, i = 0; k < p; k++) {
        if (k === j) continue;
        out.set(fullJac.subarray(k * m, (k + 1) * m), i * m);
        i++;
      }
    },
    shrink: (full) => dropAt(full, j),
    lower: dropAt(input.lower, j),
    upper: dropAt(input.upper, j),
    range: [input.lower[j], input.upper[j]],
  };
}

/**
 * Profile intervals of every parameter.
 *
 * @param input The fit's functions, estimates, standard errors, level and ranges.
 * @returns One interval and one trace per parameter, in order.
 */
export function profileIntervals(
  input: ProfileInput,
): { intervals: LabelledInterval[]; traces: ProfileTrace[] } {
  const intervals: LabelledInterval[] = [];
  const traces: ProfileTrace[] = [];
  for (let j = 0; j < input.parameters.length; j++) {
    const got = profileOf(
      input,
      parameterConstraint(input, j),
      input.parameters[j],
      input.estimates[j],
      input.stdErrors[j] ?? NaN,
    );
    intervals.push(got.interval);
    traces.push(got.trace);
  }
  return { intervals, traces };
}

/**
 * The profile interval of one quantity under a constraint.
 *
 * @param input The fit.
 * @param constraint How the quantity is held.
 * @param name The quantity's name (traces).
 * @param estimate Its estimate.
 * @param se Its standard error (the first step's scale); NaN or 0: not profiled.
 * @returns The interval and the trace.
 */
export function profileOf(
  input: ProfileInput,
  constraint: Constraint,
  name: string,
  estimate: number,
  se: number,
): { interval: LabelledInterval; trace: ProfileTrace } {
  if (!Number.isFinite(se) || se <= 0) {
    return {
      interval: {
        method: "profile",
        level: input.level,
        lower: null,
        upper: null,
        note: "not profiled: the estimate has no standard error (it is held on a range's end)",
      },
      trace: { parameter: name, at: [], tau: [] },
    };
  }
  const s0 = sumSquares(input.fns, input.estimates);
  const scale2 = input.inference === "t" ? s0 / input.dfResidual : 1;
  const profiler = new Profiler(input, constraint, name, estimate, s0, scale2);
  const lo = profiler.side(-1, se);
  const hi = profiler.side(1, se);
  const notes = [lo.note, hi.note].filter((n): n is string => n !== undefined);
  return {
    interval: {
      method: "profile",
      level: input.level,
      lower: lo.limit,
      upper: hi.limit,
      ...(notes.length > 0 ? { note: notes.join("; ") } : {}),
    },
    trace: profiler.trace(),
  };
}

function sumSquares(fns: ModelFunctions, x: Float64Array): number {
  const f = new Float64Array(fns.problem.m);
  fns.problem.fcn(x, f);
  let s = 0;
  for (let i = 0; i < f.length; i++) s += f[i] * f[i];
  return s;
}

/** One side's outcome. */
interface Side {
  limit: number | null;
  note?: string;
}

/** A point of the profile: distance from the estimate, |τ| and the full θ there. */
interface Point {
  d: number;
  tau: number;
  theta: Float64Array;
}

/** The profile of one quantity: constrained fits, warm-started, remembered. */
class Profiler {
  readonly #in: ProfileInput;
  readonly #con: Constraint;
  readonly #name: string;
  readonly #est: number;
  readonly #s0: number;
  readonly #scale2: number;
  readonly #m: number;
  readonly #p: number;
  /** Evaluated points: value → τ (for the trace). */
  #points = new Map<number, number>();
  #full: Float64Array;
  #fullJac: Float64Array;

  constructor(
    input: ProfileInput,
    constraint: Constraint,
    name: string,
    estimate: number,
    s0: number,
    scale2: number,
  ) {
    this.#in = input;
    this.#con = constraint;
    this.#name = name;
    this.#est = estimate;
    this.#s0 = s0;
    this.#scale2 = scale2;
    this.#m = input.fns.problem.m;
    this.#p = input.parameters.length;
    this.#full = new Float64Array(this.#p);
    this.#fullJac = new Float64Array(this.#m * this.#p);
    this.#points.set(estimate, 0);
  }

  /**
   * τ at level c, minimising over the free coordinates from the full θ `warm`.
   *
   * @returns τ and the full θ there, or null when the constrained fit failed.
   */
  tauAt(c: number, warm: Float64Array): { tau: number; theta: Float64Array } | null {
    const { m, p } = { m: this.#m, p: this.#p };
    const fns = this.#in.fns;
    const con = this.#con;
    const full = this.#full, fullJac = this.#fullJac;
    const z0 = clampInto(con.shrink(warm), con.lower, con.upper);
    if (p === 1) {
      if (!con.expand(z0, c, full)) return null;
      const s = sumSquares(fns, full);
      if (!Number.isFinite(s)) return null;
      return { tau: this.#tauOf(c, s), theta: full.slice() };
    }
    const nan = () => Number.NaN;
    const r = lmder(
      {
        m,
        n: p - 1,
        fcn: (z, f) => {
          if (!con.expand(z, c, full)) f.fill(nan());
          else fns.problem.fcn(full, f);
        },
        jac: (z, out) => {
          if (!con.expand(z, c, full)) {
            out.fill(nan());
            return;
          }
          fns.problem.jac(full, fullJac);
          con.reduce(fullJac, full, out, m);
        },
      },
      z0,
      { ...CONSTRAINED, lower: con.lower, upper: con.upper },
    );
    if (!r.converged || !Number.isFinite(r.fnorm) || !con.expand(r.x, c, full)) return null;
    return { tau: this.#tauOf(c, r.fnorm * r.fnorm), theta: full.slice() };
  }

  #tauOf(c: number, s: number): number {
    const rise = Math.max(0, s - this.#s0);
    const tau = Math.sign(c - this.#est) * Math.sqrt(rise / this.#scale2);
    this.#points.set(c, tau);
    return tau;
  }

  /**
   * One side of the interval: from the estimate in direction `dir`, the step
   * doubled from the Wald half-width until |τ| passes q, then the crossing.
   */
  side(dir: 1 | -1, se: number): Side {
    const est = this.#est;
    const q = this.#in.q;
    const bound = dir > 0 ? this.#con.range[1] : this.#con.range[0];
    const word = dir > 0 ? "above" : "below";
    let inside: Point = { d: 0, tau: 0, theta: this.#in.estimates.slice() };
    let d = q * se;
    let lastTau = 0;
    let flat = 0;
    for (let k = 0; k <= MAX_DOUBLINGS; k++) {
      let c = est + dir * d;
      let atBound = false;
      if ((dir > 0 && c >= bound) || (dir < 0 && c <= bound)) {
        c = bound;
        d = Math.abs(bound - est);
        atBound = true;
      }
      const got = this.tauAt(c, inside.theta);
      if (got === null) {
        return {
          limit: null,
          note: `the profile ${word} could not be followed past ${
            fmt(est + dir * inside.d)
          } (the constrained fit did not converge)`,
        };
      }
      const t = Math.abs(got.tau);
      if (t >= q) return this.#crossing(dir, inside, { d, tau: t, theta: got.theta });
      if (atBound) {
        return {
          limit: c,
          note: `the profile ${word} reaches the range's end ${
            fmt(c)
          } (within) before the level: the limit is that end`,
        };
      }
      // τ that hardly rises while the step doubles: the profile levels off below q.
      flat = t - lastTau < 0.01 * q ? flat + 1 : 0;
      if (flat >= 2) {
        return {
          limit: null,
          note: `the profile does not close ${word}: τ levels off at ${fmt(t)}, below ${fmt(q)}`,
        };
      }
      lastTau = t;
      inside = { d, tau: t, theta: got.theta };
      d *= 2;
    }
    return {
      limit: null,
      note: `the profile does not close ${word}: τ is ${fmt(lastTau)} at ${
        fmt(est + dir * inside.d)
      }, still below ${fmt(q)}`,
    };
  }

  /** The crossing |τ| = q between two distances from the estimate (Illinois steps). */
  #crossing(dir: 1 | -1, a0: Point, b0: Point): Side {
    const est = this.#est;
    const q = this.#in.q;
    let a = a0, b = b0;
    let fa = a.tau - q, fb = b.tau - q;
    let side = 0;
    for (let k = 0; k < MAX_ROOT_STEPS; k++) {
      let d = (a.d * fb - b.d * fa) / (fb - fa);
      if (!(d > Math.min(a.d, b.d) && d < Math.max(a.d, b.d))) d = (a.d + b.d) / 2;
      const warm = Math.abs(d - a.d) < Math.abs(d - b.d) ? a.theta : b.theta;
      const got = this.tauAt(est + dir * d, warm);
      if (got === null) {
        return {
          limit: null,
          note: `the profile ${dir > 0 ? "above" : "below"} could not be followed near ${
            fmt(est + dir * d)
          } (the constrained fit did not converge)`,
        };
      }
      const f = Math.abs(got.tau) - q;
      if (f === 0 || Math.abs(b.d - a.d) <= LIMIT_TOL * Math.max(Math.abs(est), d, 1e-300)) {
        return { limit: est + dir * d };
      }
      if (f > 0) {
        b = { d, tau: Math.abs(got.tau), theta: got.theta };
        fb = f;
        if (side === 1) fa /= 2;
        side = 1;
      } else {
        a = { d, tau: Math.abs(got.tau), theta: got.theta };
        fa = f;
        if (side === -1) fb /= 2;
        side = -1;
      }
    }
    const d = (a.d + b.d) / 2;
    return { limit: est + dir * d };
  }

  /** The evaluated points, ascending. */
  trace(): ProfileTrace {
    const at = [...this.#points.keys()].sort((x, y) => x - y);
    return { parameter: this.#name, at, tau: at.map((c) => this.#points.get(c)!) };
  }
}

/** v without its entry j. */
export function dropAt(v: Float64Array, j: number): Float64Array {
  const out = new Float64Array(v.length - 1);
  for (let k = 0, i = 0; k < v.length; k++) if (k !== j) out[i++] = v[k];
  return out;
}

function clampInto(x: Float64Array, lo: Float64Array, hi: Float64Array): Float64Array {
  return x.map((v, k) => Math.min(hi[k], Math.max(lo[k], v)));
}

function fmt(v: number): string {
  return Number.isFinite(v) ? Number(v.toPrecision(5)).toString() : String(v);
}
