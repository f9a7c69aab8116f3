/**
 * A linear fit whose sums a database engine computes: the rows never leave
 * it, only a few dozen numbers a pass come back (DESIGN.md §11, "in-engine
 * fit"; issue 18).
 *
 * ```
 *  model ─▶ terms ∂f/∂θⱼ, target y − f(x; 0), weight: SQL (kernel/expr/to_sql.ts)
 *  pass 1  counts, Σw, Σw·c, max|c|            ─▶ means m̃, power-of-two scales
 *  pass 2  Σw·z_a·z_b, z = (c − m̃)/2^e         ─▶ G, the Gram matrix of [c₀ | z | zy]
 *          κ of the centred design from the correlation matrix's eigenvalues
 *     κ ≤ KAPPA_LIMIT: R from Cholesky of G        (route "sums")
 *     κ > KAPPA_LIMIT: R from the rows streamed     (route "qr": EngineAccess.rfactor)
 *  solve   R₁₁γ = r (back substitution), (X̃ᵀWX̃)⁻¹ = R₁₁⁻¹R₁₁⁻ᵀ, back to the model's θ
 *  pass 3  with γ as literals: Σw·e², Σe, Σw·e, Breusch–Pagan's sums, hᵢ = wᵢ‖R₁₁⁻ᵀx̃ᵢ‖²
 *  pass 4  Durbin–Watson's Σ(e_t − e_{t−1})² in an order column's order
 *  pass 5  residual moments, studentized residuals, Cook's distance, PRESS  ┐ for a check
 *  pass 6  Durbin–Watson's null moments (with an order column)             ┘ (_in_engine_moments.ts)
 * ```
 *
 * Both routes end in the same triangular factor R of the augmented,
 * whitened design in centred coordinates x̃ = (c₀, z₁ … z_q), zy (Cholesky's
 * RᵀR = G is QR's RᵀR = X̃ᵀX̃), so everything after it is shared. Centring on
 * pass 1's means keeps the intercept out of the conditioning (Longley's
 * design: κ 4.9e9 raw, 110 centred and scaled); the Gram matrix keeps the
 * measured Σw·z (not assumed 0), so an inexact mean costs nothing.
 *
 * The accuracy rule. Solving from cross-products (the normal equations)
 * has a relative error bound that grows as κ²u, QR's as κu (plus a κ² term
 * weighted by the relative residual): Higham, *Accuracy and Stability of
 * Numerical Algorithms*, 2nd ed. (2002), §20.4, "the normal equations"
 * against §20.2's QR bounds. The route of sums is kept while κ²u ≤ 1e-12,
 * u = 2⁻⁵³: the 12 significant digits the project holds linear fits to on
 * NIST's certified sets (test/reference/strd_linear_test.ts, BAR = 12),
 * which also leaves three digits under the 1e-9 agreement with the
 * in-memory fit that issue 18 asks for. κ ≤ 94.9, then. Longley's centred
 * κ is 110 (κ²u = 1.4e-12): streamed.
 *
 * Statistics (standard errors, σ, R², criteria) come from the in-memory
 * fit's own `fitStatistics` and `likelihood`, fed the engine's sums.
 *
 * @module
 */
import type { Expr, Model } from "../../kernel/expr/mod.ts";
import type { SqlColumns, SqlDialect } from "../../kernel/expr/to_sql.ts";
import type { BreuschPagan, BreuschPaganVariant } from "../../kernel/stats/mod.ts";
import type {
  DatabaseRef,
  EngineAccess,
  EngineAnswer,
  EngineRows,
} from "../../kernel/engine/types.ts";
import { CellError } from "../../kernel/errors.ts";
import type { RunContext, Table, TableInEngine } from "../../kernel/contract/mod.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { type FitStatistics, fitStatistics } from "./_statistics.ts";
import { likelihood } from "./_likelihood.ts";
import { type Centring, pass1, pass2, pass3, pass4, rfactorSql } from "./_in_engine_sql.ts";
import { augmentedCholesky, breuschPaganOfSums } from "./_in_engine_algebra.ts";
import { type Design, design, Stop } from "./_in_engine_design.ts";
import { type InEngineJudged, judgeInEngine } from "./_in_engine_moments.ts";
import {
  at,
  centringOf,
  checkCounts,
  combined,
  type Counts,
  type Gram,
  gramOf,
  kappaOf,
  refined,
  type Solved,
  solveFromR,
} from "./_in_engine_solve.ts";

