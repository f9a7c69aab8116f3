/**
 * The invented `readings` rows of the sharded-engine suite and the engine
 * bench, one formula computed alike by PostgreSQL, DuckDB and Deno, so the
 * shards, a DuckDB file and an in-memory copy hold bit-identical rows.
 *
 * Row i (i = 1…n) takes eight 32-bit numbers hⱼ = H(kᵢⱼ), j = 0…7, from
 * the keys kᵢⱼ = (16·i + j + S) mod 2³², S = (seed · 0x9E3779B9) mod 2³²,
 * through a 32-bit integer hash (two multiply-xorshift rounds; the
 * constants are those of Wellons' "lowbias32" and of MurmurHash2, chosen
 * below 2³¹ so every product stays inside a signed 64-bit integer):
 *
 * ```
 *  H(v):  v ← v ⊕ (v ≫ 16);  v ← v·0x7FEB352D mod 2³²;
 *         v ← v ⊕ (v ≫ 15);  v ← v·0x5BD1E995 mod 2³²;  v ← v ⊕ (v ≫ 16)
 *
 *  xⱼ = aⱼ + hⱼ₋₁ / 2²⁸                 (j = 1…5, a = 0, 2, 4, 8, 16: xⱼ ∈ [aⱼ, aⱼ + 16))
 *  e  = (h₅ + h₆ + h₇ − 3·2³¹) / 2³²    (a sum of three uniforms: mean 0, sd 0.5)
 *  y  = b₀ + Σ bⱼ xⱼ + e                (b = 3, 1.5, −2, 0.75, 4, −0.25)
 * ```
 *
 * Why every engine gets the same bits: the hash is integer arithmetic
 * (64-bit integers in SQL, `Math.imul` in JavaScript), and every double is
 * a multiple of 2⁻³² below 2¹⁰ in magnitude, so each product, sum and
 * quotient above is exact in IEEE double (42 significant bits at most):
 * no rounding happens, whatever order an engine evaluates in (exact
 * arithmetic). Rows i ≤ ⌈n/2⌉ are partition 1, the rest partition 2.
 *
 * @module
 */
import { makeDuckdb } from "./_engine_testing.ts";

/** Intercept and slopes of y (invented). */
export const READINGS_B: readonly number[] = [3, 1.5, -2, 0.75, 4, -0.25];

/** The lower end aⱼ of each predictor's range [aⱼ, aⱼ + 16) (invented). */
const X_LOW = [0, 2, 4, 8, 16];

const M1 = 0x7feb352d, M2 = 0x5bd1e995, GOLDEN = 0x9e3779b9n;

/** S of the keys: (seed · 0x9E3779B9) mod 2³². */
function seedTerm(seed: number): number {
  return Number((BigInt(seed) * GOLDEN) & 0xffffffffn);
}

/** H of the formula, on an unsigned 32-bit integer. */
export function hash32(v: number): number {
  v = (v ^ (v >>> 16)) >>> 0;
  v = Math.imul(v, M1) >>> 0;
  v = (v ^ (v >>> 15)) >>> 0;
  v = Math.imul(v, M2) >>> 0;
  return (v ^ (v >>> 16)) >>> 0;
}

/** The last row of partition 1 for n rows. */
export function firstPartRows(rows: number): number {
  return Math.ceil(rows / 2);
}

/** The rows in memory, column by column. */
export interface ReadingsColumns {
  part: Int32Array;
  /** x1…x5. */
  x: Float64Array[];
  y: Float64Array;
}

/**
 * Rows 1…n computed in JavaScript.
 *
 * @param rows n.
 * @param seed The seed.
 * @returns The columns (row i at index i − 1).
 */
export function readingsInMemory(rows: number, seed: number): ReadingsColumns {
  const s = seedTerm(seed), half = firstPartRows(rows);
  const part = new Int32Array(rows), y = new Float64Array(rows);
  const x = X_LOW.map(() => new Float64Array(rows));
  const h = new Array<number>(8);
  for (let r = 0; r < rows; r++) {
    const i = r + 1;
    for (let j = 0; j < 8; j++) h[j] = hash32(((16 * i + j + s) % 2 ** 32) >>> 0);
    part[r] = i <= half ? 1 : 2;
    let yi = READINGS_B[0];
    for (let j = 0; j < 5; j++) {
      x[j][r] = X_LOW[j] + h[j] / 2 ** 28;
      yi += READINGS_B[j + 1] * x[j][r];
    }
    y[r] = yi + (h[5] + h[6] + h[7] - 3 * 2 ** 31) / 2 ** 32;
  }
  return { part, x, y };
}

