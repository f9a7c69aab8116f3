/**
 * Running a fit cell: table + model → {@link Fit}.
 *
 * ```
 *  inputs[on] ─buildProblem─▶ FitProblem ─isLinearIn?─┬─ yes: solveLinear (QR)
 *                                                     └─ no:  solveNonlinear (slot)
 *                       FitSolution ─fitStatistics─▶ Fit
 * ```
 *
 * A parameter that is one edit away from a column and is used like a column
 * (it multiplies another parameter, or is ≥ 3 characters long) is most likely
 * a misspelt column: when the fit then fails (nonlinear, aliased) the error
 * names that identifier with a suggestion instead.
 *
 * @module
 */
import { isLinearIn } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { nearest } from "../../kernel/suggest.ts";
import { quotedList } from "../../kernel/linalg/mod.ts";
import type { RunContext, Table, TableInEngine } from "../../kernel/contract/mod.ts";
import { solveInEngine } from "./_in_engine.ts";
import type { FitSpec } from "./spec.ts";
import type { Fit } from "./fit.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { buildProblem } from "./_data.ts";
import { solveLinear } from "./solve_linear.ts";
import { solveNonlinear } from "./solve_nonlinear.ts";
import { fitStatistics } from "./_statistics.ts";
import { applyWeighting, parseAgainst } from "./_weighting.ts";
import { fitIntervals } from "./_intervals.ts";
import {
  censoredFit,
  censoringFlags,
  type CensoringRecord,
  refuseCensoredPredictors,
} from "./_censored_fit.ts";
import { identifierOffset } from "./_offsets.ts";
import { type ModelUnits, modelUnits } from "../../kernel/units/mod.ts";
import { robustSolve, robustStatistics } from "./_robust.ts";

/**
 * Fits the spec's model to its table.
 *
 * @param spec The normalised options.
 * @param ctx Inputs (the table under `spec.on`) and the warning sink.
 * @returns The fit.
 * @throws {CellError} For a missing table, model errors (located in the model
 *   text), too few rows, aliased terms, a model that is not finite at the
 *   start, or a nonlinear fit that does not converge.
 */
