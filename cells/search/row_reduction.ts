/**
 * The triangular factor R of a tall matrix A (A = QR), taken a block of
 * rows at a time: R of [R so far; the next rows] is R of every row so far,
 * since Qᵀ keeps lengths and the rows below R are 0. This is the orthogonal
 * reduction by adding rows (Golub & Van Loan, *Matrix Computations*, 4th
 * ed., §6.5.3, from memory for the section; Miller 1992, "Algorithm AS 274:
 * least squares routines to supplement those of Gentleman", Applied
 * Statistics 41, does it a row at a time with Givens rotations), each block
 * factored by unpivoted Householder QR (kernel/linalg `factorInPlace`), so
 * R keeps the columns in their order. Backward stable like one QR of A, in
 * (m + {@link ROW_BLOCK})·m doubles whatever the number of rows, where a
 * QR of A would copy all n·m.
 *
 * ```
 *  [ R ]  m rows            ─QR─▶  [ R′ ]
 *  [ rows i … i + B ]                [ 0  ]
 * ```
 *
 * @module
 */
import { factorInPlace } from "../../kernel/linalg/mod.ts";

/** Rows added to the factor at a time. */
export const ROW_BLOCK = 4096;

/**
 * R of the n×m matrix whose columns are given (null: a column of ones).
 *
 * @param columns The columns, each n long, finite.
 * @param n Rows.
 * @returns R, `rows`×m column-major with rows = min(n, m) (0 below the diagonal).
 * @example
 * ```ts
 * import { reduceRows } from "./row_reduction.ts";
 * // [1 1; 1 2; 1 3]: R₁₁ = ±√3, R₁₂ = ±6/√3, |R₂₂| = √2 (hand computation).
 * const { r, rows } = reduceRows([null, Float64Array.of(1, 2, 3)], 3);
 * if (rows !== 2 || Math.abs(Math.abs(r[3]) - Math.SQRT2) > 1e-15) throw new Error(String(r));
 * ```
 */
export function reduceRows(
  columns: readonly (Float64Array | null)[],
  n: number,
): { r: Float64Array; rows: number } {
  const m = columns.length;
  let r = new Float64Array(0), rows = 0;
  for (let start = 0; start < n; start += ROW_BLOCK) {
    const len = Math.min(ROW_BLOCK, n - start), tall = rows + len;
    const a = new Float64Array(tall * m);
    for (let j = 0; j < m; j++) {
      const off = j * tall, x = columns[j];
      for (let i = 0; i < rows; i++) a[off + i] = r[i + j * rows];
      if (x === null) a.fill(1, off + rows, off + tall);
      else a.set(x.subarray(start, start + len), off + rows);
    }
    factorInPlace(a, tall, m, { pivot: false });
    const next = Math.min(tall, m);
    r = new Float64Array(next * m);
    for (let j = 0; j < m; j++) {
      for (let i = 0; i <= Math.min(j, next - 1); i++) r[i + j * next] = a[i + j * tall];
    }
    rows = next;
  }
  return { r, rows };
}
