/**
 * Every interval a fit's parameters carry, each labelled with its method
 * (issue 19; RUN-JSON `parameters[].intervals`): Wald always (`ci` stays the
 * Wald interval for scripts that read it), then profile likelihood
 * (_profile.ts) and the bootstrap (_bootstrap.ts) as the fit's `intervals`
 * option asks.
 *
 * ```
 *  spec.intervals ─▶ wald (from the statistics) ─┬─ profile: p constrained-fit searches
 *                                                └─ bootstrap: B refits + n jackknife refits
 * ```
 *
 * By default a nonlinear fit carries profile intervals beside the Wald ones;
 * a linear fit only Wald (with Gaussian errors its profile interval is the t
 * interval: nothing would change).
 *
 * @module
 */
import { modelFunctions } from "../../kernel/optim/mod.ts";
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import type { FitStatistics } from "./_statistics.ts";
import {
  type LabelledInterval,
  type ProfileInput,
  profileIntervals,
  type ProfileTrace,
} from "./_profile.ts";
import { bootstrap, bootstrapIntervals, type BootstrapRun } from "./_bootstrap.ts";
import type { IntervalsSpec } from "./_parse_intervals.ts";
import { type DerivedQuantity, type DerivedResult, derivedResults } from "./_derived.ts";
import { ExprError, parseColumnExpression } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";

/** What the fit output keeps of its intervals. */
export interface FitIntervals {
  /** Per parameter, every interval computed, Wald first. */
  byParameter: LabelledInterval[][];
  /** Profile traces per parameter (profile asked), else absent. */
  traces?: ProfileTrace[];
  /** The bootstrap replicates (bootstrap asked), else absent. */
  bootstrap?: BootstrapRun;
  /** The derived quantities (the fit's `derived`), each with every method used. */
  derived: DerivedResult[];
  /** Milliseconds each method took. */
  ms: Partial<Record<"profile" | "bootstrap" | "derived", number>>;
  /**
   * The parameters' ranges (the fit's `within`; ±Infinity where open), kept
   * when profile or bootstrap intervals were computed, so that a later cell
   * can profile another function of the parameters (predict's mean response).
   */
  bounds?: { lower: Float64Array; upper: Float64Array };
}

/**
 * The methods asked: the cell's `intervals`, else the document's, else the
 * default for the kind of fit (Wald; and profile for a nonlinear model).
 */
export function methodsFor(
  spec: IntervalsSpec,
  linear: boolean,
  document?: readonly string[],
): Set<"wald" | "profile" | "bootstrap"> {
  const asked = (spec.intervals ?? document ?? (linear ? ["wald"] : ["wald", "profile"])) as (
    | "wald"
    | "profile"
    | "bootstrap"
  )[];
  const set = new Set<"wald" | "profile" | "bootstrap">(["wald", ...asked]);
  if (spec.bootstrap !== undefined) set.add("bootstrap");
  return set;
}

/**
 * Computes the intervals asked for.
 *
 * @param spec The fit's interval options.
 * @param problem The fitted problem (rows, response, weights, limits).
 * @param solution The solution.
 * @param st Its statistics (Wald intervals, standard errors, df, the reference law).
 * @param linear Whether the model is linear in its parameters.
 * @param ctx Settings (level, seed), progress.
 * @returns The intervals by parameter and what supports them.
 */
export function fitIntervals(
  spec: IntervalsSpec,
  problem: FitProblem,
  solution: FitSolution,
  st: FitStatistics,
  linear: boolean,
  ctx: Pick<RunContext, "settings" | "progress">,
): FitIntervals {
  const level = ctx.settings.confidence;
  const params = problem.model.parameters;
  const byParameter: LabelledInterval[][] = params.map((_, j) => {
    const ci = st.intervals[j];
    return [{
      method: "wald",
      level,
      lower: ci === null ? null : ci[0],
      upper: ci === null ? null : ci[1],
      ...(ci === null ? { note: "no standard error" } : {}),
    }];
  });
  const methods = methodsFor(spec, linear, ctx.settings.intervals);
  const quantities = (spec.derived ?? []).map((d) => parseDerived(d, params));
  const out: FitIntervals = { byParameter, derived: [], ms: {} };
  const q = referenceQuantile(st, level);
  if (!methods.has("profile") && !methods.has("bootstrap")) {
    out.derived = derivedResults(quantities, params, solution.estimates, {
      profile: null,
      covariance: st.covariance,
      bootstrap: null,
      n: problem.n,
      q,
      level,
    });
    return out;
  }
  const fns = modelFunctions(problem);
  const p = params.length;
  const { lower, upper } = parameterBounds(params, problem.limits);
  out.bounds = { lower, upper };
  const profileInput = profileInputOf(fns, params, solution.estimates, st, q, level, out.bounds);
  if (methods.has("profile")) {
    const t0 = performance.now();
    const prof = profileIntervals(profileInput);
    prof.intervals.forEach((iv, j) => byParameter[j].push(iv));
    out.traces = prof.traces;
    out.ms.profile = performance.now() - t0;
  }
  if (methods.has("bootstrap")) {
    const t0 = performance.now();
    const b = spec.bootstrap ?? { resamples: 2000, resample: "residuals" as const };
    const run = bootstrap({
      fns,
      parameters: params,
      estimates: solution.estimates,
      y: problem.y,
      fitted: solution.fitted,
      design: solution.design.length === p ? solution.design : jacobianColumns(fns, solution),
      weights: problem.weights ?? null,
      lower,
      upper,
      resample: b.resample,
      b: b.resamples,
      seed: ctx.settings.seed,
      level,
      progress: (f) => ctx.progress(f, "bootstrap refits"),
    });
    for (let j = 0; j < p; j++) {
      const values = new Float64Array(run.b);
      for (let r = 0; r < run.b; r++) values[r] = run.replicates[r * p + j];
      const jack = run.jackknife === null
        ? null
        : Float64Array.from({ length: run.jackknifeRows }, (_, i) => run.jackknife![i * p + j]);
      byParameter[j].push(...bootstrapIntervals(values, solution.estimates[j], jack, level));
    }
    out.bootstrap = run;
    out.ms.bootstrap = performance.now() - t0;
  }
  if (quantities.length > 0) {
    const t0 = performance.now();
    out.derived = derivedResults(quantities, params, solution.estimates, {
      profile: methods.has("profile") ? profileInput : null,
      covariance: st.covariance,
      bootstrap: out.bootstrap ?? null,
      n: problem.n,
      q,
      level,
    });
    out.ms.derived = performance.now() - t0;
  }
  return out;
}