export function runFit(spec: FitSpec, ctx: RunContext): Fit | Promise<Fit> {
  const table = tableInput(spec, ctx);
  if (table.database?.kept) return runFitInEngine(spec, ctx, table as InEngineTable);
  const weighted = applyWeighting(
    buildProblem(ctx.name, spec, table, ctx.warn),
    spec,
    table,
    ctx.warn,
  );
  // Nonlinear fits also need the bounds, the seed for multi-start and the warning sink.
  const problem = {
    ...weighted.problem,
    limits: spec.within,
    seed: ctx.settings.seed,
    warn: ctx.warn,
  };
  const { model, n } = problem;
  const p = model.parameters.length;
  if (p === 0) {
    throw new CellError(`Cannot fit "${ctx.name}": the model has no parameters to estimate`, [
      "model",
    ], model.rhs.start);
  }
  if (n <= p) {
    throw new CellError(
      `Cannot fit "${ctx.name}": ${n} ${n === 1 ? "row" : "rows"} for ${p} parameters ${
        quotedList(model.parameters)
      }: a fit needs more rows than parameters`,
      ["model"],
    );
  }
  const linear = isLinearIn(model.rhs, model.parameters);
  const weightsText = spec.weights ?? spec.knownSigma;
  const leastSquares = solveOrExplain(problem, table, linear);
  // A robust loss: IRLS from the least-squares fit (_robust.ts), its sandwich covariance.
  const robust = spec.loss === undefined
    ? null
    : robustSolve(problem, leastSquares, linear, spec.loss, spec.tuning);
  const solution = robust?.solution ?? leastSquares;
  for (const w of model.warnings) ctx.warn(w.message);
  const units = unitsOf(ctx.name, model, table);
  for (const w of units.warnings) ctx.warn(w.message);
  if (linear) warnUnused(spec, ctx);
  const squares = fitStatistics(problem, solution, {
    confidence: ctx.settings.confidence,
    weighting: weighted.weighting,
    countVariance: spec.countVariance !== false,
  }, ctx.warn);
  refuseCensoredPredictors(problem, table);
  const flags = censoringFlags(problem, table, model.responseColumn, spec.censoredBy);
  if (flags === null && spec.substitute !== undefined) {
    ctx.warn(
      `Fit "${ctx.name}": substitute is set but no row of ${model.responseColumn} lies below a detection limit, so nothing was substituted`,
    );
  }
  if (flags !== null) checkCensoredFit(spec, ctx, model, weighted.weighting, robust !== null);
  const censored = flags === null
    ? null
    : censoredFit(problem, leastSquares, flags.below, squares, {
      substitute: spec.substitute ?? null,
      from: flags.from,
      countVariance: spec.countVariance !== false,
      solve: (pr) => solveOrExplain(pr, table, linear),
      statistics: (pr, sol) =>
        fitStatistics(pr, sol, {
          confidence: ctx.settings.confidence,
          weighting: weighted.weighting,
          countVariance: spec.countVariance !== false,
        }, () => {}),
    });
  if (censored !== null) sayCensoring(ctx, model.parameters, censored.record, problem.n);
  const statistics = censored !== null
    ? censored.statistics
    : robust === null
    ? squares
    : robustStatistics(squares, robust.record, solution.estimates);
  const fitted = censored?.solution ?? solution;
  const intervals = censored !== null
    ? fitIntervals(
      { ...spec, intervals: ["wald"], bootstrap: undefined },
      problem,
      fitted,
      statistics,
      linear,
      waldOnly(ctx),
    )
    : robust === null
    ? fitIntervals(spec, problem, solution, statistics, linear, ctx)
    : fitIntervals(spec, problem, solution, statistics, linear, waldOnly(ctx));
  if (intervals.bootstrap !== undefined && intervals.bootstrap.failed > 0) {
    const b = intervals.bootstrap;
    ctx.warn(
      `Fit "${ctx.name}": ${b.failed} of ${
        b.failed + b.b
      } bootstrap refits did not converge and are left out; the bootstrap limits rest on the other ${b.b}`,
    );
  }
  return {
    type: "Fit",
    method: fitted.method,
    on: spec.on,
    model,
    responseText: model.text.slice(model.response.start, model.response.end),
    weighted: weighted.weighting !== "none",
    weighting: weighted.weighting,
    weights: problem.weights ?? null,
    ...(weightsText === undefined ? {} : { weightsText }),
    parameters: model.parameters,
    units,
    estimates: fitted.estimates,
    unscaledCovariance: fitted.unscaledCovariance,
    statistics,
    columns: problem.columns,
    y: problem.y,
    fitted: fitted.fitted,
    residuals: fitted.residuals,
    rows: problem.rows,
    ...(problem.rowsMissing ? { rowsMissing: problem.rowsMissing } : {}),
    design: fitted.design,
    ...(fitted.designQR ? { designQR: fitted.designQR } : {}),
    offset: fitted.offset,
    hasIntercept: fitted.hasIntercept,
    conditionNumber: fitted.conditionNumber,
    converged: fitted.converged,
    iterations: fitted.iterations,
    ...(fitted.atBound ? { atBound: fitted.atBound } : {}),
    intervals,
    ...(robust === null ? {} : { robust: robust.record }),
    ...(censored === null ? {} : { censoring: censored.record, below: flags!.below }),
    ...(intervals.bootstrap === undefined ? {} : {
      bootstrap: {
        replicates: intervals.bootstrap.replicates,
        b: intervals.bootstrap.b,
        resample: intervals.bootstrap.resample,
        seed: intervals.bootstrap.seed,
      },
    }),
  };
}

type InEngineTable = Table & { database: TableInEngine };

/**
 * A linear fit on a table kept in its database: sums computed there
 * (_in_engine.ts), no per-row values in the result.
 */
