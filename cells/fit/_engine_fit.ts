/**
 * A linear fit whose sums the database computes: the rows never leave it,
 * only a (p+1)×(p+1) matrix comes back.
 *
 * ```
 *  model ─▶ design terms gⱼ = ∂rhs/∂θⱼ, response y − offset, as SQL (kernel/expr/to_sql.ts)
 *  pass 1: n and the column sums (per partition when the table names one) ─▶ means
 *  pass 2: centred cross-products Σ(a − ā)(b − b̄) ─▶ scaled to correlations ─▶ κ
 *     κ small: Cholesky solve of the centred normal equations
 *     κ large: rows streamed through QR in the engine's process (ctx.engine.rfactor)
 *  pass 3: RSS = Σ(y − ŷ)² with the estimates as literals (not from the normal equations)
 * ```
 *
 * The cross-product route loses accuracy as κ² (Higham, Accuracy and
 * Stability of Numerical Algorithms, 2nd ed., §20.4: the normal equations'
 * forward error bound grows with κ₂(A)², QR's with κ₂(A)); past
 * {@link KAPPA_LIMIT} the rows are factored by QR instead.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { derivative, type Expr, simplify } from "../../kernel/expr/mod.ts";
import { sqlName, sqlNumber, toSql } from "../../kernel/expr/to_sql.ts";
import {
  cholesky,
  choleskyInverse,
  choleskySolve,
  symmetricEigenvalues,
} from "../../kernel/linalg/small_symmetric.ts";
import type { EngineAccess, EngineAnswer } from "../../kernel/engine/types.ts";
import type { RunContext, Table, TableInEngine } from "../../kernel/contract/mod.ts";
import type { FitProblem, FitSolution } from "./problem.ts";

/**
 * κ of the scaled, centred design past which the sums of cross-products
 * are not trusted: κ² × 2.2e-16 ≈ 2e-10 at 1,000, so estimates keep about
 * nine digits by the bound above (common practice to keep a margin; no
 * single source for the number).
 */
export const KAPPA_LIMIT = 1000;

/** Where each statistic of an in-engine fit was computed (RUN-JSON `in_engine_detail`). */
export interface InEngineRecord {
  engine: "duckdb" | "postgres";
  /** "sums": centred cross-products; "qr": rows streamed through QR in the engine's process. */
  route: "sums" | "qr";
  /** Condition number of the scaled, centred design (from the correlation matrix's eigenvalues). */
  kappa: number;
  /** Rows of the query left out for a missing value in a column the model uses. */
  rows_left_out: number;
  /** Per partition sums, when the table names the column the database partitions by. */
  partition_by: string | null;
  computed: { sums: string; rss: string; residuals: string };
  /** A sentence when the QR route was taken. */
  note: string | null;
}

const zero = (e: Expr): Expr => ({ op: "num", value: 0, start: e.start, end: e.end });

/** The expression with every parameter set to 0 (a linear model's offset). */
function withoutParameters(e: Expr, params: ReadonlySet<string>): Expr {
  switch (e.op) {
    case "num":
      return e;
    case "id":
      return params.has(e.name) ? zero(e) : e;
    case "neg":
      return { ...e, arg: withoutParameters(e.arg, params) };
    case "call":
      return { ...e, args: e.args.map((a) => withoutParameters(a, params)) };
    default:
      return {
        ...e,
        left: withoutParameters(e.left, params),
        right: withoutParameters(e.right, params),
      };
  }
}

function answer<T>(a: EngineAnswer<T>, ctx: RunContext): T {
  if (a.ok) return a.value;
  if (a.why === "cancelled") ctx.progress(1);
  throw new CellError(a.message, ["on"]);
}

/** Sums of a one-row (or per-partition) answer, column by column, in order. */
function sumsOf(got: { columns: { type: string; values: unknown }[] }, skip: number): number[] {
  return got.columns.slice(skip).map((c) => {
    if (c.type !== "number") throw new CellError("The database returned a sum as text", ["on"]);
    let s = 0;
    for (const v of c.values as Float64Array) s += Number.isNaN(v) ? 0 : v;
    return s;
  });
}

/**
 * Fits a linear model to a table kept in its database.
 *
 * @param problem The problem as built from the table (its model; no rows).
 * @param table The table (with `database`).
 * @param ctx The run context (needs `engine`).
 * @returns The solution (no per-row arrays) and the record of where each number came from.
 * @throws {CellError} When a term has no SQL, the engine fails, or too few rows.
 */