/** u = 2⁻⁵³, the unit roundoff of doubles. */
const U = 2 ** -53;

/** κ above which the rows are streamed through QR: κ²u = 1e-12 (see the module notes). */
export const KAPPA_LIMIT: number = Math.sqrt(1e-12 / U);

/** What an in-engine fit is asked. */
export interface InEngineRequest {
  /** The fit cell's name, for messages. */
  name: string;
  /** The model, linear in its parameters (`isLinearIn`), parsed against the query's columns. */
  model: Model;
  /** The user's SELECT, as written. */
  query: string;
  /** The query's columns and their types. */
  columns: SqlColumns;
  /** Relative weights (`weights:`), or null. */
  weights?: { expr: Expr; text: string } | null;
  /** A column whose order is the rows' sequence, for Durbin–Watson; null: not computed. */
  order?: string | null;
  /** The column the engine partitions the rows by (sums grouped by it), or null. */
  partitionBy?: string | null;
  /** Confidence level of the intervals (the document's `confidence`). */
  confidence: number;
  /** Whether the criteria count the error variance (the fit's `count_variance`). */
  countVariance: boolean;
  /** Breusch–Pagan's form (default Koenker's). */
  varianceTest?: BreuschPaganVariant;
  /** Records a warning on the cell. */
  warn: (message: string) => void;
  /** Reports progress (0–1) with a phrase. */
  progress?: (fraction: number, what: string) => void;
}

/** Where a number was computed: by the database, by Plumb from its sums, or from rows streamed to Plumb. */
export type ComputedWhere = "engine" | "plumb" | "streamed";

/** An in-engine fit's result. */
export interface InEngineFit {
  parameters: string[];
  /** Estimates in the order of `model.parameters`. */
  estimates: Float64Array;
  /** The refinement step's largest change of an estimate, relative to it. */
  refinement: number;
  /** (XᵀWX)⁻¹, p×p column-major. */
  unscaledCovariance: Float64Array;
  /** The in-memory fit's statistics from these numbers: se, t, p, intervals, σ, R², log L, AIC… */
  statistics: FitStatistics;
  /** Rows used. */
  n: number;
  /** Rows of the query. */
  rowsRead: number;
  /** Rows left out: a used column missing (NULL or NaN), or weight 0. */
  rowsLeftOut: { missing: number; zeroWeight: number };
  hasIntercept: boolean;
  /** κ of the centred (with an intercept), unit-column design: √(λmax/λmin) of its correlation matrix. */
  kappa: number;
  /** "sums": Cholesky of the cross-products; "qr": the rows streamed through QR. */
  route: "sums" | "qr";
  /** A sentence for the cell when the rows were streamed, else null. */
  note: string | null;
  rss: number;
  /** TSS of R² (centred with an intercept). */
  tss: number;
  /** Σeᵢ and Σwᵢeᵢ (0 to rounding with an intercept). */
  sumResiduals: number;
  sumWeightedResiduals: number;
  /** Durbin–Watson's d of √w·e in the order column's order; null without one. */
  durbinWatson: number | null;
  breuschPagan: BreuschPagan | null;
  /** Leverage hᵢ summarised; `sum` equals p (a check). */
  leverage: { max: number; over2p: number; over3p: number; sum: number };
  computed:
    & Record<
      | "counts"
      | "sums"
      | "cross_products"
      | "solve"
      | "refinement"
      | "rss"
      | "residual_sums"
      | "leverage"
      | "breusch_pagan"
      | "durbin_watson"
      | "criteria",
      ComputedWhere | "not computed"
    >
    & // What a check reads (_in_engine_moments.ts): always set by fitInEngine.
    Partial<
      Record<
        "residual_moments" | "influence" | "collinearity" | "durbin_watson_null",
        ComputedWhere | "not computed"
      >
    >;
  /** What a check reads: residual moments, influence, VIF, σmax/σmin, Durbin–Watson's null law. */
  judged: InEngineJudged;
  /** Each statement's name, milliseconds (the engine's) and text. */
  passes: { name: string; ms: number; sql: string }[];
}

