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
import { derivative, type Expr, format, type Model, simplify } from "../../kernel/expr/mod.ts";
import {
  type SqlColumns,
  type SqlDialect,
  sqlNumber as sqlLiteral,
  toSql,
} from "../../kernel/expr/to_sql.ts";
import { quotedList, singularValues } from "../../kernel/linalg/mod.ts";
import type { BreuschPagan, BreuschPaganVariant } from "../../kernel/stats/mod.ts";
import type {
  DatabaseRef,
  EngineAccess,
  EngineAnswer,
  EngineRows,
} from "../../kernel/engine/types.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { type FitStatistics, fitStatistics } from "./_statistics.ts";
import { likelihood } from "./_likelihood.ts";
import { countRows } from "./_offsets.ts";
import {
  type Centring,
  type FitSql,
  pass1,
  pass2,
  pass3,
  pass4,
  rfactorSql,
} from "./_in_engine_sql.ts";
import { breuschPaganOfSums, choleskyUpper, invertUpper } from "./_in_engine_algebra.ts";

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
  computed: Record<
    | "counts"
    | "sums"
    | "cross_products"
    | "solve"
    | "rss"
    | "residual_sums"
    | "leverage"
    | "breusch_pagan"
    | "durbin_watson"
    | "criteria",
    ComputedWhere | "not computed"
  >;
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

class Stop extends Error {
  constructor(readonly cannot: "translate" | "engine" | "data", why: string) {
    super(why);
  }
}

/** The linear model's parts: terms ∂f/∂θⱼ, the parameter-free part f(x; 0) (null when 0). */
export function linearParts(model: Model): { terms: Expr[]; offset: Expr | null } {
  const terms = model.parameters.map((p) => derivative(model.rhs, p));
  const params = new Set(model.parameters);
  const offset = simplify(zeroParameters(model.rhs, params));
  return { terms, offset: offset.op === "num" && offset.value === 0 ? null : offset };
}

function zeroParameters(e: Expr, params: ReadonlySet<string>): Expr {
  switch (e.op) {
    case "num":
      return e;
    case "id":
      return params.has(e.name) ? { op: "num", value: 0, start: e.start, end: e.end } : e;
    case "neg":
      return { ...e, arg: zeroParameters(e.arg, params) };
    case "call":
      return { ...e, args: e.args.map((a) => zeroParameters(a, params)) };
    default:
      return { ...e, left: zeroParameters(e.left, params), right: zeroParameters(e.right, params) };
  }
}

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

/** The design as SQL, with the constant term apart. */
interface Design {
  sql: FitSql;
  p: number;
  /** Index of the constant term among the parameters, or -1. */
  constantAt: number;
  /** Its value (1 for an intercept). */
  constant: number;
  /** Indexes of the varying terms among the parameters, in order. */
  varying: number[];
  /** Descriptions of the value columns (terms, target, response), for messages. */
  labels: string[];
}

function design(req: InEngineRequest, dialect: SqlDialect): Design {
  const { model, name } = req;
  const { terms, offset } = linearParts(model);
  const params = model.parameters;
  const constants = terms.map((t, j) => (t.op === "num" ? j : -1)).filter((j) => j >= 0);
  if (constants.length > 1) {
    throw new Stop(
      "data",
      `Cannot fit "${name}": the terms of ${
        quotedList(constants.map((j) => params[j]))
      } are all constant, so they are aliased`,
    );
  }
  const varying = params.map((_, j) => j).filter((j) => !constants.includes(j));
  const used = new Set<string>();
  const sql = (e: Expr, what: string) => {
    const s = toSql(e, req.columns, dialect);
    if (s.sql === null) {
      throw new Stop(
        "translate",
        `Cannot fit "${name}" in the database: ${what} has no SQL (${s.why})`,
      );
    }
    s.columns.forEach((c) => used.add(c));
    return s.sql;
  };
  const termSql = varying.map((j) => sql(terms[j], `term "${format(terms[j])}" of "${params[j]}"`));
  const written = model.text.slice(model.response.start, model.response.end);
  const response = sql(model.response, `response "${written}"`);
  const target = offset === null
    ? response
    : `(${response} - ${sql(offset, `the part of the model free of parameters`)})`;
  const weight = req.weights ? sql(req.weights.expr, `weights "${req.weights.text}"`) : null;
  for (const c of [req.order, req.partitionBy]) {
    if (c != null && !req.columns.has(c)) {
      throw new Stop(
        "translate",
        `Cannot fit "${name}" in the database: "${c}" is not a column of the query`,
      );
    }
  }
  return {
    sql: {
      dialect,
      query: req.query,
      columns: [...used],
      terms: termSql,
      target,
      response: offset === null ? null : response,
      weight,
      order: req.order ?? null,
      partitionBy: req.partitionBy ?? null,
    },
    p: params.length,
    constantAt: constants.length === 1 ? constants[0] : -1,
    constant: constants.length === 1 ? (terms[constants[0]] as { value: number }).value : 0,
    varying,
    labels: [
      ...varying.map((j) => `term "${format(terms[j])}" of parameter "${params[j]}"`),
      `response "${written}"${offset === null ? "" : " less the part free of parameters"}`,
      ...(offset === null ? [] : [`response "${written}"`]),
    ],
  };
}