async function runFitInEngine(spec: FitSpec, ctx: RunContext, table: InEngineTable): Promise<Fit> {
  if (spec.loss !== undefined) {
    throw new CellError(
      `Cannot fit "${ctx.name}" with loss ${spec.loss} in the database: table "${spec.on}" keeps its ${table.database.rowsInEngine} rows there, and a robust fit reweights every row at each iteration; narrow the query to at most 1,000,000 rows`,
      ["loss"],
    );
  }
  const problem = buildProblem(ctx.name, spec, table, ctx.warn);
  const { model } = problem;
  if (model.parameters.length === 0) {
    throw new CellError(`Cannot fit "${ctx.name}": the model has no parameters to estimate`, [
      "model",
    ], model.rhs.start);
  }
  if (!isLinearIn(model.rhs, model.parameters)) {
    throw new CellError(
      `Cannot fit "${ctx.name}" in the database: the model is not linear in its parameters, and table "${spec.on}" keeps its ${table.database.rowsInEngine} rows there; a nonlinear fit needs the rows in memory: narrow the query to at most 1,000,000 rows`,
      ["model"],
    );
  }
  if (spec.knownSigma !== undefined) {
    throw new CellError(
      `Cannot fit "${ctx.name}" in the database with known standard deviations: table "${spec.on}" keeps its rows there, and the χ² tests of known_sigma need each row's fitted value; give relative weights (weights: 1/(${spec.knownSigma})^2) or narrow the query to at most 1,000,000 rows`,
      ["known_sigma"],
    );
  }
  const weights = spec.weights === undefined
    ? null
    : { expr: parseAgainst(spec.weights, table, "weights"), text: spec.weights };
  const { solution, n, record, statistics } = await solveInEngine(problem, table, ctx, {
    weights,
    countVariance: spec.countVariance !== false,
  });
  for (const w of model.warnings) ctx.warn(w.message);
  const units = unitsOf(ctx.name, model, table);
  for (const w of units.warnings) ctx.warn(w.message);
  warnUnused(spec, ctx);
  if (record.note !== null) ctx.warn(`Fit "${ctx.name}": ${record.note}`);
  return {
    type: "Fit",
    method: "linear",
    on: spec.on,
    model,
    responseText: model.text.slice(model.response.start, model.response.end),
    weighted: weights !== null,
    weighting: weights === null ? "none" : "relative",
    weights: null,
    parameters: model.parameters,
    units,
    estimates: solution.estimates,
    unscaledCovariance: solution.unscaledCovariance,
    statistics,
    columns: problem.columns,
    y: problem.y,
    fitted: solution.fitted,
    residuals: solution.residuals,
    rows: problem.rows,
    design: solution.design,
    offset: null,
    hasIntercept: solution.hasIntercept,
    conditionNumber: solution.conditionNumber,
    converged: true,
    iterations: 0,
    inEngine: record,
    keptIn: `it was fitted in the database, and its ${
      n.toLocaleString("en-US")
    } rows and residuals stay there`,
  };
}

/** Refusals for a censored response: weights, known σ, a robust loss, a decreasing transform, non-Wald intervals. */
function checkCensoredFit(
  spec: FitSpec,
  ctx: RunContext,
  model: FitProblem["model"],
  weighting: string,
  robust: boolean,
): void {
  const refuse = (what: string, path: (string | number)[]) => {
    throw new CellError(
      `Cannot fit "${ctx.name}" with rows below a detection limit ${what}`,
      path,
    );
  };
  if (weighting !== "none") {
    refuse(
      "and weights: the censored-normal likelihood here has one σ for every row",
      [spec.weights !== undefined ? "weights" : "known_sigma"],
    );
  }
  if (robust) refuse("and a robust loss: choose one of the two", ["loss"]);
  const response = model.text.slice(model.response.start, model.response.end).replace(/\s+/g, "");
  const column = model.responseColumn;
  if (![column, `log(${column})`, `log10(${column})`, `sqrt(${column})`].includes(response)) {
    refuse(
      `through the response ${response}: a limit stays a limit only under an increasing transform (the column itself, log, log10 or sqrt)`,
      ["model"],
    );
  }
  if ((spec.intervals ?? []).some((m) => m !== "wald") || spec.bootstrap !== undefined) {
    refuse(
      "and profile or bootstrap intervals: they refit by least squares; its intervals are Wald's, from the observed information",
      [spec.bootstrap !== undefined ? "bootstrap" : "intervals"],
    );
  }
}