/**
 * Why there is no fit: "translate" (an expression has no SQL: fit in memory instead),
 * "engine" (the engine refused or failed), "data" (the rows do not allow the fit).
 */
export type InEngineOutcome =
  | { ok: true; fit: InEngineFit }
  | { ok: false; cannot: "translate" | "engine" | "data"; why: string };

/**
 * Fits a linear model to a query's rows inside the database.
 *
 * @param req The model, query, columns, options and callbacks.
 * @param engine Database access (`RunContext.engine`, or a test double).
 * @param db The database.
 * @returns The fit, or why there is none (never throws for bad data or a failing engine).
 */
export async function fitInEngine(
  req: InEngineRequest,
  engine: EngineAccess,
  db: DatabaseRef,
): Promise<InEngineOutcome> {
  try {
    return { ok: true, fit: await run(req, engine, db) };
  } catch (e) {
    if (e instanceof Stop) return { ok: false, cannot: e.cannot, why: e.message };
    throw e;
  }
}

async function ask(
  engine: EngineAccess,
  db: DatabaseRef,
  passes: InEngineFit["passes"],
  name: string,
  sql: string,
): Promise<Map<string, number>> {
  const a: EngineAnswer<EngineRows> = await engine.rows(db, sql, 100_000);
  passes.push({ name, ms: a.ms, sql });
  if (!a.ok) throw new Stop("engine", a.message);
  return combined(a.value);
}

async function run(
  req: InEngineRequest,
  engine: EngineAccess,
  db: DatabaseRef,
): Promise<InEngineFit> {
  const dialect: SqlDialect = db.engine;
  const d = design(req, dialect);
  const passes: InEngineFit["passes"] = [];
  const say = req.progress ?? (() => {});
  say(0.05, "counts and sums in the database");
  const one = await ask(engine, db, passes, "pass 1: counts and sums", pass1(d.sql));
  const counts = checkCounts(req, d, one);
  const centring = centringOf(d, one, counts.sw);
  say(0.3, "cross-products in the database");
  const two = await ask(engine, db, passes, "pass 2: cross-products", pass2(d.sql, centring));
  const gram = gramOf(d, two, counts.sw, centring);
  const kappa = kappaOf(req, d, gram);
  let r = kappa <= KAPPA_LIMIT ? augmentedCholesky(gram.g, gram.k) : null;
  const route = r === null ? "qr" : "sums";
  let note: string | null = null;
  if (r === null) {
    note = `condition number ${
      kappa.toPrecision(2)
    }: sums of cross-products would lose accuracy (about κ² × 1.1e-16 = ${
      (kappa * kappa * U).toPrecision(2)
    }), so rows were streamed through QR`;
    say(0.45, "rows through QR");
    r = await streamed(engine, db, passes, d, centring, gram.k);
  }
  const solved = solveFromR(req, d, centring, r, gram.k, kappa);
  say(0.7, "residuals in the database");
  const three = await ask(
    engine,
    db,
    passes,
    "pass 3: residual sums",
    pass3(d.sql, centring, {
      residual: solved.residualSql,
      original: solved.originalSql,
      coordinates: solved.coordinates,
      leverage: solved.leverageSql,
      shift: solved.rho2 / counts.n,
      limits: [2 * d.p / counts.n, 3 * d.p / counts.n],
    }),
  );
  let dwNumerator: number | null = null;
  if (d.sql.order !== null) {
    say(0.85, "Durbin–Watson in the database");
    const four = await ask(
      engine,
      db,
      passes,
      "pass 4: Durbin–Watson",
      pass4(d.sql, centring, solved.residualSql),
    );
    dwNumerator = at(four, "dw");
  }
  say(0.9, "residual moments and influence in the database");
  const rssZ = at(three, "rss");
  const judged = await judgeInEngine({
    parameters: req.model.parameters,
    d,
    centring,
    gram,
    r,
    solved,
    n: counts.n,
    rssZ,
    sumZ: at(three, "se"),
    durbinWatson: dwNumerator === null || !(rssZ > 0) ? null : dwNumerator / rssZ,
    ask: (name, sql) => ask(engine, db, passes, name, sql),
  });
  return finish(req, d, {
    judged,
    counts,
    centring,
    gram,
    kappa,
    route,
    note,
    solved,
    three,
    dwNumerator,
    passes,
  });
}

