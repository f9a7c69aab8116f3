/**
 * Linear least squares, min ‖X·β − y‖₂, by Householder QR with column pivoting.
 *
 * Method: Golub & Van Loan, *Matrix Computations*, 4th ed., §5.3.3 (the QR
 * method for full-rank least squares) on the pivoted factorization of §5.4.1:
 * X̃·P = Q·R, β̃ = P·R⁻¹·(Qᵀy)₁..p. Never the normal equations. The steps
 * follow LAPACK: DGEQP3 (factor), DORMQR (Qᵀy), DTRTRS (back substitution),
 * DTRTRI (R⁻¹ for the covariance).
 *
 * ```
 *  columns ─scale by 2^−e─▶ X̃ ─DGEQP3─▶ Q, R, P ─┬─ rank < p ─▶ aliasing (refusal)
 *                                               └─ Qᵀy ─▶ R⁻¹ ─▶ β, (XᵀX)⁻¹ = S·P·R⁻¹R⁻ᵀ·Pᵀ·S
 * ```
 *
 * - Columns are first scaled by exact powers of two (see `_equilibrate.ts`),
 *   so rank decisions do not depend on units.
 * - The unscaled covariance (XᵀX)⁻¹ is R⁻¹R⁻ᵀ with the permutation and scaling
 *   undone (GVL §5.3.3, from memory for the exact wording), never XᵀX itself.
 * - `conditionEstimate` is the 2-norm condition number σ_max/σ_min of X as
 *   given (not equilibrated), from the singular values of its R factor by
 *   one-sided Jacobi (`singular_values.ts`): X·P = Q·(R̃·D⁻¹) with D the
 *   permuted scales, and X has the singular values of R̃·D⁻¹.
 * - Fitted values are X·β from the original columns and residuals y − X·β.
 *
 * A double-double variant (primitives in `dd.ts`) can mirror these steps (equilibrate, factor, Qᵀy,
 * back-substitute, invert R) one for one over hi/lo Float64Array pairs.
 *
 * @module
 */
import { factorInPlace, type QRFactorization } from "./householder_qr.ts";
import { applyQt } from "./apply_qt.ts";
import { invertR, solveR } from "./solve_r.ts";
import { singularValues } from "./singular_values.ts";
import { powerOfTwoScales, scaledDesign } from "./_equilibrate.ts";
import { type AliasedColumn, findAliasing } from "./_aliasing.ts";
import { rowArray } from "../arrays.ts";

export type { AliasedColumn };

/** What both outcomes of {@link leastSquares} share. */
interface LeastSquaresBase {
  /** Rows m and columns p of the design. */
  n: number;
  p: number;
  /** Numerical rank of the (equilibrated) design. */
  rank: number;
  /** σ_max/σ_min of the design as given (Infinity when rank-deficient to working precision). */
  conditionEstimate: number;
  /** The pivoted factorization of the equilibrated design X̃ = X·diag(scale). */
  qr: QRFactorization;
  /** The power-of-two column scales of X̃. */
  scale: Float64Array;
}

/** A full-rank solution. */
export interface LeastSquaresFit extends LeastSquaresBase {
  fullRank: true;
  /** β in the original column order and units. */
  coefficients: Float64Array;
  /** Residual sum of squares Σ(y − X·β)². */
  rss: number;
  fitted: Float64Array;
  residuals: Float64Array;
  /** (XᵀX)⁻¹, p×p column-major (symmetric), original order and units. */
  unscaledCovariance: Float64Array;
  /** Qᵀy, m long: its last m − p entries give the residual as Q·(0, (Qᵀy)₂) (`refine_least_squares.ts`). */
  qty: Float64Array;
  /** Always empty for a full-rank fit. */
  aliased: string[];
  aliasing: AliasedColumn[];
}

/** A refusal: the design is rank-deficient, so no β is returned. */
export interface LeastSquaresRefusal extends LeastSquaresBase {
  fullRank: false;
  /** Names of the columns that are linear combinations of earlier ones. */
  aliased: string[];
  /** For each aliased column, which columns combine to it and how. */
  aliasing: AliasedColumn[];
}

/** Outcome of {@link leastSquares}; check `fullRank` before using the solution. */
export type LeastSquaresResult = LeastSquaresFit | LeastSquaresRefusal;

/**
 * Solves min ‖X·β − y‖₂ for the design whose columns are `columns`.
 *
 * @param columns The p design columns, each m long (m ≥ 1, p ≥ 1); not modified.
 * @param y The response, m long.
 * @param names One name per column, used for the aliasing report.
 * @returns A full-rank fit, or a refusal naming the aliased columns (rank < p).
 * @throws {RangeError} For no columns, mismatched lengths or non-finite values.
 * @example
 * ```ts
 * import { leastSquares } from "./least_squares.ts";
 * const one = new Float64Array([1, 1, 1, 1]), x = new Float64Array([0, 1, 2, 3]);
 * const r = leastSquares([one, x], new Float64Array([1, 3, 5, 7]), ["a", "b"]);
 * if (!r.fullRank || Math.abs(r.coefficients[1] - 2) > 1e-14) throw new Error("unexpected");
 * ```
 */
