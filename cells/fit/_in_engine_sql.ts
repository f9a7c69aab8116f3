/**
 * The statements of an in-engine linear fit (cells/fit/_in_engine.ts): three
 * layers of subqueries over the user's query, and one aggregate pass each.
 *
 * ```
 *  (<query>) AS plumb_q                                   the user's SELECT, untouched
 *  └ plumb_d: plumb_m (a used column missing), the varying terms c0…, the target cy
 *             (response less the model's parameter-free part), the weight cw,
 *             the order column co, the partition column plumb_part
 *    └ plumb_z: z_j = (c_j − m̃_j)·2^−e_j, zy likewise: centred on pass 1's means,
 *               scaled by a power of two (exact) so that no product overflows;
 *               only the rows used (one WHERE, evaluated once a row), w = cw
 *
 *  pass 1  counts (all, missing, not finite per column, weight refused or 0), Σw, Σw·c, max|c|
 *  pass 2  Σw·z_a·z_b over the varying terms and the target, Σw·z_a (and unweighted ones)
 *  pass 3  with the estimates as literals: Σw·e², Σe, Σw·e, Breusch–Pagan's sums, leverage
 *  pass 4  Σ(√w·e_t − √w·e_{t−1})² in the order column's order (LAG … OVER)
 * ```
 *
 * With a partition column every aggregate pass groups by it, so a sharded
 * PostgreSQL (postgres_fdw, partitionwise aggregation) computes each
 * partition's sums on its shard and Plumb adds them (test/engine/shards_test.ts
 * checks that shape is pushed). Sums are `fsum` in DuckDB (Kahan–Babuška
 * summation) and `sum` in PostgreSQL.
 *
 * PostgreSQL inlines the layers into every aggregate's argument and shares no
 * subexpression, so a test or a residual written once in a layer is evaluated
 * once per sum that reads it. The passes therefore choose rows by a WHERE,
 * turn repeated tests into boolean grouping keys (computed once a row, and
 * referred to wherever an aggregate repeats them whole), and read the costly
 * values (residual, leverage) in as few sums as the numbers allow.
 *
 * @module
 */
import { type SqlDialect, sqlName, sqlNumber } from "../../kernel/expr/to_sql.ts";

const D = "DOUBLE PRECISION";
const INF = `CAST('Infinity' AS ${D})`;

/** What the statements are built from (SQL texts already translated). */
export interface FitSql {
  dialect: SqlDialect;
  query: string;
  /** The raw columns the model and the weights read. */
  columns: string[];
  /** SQL of each varying term (the constant term, if any, is not a column). */
  terms: string[];
  /** SQL of the response less the parameter-free part. */
  target: string;
  /** SQL of the response itself when the model has a parameter-free part (for R²'s TSS). */
  response: string | null;
  /** SQL of the weight, or null. */
  weight: string | null;
  /** Column whose order Durbin–Watson follows, or null. */
  order: string | null;
  /** Column the engine partitions the rows by, or null. */
  partitionBy: string | null;
}

/** A value finite (not NULL, NaN or ±∞): NaN sorts above ∞ in both engines. */
const finite = (c: string) => `abs(${c}) < ${INF}`;

function sumOf(f: FitSql): (x: string) => string {
  return f.dialect === "duckdb" ? (x) => `fsum(${x})` : (x) => `sum(${x})`;
}

/** `x` times the weight `w`, or `x` alone when the fit has none (the weight is then 1). */
function weighted(f: FitSql, x: string, w = "cw"): string {
  return f.weight === null ? x : `${w} * ${x}`;
}

function grouped(f: FitSql): { lead: string; group: string } {
  return f.partitionBy === null
    ? { lead: "", group: "" }
    : { lead: "plumb_part, ", group: " GROUP BY plumb_part" };
}

/**
 * A test as a boolean that is never NULL, and a whole of its own: PostgreSQL flattens
 * `(a AND b) AND (c AND d)` into one AND, after which a grouping key `a AND b` no longer
 * appears in `CASE WHEN (a AND b) AND (c AND d)`, and a shard refuses the statement
 * postgres_fdw sends it ("must appear in the GROUP BY clause").
 */
export const flag = (test: string): string => `CASE WHEN ${test} THEN TRUE ELSE FALSE END`;

/**
 * The values layer: every derived column, no filter. plumb_p: every raw column present (not
 * NULL, not NaN: `x <= ∞` is NULL for NULL and false for NaN, one comparison a column and a
 * condition postgres_fdw sends to a shard); plumb_m0…: 1 where that column is missing.
 */
