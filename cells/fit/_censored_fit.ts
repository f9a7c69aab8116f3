/**
 * A fit whose response has rows below a detection limit (issue 20 item 2):
 * which rows are censored, the maximum-likelihood fit (_censored.ts) as the
 * fit kind's solution and statistics, and what substituting a fraction of
 * the limit would have given instead.
 *
 * ```
 *  flags: the response column's `below` (table `below_limit`: cells written <L)
 *         or the fit's `censored_by` column (1/true: the response holds the limit)
 *  no `substitute`: censored-normal ML (θ, σ); SEs from the observed information; z intervals;
 *                   log L, AIC, AICc, BIC of that likelihood; R² and the F test do not apply
 *  `substitute: f`: least squares with each limit L replaced by f·L — with a warning — and the
 *                   ML fit beside it so the shift shows
 *  always: least squares with L replaced by 0, L/2, L/√2 and L, each estimate's shift from
 *          the ML estimate in ML standard errors (RUN-JSON `censoring.substitutions`)
 * ```
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { modelFunctions } from "../../kernel/optim/mod.ts";
import { standardNormal } from "../../kernel/stats/mod.ts";
import type { Table } from "../../kernel/contract/mod.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import type { FitStatistics } from "./_statistics.ts";
import { fitCensored } from "./_censored.ts";
import { identifierOffset } from "./_offsets.ts";

/** What RUN-JSON says of a censored fit (`censoring`). */
export interface CensoringRecord {
  /** Rows whose response lies below its detection limit. */
  rows_below: number;
  /** Where the flags came from: the table's `<L` cells, or the fit's `censored_by` column. */
  flags_from: string;
  /** "maximum likelihood" (censored normal), or "substitution" when `substitute` was asked. */
  method: "maximum likelihood" | "substitution";
  /** With `substitute`: the fraction of the limit the rows were given. */
  substitute: number | null;
  /** σ of the censored-normal fit and its standard error. */
  sigma: number;
  sigma_std_error: number | null;
  log_likelihood: number;
  converged: boolean;
  /** The ML estimates (the fit's own unless `substitute` was asked). */
  ml_estimates: number[];
  ml_std_errors: (number | null)[];
  /** Least squares with each limit replaced by fraction·L, beside the ML fit. */
  substitutions: {
    fraction: number;
    label: string;
    estimates: (number | null)[];
    /** (estimate − ML estimate) / ML standard error, per parameter. */
    shift: (number | null)[];
  }[];
}

/** Substitutions practice uses, compared with ML on every censored fit. */
const FRACTIONS: [number, string][] = [
  [0, "0"],
  [0.5, "L/2"],
  [Math.SQRT1_2, "L/√2"],
  [1, "L"],
];

/**
 * Refuses a predictor with values below a detection limit: only a censored
 * response is modelled.
 *
 * @param problem The fit's problem (its rows are source row numbers).
 * @param table The table.
 * @throws {CellError} At the predictor's place in the model, naming a flagged row.
 */
export function refuseCensoredPredictors(problem: FitProblem, table: Table): void {
  // Only for a predictor with flags: a set of a million rows costs ~0.2 s and ~60 MB.
  let used: Set<number> | null = null;
  for (const name of problem.model.columns) {
    const c = table.columns.find((c) => c.name === name);
    if (c?.type !== "number" || c.below === undefined) continue;
    const rows = used ??= new Set(problem.rows);
    const at = c.below.findIndex((v, i) => v === 1 && rows.has(table.rows[i]));
    if (at < 0) continue;
    throw new CellError(
      `Cannot fit "${problem.name}": predictor "${name}" has values below a detection limit (row ${
        table.rows[at]
      } is written <L); only a response below a limit is modelled (censored), not a predictor: leave those rows out, or model ${name} as the response`,
      ["model"],
      identifierOffset(problem.model.rhs, name),
    );
  }
}

