/**
 * Intervals beyond Wald for predict's points (issue 19): the mean response
 * g(θ) = f(x₀; θ) by profile likelihood and by the bootstrap, and a new
 * observation by the bootstrap, following what the fit computed (its own
 * `intervals` option: profile by default for a nonlinear fit; bootstrap when
 * its `bootstrap:` option is given). All on the model scale; run.ts
 * back-transforms the ends for a transformed response.
 *
 * ```
 *  g(θ) = f(x₀; θ)  (the model compiled once, its columns bound to the point's values)
 *  profile:   S minimised with g(θ) = c held (cells/fit/_derived.ts derivedConstraint:
 *             θₖ solved from the others) ─▶ |τ(c)| = q          (cells/fit/_profile.ts)
 *  bootstrap: g(θ*ᵣ) for the fit's replicates ─▶ percentile, BCa (the fit's jackknife)
 *  new observation: δ*ᵣ = g(θ*ᵣ) − (g(θ̂) + c₀·ε*ᵣ), ε*ᵣ a centred modified residual
 *             (the mean of m for `replicates: m`), c₀ the point's scale;
 *             limits ŷ₀ − δ*₍(B+1)(1−α)₎, ŷ₀ − δ*₍(B+1)α₎    (Davison & Hinkley 1997, Alg. 6.4)
 * ```
 *
 * Sources: Bates & Watts, *Nonlinear Regression Analysis and Its
 * Applications* (1988), §6.1 (the profile of a function of the parameters;
 * for a model linear in θ the mean response's profile interval is the t
 * interval); Davison & Hinkley, *Bootstrap Methods and their Application*
 * (1997), §6.3.3 and Alg. 6.4 (prediction error δ = ŷ₊ − y₊ from a
 * resampled fit and a resampled residual; one residual per replicate here,
 * their M = 1, so each limit's Monte Carlo error stays the binomial one of
 * cells/fit/_bootstrap.ts); Efron & Tibshirani, *An Introduction to the
 * Bootstrap* (1993), ch. 14 (BCa).
 *
 * The scale of a new observation's error: the modified residuals eᵢ =
 * √wᵢ·rᵢ/√(1 − hᵢ) have variance about s² (unweighted, relative weights) or
 * 1 (known σ, wᵢ = 1/σᵢ²), so c₀² is the point's new-observation variance
 * over that: 1 unweighted, 1/w₀ with relative weights, σ₀² with known σ
 * (our reading of D&H's homoscedastic algorithm for weighted fits, as the
 * fit's own bootstrap does; common practice, no source). The residuals are
 * drawn whichever resampling (residuals or cases) made the fit's replicates.
 *
 * @module
 */
import { compile, derivative, simplify } from "../../kernel/expr/mod.ts";
import { modelFunctions } from "../../kernel/optim/mod.ts";
import { mulberry32Uint } from "../../kernel/random.ts";
import { fmix32 } from "../../kernel/murmur3.ts";
import type { Fit } from "../fit/mod.ts";
import { fitLeverage } from "../fit/mod.ts";
import { type LabelledInterval, type ProfileInput, profileOf } from "../fit/_profile.ts";
import { bootstrapIntervals } from "../fit/_bootstrap.ts";
import { derivedConstraint } from "../fit/_derived.ts";
import { profileInputOf } from "../fit/_intervals.ts";

export type { LabelledInterval };

/** What the points' intervals rest on. */
export interface PointIntervalOptions {
  /** The predict cell's level (the fit's replicates serve any level). */
  level: number;
  /** The two-sided quantile of the level on the fit's law (t(n − p), or normal with known σ). */
  q: number;
  /** The document's seed. */
  seed: number;
}

/** Intervals of the points of one predict cell. */
export interface PointIntervals {
  /** Whether the fit carries profile intervals (then so does the mean response). */
  profile: boolean;
  /** The fit's bootstrap replicates kept, or 0 (no bootstrap). */
  resamples: number;
  /**
   * The mean response's intervals beyond Wald at a point (model scale): profile, then
   * bootstrap percentile and BCa, as the fit computed them.
   *
   * @param x0 The point's value of each model column, in `fit.model.columns` order.
   * @param se Its standard error (the first profile step's scale).
   */
  mean(x0: readonly number[], se: number): LabelledInterval[];
  /**
   * The bootstrap prediction interval for a new observation (the mean of m) at a
   * point (model scale), or null when the fit has no replicates.
   *
   * @param x0 The point's column values.
   * @param index The point's number from 0 (its own stream of draws).
   * @param estimate ŷ₀ as reported (model scale).
   * @param variance The variance of one new observation there (s², s²/w₀, σ₀²); NaN unknown.
   * @param m New observations averaged.
   */
  newObservation(
    x0: readonly number[],
    index: number,
    estimate: number,
    variance: number,
    m: number,
  ): LabelledInterval | null;
}

/**
 * The points' intervals for a fit: what it carries decides the methods.
 *
 * @param fit The fit predicted from.
 * @param o Level, quantile and seed.
 * @returns The intervals at points.
 */
