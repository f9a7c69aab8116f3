/**
 * The mean of y on the original scale for a log response (`log(y) = …`,
 * `log10(y) = …`). Back-transforming the prediction, exp(μ̂), estimates the
 * median of y (`response_scale.ts`); the mean is larger, and two labelled
 * estimates of it are given:
 *
 * - Lognormal correction: with normal errors of variance σ₀² on the log
 *   scale, E[y] = exp(μ + σ₀²/2) (the lognormal mean; Aitchison & Brown,
 *   *The Lognormal Distribution*, 1957; from memory), estimated by
 *   exp(μ̂ + s₀²/2) with s₀² the variance of one new observation at the
 *   point (s², s²/w₀ or σ₀²: `new_observation.ts`). Interval by Cox's
 *   method (Land 1972, Technometrics 14:951–966; Zhou & Gao 1997, Statistics
 *   in Medicine 16:783–790; from memory): θ̂ = μ̂ + s₀²/2 with
 *   Var θ̂ ≈ se_fit² + s₀⁴/(2ν) (Var s² = 2σ⁴/ν for ν residual degrees of
 *   freedom; 0 with known σ), interval exp(θ̂ ± q·√Var θ̂) with the cell's
 *   quantile q.
 * - Duan's smearing estimate (Duan 1983, "Smearing estimate: a
 *   nonparametric retransformation method", JASA 78:605–610): E[y] ≈
 *   exp(μ̂)·(1/n)Σ exp(eᵢ), the residuals' own distribution in place of the
 *   normal; no interval. For a weighted fit the residuals are first scaled to
 *   the point's variance, eᵢ·√(wᵢ/w₀) (eᵢ·√wᵢ·σ₀ with known σ), as under the
 *   weighted model eᵢ√wᵢ are exchangeable (our extension of Duan's
 *   homoscedastic estimate; common practice, no source).
 *
 * For log10 write y = exp(c·z) with c = ln 10: E[y] = exp(c·μ + c²σ₀²/2)
 * and the smearing factor (1/n)Σ exp(c·eᵢ).
 *
 * @module
 */
import type { Model } from "../../kernel/expr/mod.ts";
import type { Fit } from "../fit/mod.ts";

/** One labelled estimate of the mean of y on the original scale. */
export interface MeanEstimate {
  /** "lognormal" (exp(μ + σ²/2)) or "smearing" (Duan 1983). */
  method: "lognormal" | "smearing";
  /** What it is, in words, with its formula. */
  label: string;
  /** The estimate; null where it cannot be had (unknown variance, overflow). */
  estimate: number | null;
  /** Interval for the mean at the cell's level; null for smearing (none is given) or where unknown. */
  ci: [number, number] | null;
}

/**
 * c with y = exp(c·z) when the response is log(y) (c = 1) or log10(y)
 * (c = ln 10) of its bare column, else null.
 *
 * @param model The fit's model.
 * @returns c, or null for other responses.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { logBase } from "./log_mean.ts";
 * if (logBase(parseModel("log10(y) = a + b*x", ["x", "y"])) !== Math.LN10) throw new Error();
 * if (logBase(parseModel("sqrt(y) = a + b*x", ["x", "y"])) !== null) throw new Error();
 * ```
 */
export function logBase(model: Model): number | null {
  const r = model.response;
  if (r.op !== "call" || r.args.length !== 1) return null;
  const a = r.args[0];
  if (a.op !== "id" || a.name !== model.responseColumn) return null;
  return r.fn === "log" ? 1 : r.fn === "log10" ? Math.LN10 : null;
}

/** What the mean estimates at the points of one cell share. */
export interface LogMeanContext {
  fit: Fit;
  /** c of {@link logBase}. */
  c: number;
  /** The interval quantile. */
  q: number;
  /** Residual degrees of freedom (Infinity with known σ). */
  df: number;
  /** Smearing factors already computed, by the point's variance (one for an unweighted fit). */
  factors?: Map<number, number>;
}

/**
 * The two labelled mean estimates at one point.
 *
 * @param x The shared context.
 * @param mu The model-scale prediction μ̂.
 * @param seFit Its standard error.
 * @param v1 Variance of one new observation there on the model scale (NaN when unknown).
 * @returns The lognormal and smearing estimates, in that order.
 * @example
 * ```ts
 * import { logMeans } from "./log_mean.ts";
 * import type { Fit } from "../fit/mod.ts";
 * // Residuals ±0.1: Duan's factor (e^0.1 + e^−0.1)/2 = cosh 0.1 (hand computation).
 * const fit = {
 *   weighting: "none", weights: null, residuals: Float64Array.of(0.1, -0.1),
 *   model: { responseColumn: "y" },
 * } as unknown as Fit;
 * const [, duan] = logMeans({ fit, c: 1, q: 2, df: 1 }, 0, 0, 0.01);
 * if (Math.abs(duan.estimate! - Math.cosh(0.1)) > 1e-15) throw new Error(String(duan.estimate));
 * ```
 */
export function logMeans(x: LogMeanContext, mu: number, seFit: number, v1: number): MeanEstimate[] {
  const { c, q, df } = x;
  const theta = c * mu + c * c * v1 / 2;
  const sd = Math.sqrt(
    c * c * seFit * seFit + (df === Infinity ? 0 : (c * c * v1) ** 2 / (2 * df)),
  );
  const est = finite(Math.exp(theta));
  const lo = finite(Math.exp(theta - q * sd)), hi = finite(Math.exp(theta + q * sd));
  const key = x.fit.weights === null ? 0 : v1;
  const factors = x.factors ??= new Map();
  let factor = factors.get(key);
  if (factor === undefined) factors.set(key, factor = smearingFactor(x.fit, c, v1));
  const duan = finite(Math.exp(c * mu) * factor);
  const y = x.fit.model.responseColumn;
  const e = c === 1 ? "exp(μ)" : "10^μ";
  const half = c === 1 ? "σ₀²/2" : "(ln 10·σ₀)²/2";
  return [
    {
      method: "lognormal",
      label:
        `mean of ${y} for normal errors on the log scale: ${e}·exp(${half}), σ₀² the variance of a new observation there; interval by Cox's method`,
      estimate: est,
      ci: est === null || lo === null || hi === null ? null : [lo, hi],
    },
    {
      method: "smearing",
      label: `mean of ${y} by Duan's smearing estimate (1983): ${e}·mean(${
        c === 1 ? "exp(eᵢ)" : "10^eᵢ"
      }) over the residuals${
        x.fit.weights === null ? "" : " scaled to the point's variance"
      }; no interval`,
      estimate: duan,
      ci: null,
    },
  ];
}

function finite(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

/** (1/n)Σ exp(c·ẽᵢ), ẽᵢ the residuals (unweighted) or scaled to variance v1 (weighted). */
function smearingFactor(fit: Fit, c: number, v1: number): number {
  const e = fit.residuals, w = fit.weights, n = e.length;
  if (w !== null && !(v1 > 0 && v1 < Infinity)) return NaN;
  // Relative weights: eᵢ√wᵢ/s are exchangeable, so at the point ẽᵢ = eᵢ√(wᵢ·v1)/s; known σ: s = 1.
  const s2 = fit.weighting === "relative" ? (fit.statistics.sigma ?? NaN) ** 2 : 1;
  const scale = w === null ? 1 : Math.sqrt(v1 / s2);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    sum += Math.exp(c * e[i] * (w === null ? 1 : Math.sqrt(w[i]) * scale));
  }
  return sum / n;
}