/** R of the augmented design from the rows streamed through QR (EngineAccess.rfactor). */
async function streamed(
  engine: EngineAccess,
  db: DatabaseRef,
  passes: InEngineFit["passes"],
  d: Design,
  c: Centring,
  k: number,
): Promise<Float64Array> {
  const sql = rfactorSql(d.sql, c, d.constantAt >= 0 ? d.constant : null);
  const a = await engine.rfactor(db, sql);
  passes.push({ name: "rows streamed through QR", ms: a.ms, sql });
  if (!a.ok) throw new Stop("engine", a.message);
  if (a.value.k !== k) {
    throw new Stop("engine", `The R factor came back with ${a.value.k} columns, not ${k}`);
  }
  return a.value.r;
}

/** Everything the passes gave, for {@link finish}. */
interface Gathered {
  counts: Counts;
  centring: Centring;
  gram: Gram;
  kappa: number;
  route: "sums" | "qr";
  note: string | null;
  solved: Solved;
  three: Map<string, number>;
  dwNumerator: number | null;
  passes: InEngineFit["passes"];
  judged: InEngineJudged;
}

function finish(req: InEngineRequest, d: Design, g: Gathered): InEngineFit {
  const { counts, centring, gram, solved, three } = g;
  const q = d.varying.length, n = counts.n;
  const sy = 2 ** centring.exponents[q];
  const rssZ = at(three, "rss");
  const rss = rssZ * sy * sy;
  const hasIntercept = d.constantAt >= 0;
  const weighted = d.sql.weight !== null;
  const xtwe = Float64Array.from(solved.coordinates, (_, k) => at(three, `x${k}`));
  const { estimates, step } = refined(solved, xtwe);
  const statistics = statisticsOf(req, d, {
    n,
    estimates,
    unscaled: solved.unscaled,
    rss,
    tss: gram.tss,
    hasIntercept,
    kappa: g.kappa,
    slw: weighted ? counts.slw : null,
  });
  const breuschPagan = breuschPaganOf(req, d, gram, three, n, rssZ);
  const streamedRoute = g.route === "qr";
  return {
    parameters: [...req.model.parameters],
    estimates,
    refinement: step,
    unscaledCovariance: solved.unscaled,
    statistics,
    n,
    rowsRead: counts.rows,
    rowsLeftOut: { missing: counts.missing, zeroWeight: counts.zeroWeight },
    hasIntercept,
    kappa: g.kappa,
    route: g.route,
    note: g.note,
    rss,
    tss: gram.tss,
    sumResiduals: at(three, "se") * sy,
    sumWeightedResiduals: at(three, "swe") * sy,
    durbinWatson: g.dwNumerator === null || !(rssZ > 0) ? null : g.dwNumerator / rssZ,
    breuschPagan,
    leverage: {
      max: at(three, "max_h"),
      over2p: at(three, "h2"),
      over3p: at(three, "h3"),
      sum: at(three, "hs"),
    },
    computed: {
      counts: "engine",
      sums: "engine",
      cross_products: "engine",
      solve: streamedRoute ? "streamed" : "plumb",
      refinement: "engine",
      rss: "engine",
      residual_sums: "engine",
      leverage: "engine",
      breusch_pagan: "engine",
      durbin_watson: g.dwNumerator === null ? "not computed" : "engine",
      criteria: "plumb",
      residual_moments: "engine",
      influence: "engine",
      collinearity: "plumb",
      durbin_watson_null: g.judged.durbin_watson_test === null ? "not computed" : "engine",
    },
    passes: g.passes,
    judged: g.judged,
  };
}