export function pointIntervals(fit: Fit, o: PointIntervalOptions): PointIntervals {
  const { model } = fit;
  const params = model.parameters;
  const p = params.length;
  const f = compile(model.rhs, model.columns, params);
  const df = params.map((name) =>
    compile(simplify(derivative(model.rhs, name)), model.columns, params)
  );
  const one = new Float64Array(1);
  /** g(θ) = f(x₀; θ) and ∂g/∂θⱼ, the model's columns bound to the point's values. */
  const at = (x0: readonly number[]) => {
    const cols = x0.map((v) => Float64Array.of(v));
    const g = (theta: Float64Array) => f(cols, theta, 1, one)[0];
    const grad = df.map((d) => (theta: Float64Array) => d(cols, theta, 1, one)[0]);
    return { g, grad };
  };
  const iv = fit.intervals;
  const run = iv?.bootstrap !== undefined && iv.bootstrap.b > 0 ? iv.bootstrap : null;
  const profile = iv?.traces !== undefined && iv.bounds !== undefined;
  let input: ProfileInput | null = null;
  const profileInput = () =>
    input ??= profileInputOf(
      modelFunctions({
        model,
        n: fit.y.length,
        columns: fit.columns,
        y: fit.y,
        weights: fit.weights,
      }),
      params,
      fit.estimates,
      fit.statistics,
      o.q,
      o.level,
      iv!.bounds!,
    );
  let residuals: Float64Array | null = null;
  const theta = new Float64Array(p);
  /** g at every replicate (and at every jackknife row). */
  const replicated = (g: (t: Float64Array) => number, from: Float64Array, rows: number) => {
    const out = new Float64Array(rows);
    for (let r = 0; r < rows; r++) {
      for (let k = 0; k < p; k++) theta[k] = from[r * p + k];
      out[r] = g(theta);
    }
    return out;
  };
  return {
    profile,
    resamples: run?.b ?? 0,
    mean(x0, se) {
      const { g, grad } = at(x0);
      const est = g(fit.estimates);
      const out: LabelledInterval[] = [];
      if (profile) out.push(profileAt(profileInput(), g, grad, est, se, o.level));
      if (run !== null) {
        const values = replicated(g, run.replicates, run.b);
        const jack = run.jackknife === null
          ? null
          : replicated(g, run.jackknife, run.jackknifeRows);
        out.push(...bootstrapIntervals(values, est, jack, o.level));
      }
      return out;
    },
    newObservation(x0, index, estimate, variance, m) {
      if (run === null) return null;
      const method = "bootstrap-percentile" as const;
      if (!(variance > 0 && variance < Infinity)) {
        return {
          method,
          level: o.level,
          lower: null,
          upper: null,
          note: "the variance of a new observation is not known here",
        };
      }
      residuals ??= modifiedResiduals(fit);
      const unit = fit.weighting === "absolute" ? 1 : (fit.statistics.sigma ?? NaN) ** 2;
      const c0 = Math.sqrt(variance / unit);
      if (!Number.isFinite(c0)) {
        return { method, level: o.level, lower: null, upper: null, note: "no residual variance" };
      }
      const { g } = at(x0);
      const ghat = g(fit.estimates);
      const means = replicated(g, run.replicates, run.b);
      const n = residuals.length;
      const next = mulberry32Uint(fmix32((o.seed ^ 0x3c6ef372) + Math.imul(index + 1, 0x9e3779b1)));
      // ŷ₀ − δ*ᵣ, δ*ᵣ = ŷ*ᵣ − y*ᵣ: its percentile limits are ŷ₀ − δ*₍(1−α)₎ and ŷ₀ − δ*₍α₎.
      const values = new Float64Array(run.b);
      for (let r = 0; r < run.b; r++) {
        let e = 0;
        for (let k = 0; k < m; k++) e += residuals[Math.floor((next() / 4294967296) * n)];
        const delta = means[r] - (ghat + (c0 * e) / m);
        values[r] = estimate - delta;
      }
      const [pct] = bootstrapIntervals(values, estimate, null, o.level);
      return pct;
    },
  };
}

/** The profile interval of g = f(x₀; θ) (the fit's profile machinery under g(θ) = c held). */
function profileAt(
  input: ProfileInput,
  g: (t: Float64Array) => number,
  grad: ((t: Float64Array) => number)[],
  est: number,
  se: number,
  level: number,
): LabelledInterval {
  const g0 = Float64Array.from(grad, (d) => d(input.estimates));
  const con = Number.isFinite(est) && se > 0 && se < Infinity
    ? derivedConstraint(input, g, grad, g0, input.estimates)
    : null;
  if (con === null) {
    return {
      method: "profile",
      level,
      lower: null,
      upper: null,
      note: "not profiled: the mean response does not vary with the parameters here",
    };
  }
  return profileOf(input, con, "mean response", est, se).interval;
}

/**
 * Centred modified residuals √wᵢ·rᵢ/√(1 − hᵢ) of the fit (Davison & Hinkley
 * 1997, eq. 6.9), as the fit's residual bootstrap draws them.
 */
function modifiedResiduals(fit: Fit): Float64Array {
  const n = fit.residuals.length;
  let h: Float64Array;
  try {
    h = fitLeverage(fit);
  } catch {
    h = new Float64Array(n);
  }
  const e = new Float64Array(n);
  let mean = 0;
  for (let i = 0; i < n; i++) {
    const w = fit.weights === null ? 1 : Math.sqrt(fit.weights[i]);
    e[i] = (w * fit.residuals[i]) / Math.sqrt(1 - Math.min(h[i], 1 - 1e-12));
    mean += e[i];
  }
  mean /= n;
  for (let i = 0; i < n; i++) e[i] -= mean;
  return e;
}
