/**
 * The design of an in-engine linear fit (cells/fit/_in_engine.ts) as SQL:
 * the model's terms ∂f/∂θⱼ (free of parameters for a linear model, as
 * solve_linear.ts builds its design), the constant term set apart, the
 * target y − f(x; 0), the weight; and the reason when something has no
 * faithful SQL (kernel/expr/to_sql.ts).
 *
 * @module
 */
import { derivative, type Expr, format, type Model, simplify } from "../../kernel/expr/mod.ts";
import { type SqlDialect, toSql } from "../../kernel/expr/to_sql.ts";
import { quotedList } from "../../kernel/linalg/mod.ts";
import type { FitSql } from "./_in_engine_sql.ts";
import type { InEngineRequest } from "./_in_engine.ts";

/** Why an in-engine fit stopped: "translate", "engine" or "data" (see `InEngineOutcome`). */
export class Stop extends Error {
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

/** The design as SQL, with the constant term apart. */
export interface Design {
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

export function design(req: InEngineRequest, dialect: SqlDialect): Design {
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