/**
 * The censoring flags of the rows a fit uses, or null when none is below a limit.
 *
 * @param problem The fit's problem (its rows are source row numbers).
 * @param table The table.
 * @param responseColumn The model's response column.
 * @param censoredBy The `censored_by` column, or undefined.
 * @returns Flags aligned with `problem.y`, and where they came from; null when no row is flagged.
 * @throws {CellError} For a `censored_by` column that is missing, text, or not 0/1.
 */
export function censoringFlags(
  problem: FitProblem,
  table: Table,
  responseColumn: string,
  censoredBy: string | undefined,
): { below: Uint8Array; from: string } | null {
  let source: ArrayLike<number> | null = null;
  let from = "";
  if (censoredBy !== undefined) {
    const c = table.columns.find((c) => c.name === censoredBy);
    if (c === undefined) {
      throw new CellError(
        `censored_by names "${censoredBy}", which is not a column of table "${problem.name}"'s input`,
        ["censored_by"],
      );
    }
    if (c.type !== "number") {
      throw new CellError(
        `censored_by column "${censoredBy}" holds text: it needs 1 (below the limit) or 0 per row`,
        ["censored_by"],
      );
    }
    for (let i = 0; i < c.values.length; i++) {
      const v = c.values[i];
      if (v !== 0 && v !== 1 && !Number.isNaN(v)) {
        throw new CellError(
          `censored_by column "${censoredBy}" row ${
            table.rows[i]
          } holds ${v}: it needs 1 (below the limit) or 0`,
          ["censored_by"],
        );
      }
    }
    source = c.values;
    from = `column ${censoredBy}`;
  } else {
    const c = table.columns.find((c) => c.name === responseColumn);
    if (c?.type === "number" && c.below !== undefined) {
      source = c.below;
      from = `cells of ${responseColumn} written <L`;
    }
  }
  if (source === null) return null;
  // Made only now: most fits have no censored response, and a million rows' map costs ~0.2 s.
  const index = new Map<number, number>();
  for (let i = 0; i < table.rows.length; i++) index.set(table.rows[i], i);
  const below = new Uint8Array(problem.n);
  let any = 0;
  for (let i = 0; i < problem.n; i++) {
    const at = index.get(problem.rows[i]);
    below[i] = at !== undefined && source[at] === 1 ? 1 : 0;
    any += below[i];
  }
  return any === 0 ? null : { below, from };
}

/**
 * The censored-normal ML fit as the fit kind's solution and statistics.
 *
 * @param problem The problem (response values: measured, or the limit where flagged).
 * @param leastSquares The least-squares fit on the values as written (the start).
 * @param below The flags.
 * @param squares Its least-squares statistics (n, p, df, confidence; replaced where ML differs).
 * @param options `substitute` fraction (null: ML), flags' origin, `countVariance`, the solver
 *   and the least-squares statistics (for `substitute`).
 * @returns The solution, statistics and record.
 */
