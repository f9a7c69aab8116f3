/**
 * Inverse prediction (calibration): which x gives the response y₀, with an
 * interval, for fits with one predictor column.
 *
 * Point estimate: the root of f(x; θ̂) = z₀ (z₀ = g(y₀) for a transformed
 * response). Straight lines: x̂₀ = (z₀ − α̂)/β̂ in closed form. Other
 * models: a scan of 400 steps over the search range for sign changes,
 * refined by bisection; no root or several roots are refused.
 *
 * Interval, for a new single observation y₀ (or the mean of m,
 * `replicates`): the set of x whose prediction band contains z₀,
 *
 *     (z₀ − f(x))² ≤ q²·(se_fit(x)² + s₀²(x)),
 *
 * s₀²(x) the variance of the new observation(s) (`new_observation.ts`: it
 * changes along x with weights such as 1/x²) and se_fit from the cell's
 * covariance (the fit's, or a robust one: `interval_settings.ts`).
 *
 * - Straight line f = α + βx (method "fieller"): with V the covariance of
 *   (α̂, β̂) the set is A·x² + B·x + C ≤ 0,
 *       A = β̂² − q²V_ββ,  B = −2(β̂·d + q²V_αβ),  C = d² − q²(s₀² + V_αα),  d = z₀ − α̂,
 *   Fieller's theorem as Draper & Smith, *Applied Regression Analysis*,
 *   3rd ed., §3.2, give it for inverse regression. It is a finite interval
 *   only when A > 0, i.e. g = q²V_ββ/β̂² < 1 (the slope is significantly
 *   nonzero at this level); otherwise it is the whole line or two half-lines,
 *   and we give null with a warning. The general V covers weights, fits
 *   without an intercept and any parameterisation of the line. It needs s₀²
 *   constant in x: a straight line whose new observation's variance varies
 *   with x (weights 1/x²) takes the prediction band below.
 * - Other models (method "prediction-band"): the same set found numerically,
 *   walking out from x̂₀ in 400 steps to each end of the band range and
 *   bisecting where the band stops containing z₀; the interval is the
 *   connected piece containing x̂₀. This is the graphical construction
 *   Draper & Smith describe beside the Fieller interval (the horizontal line
 *   at y₀ cut by the prediction band; from memory). For a nonlinear fit the
 *   band is the delta-method band, so the interval is approximate. A band
 *   that still contains z₀ at an end of the range gives null and a warning.
 *
 * @module
 */
import { derivative, freeNames } from "../../kernel/expr/mod.ts";
import { CellError, type OptionPath } from "../../kernel/errors.ts";
import type { Fit } from "../fit/mod.ts";
import { meanResponse, type ModelAtEstimates } from "./mean_response.ts";
import type { IntervalSettings } from "./interval_settings.ts";
import { bisectRoot, firstExit, scanSignChanges } from "./_roots.ts";
import { formatNumber } from "../shared/format.ts";

/** One inverse prediction. */
export interface InversePrediction {
  x: number;
  /** Interval for x, or null (not a finite interval, or s₀² unknown). */
  ci: [number, number] | null;
  method: "fieller" | "prediction-band";
}

/** What an inverse prediction needs. */
export interface InverseContext {
  /** The predict cell's name, for messages. */
  name: string;
  fit: Fit;
  /** The fit's name. */
  fitName: string;
  model: ModelAtEstimates;
  settings: IntervalSettings;
  /** Where roots are searched. */
  range: [number, number];
  /** How far the interval ends are looked for (contains `range`). */
  bandRange: [number, number];
  /** The covariance of the estimates (p×p column-major): the fit's or a robust one. */
  covariance: Float64Array;
  /** A robust covariance's middle in the fit factor's coordinates (`mean_response.ts`), else null. */
  middle: Float64Array | null;
  warn(m: string): void;
}

/** s₀²(x)/m, the variance of the new observation(s) giving y₀ at x (NaN where unknown). */
export interface NewVariance {
  at(x: number): number;
  /** Whether it is the same at every x. */
  constant: boolean;
}

/**
 * Solves f(x) = z₀ and gives the interval described in the module notes.
 *
 * @param c The context.
 * @param z0 The response on the model scale.
 * @param shown y₀ as written, for messages.
 * @param path The option holding y₀, for errors.
 * @param s0 The variance of the new observation(s) along x.
 * @returns x̂₀, its interval and the method.
 * @throws {CellError} When no x in the search range gives y₀, several do, or
 *   the straight line is flat.
 */
export function inversePrediction(
  c: InverseContext,
  z0: number,
  shown: string,
  path: OptionPath,
  s0: NewVariance,
): InversePrediction {
  const line = straightLine(c);
  if (line !== null && s0.constant) return fieller(c, line, z0, shown, path, s0.at(0));
  if (line !== null) flat(c, line.beta, shown, path);
  const x = line !== null ? (z0 - line.alpha) / line.beta : uniqueRoot(c, z0, shown, path);
  return { x, ci: bandInterval(c, z0, x, shown, s0), method: "prediction-band" };
}