export function leastSquares(
  columns: readonly Float64Array[],
  y: Float64Array,
  names: readonly string[],
): LeastSquaresResult {
  const m = checkProblem(columns, y, names);
  const p = columns.length;
  const scale = powerOfTwoScales(columns);
  // The scaled copy is our scratch: factor it in place (one m×p array, not two).
  const qr = factorInPlace(scaledDesign(columns, scale, m), m, p);
  const base = { n: m, p, rank: qr.rank, conditionEstimate: conditionOf(qr, scale), qr, scale };
  if (qr.rank < p) {
    const aliasing = findAliasing(scaledDesign(columns, scale, m), m, p, scale, names, qr);
    return { ...base, fullRank: false, aliased: aliasing.map((a) => a.name), aliasing };
  }
  const qty = applyQt(qr, y);
  const coefficients = solveCoefficients(qr, scale, qty);
  const fitted = evaluate(columns, coefficients, m);
  const residuals = rowArray(m);
  let rss = 0;
  for (let i = 0; i < m; i++) {
    residuals[i] = y[i] - fitted[i];
    rss += residuals[i] * residuals[i];
  }
  const unscaledCovariance = covarianceOf(qr, scale);
  return {
    ...base,
    fullRank: true,
    coefficients,
    rss,
    fitted,
    residuals,
    unscaledCovariance,
    qty,
    aliased: [],
    aliasing: [],
  };
}

function checkProblem(
  columns: readonly Float64Array[],
  y: Float64Array,
  names: readonly string[],
): number {
  if (columns.length === 0) {
    throw new RangeError("Cannot solve least squares with no columns: need at least one");
  }
  if (names.length !== columns.length) {
    throw new RangeError(
      `Cannot solve least squares: ${columns.length} columns but ${names.length} names`,
    );
  }
  const m = y.length;
  if (m === 0) throw new RangeError("Cannot solve least squares with no rows: need at least one");
  columns.forEach((c, j) => {
    if (c.length !== m) {
      throw new RangeError(
        `Cannot solve least squares: column "${names[j]}" has ${c.length} rows, the response ${m}`,
      );
    }
  });
  for (let i = 0; i < m; i++) {
    if (!Number.isFinite(y[i])) {
      throw new RangeError(
        `Cannot solve least squares: response row ${i} is "${y[i]}", not a finite number`,
      );
    }
  }
  return m;
}

/** β̃ = R⁻¹·(Qᵀy)₁..p in pivoted order, then β_perm[k] = s_perm[k]·β̃_k. */
function solveCoefficients(
  qr: QRFactorization,
  scale: Float64Array,
  z: Float64Array,
): Float64Array {
  const g = solveR(qr, z, qr.n);
  const beta = new Float64Array(qr.n);
  for (let k = 0; k < qr.n; k++) beta[qr.perm[k]] = g[k] * scale[qr.perm[k]];
  return beta;
}

function evaluate(columns: readonly Float64Array[], beta: Float64Array, m: number): Float64Array {
  const out = rowArray(m);
  columns.forEach((c, j) => {
    const b = beta[j];
    for (let i = 0; i < m; i++) out[i] += b * c[i];
  });
  return out;
}

/** (XᵀX)⁻¹[perm i, perm j] = s·s·(R⁻¹R⁻ᵀ)[i, j]. */
function covarianceOf(qr: QRFactorization, scale: Float64Array): Float64Array {
  const p = qr.n;
  const ri = invertR(qr, p);
  const cov = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = i; j < p; j++) {
      // (R⁻¹R⁻ᵀ)[i, j] = Σ_l R⁻¹[i, l]·R⁻¹[j, l]; R⁻¹ is upper, so l ≥ max(i, j) = j.
      let acc = 0;
      for (let l = j; l < p; l++) acc += ri[i + l * p] * ri[j + l * p];
      const a = qr.perm[i], b = qr.perm[j];
      const v = acc * scale[a] * scale[b];
      cov[a + b * p] = v;
      cov[b + a * p] = v;
    }
  }
  return cov;
}

/** σ_max/σ_min of R̃·D⁻¹ (the R factor of X as given). */
function conditionOf(qr: QRFactorization, scale: Float64Array): number {
  const { m, n } = qr;
  if (m < n) return Infinity;
  const r = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    const d = scale[qr.perm[j]];
    for (let i = 0; i <= j; i++) r[i + j * n] = qr.qr[i + j * m] / d;
  }
  const s = singularValues(r, n, n);
  return s[n - 1] === 0 ? Infinity : s[0] / s[n - 1];
}