/** Breusch–Pagan from pass 2's unweighted sums and pass 3's sums of f = w·e² − shift. */
function breuschPaganOf(
  req: InEngineRequest,
  d: Design,
  gram: Gram,
  three: Map<string, number>,
  n: number,
  rssZ: number,
): BreuschPagan | null {
  const q = d.varying.length;
  const { cross, first } = gram.plain;
  const rows = Number.isNaN(gram.plain.n) ? n : gram.plain.n;
  const centred = cross.map((v, i) => v - first[Math.floor(i / q)] * first[i % q] / rows);
  const bf = at(three, "bf"), bff = at(three, "bff");
  const g = Float64Array.from({ length: q }, (_, j) => at(three, `bz${j}`) - first[j] * bf / rows);
  return breuschPaganOfSums({
    n,
    cross: centred,
    g,
    tss: bff - bf * bf / n,
    sumF: rssZ,
    variant: req.varianceTest ?? "koenker",
  });
}

/**
 * The in-memory fit's statistics (`fitStatistics`, `likelihood`) from the engine's numbers: a
 * problem and a solution without rows, the TSS given (so no row is read).
 */
function statisticsOf(
  req: InEngineRequest,
  d: Design,
  s: {
    n: number;
    estimates: Float64Array;
    unscaled: Float64Array;
    rss: number;
    tss: number;
    hasIntercept: boolean;
    kappa: number;
    slw: number | null;
  },
): FitStatistics {
  const empty = new Float64Array(0);
  const problem: FitProblem = {
    name: req.name,
    model: req.model,
    n: s.n,
    columns: [],
    y: empty,
    rows: new Int32Array(0),
    start: {},
    weights: null,
  };
  const solution: FitSolution = {
    method: "linear",
    estimates: s.estimates,
    unscaledCovariance: s.unscaled,
    fitted: empty,
    residuals: empty,
    rss: s.rss,
    hasIntercept: s.hasIntercept,
    conditionNumber: s.kappa,
    converged: true,
    iterations: 0,
    design: [],
    offset: null,
    tss: s.tss,
  };
  const weighting = s.slw === null ? "none" : "relative";
  const stats = fitStatistics(problem, solution, {
    confidence: req.confidence,
    weighting,
    countVariance: req.countVariance,
  }, req.warn);
  if (s.slw === null) return stats;
  // Relative weights add ½Σ ln wᵢ to log L; `likelihood` sums it from the weights, so it is
  // given weights whose logarithms add up to Σ ln wᵢ (its warnings were said above).
  const l = likelihood(
    { name: req.name, n: s.n, p: d.p, rss: s.rss, weights: logStandIn(s.slw), weighting },
    req.countVariance,
    () => {},
  );
  return { ...stats, ...l };
}

/** Weights whose natural logarithms add up to `sum` (each within exp's range). */
function logStandIn(sum: number): Float64Array {
  const m = Math.max(1, Math.ceil(Math.abs(sum) / 600));
  return new Float64Array(m).fill(Math.exp(sum / m));
}

// ---------------------------------------------------------------------------------------------
// The fit kind's entry (cells/fit/run.ts): a table kept in its engine.

/** Where each number of an in-engine fit came from (the fit's `inEngine`, RUN-JSON `in_engine_detail`). */
export interface InEngineRecord {
  engine: "duckdb" | "postgres";
  route: "sums" | "qr";
  kappa: number;
  /** Rows of the query left out for a missing value in a column the model uses. */
  rows_left_out: number;
  partition_by: string | null;
  /** The column whose order Durbin–Watson followed (the table's `order_by`), or null. */
  order_by: string | null;
  /** The relative weights' expression as written, or null for an unweighted fit. */
  weights: string | null;
  computed: InEngineFit["computed"];
  /** The sentence said when the rows were streamed, else null. */
  note: string | null;
  sum_residuals: number;
  leverage: InEngineFit["leverage"];
  durbin_watson: number | null;
  breusch_pagan: BreuschPagan | null;
  // What a check reads (_in_engine_moments.ts); set by solveInEngine, optional for records
  // built elsewhere (a page copy, a test's hand-made record).
  /** Central moments of √w·e (divide by n) with skewness, kurtosis and Jarque–Bera (pass 5). */
  residual_moments?: InEngineJudged["residual_moments"];
  /** Studentized residuals, Cook's distance and PRESS summarised over the rows (pass 5). */
  influence?: InEngineJudged["influence"];
  /** VIF by parameter (none for the constant term; null: infinite), from the fit's sums. */
  vif?: InEngineJudged["vif"];
  vif_form?: InEngineJudged["vif_form"];
  /** σmax/σmin of √W·X unscaled, as a check gives it (`kappa` is of the centred, unit-column design). */
  condition_number?: number | null;
  /** Durbin–Watson's null mean, variance and p-values by the beta law (pass 6), or null. */
  durbin_watson_test?: InEngineJudged["durbin_watson_test"];
  /** Milliseconds of each statement, in order. */
  passes: { name: string; ms: number }[];
}