/** One answer's columns by name, the partitions' rows combined (summed; `max…` columns: max). */
function combined(got: EngineRows): Map<string, number> {
  const out = new Map<string, number>();
  for (const c of got.columns) {
    if (c.name === "plumb_part") continue;
    if (c.type !== "number") {
      throw new Stop(
        "engine",
        `The database returned "${c.name}" as text, where a sum was expected`,
      );
    }
    const isMax = c.name.startsWith("m") || c.name === "hmax";
    let v = isMax ? -Infinity : 0;
    for (const x of c.values) {
      if (Number.isNaN(x)) continue; // a partition without used rows: NULL
      v = isMax ? Math.max(v, x) : v + x;
    }
    out.set(c.name, v);
  }
  return out;
}

/** The value of a column of a combined answer. */
function at(m: Map<string, number>, name: string): number {
  const v = m.get(name);
  if (v === undefined) throw new Error(`in-engine fit: no column ${name} in the answer`);
  return v;
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
  let r = kappa <= KAPPA_LIMIT ? choleskyUpper(gram.g, gram.k) : null;
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
  return finish(req, d, {
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

/** Pass 1's counts, checked. */
interface Counts {
  rows: number;
  missing: number;
  zeroWeight: number;
  n: number;
  sw: number;
  /** Σ ln wᵢ. */
  slw: number;
}

function checkCounts(req: InEngineRequest, d: Design, one: Map<string, number>): Counts {
  const { name } = req;
  d.labels.forEach((label, i) => {
    const bad = at(one, `b${i}`);
    if (bad > 0) {
      throw new Stop(
        "data",
        `Cannot fit "${name}": ${label} is not finite in ${countRows(bad)} of the query`,
      );
    }
  });
  const bw = at(one, "bw");
  if (bw > 0) {
    throw new Stop(
      "data",
      `Cannot fit "${name}": weights "${req.weights?.text}" are negative or not finite in ${
        countRows(bw)
      } of the query: a weight must be 0 or more`,
    );
  }
  const c: Counts = {
    rows: at(one, "plumb_rows"),
    missing: at(one, "plumb_missing"),
    zeroWeight: at(one, "zw"),
    n: at(one, "n"),
    sw: at(one, "sw"),
    slw: at(one, "slw"),
  };
  if (c.missing > 0) {
    req.warn(
      `${countRows(c.missing)} of the query left out for missing values in ${
        quotedList(d.sql.columns)
      }`,
    );
  }
  if (c.zeroWeight > 0) {
    req.warn(`${countRows(c.zeroWeight)} left out for weight 0 in "weights"`);
  }
  if (c.n <= d.p) {
    throw new Stop(
      "data",
      `Cannot fit "${name}": the query gives ${countRows(c.n)} to fit ${d.p} ${
        d.p === 1 ? "parameter" : "parameters"
      }; it needs more rows than parameters`,
    );
  }
  return c;
}

/** The value columns: the varying terms, the target, and the response when apart. */
function valueCount(d: Design): number {
  return d.varying.length + 1 + (d.sql.response === null ? 0 : 1);
}

/** Means (with a constant term) and power-of-two scales from pass 1. */
function centringOf(d: Design, one: Map<string, number>, sw: number): Centring {
  const k = valueCount(d);
  const means = d.constantAt >= 0
    ? Array.from({ length: k }, (_, i) => at(one, `s${i}`) / sw)
    : null;
  const exponents = Array.from({ length: k }, (_, i) => {
    const m = at(one, `m${i}`);
    return m > 0 && Number.isFinite(m)
      ? Math.max(-1000, Math.min(1000, Math.ceil(Math.log2(m))))
      : 0;
  });
  return { means, exponents };
}

/** The Gram matrix of [c₀ | z | zy] (k×k row-major), TSS, and the unweighted sums for Breusch–Pagan. */
interface Gram {
  g: Float64Array;
  k: number;
  /** Coordinate of the first varying term (1 with a constant term, else 0). */
  off: number;
  tss: number;
  /** Unweighted: Σz_a·z_b (q×q), Σz_a, rows. */
  plain: { cross: Float64Array; first: Float64Array; n: number };
}

function gramOf(d: Design, two: Map<string, number>, sw: number, c: Centring): Gram {
  const q = d.varying.length, k = d.p + 1, off = d.constantAt >= 0 ? 1 : 0;
  const g = new Float64Array(k * k);
  const put = (a: number, b: number, v: number) => (g[a * k + b] = g[b * k + a] = v);
  const plainCross = new Float64Array(q * q);
  const weighted = d.sql.weight !== null;
  let i = 0;
  for (let a = 0; a <= q; a++) {
    for (let b = a; b <= q; b++, i++) {
      put(off + a, off + b, at(two, `p${i}`));
      if (a < q && b < q) {
        const u = weighted ? at(two, `u${i}`) : at(two, `p${i}`);
        plainCross[a * q + b] = plainCross[b * q + a] = u;
      }
    }
  }
  if (off === 1) {
    put(0, 0, d.constant * d.constant * sw);
    for (let a = 0; a <= q; a++) put(0, 1 + a, d.constant * at(two, `f${a}`));
  }
  const first = Float64Array.from({ length: q }, (_, a) => at(two, weighted ? `g${a}` : `f${a}`));
  // TSS of the response (zy, or zr when the model has a part free of parameters), unscaled.
  const apart = d.sql.response !== null;
  const ss = apart ? at(two, "rr") : g[k * k - 1];
  const s1 = apart ? at(two, "rf") : at(two, `f${q}`);
  const e = c.exponents[apart ? q + 1 : q];
  const tss = (off === 1 ? ss - s1 * s1 / sw : ss) * 2 ** (2 * e);
  return { g, k, off, tss, plain: { cross: plainCross, first, n: weighted ? at(two, "n") : NaN } };
}

/** κ of the varying terms' correlation matrix (centred on the constant term when there is one). */
function kappaOf(req: InEngineRequest, d: Design, gram: Gram): number {
  const q = d.varying.length, { g, k, off } = gram;
  if (q === 0) return 1;
  const c = new Float64Array(q * q);
  for (let a = 0; a < q; a++) {
    for (let b = 0; b < q; b++) {
      const v = g[(off + a) * k + off + b];
      c[a * q + b] = off === 1 ? v - g[off + a] * g[off + b] / g[0] : v;
    }
  }
  for (let a = 0; a < q; a++) {
    if (!(c[a * q + a] > 0)) {
      const j = d.varying[a];
      throw new Stop(
        "data",
        `Cannot fit "${req.name}": ${d.labels[a]} is ${
          off === 1 ? "constant" : "0"
        } on every row used, so "${req.model.parameters[j]}" cannot be told apart${
          off === 1 ? ` from "${req.model.parameters[d.constantAt]}"` : ""
        }`,
      );
    }
  }
  const corr = c.map((v, i) =>
    v / Math.sqrt(c[Math.floor(i / q) * (q + 1)] * c[(i % q) * (q + 1)])
  );
  const ev = singularValues(corr, q, q); // symmetric positive semidefinite: the eigenvalues
  return ev[q - 1] > 0 ? Math.sqrt(ev[0] / ev[q - 1]) : Infinity;
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

/** The solve from R: estimates and (XᵀWX)⁻¹ in the model's parameters, and pass 3's SQL. */
interface Solved {
  estimates: Float64Array;
  /** p×p column-major. */
  unscaled: Float64Array;
  /** ρ², the normal equations' RSS in zy units (pass 3 computes the RSS itself). */
  rho2: number;
  residualSql: string;
  leverageSql: string;
}

function solveFromR(
  req: InEngineRequest,
  d: Design,
  c: Centring,
  r: Float64Array,
  k: number,
  kappa: number,
): Solved {
  const P = k - 1, off = d.constantAt >= 0 ? 1 : 0;
  let big = 0;
  for (let i = 0; i < P; i++) big = Math.max(big, Math.abs(r[i * k + i]));
  for (let i = 0; i < P; i++) {
    // A pivot 1e-13 below the largest: the terms are dependent to working accuracy.
    if (!(Math.abs(r[i * k + i]) > 1e-13 * big)) {
      throw new Stop(
        "data",
        `Cannot fit "${req.name}": the terms are linearly dependent on the rows used (condition number ${
          kappa.toPrecision(2)
        }): ${quotedList(req.model.parameters)} cannot all be estimated`,
      );
    }
  }
  const v = invertUpper(r, P, k); // R₁₁⁻¹
  const gamma = new Float64Array(P);
  for (let i = 0; i < P; i++) {
    let s = 0;
    for (let j = i; j < P; j++) s += v[i * P + j] * r[j * k + P];
    gamma[i] = s;
  }
  // Coordinates x̃ = (c₀, z₀ … z_{q−1}) as SQL; the fitted value and hᵢ = wᵢ‖R₁₁⁻ᵀx̃ᵢ‖².
  const coord = (i: number) => (off === 1 && i === 0 ? null : `z${i - off}`);
  const fitted = Array.from(gamma, (gi, i) => {
    const x = coord(i);
    return x === null ? sqlLiteral(gi * d.constant) : `${sqlLiteral(gi)} * ${x}`;
  });
  const vk = Array.from({ length: P }, (_, col) => {
    const parts: string[] = [];
    for (let l = 0; l <= col; l++) {
      const x = coord(l);
      parts.push(
        x === null
          ? sqlLiteral(v[l * P + col] * d.constant)
          : `${sqlLiteral(v[l * P + col])} * ${x}`,
      );
    }
    return `(${parts.join(" + ")})`;
  });
  const { estimates, unscaled } = toModel(d, c, gamma, v, P);
  return {
    estimates,
    unscaled,
    rho2: r[P * k + P] * r[P * k + P],
    residualSql: `(zy - (${fitted.join(" + ")}))`,
    leverageSql: `w * (${vk.map((s) => `${s} * ${s}`).join(" + ")})`,
  };
}

/**
 * From centred, scaled coordinates back to the model's parameters. With x̃ = M·x
 * (x = (c₀, t₁ … t_q) the model's terms; x̃ = (c₀, (t_j − m̃_j)/2^e_j)) and the target
 * scaled by s_y = 2^e_y: θ = s_y·Mᵀγ (+ m̃_y/c₀ on the constant term) and
 * (XᵀWX)⁻¹ = Mᵀ(X̃ᵀWX̃)⁻¹M.
 */
function toModel(
  d: Design,
  c: Centring,
  gamma: Float64Array,
  v: Float64Array,
  P: number,
): { estimates: Float64Array; unscaled: Float64Array } {
  const p = d.p, q = d.varying.length, off = d.constantAt >= 0 ? 1 : 0;
  const mean = (i: number) => (c.means === null ? 0 : c.means[i]);
  const sy = 2 ** c.exponents[q];
  // Mᵀ, p×P row-major: rows the model's parameters, columns the coordinates.
  const mt = new Float64Array(p * P);
  d.varying.forEach((j, i) => (mt[j * P + off + i] = 2 ** -c.exponents[i]));
  if (off === 1) {
    const jc = d.constantAt;
    mt[jc * P] = 1;
    for (let i = 0; i < q; i++) mt[jc * P + 1 + i] = -mean(i) * 2 ** -c.exponents[i] / d.constant;
  }
  const estimates = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let s = 0;
    for (let a = 0; a < P; a++) s += mt[j * P + a] * gamma[a];
    estimates[j] = sy * s;
  }
  if (off === 1) estimates[d.constantAt] += mean(q) / d.constant;
  // (X̃ᵀWX̃)⁻¹ = R₁₁⁻¹R₁₁⁻ᵀ, then Mᵀ·it·M.
  const inner = new Float64Array(P * P);
  for (let a = 0; a < P; a++) {
    for (let b = a; b < P; b++) {
      let s = 0;
      for (let t = b; t < P; t++) s += v[a * P + t] * v[b * P + t];
      inner[a * P + b] = inner[b * P + a] = s;
    }
  }
  const left = new Float64Array(p * P); // Mᵀ·inner
  for (let j = 0; j < p; j++) {
    for (let b = 0; b < P; b++) {
      let s = 0;
      for (let a = 0; a < P; a++) s += mt[j * P + a] * inner[a * P + b];
      left[j * P + b] = s;
    }
  }
  const unscaled = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      let s = 0;
      for (let b = 0; b < P; b++) s += left[i * P + b] * mt[j * P + b];
      unscaled[j * p + i] = s;
    }
  }
  return { estimates, unscaled };
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
}

function finish(req: InEngineRequest, d: Design, g: Gathered): InEngineFit {
  const { counts, centring, gram, solved, three } = g;
  const q = d.varying.length, n = counts.n;
  const sy = 2 ** centring.exponents[q];
  const rssZ = at(three, "rss");
  const rss = rssZ * sy * sy;
  const hasIntercept = d.constantAt >= 0;
  const weighted = d.sql.weight !== null;
  const statistics = statisticsOf(req, d, {
    n,
    estimates: solved.estimates,
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
    estimates: solved.estimates,
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
      max: at(three, "hmax"),
      over2p: at(three, "h2"),
      over3p: at(three, "h3"),
      sum: at(three, "hs"),
    },
    computed: {
      counts: "engine",
      sums: "engine",
      cross_products: "engine",
      solve: streamedRoute ? "streamed" : "plumb",
      rss: "engine",
      residual_sums: "engine",
      leverage: "engine",
      breusch_pagan: "engine",
      durbin_watson: g.dwNumerator === null ? "not computed" : "engine",
      criteria: "plumb",
    },
    passes: g.passes,
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