function valuesLayer(f: FitSql): string {
  const present = f.columns.map((c) => `CAST(${sqlName(c)} AS ${D}) <= ${INF}`);
  const cols = [
    `${present.length === 0 ? "TRUE" : flag(present.join(" AND "))} AS plumb_p`,
    ...present.map((p, i) => `CASE WHEN ${p} THEN 0 ELSE 1 END AS plumb_m${i}`),
    ...f.terms.map((t, j) => `${t} AS c${j}`),
    `${f.target} AS cy`,
    ...(f.response === null ? [] : [`${f.response} AS cr`]),
    `${f.weight ?? sqlNumber(1)} AS cw`,
    ...(f.order === null ? [] : [`${sqlName(f.order)} AS co`]),
    ...(f.partitionBy === null ? [] : [`${sqlName(f.partitionBy)} AS plumb_part`]),
  ];
  return `(SELECT ${cols.join(", ")} FROM (${f.query}) AS plumb_q) AS plumb_d`;
}

/** The names of the value columns: c0…, cy [, cr]. */
function valueNames(f: FitSql): string[] {
  return [...f.terms.map((_, j) => `c${j}`), "cy", ...(f.response === null ? [] : ["cr"])];
}

/**
 * Pass 1: counts, Σw, Σw·c and max|c| of the used rows, one scan, grouped by three tests of
 * the row, each computed once a row ([plumb_part,] plumb_p, plumb_f [, plumb_u]): every raw
 * column present; every value finite (terms, target, response; NULL is not finite); the
 * weight positive and finite. A row is used when all three hold, so the sums over the used
 * rows are plain sums over their group, with no test of their own (a test in each sum's
 * argument is evaluated once a sum: PostgreSQL shares no subexpression). A column is NULL on
 * the groups it does not count, which Plumb's adding of the answer's rows skips. The keys are
 * boolean because PostgreSQL estimates two groups for a boolean key, where it estimates a
 * group per ten rows for an integer computed from the columns, and then adds up the rows on
 * the coordinator rather than on the shards (measured, PostgreSQL 15).
 *
 * The sums of the groups not used are computed and dropped; a weight-0 row adds 0·c.
 *
 * Columns: [plumb_part,] plumb_rows, plumb_missing, plumb_missing_0… (per raw column),
 * b0… (not finite: terms, target, response), bw, zw, n, sw, s0…, max_0…, slw (Σ ln w).
 */
export function pass1(f: FitSql): string {
  const S = sumOf(f);
  const lead = f.partitionBy === null ? "" : "plumb_part, ";
  const names = valueNames(f);
  const usedKeys = f.weight === null ? "plumb_p AND plumb_f" : "plumb_p AND plumb_f AND plumb_u";
  const used = (x: string) => `CASE WHEN ${usedKeys} THEN ${x} END`;
  const missing = (x: string) => `CASE WHEN plumb_p THEN NULL ELSE ${x} END`;
  const present = (x: string) => `CASE WHEN plumb_p THEN ${x} END`;
  const allFinite = (x: string) => `CASE WHEN plumb_p AND plumb_f THEN ${x} END`;
  const notFinite = (c: string) => `sum(CASE WHEN ${finite(c)} THEN 0 ELSE 1 END)`;
  const zero = `CAST(${sqlNumber(0)} AS ${D})`;
  const cols = [
    "count(*) AS plumb_rows",
    `${missing("count(*)")} AS plumb_missing`,
    ...f.columns.map((_, i) => `${missing(`sum(plumb_m${i})`)} AS plumb_missing_${i}`),
    ...names.map((c, i) => `${present(notFinite(c))} AS b${i}`),
    `${
      f.weight === null
        ? zero
        : allFinite(`sum(CASE WHEN cw >= ${sqlNumber(0)} AND ${finite("cw")} THEN 0 ELSE 1 END)`)
    } AS bw`,
    `${
      f.weight === null ? zero : allFinite(`sum(CASE WHEN cw = ${sqlNumber(0)} THEN 1 ELSE 0 END)`)
    } AS zw`,
    `${used("count(*)")} AS n`,
    `${used(S("cw"))} AS sw`,
    ...names.map((c, i) => `${used(S(weighted(f, c)))} AS s${i}`),
    ...names.map((c, i) => `${used(`max(abs(${c}))`)} AS max_${i}`),
    // ln(w) of every row of the group, so guarded: ln(0) and ln of a negative stop PostgreSQL.
    `${
      f.weight === null ? zero : used(S(`ln(CASE WHEN cw > ${sqlNumber(0)} THEN cw END)`))
    } AS slw`,
  ];
  const keys = [
    "plumb_p",
    `${flag(names.map(finite).join(" AND "))} AS plumb_f`,
    ...(f.weight === null ? [] : [`${flag(`cw > ${sqlNumber(0)} AND cw < ${INF}`)} AS plumb_u`]),
  ];
  const keyNames = `plumb_p, plumb_f${f.weight === null ? "" : ", plumb_u"}`;
  return `SELECT ${lead}${cols.join(", ")} FROM (SELECT *, ${keys.slice(1).join(", ")} FROM ${
    valuesLayer(f)
  }) AS plumb_c GROUP BY ${lead}${keyNames}`;
}

