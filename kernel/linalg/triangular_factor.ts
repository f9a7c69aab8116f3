/**
 * The triangular factor of a least-squares solve, and the quadratic forms
 * gᵀ(XᵀX)⁻¹g read through it: prediction variances and leverages.
 *
 * Method: the solver factors the scaled design X̃ = X·S (S the power-of-two
 * column scales of `_equilibrate.ts`) as X̃·P = Q₁·R̃, so that
 * (XᵀX)⁻¹ = S·P·R̃⁻¹R̃⁻ᵀ·Pᵀ·S and, for any g,
 *
 * ```
 *   gᵀ(XᵀX)⁻¹g = ‖z‖²,   R̃ᵀ·z = g̃,   g̃_k = s_π(k)·g_π(k)     (π = the pivot order)
 * ```
 *
 * one forward substitution with R̃ᵀ (Golub & Van Loan, *Matrix Computations*,
 * 4th ed., §3.1.1, row-oriented forward substitution; LAPACK DTRSV 'U', 'T').
 * The variance of a linear function gᵀθ̂ is σ²‖R⁻ᵀg‖² and the leverage of row
 * xᵢ is ‖R⁻ᵀxᵢ‖², the squared length of row i of Q₁ (Björck, *Numerical
 * Methods for Least Squares Problems*, SIAM 1996, ch. 1–2; from memory for
 * the chapters). Never gᵀ·C·g with C = (XᵀX)⁻¹ formed: that sum of terms
 * of alternating sign loses about κ² of the digits, where ‖z‖² has none to
 * lose; on a degree-5 polynomial in raw calendar years gᵀCg gave a standard
 * error of 0 where the exact one is 1.67 (cells/predict/mean_response_test.ts).
 *
 * A factor from the double-double solver keeps R̃ as hi + lo pairs; the forms
 * are then computed in double-double from g given as hi + lo (kernels of
 * `_dd_kernels.ts`), and are as accurate as the fit itself. The double-double
 * solver's own R̃ and its covariance R̃⁻¹R̃⁻ᵀ are read out here too.
 *
 * @module
 */
import * as K from "./_dd_kernels.ts";
import type { QRFactorization } from "./householder_qr.ts";
import type { DDVector } from "./dd_least_squares.ts";

/** R̃ of a least-squares solve in its own scaled, pivoted coordinates. */
export interface TriangularFactor {
  /** Order of R̃: the columns it covers (the rank; every column for a full-rank solve). */
  p: number;
  /** order[k] = the design column at pivot position k (p entries). */
  order: Int32Array;
  /** The power-of-two scale s_j of every design column j (by original index). */
  scale: Float64Array;
  /** R̃, p×p column-major, upper triangle (the hi parts). */
  r: Float64Array;
  /** The lo parts of R̃ (double-double), or null when R̃ is in double. */
  rLo: Float64Array | null;
}

/**
 * The factor of a double QR of the scaled design (its leading `rank` block).
 *
 * @param qr The pivoted QR of X̃ = X·diag(scale) (e.g. `leastSquares(…).qr`).
 * @param scale The column scales that were applied before factoring (ones for none).
 * @returns The leading rank×rank block of R̃ with the pivot order and the scales.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { factorOfQR } from "./triangular_factor.ts";
 * const f = factorOfQR(householderQR(new Float64Array([3, 4]), 2, 1), Float64Array.of(1));
 * if (f.p !== 1 || Math.abs(Math.abs(f.r[0]) - 5) > 1e-15) throw new Error("R = ±5");
 * ```
 */
export function factorOfQR(qr: QRFactorization, scale: Float64Array): TriangularFactor {
  const p = qr.rank, m = qr.m;
  const r = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    for (let i = 0; i <= j; i++) r[i + j * p] = qr.qr[i + j * m];
  }
  return { p, order: qr.perm.slice(0, p), scale: Float64Array.from(scale), r, rLo: null };
}