export async function solveInEngine(
  problem: FitProblem,
  table: Table & { database: TableInEngine },
  ctx: RunContext,
): Promise<{ solution: FitSolution; n: number; record: InEngineRecord }> {
  const engine: EngineAccess | undefined = ctx.engine;
  if (engine === undefined) {
    throw new CellError("This table's rows are in a database, which cannot be reached here", [
      "on",
    ]);
  }
  const { model } = problem;
  const db = table.database;
  const columns = new Map(table.columns.map((c) => [c.name, c.type] as const));
  const params = model.parameters;
  const p = params.length;
  const sql = (e: Expr, what: string) => {
    const s = toSql(simplify(e), columns, db.ref.engine);
    if (s.sql === null) {
      throw new CellError(
        `Cannot fit in the database: ${what} has no SQL form (${s.why}); compute it in the query instead`,
        ["model"],
      );
    }
    return s.sql;
  };
  // Design terms, the offset, and the response less the offset.
  const terms = params.map((name) => derivative(model.rhs, name));
  const constant = terms.map((t) => (t.op === "num" ? t.value : null));
  const offset = simplify(withoutParameters(model.rhs, new Set(params)));
  const hasOffset = !(offset.op === "num" && offset.value === 0);
  const ySql = hasOffset
    ? `(${sql(model.response, "the response")} - ${sql(offset, "the model's constant part")})`
    : sql(model.response, "the response");
  const termSql = terms.map((t, j) => sql(t, `the term of ${params[j]}`));
  const part = db.partitionBy === null ? "" : `, ${sqlName(db.partitionBy)} AS plumb_part`;
  const cols = [ySql, ...termSql];
  const named = cols.map((s, i) => `${s} AS d${i}`).join(", ");
  const notNull = cols.map((_, i) => `d${i} IS NOT NULL`).join(" AND ");
  const source =
    `(SELECT ${named}${part} FROM (${db.query}) AS plumb_q) AS plumb_d WHERE ${notNull}`;
  const group = db.partitionBy === null ? "" : " GROUP BY plumb_part";
  const lead = db.partitionBy === null ? "" : "plumb_part, ";
  const skip = db.partitionBy === null ? 0 : 1;
  const sum = db.ref.engine === "duckdb" ? "fsum" : "sum";

  // Pass 1: n and sums.
  ctx.progress(0.05, "sums in the database");
  const k = p + 1;
  const pass1 = answer(
    await engine.rows(
      db.ref,
      `SELECT ${lead}count(*) AS n, ${
        cols.map((_, i) => `${sum}(d${i}) AS s${i}`).join(", ")
      } FROM ${source}${group}`,
      10_000,
    ),
    ctx,
  );
  const s1 = sumsOf(pass1, skip);
  const n = s1[0];
  if (n <= p) {
    throw new CellError(
      `Cannot fit: the query gives ${n} usable ${n === 1 ? "row" : "rows"} for ${p} parameters`,
      ["on"],
    );
  }
  const mean = s1.slice(1).map((s) => s / n);
  // Columns that vary: y and every non-constant term.
  const vary = [0, ...terms.map((_, j) => j + 1).filter((i) => constant[i - 1] === null)];
  const intercepts = constant.filter((c) => c !== null).length;

  // Pass 2: centred cross-products of the varying columns.
  ctx.progress(0.35, "cross-products in the database");
  const centred = (i: number) => `(d${i} - ${sqlNumber(mean[i])})`;
  const pairs: [number, number][] = [];
  for (let a = 0; a < vary.length; a++) {
    for (let b = a; b < vary.length; b++) pairs.push([vary[a], vary[b]]);
  }
  const pass2 = answer(
    await engine.rows(
      db.ref,
      `SELECT ${lead}${
        pairs.map(([a, b], i) => `${sum}(${centred(a)} * ${centred(b)}) AS c${i}`).join(", ")
      } FROM ${source}${group}`,
      10_000,
    ),
    ctx,
  );
  const s2 = sumsOf(pass2, skip);
  const vk = vary.length;
  const M = new Float64Array(vk * vk);
  pairs.forEach(([a, b], i) => {
    const ia = vary.indexOf(a), ib = vary.indexOf(b);
    M[ia * vk + ib] = M[ib * vk + ia] = s2[i];
  });
  const tss = M[0];
  // The slopes' system: rows/columns 1.. of M.
  const q = vk - 1;
  const Mxx = new Float64Array(q * q);
  const Mxy = new Float64Array(q);
  for (let i = 0; i < q; i++) {
    Mxy[i] = M[(i + 1) * vk];
    for (let j = 0; j < q; j++) Mxx[i * q + j] = M[(i + 1) * vk + j + 1];
  }
  const scale = Float64Array.from({ length: q }, (_, i) => Math.sqrt(Mxx[i * q + i]));
  const corr = new Float64Array(q * q);
  for (let i = 0; i < q; i++) {
    for (let j = 0; j < q; j++) corr[i * q + j] = Mxx[i * q + j] / (scale[i] * scale[j]);
  }
  const ev = q > 0 ? symmetricEigenvalues(corr, q) : new Float64Array([1]);
  const kappa = Math.sqrt(ev[ev.length - 1] / Math.max(ev[0], 0));
  const l = q > 0 ? cholesky(corr, q) : new Float64Array(0);
  const useSums = intercepts === 1 && Number.isFinite(kappa) && kappa <= KAPPA_LIMIT && l !== null;

  let estimates: Float64Array;
  let unscaled: Float64Array; // p×p, column-major
  let route: "sums" | "qr";
  let note: string | null = null;
  if (useSums) {
    route = "sums";
    const zs = choleskySolve(l!, q, Mxy.map((v, i) => v / scale[i]));
    const slopes = zs.map((z, i) => z / scale[i]);
    const invCorr = choleskyInverse(l!, q);
    const S = new Float64Array(q * q); // (Xc'Xc)⁻¹
    for (let i = 0; i < q; i++) {
      for (let j = 0; j < q; j++) S[i * q + j] = invCorr[i * q + j] / (scale[i] * scale[j]);
    }
    // Back to the model's parameters: slopes where terms vary, the constant term's from the means.
    const c0 = constant.findIndex((c) => c !== null);
    const cval = constant[c0]!;
    const varyingParams = params.map((_, j) => j).filter((j) => constant[j] === null);
    estimates = new Float64Array(p);
    let fitAtMeans = 0;
    varyingParams.forEach((j, i) => {
      estimates[j] = slopes[i];
      fitAtMeans += slopes[i] * mean[j + 1];
    });
    estimates[c0] = (mean[0] - fitAtMeans) / cval;
    // (XᵀX)⁻¹ of [c·1, X]: the slopes' block S; the constant's from n and the means.
    const m = varyingParams.map((j) => mean[j + 1]);
    const Sm = Float64Array.from({ length: q }, (_, i) => {
      let s = 0;
      for (let t = 0; t < q; t++) s += S[i * q + t] * m[t];
      return s;
    });
    let mSm = 0;
    for (let i = 0; i < q; i++) mSm += m[i] * Sm[i];
    unscaled = new Float64Array(p * p);
    const put = (r: number, c: number, v: number) => {
      unscaled[c * p + r] = v;
      unscaled[r * p + c] = v;
    };
    put(c0, c0, (1 / n + mSm) / (cval * cval));
    varyingParams.forEach((j, i) => {
      put(c0, j, -Sm[i] / cval);
      varyingParams.forEach((jj, ii) => put(j, jj, S[i * q + ii]));
    });
  } else {
    route = "qr";
    note = intercepts !== 1
      ? "the model has no single constant term, so its rows were streamed through QR in the database's process"
      : `condition number ${
        kappa.toPrecision(2)
      }: sums of cross-products would lose accuracy, so the rows were streamed through QR in the database's process`;
    ctx.progress(0.5, "rows through QR");
    const rf = answer(
      await engine.rfactor(
        db.ref,
        `SELECT ${
          termSql.map((s, j) => `${s} AS t${j}`).join(", ")
        }, ${ySql} AS y FROM (${db.query}) AS plumb_q`,
      ),
      ctx,
    );
    const { r } = rf;
    // R = [[R11, r12], [0, ρ]]: R11 θ = r12; (XᵀX)⁻¹ = R11⁻¹R11⁻ᵀ.
    const Rinv = new Float64Array(p * p); // row-major, upper
    for (let j = p - 1; j >= 0; j--) {
      Rinv[j * p + j] = 1 / r[j * k + j];
      for (let i = j - 1; i >= 0; i--) {
        let s = 0;
        for (let t = i + 1; t <= j; t++) s += r[i * k + t] * Rinv[t * p + j];
        Rinv[i * p + j] = -s / r[i * k + i];
      }
    }
    estimates = new Float64Array(p);
    for (let i = p - 1; i >= 0; i--) {
      let s = r[i * k + p];
      for (let t = i + 1; t < p; t++) s -= r[i * k + t] * estimates[t];
      estimates[i] = s / r[i * k + i];
    }
    unscaled = new Float64Array(p * p);
    for (let i = 0; i < p; i++) {
      for (let j = 0; j < p; j++) {
        let s = 0;
        for (let t = Math.max(i, j); t < p; t++) s += Rinv[i * p + t] * Rinv[j * p + t];
        unscaled[j * p + i] = s;
      }
    }
  }

  // Pass 3: the residual sum of squares with the estimates as literals.
  ctx.progress(0.8, "residuals in the database");
  const fittedSql = termSql.map((_, j) => `${sqlNumber(estimates[j])} * d${j + 1}`).join(" + ");
  const pass3 = answer(
    await engine.rows(
      db.ref,
      `SELECT ${lead}${sum}((d0 - (${fittedSql})) * (d0 - (${fittedSql}))) AS rss, ${sum}(d0 - (${fittedSql})) AS e FROM ${source}${group}`,
      10_000,
    ),
    ctx,
  );
  const [rss] = sumsOf(pass3, skip);
  const solution: FitSolution = {
    method: "linear",
    estimates,
    unscaledCovariance: unscaled,
    fitted: new Float64Array(0),
    residuals: new Float64Array(0),
    rss,
    hasIntercept: intercepts > 0,
    conditionNumber: kappa,
    converged: true,
    iterations: 0,
    design: [],
    offset: null,
    tss: intercepts > 0 ? tss : tss + n * mean[0] * mean[0],
  };
  return {
    solution,
    n,
    record: {
      engine: db.ref.engine,
      route,
      kappa,
      rows_left_out: db.rowsInEngine - n,
      partition_by: db.partitionBy,
      computed: {
        sums: "engine",
        rss: "engine",
        residuals: "not kept: the rows stay in the database",
      },
      note,
    },
  };
}