/**
 * Fits a linear model to a table kept in its database, for cells/fit/run.ts: the solution
 * (without per-row arrays), n, the record of where each number came from, and the
 * statistics (relative weights count in the likelihood as in memory).
 *
 * @param problem The problem built from the table (its model; no rows).
 * @param table The table, with `database` (its `orderBy` orders Durbin–Watson).
 * @param ctx The run context (its `engine`, settings, warnings, progress).
 * @param options Relative weights (`weights:`) or null; whether the criteria count σ².
 * @returns The solution, n, the record and the statistics.
 * @throws {CellError} When a term has no SQL, the engine fails, or the rows do not allow the fit.
 */
export async function solveInEngine(
  problem: FitProblem,
  table: Table & { database: TableInEngine },
  ctx: RunContext,
  options: {
    weights: { expr: Expr; text: string } | null;
    countVariance: boolean;
  } = { weights: null, countVariance: true },
): Promise<{
  solution: FitSolution;
  n: number;
  record: InEngineRecord;
  statistics: FitStatistics;
}> {
  const db = table.database;
  if (ctx.engine === undefined) {
    throw new CellError("This table's rows are in a database, which cannot be reached here", [
      "on",
    ]);
  }
  const got = await fitInEngine(
    {
      name: problem.name,
      model: problem.model,
      query: db.query,
      columns: new Map(table.columns.map((c) => [c.name, c.type])),
      partitionBy: db.partitionBy,
      order: db.orderBy ?? null,
      weights: options.weights,
      confidence: ctx.settings.confidence,
      countVariance: options.countVariance,
      warn: ctx.warn,
      progress: (f, what) => ctx.progress(f, what),
    },
    ctx.engine,
    db.ref,
  );
  if (!got.ok) throw new CellError(got.why, [got.cannot === "engine" ? "on" : "model"]);
  const f = got.fit;
  const solution: FitSolution = {
    method: "linear",
    estimates: f.estimates,
    unscaledCovariance: f.unscaledCovariance,
    fitted: new Float64Array(0),
    residuals: new Float64Array(0),
    rss: f.rss,
    hasIntercept: f.hasIntercept,
    conditionNumber: f.kappa,
    converged: true,
    iterations: 0,
    design: [],
    offset: null,
    tss: f.tss,
  };
  const record: InEngineRecord = {
    engine: db.ref.engine,
    route: f.route,
    kappa: f.kappa,
    rows_left_out: f.rowsLeftOut.missing + f.rowsLeftOut.zeroWeight,
    partition_by: db.partitionBy,
    order_by: db.orderBy ?? null,
    weights: options.weights?.text ?? null,
    computed: f.computed,
    note: f.note,
    sum_residuals: f.sumResiduals,
    leverage: f.leverage,
    durbin_watson: f.durbinWatson,
    breusch_pagan: f.breuschPagan,
    residual_moments: f.judged.residual_moments,
    influence: f.judged.influence,
    vif: f.judged.vif,
    vif_form: f.judged.vif_form,
    condition_number: f.judged.condition_number,
    durbin_watson_test: f.judged.durbin_watson_test,
    passes: f.passes.map(({ name, ms }) => ({ name, ms })),
  };
  return { solution, n: f.n, record, statistics: f.statistics };
}