export function censoredFit(
  problem: FitProblem,
  leastSquares: FitSolution,
  below: Uint8Array,
  squares: FitStatistics,
  options: {
    substitute: number | null;
    from: string;
    countVariance: boolean;
    solve: (p: FitProblem) => FitSolution;
    /** The least-squares statistics of a problem and its solution (`substitute`). */
    statistics: (p: FitProblem, s: FitSolution) => FitStatistics;
  },
): { solution: FitSolution; statistics: FitStatistics; record: CensoringRecord } {
  const fns = modelFunctions(problem);
  const ml = fitCensored({ fns, y: problem.y, below, start: leastSquares.estimates });
  const p = ml.estimates.length, q = p + 1;
  const substitutions = FRACTIONS.map(([fraction, label]) => {
    const est = substitutedFit(problem, below, fraction, options.solve);
    return {
      fraction,
      label,
      estimates: est === null ? problem.model.parameters.map(() => null) : [...est],
      shift: problem.model.parameters.map((_, j) =>
        est === null || !(ml.stdErrors[j] > 0) ? null : (est[j] - ml.estimates[j]) / ml.stdErrors[j]
      ),
    };
  });
  const record: CensoringRecord = {
    rows_below: ml.below,
    flags_from: options.from,
    method: options.substitute === null ? "maximum likelihood" : "substitution",
    substitute: options.substitute,
    sigma: ml.sigma,
    sigma_std_error: Number.isFinite(ml.sigmaStdError) ? ml.sigmaStdError : null,
    log_likelihood: ml.logLikelihood,
    converged: ml.converged,
    ml_estimates: [...ml.estimates],
    ml_std_errors: [...ml.stdErrors].map((v) => (Number.isFinite(v) ? v : null)),
    substitutions,
  };
  if (options.substitute !== null) {
    // Least squares on f·L: the fit the user asked for, with ML beside it in the record.
    const sub = {
      ...problem,
      y: problem.y.map((v, i) => (below[i] ? options.substitute! * v : v)),
      lo: undefined,
    };
    const solution = options.solve(sub);
    return { solution, statistics: options.statistics(sub, solution), record };
  }
  const cov = new Float64Array(p * p);
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) cov[a + b * p] = ml.covariance[a + b * q];
  const fitted = fns.f(ml.estimates);
  const residuals = problem.y.map((v, i) => v - fitted[i]);
  const jac = new Float64Array(problem.n * p);
  fns.jac(ml.estimates, jac);
  const solution: FitSolution = {
    ...leastSquares,
    estimates: ml.estimates,
    unscaledCovariance: cov.map((v) => v / (ml.sigma * ml.sigma)),
    fitted,
    residuals,
    rss: residuals.reduce((t, r, i) => t + (below[i] ? 0 : r * r), 0),
    converged: ml.converged,
    iterations: ml.iterations,
    design: Array.from({ length: p }, (_, j) => jac.slice(j * problem.n, (j + 1) * problem.n)),
  };
  const z = standardNormal.upperQuantile((1 - squares.confidence) / 2);
  const se = [...ml.stdErrors].map((v) => (Number.isFinite(v) ? v : null));
  const k = p + (options.countVariance ? 1 : 0);
  const n = problem.n;
  const ll = ml.logLikelihood;
  const statistics: FitStatistics = {
    ...squares,
    rss: solution.rss,
    tss: NaN,
    ess: NaN,
    r2: null,
    adjR2: null,
    sigma: ml.sigma,
    stdErrors: se,
    t: se.map((s, j) => (s === null ? null : ml.estimates[j] / s)),
    pValues: se.map((s, j) =>
      s === null ? null : 2 * standardNormal.upper(Math.abs(ml.estimates[j] / s))
    ),
    intervals: se.map((s, j) =>
      s === null ? null : [ml.estimates[j] - z * s, ml.estimates[j] + z * s] as [number, number]
    ),
    inference: "normal",
    covariance: cov,
    correlation: cov.map((v, idx) => {
      const a = idx % p, b = Math.floor(idx / p);
      return v / Math.sqrt(cov[a + a * p] * cov[b + b * p]);
    }),
    covarianceScaled: true,
    fStatistic: null,
    fPValue: null,
    logLikelihood: ll,
    k,
    kConvention: options.countVariance
      ? "k = p + 1: mean parameters and σ of the censored-normal likelihood"
      : "k = p: mean parameters only",
    aic: -2 * ll + 2 * k,
    aicc: n - k - 1 > 0 ? -2 * ll + 2 * k + (2 * k * (k + 1)) / (n - k - 1) : null,
    bic: -2 * ll + k * Math.log(n),
  };
  return { solution, statistics, record };
}

/** Least squares with each limit replaced by fraction·L; null when that fit fails. */
function substitutedFit(
  problem: FitProblem,
  below: Uint8Array,
  fraction: number,
  solve: (p: FitProblem) => FitSolution,
): Float64Array | null {
  const y = problem.y.map((v, i) => (below[i] ? fraction * v : v));
  if (!y.every(Number.isFinite)) return null;
  try {
    return solve({ ...problem, y, lo: undefined, warn: () => {} }).estimates;
  } catch {
    return null;
  }
}
