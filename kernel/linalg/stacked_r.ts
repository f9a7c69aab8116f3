/**
 * The R factor of a tall matrix whose rows arrive in blocks (tall-skinny
 * QR): each block is stacked under the R so far and the k+b rows are
 * factored again by unpivoted Householder QR, so no more than one block is
 * held. RᵀR = XᵀX to rounding, and R's accuracy is that of QR on X itself
 * (Demmel, Grigori, Hoemmen & Langou, "Communication-optimal parallel and
 * sequential QR and LU factorizations", SIAM J. Sci. Comput. 34 (2012)).
 *
 * @module
 */
import { applyReflector, makeReflector } from "./_householder.ts";

/** Rows stacked under R before a factorisation (a block). */
const BLOCK = 4096;

/**
 * Accumulates rows of k numbers and gives R (k×k, upper triangular).
 *
 * @example
 * ```ts
 * import { StackedR } from "./stacked_r.ts";
 * const s = new StackedR(2);
 * for (const [a, b] of [[1, 1], [1, 2], [1, 3]]) s.add([a, b]);
 * const r = s.finish(); // row-major 2×2
 * // RᵀR = XᵀX = [[3, 6], [6, 14]] (exact arithmetic)
 * if (Math.abs(r[0] * r[0] - 3) > 1e-12) throw new Error("r11");
 * if (Math.abs(r[0] * r[1] - 6) > 1e-12) throw new Error("r12");
 * if (Math.abs(r[1] * r[1] + r[3] * r[3] - 14) > 1e-12) throw new Error("r22");
 * ```
 */
export class StackedR {
  readonly k: number;
  /** Column-major, (k + BLOCK) rows: R on top, then the block's rows. */
  #a: Float64Array;
  #m: number;
  #rows = 0;
  #filled: number;

  /** @param k Columns of each row. */
  constructor(k: number) {
    this.k = k;
    this.#m = k + BLOCK;
    this.#a = new Float64Array(this.#m * k);
    this.#filled = k; // the top k rows hold R (zeros at first)
  }

  /** Rows added so far. */
  get rows(): number {
    return this.#rows;
  }

  /** Adds one row (k numbers). */
  add(row: ArrayLike<number>): void {
    const { k } = this;
    const a = this.#a, m = this.#m, i = this.#filled;
    for (let j = 0; j < k; j++) a[j * m + i] = row[j];
    this.#rows++;
    if (++this.#filled === m) this.#factor();
  }

  /** Adds rows from columns (each `n` long), row by row. */
  addColumns(columns: readonly ArrayLike<number>[], n: number): void {
    const { k } = this;
    const a = this.#a, m = this.#m;
    for (let r = 0; r < n; r++) {
      const i = this.#filled;
      for (let j = 0; j < k; j++) a[j * m + i] = columns[j][r];
      this.#rows++;
      if (++this.#filled === m) this.#factor();
    }
  }

  /** Factors [R; rows] and keeps the new R on top. */
  #factor(): void {
    const { k } = this;
    const a = this.#a, m = this.#m, used = this.#filled;
    for (let j = 0; j < k; j++) {
      const tau = makeReflector(a, j * m + j, used - j);
      for (let c = j + 1; c < k; c++) applyReflector(a, j * m + j, tau, a, c * m + j, used - j);
    }
    // Keep the upper triangle; clear what lies below it in the top k rows.
    for (let j = 0; j < k; j++) for (let i = j + 1; i < k; i++) a[j * m + i] = 0;
    this.#filled = k;
  }

  /** R as a row-major k×k array (zeros below the diagonal). */
  finish(): Float64Array {
    if (this.#filled > this.k) this.#factor();
    const { k } = this;
    const r = new Float64Array(k * k);
    for (let i = 0; i < k; i++) for (let j = i; j < k; j++) r[i * k + j] = this.#a[j * this.#m + i];
    return r;
  }
}
