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
 *               w = cw and plumb_k = 1 on the rows used (nothing missing, every
 *               value finite, cw > 0), NULL elsewhere, so sums skip the others
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

function grouped(f: FitSql): { lead: string; group: string } {
  return f.partitionBy === null
    ? { lead: "", group: "" }
    : { lead: "plumb_part, ", group: " GROUP BY plumb_part" };
}

/** The values layer: every derived column, no filter. */
function valuesLayer(f: FitSql): string {
  const missing = f.columns.map((c) => {
    const x = `CAST(${sqlName(c)} AS ${D})`;
    // NaN sorts above +∞ in both engines; `x = 'NaN'` would keep postgres_fdw from
    // sending the aggregate to the shards (PostgreSQL 15, measured), `x > '∞'` does not.
    return `${x} IS NULL OR ${x} > ${INF}`;
  });
  const cols = [
    `CASE WHEN ${missing.join(" OR ")} THEN 1 ELSE 0 END AS plumb_m`,
    ...missing.map((m, i) => `CASE WHEN ${m} THEN 1 ELSE 0 END AS plumb_m${i}`),
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

/** Every value present and finite (the weight checked apart). */
function present(f: FitSql): string {
  return ["plumb_m = 0", ...valueNames(f).map(finite)].join(" AND ");
}

/**
 * Rows where `given` holds and `test` does not (NULL counts as not): CASE, not
 * `NOT coalesce(test, false)`, which postgres_fdw 15 does not send to a shard.
 */
function failing(given: string, test: string): string {
  return `sum(CASE WHEN ${given} AND ${test} THEN 0 WHEN ${given} THEN 1 ELSE 0 END)`;
}

/** A row the fit uses: present, finite and of positive finite weight. */
function used(f: FitSql): string {
  return `${present(f)} AND cw > ${sqlNumber(0)} AND ${finite("cw")}`;
}

/**
 * Pass 1: counts, Σw, Σw·c and max|c| of the used rows, one scan.
 *
 * Columns: [plumb_part,] plumb_rows, plumb_missing, plumb_missing_0… (per raw column),
 * b0… (not finite: terms, target, response), bw, zw,
 * n, sw, s0…, max_0…, slw (Σ ln w).
 */
export function pass1(f: FitSql): string {
  const S = sumOf(f), { lead, group } = grouped(f);
  const ok = used(f);
  const when = (c: string, v: string) => `CASE WHEN ${c} THEN ${v} END`;
  const count = (c: string) => `sum(CASE WHEN ${c} THEN 1 ELSE 0 END)`;
  const names = valueNames(f);
  const cols = [
    "count(*) AS plumb_rows",
    "sum(plumb_m) AS plumb_missing",
    ...f.columns.map((_, i) => `sum(plumb_m${i}) AS plumb_missing_${i}`),
    ...names.map((c, i) => `${failing("plumb_m = 0", finite(c))} AS b${i}`),
    `${failing(present(f), `cw >= ${sqlNumber(0)} AND ${finite("cw")}`)} AS bw`,
    `${count(`${present(f)} AND cw = ${sqlNumber(0)}`)} AS zw`,
    `${count(ok)} AS n`,
    `${S(when(ok, "cw"))} AS sw`,
    ...names.map((c, i) => `${S(when(ok, `cw * ${c}`))} AS s${i}`),
    ...names.map((c, i) => `max(${when(ok, `abs(${c})`)}) AS max_${i}`),
    `${S(when(ok, "ln(cw)"))} AS slw`,
  ];
  return `SELECT ${lead}${cols.join(", ")} FROM ${valuesLayer(f)}${group}`;
}

/** Pass 1's means (m̃, null: not centred) and power-of-two exponents, per value column. */
export interface Centring {
  means: number[] | null;
  /** z = (c − m̃)·2^−exponent. */
  exponents: number[];
}

/** The centred, scaled layer (plumb_z): z0…, zy, c0…, cy, w [, co] [, plumb_part]. */
export function centredLayer(f: FitSql, c: Centring, filtered = false): string {
  const z = valueNames(f).map((name, i) => {
    const centred = c.means === null ? name : `(${name} - ${sqlNumber(c.means[i])})`;
    const zname = i < f.terms.length ? `z${i}` : i === f.terms.length ? "zy" : "zr";
    return `(${centred} * ${sqlNumber(2 ** -c.exponents[i])}) AS ${zname}`;
  });
  const extra = [
    ...f.terms.map((_, j) => `c${j}`),
    "cy",
    // Aggregate passes keep every row and select by w and plumb_k (NULL off the rows used):
    // a WHERE of one condition a column makes PostgreSQL estimate a few rows per partition
    // and aggregate on the coordinator, not on the shards (measured, PostgreSQL 15).
    `CASE WHEN ${used(f)} THEN cw END AS w`,
    `CASE WHEN ${used(f)} THEN 1 END AS plumb_k`,
    ...(f.order === null ? [] : ["co"]),
    ...(f.partitionBy === null ? [] : ["plumb_part"]),
  ];
  const where = filtered ? ` WHERE ${used(f)}` : "";
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
  const products = (w: string) => {
    const out: string[] = [];
    for (let a = 0; a < z.length; a++) {
      for (let b = a; b < z.length; b++) out.push(S(`${w}${z[a]} * ${z[b]}`));
    }
    return out;
  };
  const cols = [
    ...products("w * ").map((s, i) => `${s} AS p${i}`),
    ...z.map((n, i) => `${S(`w * ${n}`)} AS f${i}`),
    ...(f.response === null ? [] : [`${S("w * zr * zr")} AS rr`, `${S("w * zr")} AS rf`]),
    ...(f.weight === null ? [] : [
      ...products("plumb_k * ").map((s, i) => `${s} AS u${i}`),
      ...z.map((n, i) => `${S(`plumb_k * ${n}`)} AS g${i}`),
      "count(plumb_k) AS n",
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
 */
export function pass3(f: FitSql, c: Centring, r: ResidualSql): string {
  const S = sumOf(f), { lead, group } = grouped(f);
  const inner = [
    `${r.residual} AS e`,
    `${r.leverage} AS h`,
    `${r.original} AS eo`,
    "w",
    "plumb_k",
    ...f.terms.map((_, j) => `z${j}`),
    ...(f.partitionBy === null ? [] : ["plumb_part"]),
  ];
  const bf = `(w * e * e - ${sqlNumber(r.shift)})`;
  const cols = [
    `${S("w * e * e")} AS rss`,
    `${S("plumb_k * e")} AS se`,
    `${S("w * e")} AS swe`,
    `${S(bf)} AS bf`,
    `${S(`${bf} * ${bf}`)} AS bff`,
    ...f.terms.map((_, j) => `${S(`z${j} * ${bf}`)} AS bz${j}`),
    "max(h) AS max_h",
    `sum(CASE WHEN h > ${sqlNumber(r.limits[0])} THEN 1 ELSE 0 END) AS h2`,
    `sum(CASE WHEN h > ${sqlNumber(r.limits[1])} THEN 1 ELSE 0 END) AS h3`,
    `${S("h")} AS hs`,
    ...r.coordinates.map((x, k) => `${S(`w * ${x} * eo`)} AS x${k}`),
  ];
  return `SELECT ${lead}${cols.join(", ")} FROM (SELECT ${inner.join(", ")} FROM ${
    centredLayer(f, c)
  }) AS plumb_r${group}`;
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