/** Pass 1's means (m̃, null: not centred) and power-of-two exponents, per value column. */
export interface Centring {
  means: number[] | null;
  /** z = (c − m̃)·2^−exponent. */
  exponents: number[];
}

/**
 * The centred, scaled layer (plumb_z): z0…, zy [, zr], c0…, cy, w, plumb_k [, co]
 * [, plumb_part], over the rows the fit uses only: w is the weight, plumb_k is 1.
 *
 * The rows are chosen by a WHERE evaluated once a row, so that no sum over the layer repeats
 * the test (PostgreSQL inlines the layers into each aggregate's argument, with no common
 * subexpressions: a CASE in `w` was evaluated once per sum that reads w, and dominated the
 * passes' time on the shards). The test is short because pass 1 has checked the rest: once no
 * present row has a value that is not finite or a weight refused (checkCounts), a row is used
 * when every raw column is present and, with weights, its weight is positive. It is written
 * `(CASE WHEN … THEN 1 END) IS NOT NULL` so that PostgreSQL estimates it keeps nearly every
 * row whatever the columns (a chain of comparisons on expressions is estimated at a third a
 * comparison, and a partition estimated at a few rows is aggregated on the coordinator, not
 * on its shard: measured, PostgreSQL 15).
 *
 * @param f The fit's SQL.
 * @param c Pass 1's centring.
 * @param _filtered Kept for callers: the layer always holds the used rows only.
 */
export function centredLayer(f: FitSql, c: Centring, _filtered = true): string {
  const z = valueNames(f).map((name, i) => {
    const centred = c.means === null ? name : `(${name} - ${sqlNumber(c.means[i])})`;
    const zname = i < f.terms.length ? `z${i}` : i === f.terms.length ? "zy" : "zr";
    return `(${centred} * ${sqlNumber(2 ** -c.exponents[i])}) AS ${zname}`;
  });
  const extra = [
    ...f.terms.map((_, j) => `c${j}`),
    "cy",
    "cw AS w",
    "1 AS plumb_k",
    ...(f.order === null ? [] : ["co"]),
    ...(f.partitionBy === null ? [] : ["plumb_part"]),
  ];
  const used = f.weight === null ? "plumb_p" : `plumb_p AND cw > ${sqlNumber(0)}`;
  const where = ` WHERE (CASE WHEN ${used} THEN 1 END) IS NOT NULL`;
  return `(SELECT ${[...z, ...extra].join(", ")} FROM ${valuesLayer(f)}${where}) AS plumb_z`;
}

/** z names in pass order: the varying terms, then the target. */
export function zNames(f: FitSql): string[] {
  return [...f.terms.map((_, j) => `z${j}`), "zy"];
}

/**
 * Pass 2: Σw·z_a·z_b for a ≤ b (row-major upper triangle over z0…, zy), Σw·z_a, and for a
 * weighted fit the same unweighted (Breusch–Pagan's auxiliary regression is unweighted).
 *
 * Columns: [plumb_part,] p0… (weighted products), f0… (weighted first moments),
 * [rr, rf: Σw·zr², Σw·zr of the response itself, with a parameter-free part,]
 * then, weighted: u0… (products), g0… (first moments), n.
 */
export function pass2(f: FitSql, c: Centring): string {
  const S = sumOf(f), { lead, group } = grouped(f);
  const z = zNames(f);
  const W = (x: string) => weighted(f, x, "w");
  const products = (weigh: (x: string) => string) => {
    const out: string[] = [];
    for (let a = 0; a < z.length; a++) {
      for (let b = a; b < z.length; b++) out.push(S(weigh(`${z[a]} * ${z[b]}`)));
    }
    return out;
  };
  const cols = [
    ...products(W).map((s, i) => `${s} AS p${i}`),
    ...z.map((n, i) => `${S(W(n))} AS f${i}`),
    ...(f.response === null ? [] : [`${S(W("zr * zr"))} AS rr`, `${S(W("zr"))} AS rf`]),
    ...(f.weight === null ? [] : [
      ...products((x) => x).map((s, i) => `${s} AS u${i}`),
      ...z.map((n, i) => `${S(n)} AS g${i}`),
      "count(*) AS n",
    ]),
  ];
  return `SELECT ${lead}${cols.join(", ")} FROM ${centredLayer(f, c)}${group}`;
}