/** Refuses a straight line of slope 0 (or not finite). */
function flat(c: InverseContext, beta: number, shown: string, path: OptionPath): void {
  if (beta !== 0 && Number.isFinite(beta)) return;
  throw new CellError(
    `Cannot solve ${shown} in predict "${c.name}": the fitted line of "${c.fitName}" has slope ${beta}, so no single x gives it`,
    path,
  );
}

/** α̂, β̂ and their covariance when f is affine in its one column, else null. */
function straightLine(c: InverseContext) {
  const { model, method } = c.fit;
  const col = model.columns[0];
  if (method !== "linear" || model.columns.length !== 1) return null;
  if (freeNames(derivative(model.rhs, col)).has(col)) return null;
  const at = (x: number) => ({
    f: c.model.value([[x]], 1)[0],
    g: c.model.gradient([[x]], 1).map((d) => d[0]),
  });
  const x0 = at(0), x1 = at(1);
  const gb = x1.g.map((v, j) => v - x0.g[j]);
  const cov = c.covariance, p = c.fit.parameters.length;
  const form = (u: number[], v: number[]) => {
    let s = 0;
    for (let j = 0; j < p; j++) {
      for (let k = 0; k < p; k++) {
        if (Number.isFinite(cov[j + k * p])) s += u[j] * cov[j + k * p] * v[k];
      }
    }
    return s;
  };
  return {
    alpha: x0.f,
    beta: x1.f - x0.f,
    vaa: form(x0.g, x0.g),
    vab: form(x0.g, gb),
    vbb: form(gb, gb),
  };
}

function fieller(
  c: InverseContext,
  l: NonNullable<ReturnType<typeof straightLine>>,
  z0: number,
  shown: string,
  path: OptionPath,
  s0: number,
): InversePrediction {
  flat(c, l.beta, shown, path);
  const x = (z0 - l.alpha) / l.beta;
  if (Number.isNaN(s0)) return { x, ci: null, method: "fieller" };
  const q2 = c.settings.q * c.settings.q, d = z0 - l.alpha;
  const A = l.beta * l.beta - q2 * l.vbb;
  const B = -2 * (l.beta * d + q2 * l.vab);
  const C = d * d - q2 * (s0 + l.vaa);
  const g = q2 * l.vbb / (l.beta * l.beta);
  const disc = B * B - 4 * A * C;
  if (!(A > 0) || !(disc >= 0)) {
    c.warn(
      `The interval for ${shown} is not a finite interval (g = ${
        formatNumber(g, 4)
      } ≥ 1): the slope of "${c.fitName}" is not significantly different from 0 at level ${c.settings.level}, so the Fieller set is unbounded`,
    );
    return { x, ci: null, method: "fieller" };
  }
  // The root of larger magnitude first, the other from the product of roots (no cancellation).
  const t = -(B + Math.sign(B || 1) * Math.sqrt(disc)) / 2;
  const r1 = t / A, r2 = C / t;
  return { x, ci: [Math.min(r1, r2), Math.max(r1, r2)], method: "fieller" };
}

function uniqueRoot(c: InverseContext, z0: number, shown: string, path: OptionPath): number {
  const [a, b] = c.range;
  const h = (x: number) => c.model.value([[x]], 1)[0] - z0;
  const roots = scanSignChanges(h, a, b, 400).map((br) => bisectRoot(h, br));
  const col = c.fit.model.columns[0];
  const range = `"${col}" in [${formatNumber(a, 6)}, ${formatNumber(b, 6)}]`;
  if (roots.length === 0) {
    throw new CellError(
      `Cannot solve ${shown} in predict "${c.name}": no ${range} gives it under fit "${c.fitName}": widen the range with the option search, as in search: [${a}, ${b}]`,
      path,
    );
  }
  if (roots.length > 1) {
    const list = roots.slice(0, 5).map((r) => formatNumber(r, 6)).join(", ");
    throw new CellError(
      `Cannot solve ${shown} in predict "${c.name}": ${roots.length} values of ${range} give it (${list}): narrow the range with the option search`,
      path,
    );
  }
  return roots[0];
}

function bandInterval(c: InverseContext, z0: number, x: number, shown: string, s0: NewVariance) {
  if (Number.isNaN(s0.at(x))) return null;
  const q2 = c.settings.q * c.settings.q;
  const h = (t: number) => {
    const m = meanResponse(c.fit, c.model, [[t]], 1, c.covariance, c.middle);
    const r = z0 - m.estimate[0];
    return r * r - q2 * (m.seFit[0] * m.seFit[0] + s0.at(t));
  };
  const [a, b] = c.bandRange;
  const lo = firstExit(h, x, a, 400), hi = firstExit(h, x, b, 400);
  if (lo === null || hi === null) {
    c.warn(
      `The interval for ${shown} is not finite within "${c.fit.model.columns[0]}" in [${
        formatNumber(a, 6)
      }, ${
        formatNumber(b, 6)
      }]: the prediction band of "${c.fitName}" still contains it at the end of the range`,
    );
    return null;
  }
  return [lo, hi] as [number, number];
}