/**
 * gᵢᵀ(XᵀX)⁻¹gᵢ = ‖R̃⁻ᵀg̃ᵢ‖² at each of `count` points, in double-double when
 * the factor is.
 *
 * @param f The factor.
 * @param g One vector per design column (`count` long; hi + lo, lo may be
 *   null), the point's gradient or design row; columns outside `f.order`
 *   are not read.
 * @param count Number of points.
 * @param rowScale Optional multiplier of each point (√wᵢ for the leverage of
 *   a weighted fit), taken as an exact double.
 * @param middle Optional symmetric M (f.p × f.p, column-major, pivot order):
 *   the forms are then z̃ᵀ·M·z̃ instead of ‖z̃‖², e.g. a robust variance with
 *   M the sandwich's middle in the factor's orthonormal coordinates
 *   (kernel/stats `robustCovarianceOfFactor`); z̃ is solved as always and the
 *   product taken in double from its rounded value.
 * @returns The forms, NaN where some used gᵢ is not finite.
 * @throws {RangeError} When a used column has fewer than `count` entries.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { factorOfQR, inverseGramForms } from "./triangular_factor.ts";
 * // Straight line through x = 1, 2, 3: h = 5/6, 1/3, 5/6 (hand computation).
 * const one = [1, 1, 1], x = [1, 2, 3];
 * const f = factorOfQR(householderQR(new Float64Array([...one, ...x]), 3, 2), Float64Array.of(1, 1));
 * const h = inverseGramForms(f, [{ hi: one, lo: null }, { hi: x, lo: null }], 3);
 * if (Math.abs(h[1] - 1 / 3) > 1e-14 || Math.abs(h[0] - 5 / 6) > 1e-14) throw new Error(String(h));
 * ```
 */
export function inverseGramForms(
  f: TriangularFactor,
  g: readonly DDVector[],
  count: number,
  rowScale: ArrayLike<number> | null = null,
  middle: Float64Array | null = null,
): Float64Array {
  for (let k = 0; k < f.p; k++) {
    const c = g[f.order[k]];
    if (c === undefined || c.hi.length < count || (c.lo !== null && c.lo.length < count)) {
      throw new RangeError(
        `Cannot form gᵀ(XᵀX)⁻¹g: column ${f.order[k]} has fewer than ${count} entries`,
      );
    }
  }
  return f.rLo === null
    ? formsDouble(f, g, count, rowScale, middle)
    : formsDD(f, g, count, rowScale, middle);
}

/** z̃ᵀ·M·z̃ over the first p entries (M symmetric, p×p column-major). */
function middleForm(z: Float64Array, m: Float64Array, p: number): number {
  let s = 0;
  for (let b = 0; b < p; b++) {
    let t = 0;
    for (let a = 0; a < p; a++) t += m[a + b * p] * z[a];
    s += z[b] * t;
  }
  return s;
}

/** The forms in double: z = R̃⁻ᵀg̃ by forward substitution, then Σz². */
function formsDouble(
  f: TriangularFactor,
  g: readonly DDVector[],
  count: number,
  w: ArrayLike<number> | null,
  middle: Float64Array | null,
): Float64Array {
  const { p, r, order, scale } = f;
  const out = new Float64Array(count), z = new Float64Array(p);
  for (let i = 0; i < count; i++) {
    const wi = w === null ? 1 : w[i];
    let ss = 0;
    for (let k = 0; k < p; k++) {
      const c = g[order[k]];
      let s = (c.hi[i] + (c.lo === null ? 0 : c.lo[i])) * wi * scale[order[k]];
      for (let l = 0; l < k; l++) s -= r[l + k * p] * z[l];
      z[k] = s / r[k + k * p];
      ss += z[k] * z[k];
    }
    out[i] = middle === null ? ss : middleForm(z, middle, p);
  }
  return out;
}

/** The forms in double-double: each step of {@link formsDouble} on hi + lo pairs. */
function formsDD(
  f: TriangularFactor,
  g: readonly DDVector[],
  count: number,
  w: ArrayLike<number> | null,
  middle: Float64Array | null,
): Float64Array {
  const { p, r, order, scale } = f;
  const rl = f.rLo!;
  const out = new Float64Array(count);
  const zh = new Float64Array(p), zl = new Float64Array(p);
  for (let i = 0; i < count; i++) {
    for (let k = 0; k < p; k++) {
      const c = g[order[k]], s = scale[order[k]];
      // g̃_k = gᵢ·wᵢ·s (s a power of two: exact)
      K.mul(c.hi[i] * s, c.lo === null ? 0 : c.lo[i] * s, w === null ? 1 : w[i], 0);
      const gh = K.OUT[0], gl = K.OUT[1];
      K.dot(0, 0, r, rl, k * p, zh, zl, 0, k);
      K.add(gh, gl, -K.OUT[0], -K.OUT[1]);
      K.div(K.OUT[0], K.OUT[1], r[k + k * p], rl[k + k * p]);
      zh[k] = K.OUT[0];
      zl[k] = K.OUT[1];
    }
    if (middle !== null) {
      for (let k = 0; k < p; k++) zh[k] += zl[k];
      out[i] = middleForm(zh, middle, p);
      continue;
    }
    K.dot(0, 0, zh, zl, 0, zh, zl, 0, p);
    out[i] = K.OUT[0] + K.OUT[1];
  }
  return out;
}