/** The censored fit said on the cell: how, and (with `substitute`) what ML gives instead. */
function sayCensoring(
  ctx: RunContext,
  parameters: readonly string[],
  r: CensoringRecord,
  n: number,
): void {
  if (r.method === "maximum likelihood") {
    ctx.warn(
      `Fit "${ctx.name}": ${r.rows_below} of ${n} rows lie below their detection limit (${r.flags_from}); fitted by maximum likelihood with those rows entering through the normal distribution function, so R² and the F test do not apply${
        r.converged ? "" : "; the likelihood's maximum was not reached within the iteration limit"
      }`,
    );
    return;
  }
  const sub = r.substitutions.find((x) => Math.abs(x.fraction - r.substitute!) < 1e-12);
  const ml = parameters.map((name, j) => `${name} ${Number(r.ml_estimates[j].toPrecision(4))}`)
    .join(", ");
  const worst = sub === undefined ? null : Math.max(
    ...sub.shift.map((v) => (v === null ? 0 : Math.abs(v))),
  );
  ctx.warn(
    `Fit "${ctx.name}": the ${r.rows_below} rows below their detection limit were given ${r.substitute}·L (substitute) and fitted as if measured: such substitution biases estimates and understates their uncertainty; maximum likelihood (leave substitute out) gives ${ml}${
      worst === null
        ? ""
        : `, up to ${Number(worst.toPrecision(2))} standard errors from the substituted fit`
    }`,
  );
}

/**
 * A robust fit's context for its intervals: Wald only (the cell's own
 * profile or bootstrap are refused at parse, _robust_parse.ts); a document
 * default naming them is set aside with a warning.
 */
function waldOnly(ctx: RunContext): RunContext {
  const asked = (ctx.settings.intervals ?? []).filter((m) => m !== "wald");
  if (asked.length > 0) {
    ctx.warn(
      `Fit "${ctx.name}" gives only Wald intervals (from its sandwich covariance), not the document's ${
        asked.join(" and ")
      }: both refit by least squares, which a robust fit is not`,
    );
  }
  return { ...ctx, settings: { ...ctx.settings, intervals: ["wald"] } };
}

/** Start values and ranges mean nothing to a model linear in its parameters. */
function warnUnused(spec: FitSpec, ctx: RunContext): void {
  if (Object.keys(spec.start).length > 0) {
    ctx.warn(`Start values of "${ctx.name}" are not used: the model is linear in its parameters`);
  }
  if (spec.within !== undefined) {
    ctx.warn(
      `Ranges ("within") of "${ctx.name}" are not used: the model is linear in its parameters`,
    );
  }
}

function tableInput(spec: FitSpec, ctx: RunContext): Table {
  const t = ctx.inputs[spec.on];
  if (t === undefined || t.type !== "Table") {
    throw new CellError(`Cannot fit "${ctx.name}": cell "${spec.on}" gives no table`, ["on"]);
  }
  return t as Table;
}

function solveOrExplain(problem: FitProblem, table: Table, linear: boolean): FitSolution {
  try {
    return linear ? solveLinear(problem) : solveNonlinear(problem);
  } catch (e) {
    if (e instanceof CellError) throw misspeltColumn(problem, table) ?? e;
    throw e;
  }
}

/** The error for a parameter that looks like a misspelt column, if there is one. */
function misspeltColumn(problem: FitProblem, table: Table): CellError | undefined {
  const { model } = problem;
  const names = table.columns.map((c) => c.name);
  // Only names of three or more characters, as for the expression language's
  // typo warnings: a one- or two-letter parameter is one edit from every short
  // column, and replacing a real solver error by a guess would mislead.
  for (const p of model.parameters) {
    if (p.length < 3) continue;
    const near = nearest(p, names, 1);
    if (near === undefined) continue;
    return new CellError(
      `Cannot fit "${problem.name}": unknown column "${p}", taken as a parameter: did you mean "${near}"?`,
      ["model"],
      identifierOffset(model.rhs, p),
    );
  }
  return undefined;
}

/** The units of the model's parameters and response from the table's column units. */
function unitsOf(name: string, model: FitProblem["model"], table: Table): ModelUnits {
  // The response's column first, so a parameter's unit leads with the response's symbols.
  const unitOf = new Map(table.columns.map((c) => [c.name, c.unit] as const));
  const units = new Map(
    [model.responseColumn, ...model.columns].map((c) => [c, unitOf.get(c) ?? null] as const),
  );
  const u = modelUnits(model, units);
  for (const w of u.warnings) w.message = `${w.message} (fit "${name}")`;
  return u;
}
