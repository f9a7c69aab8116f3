/**
 * Multi-start search for start values a least-squares fit lacks, seeded so
 * that equal inputs give equal results.
 *
 * Strategy (ours; the ingredients are published):
 *
 * 1. Sample: a Latin hypercube (McKay, Beckman & Conover 1979, Technometrics
 *    21) of `samples` points over the log-magnitudes of the unknown
 *    parameters, log₁₀|θ| ∈ [−4, 4] (wide because a parameter's scale is not
 *    known before the fit: rates scale as 1/x, amplitudes as y), with a sign
 *    drawn per point and parameter (positive only when the lower bound is
 *    ≥ 0, negative only when the upper bound is ≤ 0), clipped into the
 *    bounds. Known start values stay as given. The point θ = 1 (all unknown
 *    set to 1, or the nearest value inside the bounds) is always included.
 * 2. Project (optional): the caller may set the parameters that enter the
 *    model linearly by linear least squares given the others (variable
 *    projection, Golub & Pereyra 1973, SIAM J. Numer. Anal. 10), so only the
 *    nonlinear ones need sampling.
 * 3. Screen: evaluate ‖F‖ at every sample; keep the `keep` best finite ones.
 * 4. Race: a short Levenberg–Marquardt run (`lmder`, at most 40·(n+1)
 *    evaluations) from each kept point; finish the 3 best with the full
 *    tolerances and return the lowest ‖F‖ (ties: the earlier sample).
 *
 * @module
 */
import { enorm } from "./enorm.ts";
import { type LeastSquaresProblem, lmder, type LmderOptions, type LmderResult } from "./lmder.ts";
import { latinHypercube, mulberry32 } from "./_random.ts";

/** Settings of the search. */
export interface MultiStartOptions extends LmderOptions {
  /** The seed (the document's `seed` setting). */
  seed: number;
  /** Samples drawn (default 48 per unknown parameter, at most 1024). */
  samples?: number;
  /** Samples raced with short runs (default 8). */
  keep?: number;
  /** Sets parameters that enter linearly, given the others, in place; false if it could not. */
  project?: (x: Float64Array) => boolean;
}

/** The best run, and how many samples were finite. */
export interface MultiStartResult extends LmderResult {
  /** The start the best run began from. */
  start: Float64Array;
  /** Samples at which F was finite. */
  finiteSamples: number;
}

/**
 * Finds a least-squares solution from partial start values (see the module doc).
 *
 * @param problem F and its Jacobian.
 * @param partial Start values, NaN where unknown.
 * @param options Seed, sample counts, bounds and tolerances.
 * @returns The best run, or null when F was not finite at any sample.
 * @example
 * ```ts
 * import { multiStart } from "./multi_start.ts";
 * // y = exp(b·t) with b = 0.5, no start value.
 * const t = [0, 1, 2, 3], y = t.map((v) => Math.exp(0.5 * v));
 * const r = multiStart({
 *   m: 4, n: 1,
 *   fcn: (x, f) => { for (let i = 0; i < 4; i++) f[i] = Math.exp(x[0] * t[i]) - y[i]; },
 *   jac: (x, j) => { for (let i = 0; i < 4; i++) j[i] = t[i] * Math.exp(x[0] * t[i]); },
 * }, new Float64Array([NaN]), { seed: 1 });
 * if (r === null || Math.abs(r.x[0] - 0.5) > 1e-12) throw new Error("multi-start");
 * ```
 */
export function multiStart(
  problem: LeastSquaresProblem,
  partial: Float64Array,
  options: MultiStartOptions,
): MultiStartResult | null {
  const { m, n } = problem;
  const unknown = [...partial.keys()].filter((j) => Number.isNaN(partial[j]));
  const count = options.samples ?? Math.min(1024, 48 * Math.max(1, unknown.length));
  const keep = options.keep ?? 8;
  const points = samplePoints(partial, unknown, count, options);
  const f = new Float64Array(m);
  const scored: { x: Float64Array; fnorm: number; k: number }[] = [];
  points.forEach((x, k) => {
    if (options.project && !options.project(x)) return;
    for (let j = 0; j < n; j++) {
      x[j] = Math.min(
        options.upper?.[j] ?? Infinity,
        Math.max(options.lower?.[j] ?? -Infinity, x[j]),
      );
    }
    problem.fcn(x, f);
    const fnorm = enorm(f);
    if (Number.isFinite(fnorm)) scored.push({ x, fnorm, k });
  });
  if (scored.length === 0) return null;
  scored.sort((a, b) => a.fnorm - b.fnorm || a.k - b.k);
  const short = { ...options, maxfev: 40 * (n + 1) };
  const raced = scored.slice(0, keep).map((s) => ({ s, r: lmder(problem, s.x, short) }))
    .sort((a, b) => a.r.fnorm - b.r.fnorm || a.s.k - b.s.k);
  let best: MultiStartResult | null = null;
  for (const { s, r } of raced.slice(0, 3)) {
    const full = r.converged ? r : lmder(problem, r.x, { ...options, maxfev: undefined });
    const better = best === null || (full.converged && !best.converged) ||
      (full.converged === best.converged && full.fnorm < best.fnorm);
    if (better) best = { ...full, start: s.x, finiteSamples: scored.length };
  }
  return best;
}

/** The sample points: θ = 1 first, then the Latin hypercube (see the module doc). */
function samplePoints(
  partial: Float64Array,
  unknown: number[],
  count: number,
  o: MultiStartOptions,
): Float64Array[] {
  const rand = mulberry32(o.seed);
  const cube = latinHypercube(count, unknown.length, rand);
  const lo = (j: number) => o.lower?.[j] ?? -Infinity, hi = (j: number) => o.upper?.[j] ?? Infinity;
  const clip = (j: number, v: number) => Math.min(hi(j), Math.max(lo(j), v));
  const ones = Float64Array.from(partial);
  for (const j of unknown) ones[j] = clip(j, 1);
  const out = [ones];
  for (const u of cube) {
    const x = Float64Array.from(partial);
    unknown.forEach((j, d) => {
      const mag = 10 ** (-4 + 8 * u[d]);
      const coin = rand();
      const sign = lo(j) >= 0 ? 1 : hi(j) <= 0 ? -1 : coin < 0.5 ? 1 : -1;
      x[j] = clip(j, sign * mag);
    });
    out.push(x);
  }
  return out;
}