// The double-double solver's factor and covariance (used by `dd_least_squares.ts`): R̃⁻¹ column by
// column as LAPACK DTRTRI, then (XᵀX)⁻¹ = S·P·R̃⁻¹R̃⁻ᵀ·Pᵀ·S (Golub & Van Loan, *Matrix
// Computations*, 4th ed., §3.1 and §5.3.3), each step in double-double.

/**
 * The leading p×p block of a matrix factored in double-double (R̃, hi and
 * lo) with its pivot order and scales, as a {@link TriangularFactor}.
 *
 * @param ah The factored m×(p+…) matrix's hi parts, column-major (R̃ on and above the diagonal).
 * @param al Its lo parts.
 * @param m Rows.
 * @param p Order of R̃.
 * @param order The pivot order.
 * @param scale The column scales, by original column.
 * @returns The factor (rLo set).
 * @example
 * ```ts
 * import { ddFactorOf } from "./triangular_factor.ts";
 * const f = ddFactorOf(Float64Array.of(2, 0), Float64Array.of(1e-20, 0), 2, 1, [0], [1]);
 * if (f.r[0] !== 2 || f.rLo![0] !== 1e-20) throw new Error("R̃ = 2 + 1e−20");
 * ```
 */
export function ddFactorOf(
  ah: Float64Array,
  al: Float64Array,
  m: number,
  p: number,
  order: ArrayLike<number>,
  scale: ArrayLike<number>,
): TriangularFactor {
  const r = new Float64Array(p * p), rLo = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    for (let i = 0; i <= j; i++) {
      r[i + j * p] = ah[i + j * m];
      rLo[i + j * p] = al[i + j * m];
    }
  }
  return { p, order: Int32Array.from(order), scale: Float64Array.from(scale), r, rLo };
}

/**
 * (XᵀX)⁻¹ from R̃⁻¹R̃⁻ᵀ in double-double (DTRTRI, then the product), undoing
 * the pivot order and the scales, rounded to doubles.
 *
 * @param f A double-double factor (`rLo` set; e.g. from {@link ddFactorOf}).
 * @returns (XᵀX)⁻¹, p×p column-major, original order and units.
 * @example
 * ```ts
 * import { ddCovariance, ddFactorOf } from "./triangular_factor.ts";
 * // R̃ = 2 for a column scaled by 1/2: (XᵀX)⁻¹ = (1/2)²/2² = 1/16
 * const f = ddFactorOf(Float64Array.of(2, 0), Float64Array.of(0, 0), 2, 1, [0], [0.5]);
 * if (ddCovariance(f)[0] !== 1 / 16) throw new Error("1/16");
 * ```
 */
export function ddCovariance(f: TriangularFactor): Float64Array {
  const { p, order, scale, r: ah } = f, al = f.rLo!, m = p;
  // R⁻¹ column by column: X[j,j] = 1/R[j,j]; X[i,j] = −(Σ_{l=i+1..j} R[i,l]·X[l,j])/R[i,i].
  const xh = new Float64Array(p * p), xl = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    K.div(1, 0, ah[j + j * m], al[j + j * m]);
    xh[j + j * p] = K.OUT[0];
    xl[j + j * p] = K.OUT[1];
    for (let i = j - 1; i >= 0; i--) {
      let sh = 0, sl = 0;
      for (let l = i + 1; l <= j; l++) {
        K.mul(ah[i + l * m], al[i + l * m], xh[l + j * p], xl[l + j * p]);
        K.add(sh, sl, K.OUT[0], K.OUT[1]);
        sh = K.OUT[0], sl = K.OUT[1];
      }
      K.div(-sh, -sl, ah[i + i * m], al[i + i * m]);
      xh[i + j * p] = K.OUT[0];
      xl[i + j * p] = K.OUT[1];
    }
  }
  const cov = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = i; j < p; j++) {
      let sh = 0, sl = 0;
      for (let l = j; l < p; l++) {
        K.mul(xh[i + l * p], xl[i + l * p], xh[j + l * p], xl[j + l * p]);
        K.add(sh, sl, K.OUT[0], K.OUT[1]);
        sh = K.OUT[0], sl = K.OUT[1];
      }
      const a = order[i], b = order[j];
      const v = (sh + sl) * scale[a] * scale[b];
      cov[a + b * p] = v;
      cov[b + a * p] = v;
    }
  }
  return cov;
}