/** The two SQL dialects the formula is written in. */
export type Dialect = "postgres" | "duckdb";

const xor = (d: Dialect, a: string, b: string) =>
  d === "postgres" ? `(${a} # ${b})` : `xor(${a}, ${b})`;

/**
 * One step of H on each of the eight key columns k0…k7, as a SELECT over
 * `inner`. PostgreSQL would fold nested subqueries into one expression that
 * repeats each column (2⁵ copies after five steps); OFFSET 0 keeps each
 * step a step.
 */
function hashStep(d: Dialect, step: number, inner: string): string {
  const col = (j: number) => {
    const k = `k${j}`;
    switch (step) {
      case 0:
      case 4:
        return xor(d, k, `(${k} >> 16)`);
      case 1:
        return `((${k} * ${M1}) & 4294967295)`;
      case 2:
        return xor(d, k, `(${k} >> 15)`);
      default:
        return `((${k} * ${M2}) & 4294967295)`;
    }
  };
  const cols = Array.from({ length: 8 }, (_, j) => `${col(j)} AS k${j}`).join(", ");
  const fence = d === "postgres" ? " OFFSET 0" : "";
  return `SELECT i, part, ${cols} FROM (${inner}${fence}) AS h${step}`;
}

/**
 * A SELECT giving rows lo…hi of the formula as (id, part, x1…x5, y).
 *
 * @param d The dialect.
 * @param range First and last row, and the rows in all (for the partition).
 * @param seed The seed.
 * @returns The statement.
 */
export function readingsSelect(
  d: Dialect,
  range: { lo: number; hi: number; rows: number },
  seed: number,
): string {
  const half = firstPartRows(range.rows), s = seedTerm(seed);
  const keys = Array.from({ length: 8 }, (_, j) => `((16 * i + ${j + s}) & 4294967295) AS k${j}`)
    .join(", ");
  let sql =
    `SELECT i, CAST(CASE WHEN i <= ${half} THEN 1 ELSE 2 END AS INTEGER) AS part, ${keys} ` +
    `FROM generate_series(CAST(${range.lo} AS BIGINT), CAST(${range.hi} AS BIGINT)) AS g(i)`;
  for (let step = 0; step < 5; step++) sql = hashStep(d, step, sql);
  const dbl = (e: string) => `CAST(${e} AS DOUBLE PRECISION)`;
  const x = X_LOW.map((a, j) => `${a} + ${dbl(`k${j}`)} / 268435456 AS x${j + 1}`);
  const b = READINGS_B;
  const y =
    `${b[0]} + ${b[1]} * x1 + (${b[2]}) * x2 + ${b[3]} * x3 + ${b[4]} * x4 + (${b[5]}) * x5` +
    ` + ${dbl("k5 + k6 + k7 - 6442450944")} / 4294967296`;
  const fence = d === "postgres" ? " OFFSET 0" : "";
  const xs = `SELECT i, part, ${x.join(", ")}, k5, k6, k7 FROM (${sql}${fence}) AS hx`;
  return `SELECT i AS id, part, x1, x2, x3, x4, x5, ${y} AS y FROM (${xs}${fence}) AS hy`;
}

/**
 * Writes the rows as table `readings` (id, part, x1…x5, y) of a new DuckDB
 * file, made by DuckDB itself from the formula.
 *
 * @param path The file (must not exist).
 * @param rows n.
 * @param seed The seed.
 */
export async function makeReadingsDuckdb(path: string, rows: number, seed: number): Promise<void> {
  const select = readingsSelect("duckdb", { lo: 1, hi: rows, rows }, seed);
  await makeDuckdb(path, [`CREATE TABLE readings AS ${select}`, "CHECKPOINT"]);
}