/** What pass 3 needs besides the layers: the residual and leverage as SQL of the z columns. */
export interface ResidualSql {
  /** e in z units: zy − fitted. */
  residual: string;
  /**
   * e in the target's units from the estimates in the model's own terms (c0…, cy, the
   * constant term a literal): what the refinement's X̃ᵀWe is summed from.
   */
  original: string;
  /** The coordinates x̃ as SQL (a literal for the constant term, z0… else). */
  coordinates: string[];
  /** hᵢ. */
  leverage: string;
  /** Breusch–Pagan's shift c (w·e² − c keeps the sums small): about RSS/n in z units. */
  shift: number;
  /** 2p/n and 3p/n. */
  limits: [number, number];
}

/**
 * Pass 3: residual sums, Breusch–Pagan's sums and the leverage summary.
 *
 * Columns: [plumb_part,] rss (Σw·e²), se (Σe), swe (Σw·e), bf (Σf), bff (Σf²),
 * bz0… (Σz_j·f), max_h, h2, h3, hs; f = w·e² − shift, all in z units; and the refinement's
 * x0… (Σw·x̃_k·e in the target's units, e from the estimates in the model's terms).
 *
 * PostgreSQL evaluates each sum's argument apart (no common subexpressions), so e and h are
 * read as few times as the sums allow: e² as `power(e, 2)`; Σf as Σw·e² − n·shift (the same
 * aggregate as rss, computed once); hᵢ > 2p/n as a grouping key, computed once a row and
 * referred to by h2 and h3 (h is compared with 3p/n only on the rows above 2p/n). Each
 * partition gives at most two rows (Plumb adds them).
 */
export function pass3(f: FitSql, c: Centring, r: ResidualSql): string {
  const S = sumOf(f), lead = f.partitionBy === null ? "" : "plumb_part, ";
  const inner = [
    `${r.residual} AS e`,
    `${r.leverage} AS h`,
    `${r.original} AS eo`,
    "w",
    ...f.terms.map((_, j) => `z${j}`),
    ...(f.partitionBy === null ? [] : ["plumb_part"]),
  ];
  const W = (x: string) => weighted(f, x, "w");
  const shift = sqlNumber(r.shift);
  const f2 = `(${W("power(e, 2)")} - ${shift})`;
  const over2 = flag(`h > ${sqlNumber(r.limits[0])}`);
  const cols = [
    `${S(W("power(e, 2)"))} AS rss`,
    `${S("e")} AS se`,
    `${S(W("e"))} AS swe`,
    `${S(W("power(e, 2)"))} - ${shift} * count(*) AS bf`,
    `${S(`power(${f2}, 2)`)} AS bff`,
    ...f.terms.map((_, j) => `${S(`z${j} * ${f2}`)} AS bz${j}`),
    "max(h) AS max_h",
    `sum(CASE WHEN ${over2} THEN 1 ELSE 0 END) AS h2`,
    `sum(CASE WHEN ${over2} THEN CASE WHEN h > ${
      sqlNumber(r.limits[1])
    } THEN 1 ELSE 0 END ELSE 0 END) AS h3`,
    `${S("h")} AS hs`,
    ...r.coordinates.map((x, k) => `${S(W(`${x} * eo`))} AS x${k}`),
  ];
  return `SELECT ${lead}${cols.join(", ")} FROM (SELECT ${inner.join(", ")} FROM ${
    centredLayer(f, c)
  }) AS plumb_r GROUP BY ${lead}${over2}`;
}

/**
 * Pass 4: Durbin–Watson's numerator Σ(√w·e_t − √w·e_{t−1})² in the order column's order
 * (the first row has no predecessor: its NULL difference is not summed). One column, dw.
 */
export function pass4(f: FitSql, c: Centring, residual: string): string {
  const S = sumOf(f);
  const e = `sqrt(w) * (${residual})`;
  return `SELECT ${
    S("(e - pe) * (e - pe)")
  } AS dw FROM (SELECT ${e} AS e, LAG(${e}) OVER (ORDER BY co) AS pe FROM ${
    centredLayer(f, c, true)
  }) AS plumb_l`;
}

/**
 * The rows for the R factor of the streamed route: √w·c₀ (the constant term, when there is
 * one), √w·z_j, √w·zy.
 */
export function rfactorSql(f: FitSql, c: Centring, constant: number | null): string {
  const cols = [
    ...(constant === null ? [] : [`sqrt(w) * ${sqlNumber(constant)} AS k`]),
    ...zNames(f).map((z) => `sqrt(w) * ${z} AS ${z}`),
  ];
  return `SELECT ${cols.join(", ")} FROM ${centredLayer(f, c, true)}`;
}