/**
 * The parameters' ranges from a fit's `within` limits: ±Infinity where open.
 *
 * @param params The parameter names, in order.
 * @param limits Bounds by name (`null` for an open end), or undefined.
 * @returns Lower and upper bounds, in parameter order.
 * @example
 * ```ts
 * import { parameterBounds } from "./_intervals.ts";
 * const b = parameterBounds(["a", "k"], { k: [0, null] });
 * if (b.lower[1] !== 0 || b.upper[1] !== Infinity || b.lower[0] !== -Infinity) throw new Error();
 * ```
 */
export function parameterBounds(
  params: readonly string[],
  limits: FitProblem["limits"],
): { lower: Float64Array; upper: Float64Array } {
  const p = params.length;
  const lower = new Float64Array(p).fill(-Infinity), upper = new Float64Array(p).fill(Infinity);
  for (const [k, [lo, hi]] of Object.entries(limits ?? {})) {
    const j = params.indexOf(k);
    if (j < 0) continue;
    if (lo !== null) lower[j] = lo;
    if (hi !== null) upper[j] = hi;
  }
  return { lower, upper };
}

/**
 * What profiling needs of a fitted problem: its functions, estimates,
 * standard errors, residual df and reference law, the quantile of the level
 * and the parameters' ranges (the profile of a parameter, of a derived
 * quantity, or of predict's mean response at a point).
 *
 * @param fns The model functions of the fitted rows (`modelFunctions`).
 * @param params The parameter names.
 * @param estimates θ̂.
 * @param st The fit's statistics (standard errors, df, law).
 * @param q The quantile of the level on the fit's law.
 * @param level The confidence level.
 * @param bounds The parameters' ranges ({@link parameterBounds}).
 * @returns The profile input.
 */
export function profileInputOf(
  fns: ReturnType<typeof modelFunctions>,
  params: readonly string[],
  estimates: Float64Array,
  st: Pick<FitStatistics, "stdErrors" | "dfResidual" | "inference">,
  q: number,
  level: number,
  bounds: { lower: Float64Array; upper: Float64Array },
): ProfileInput {
  return {
    fns,
    parameters: params,
    estimates,
    stdErrors: st.stdErrors,
    dfResidual: st.dfResidual,
    inference: st.inference,
    q,
    level,
    lower: bounds.lower,
    upper: bounds.upper,
  };
}

/** A derived quantity's expression parsed against the parameters, its errors on `derived`. */
function parseDerived(
  d: { name: string; text: string },
  params: readonly string[],
): DerivedQuantity {
  if (params.includes(d.name)) {
    throw new CellError(
      `Derived quantity "${d.name}" has the name of a parameter of the model: give it another name`,
      ["derived", d.name],
    );
  }
  try {
    return { name: d.name, text: d.text, expr: parseColumnExpression(d.text, params) };
  } catch (e) {
    if (e instanceof ExprError) {
      const message = e.message.replace(
        /Unknown column "([^"]+)": a derived column may use only columns and the constants pi and e/,
        `Unknown parameter "$1" in derived quantity "${d.name}": it may use the model's parameters (${
          params.join(", ")
        }), numbers, functions and the constants pi and e`,
      ).replace(/Unknown column/, "Unknown parameter");
      throw new CellError(message, ["derived", d.name], e.offset);
    }
    throw e;
  }
}

/** The quantile q of the level on the fit's reference law (t with n − p df, or normal). */
function referenceQuantile(st: FitStatistics, level: number): number {
  const law = st.inference === "normal" ? standardNormal : studentT(st.dfResidual);
  return law.upperQuantile((1 - level) / 2);
}

function jacobianColumns(fns: ReturnType<typeof modelFunctions>, s: FitSolution): Float64Array[] {
  const n = fns.problem.m, p = s.estimates.length;
  const jac = new Float64Array(n * p);
  fns.jac(s.estimates, jac);
  return Array.from({ length: p }, (_, j) => jac.slice(j * n, (j + 1) * n));
}
