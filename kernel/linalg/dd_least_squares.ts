/**
 * Linear least squares in double-double arithmetic: min ‖X·β − y‖₂ with X
 * and y given as hi + lo pairs (about 32 significant digits), by Householder
 * QR in the column order chosen by the pivoted double factorization.
 *
 * Method: the steps of `least_squares.ts` one for one (Golub & Van Loan,
 * *Matrix Computations*, 4th ed., §5.2.1, §5.3.3 and §5.4.1; LAPACK DGEQP3,
 * DLARFG, DORMQR, DTRTRS, DTRTRI), each carried out in double-double with
 * the kernels of `_dd_kernels.ts`:
 *
 * ```
 *  X (hi, lo) ─scale by 2^−e─▶ X̃ ─permute (order)─▶ Householder in DD ─▶ R, Qᵀy
 *      β̃ = R⁻¹(Qᵀy)₁..p ─▶ β = S·P·β̃     r = y − X·β (DD)     (XᵀX)⁻¹ = S·P·R⁻¹R⁻ᵀ·Pᵀ·S
 * ```
 *
 * Deviation: column pivoting is not repeated. The caller passes the pivot
 * order (and has made the rank decision) from the double factorization of
 * the same design: pivoting only needs the column norms to a few digits, and
 * so the double and double-double paths agree on rank and on aliasing.
 *
 * Residuals are y − X·β from the original columns, so an exact fit (NIST
 * Wampler1) gives residuals at the 1e−30 level of y, not at the 1e−16 level.
 *
 * @module
 */
import * as K from "./_dd_kernels.ts";
import { fastSumError, productError, sumError } from "../dd.ts";
import { ddCovariance, ddFactorOf, type TriangularFactor } from "./triangular_factor.ts";

/** A vector as hi + lo parts (a null lo: the values are exact doubles). */
export interface DDVector {
  hi: ArrayLike<number>;
  lo: ArrayLike<number> | null;
}

/** The double-double solution; each quantity is hi + lo. */
export interface DDLeastSquaresFit {
  coefficients: Float64Array;
  coefficientsLo: Float64Array;
  /** X·β (unweighted). */
  fitted: Float64Array;
  fittedLo: Float64Array;
  /** y − X·β (unweighted). */
  residuals: Float64Array;
  residualsLo: Float64Array;
  /** Σ (wᵢ·rᵢ)² with w the row scales (Σ rᵢ² without). */
  rss: number;
  rssLo: number;
  /** (XᵀX)⁻¹ rounded to doubles, p×p column-major, original order and units. */
  unscaledCovariance: Float64Array;
  /** R̃ in double-double with its pivot order and scales, for gᵀ(XᵀX)⁻¹g (`triangular_factor.ts`). */
  factor: TriangularFactor;
}

/**
 * Solves min ‖X·β − y‖₂ in double-double for a full-rank design.
 *
 * @param columns The p design columns, each m long (m ≥ p ≥ 1), finite.
 * @param y The response, m long.
 * @param order Pivot order: order[k] is the column factored at step k (a
 *   permutation of 0 … p−1, e.g. `perm` of the double `householderQR`).
 * @param rowScale Optional positive scale of each row (√wᵢ of a weighted
 *   fit, taken as exact doubles): solves min ‖diag(w)(X·β − y)‖₂.
 * @returns Coefficients, fitted values, residuals, RSS and (XᵀX)⁻¹.
 * @throws {RangeError} For mismatched sizes, an order that is not a
 *   permutation, or a zero pivot (a rank-deficient design).
 * @example
 * ```ts
 * import { ddLeastSquares } from "./dd_least_squares.ts";
 * const one = { hi: [1, 1, 1], lo: null }, x = { hi: [0, 1, 2], lo: null };
 * // y = 0.1 + 0.2x as printed: hi = the doubles, lo = their decimal corrections
 * const y = { hi: [0.1, 0.3, 0.5], lo: [5.551115123125783e-18, -1.1102230246251566e-17, 0] };
 * const f = ddLeastSquares([one, x], y, [1, 0]);
 * if (Math.abs(f.rss) > 1e-31) throw new Error(`rss ${f.rss}`);
 * ```
 */
export function ddLeastSquares(
  columns: readonly DDVector[],
  y: DDVector,
  order: ArrayLike<number>,
  rowScale: ArrayLike<number> | null = null,
): DDLeastSquaresFit {
  const m = y.hi.length, p = columns.length;
  const w = rowScale;
  checkSizes(columns, m, order);
  const scale = columns.map((c) => powerOfTwoScale(c.hi, w));
  // Column-major m×(p+1) working matrix: permuted, scaled design, then y.
  const ah = new Float64Array(m * (p + 1)), al = new Float64Array(m * (p + 1));
  for (let k = 0; k < p; k++) {
    const c = columns[order[k]], s = scale[order[k]];
    for (let i = 0; i < m; i++) {
      put(ah, al, i + k * m, c.hi[i] * s, c.lo === null ? 0 : c.lo[i] * s, w, i);
    }
  }
  for (let i = 0; i < m; i++) put(ah, al, i + p * m, y.hi[i], y.lo === null ? 0 : y.lo[i], w, i);
  factor(ah, al, m, p);
  const [gh, gl] = backSubstitute(ah, al, m, p);
  const bh = new Float64Array(p), bl = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    const j = order[k], s = scale[j];
    bh[j] = gh[k] * s;
    bl[j] = gl[k] * s;
  }
  const out = residualsOf(columns, y, bh, bl, m, w);
  const r = ddFactorOf(ah, al, m, p, order, scale);
  return {
    coefficients: bh,
    coefficientsLo: bl,
    ...out,
    unscaledCovariance: ddCovariance(r),
    factor: r,
  };
}

function checkSizes(columns: readonly DDVector[], m: number, order: ArrayLike<number>): void {
  const p = columns.length;
  if (p === 0 || m < p) {
    throw new RangeError(
      `Cannot solve least squares with ${m} rows and ${p} columns: need m ≥ p ≥ 1`,
    );
  }
  columns.forEach((c, j) => {
    if (c.hi.length !== m || (c.lo !== null && c.lo.length !== m)) {
      throw new RangeError(
        `Cannot solve least squares: column ${j} has ${c.hi.length} rows, the response ${m}`,
      );
    }
  });
  const seen = new Set(Array.from(order));
  if (order.length !== p || seen.size !== p || [...seen].some((k) => !(k >= 0 && k < p))) {
    throw new RangeError(
      `Cannot solve least squares: order "${
        Array.from(order).join(",")
      }" is not a permutation of 0…${p - 1}`,
    );
  }
}

/** a[k] = (h + l)·w[i] in double-double (w null: 1). */
function put(
  ah: Float64Array,
  al: Float64Array,
  k: number,
  h: number,
  l: number,
  w: ArrayLike<number> | null,
  i: number,
): void {
  if (w === null) return void (ah[k] = h, al[k] = l);
  K.mul(h, l, w[i], 0);
  ah[k] = K.OUT[0];
  al[k] = K.OUT[1];
}

/** 2^−(⌊log₂‖c‖⌋+1), as `_equilibrate.ts` (exact scaling; 1 for a zero column). */
function powerOfTwoScale(c: ArrayLike<number>, w: ArrayLike<number> | null): number {
  let s = 0;
  for (let i = 0; i < c.length; i++) s += (w === null ? c[i] : c[i] * w[i]) ** 2;
  const nrm = Math.sqrt(s);
  return nrm === 0 || !Number.isFinite(nrm) ? 1 : 2 ** -(Math.floor(Math.log2(nrm)) + 1);
}

/**
 * Householder QR of the first p columns in place, applying each reflector to
 * the remaining columns and to column p (y). DLARFG: β = −sign(α)·‖x‖,
 * τ = (β − α)/β, v = x/(α − β) with v₀ = 1; R_kk = β stored on the diagonal.
 */
function factor(ah: Float64Array, al: Float64Array, m: number, p: number): void {
  for (let k = 0; k < p; k++) {
    const d = k + k * m, len = m - k - 1;
    K.dot(0, 0, ah, al, d + 1, ah, al, d + 1, len);
    const sh = K.OUT[0], sl = K.OUT[1];
    const alh = ah[d], all = al[d];
    if (sh === 0) continue; // H = I: τ = 0
    K.mul(alh, all, alh, all);
    K.add(K.OUT[0], K.OUT[1], sh, sl);
    K.sqrt(K.OUT[0], K.OUT[1]);
    const sign = alh < 0 ? 1 : -1;
    const betah = sign * K.OUT[0], betal = sign * K.OUT[1];
    K.add(betah, betal, -alh, -all);
    K.div(K.OUT[0], K.OUT[1], betah, betal);
    const tauh = K.OUT[0], taul = K.OUT[1];
    K.add(alh, all, -betah, -betal);
    K.div(1, 0, K.OUT[0], K.OUT[1]);
    const invh = K.OUT[0], invl = K.OUT[1];
    for (let i = d + 1; i < d + 1 + len; i++) {
      K.mul(ah[i], al[i], invh, invl);
      ah[i] = K.OUT[0];
      al[i] = K.OUT[1];
    }
    ah[d] = betah;
    al[d] = betal;
    for (let j = k + 1; j <= p; j++) {
      const c = k + j * m;
      // w = vᵀc (v₀ = 1), c −= τ·w·v
      K.dot(ah[c], al[c], ah, al, d + 1, ah, al, c + 1, len);
      K.mul(tauh, taul, K.OUT[0], K.OUT[1]);
      const twh = K.OUT[0], twl = K.OUT[1];
      K.add(ah[c], al[c], -twh, -twl);
      ah[c] = K.OUT[0];
      al[c] = K.OUT[1];
      K.axpy(twh, twl, ah, al, d + 1, ah, al, c + 1, len);
    }
  }
}

/** β̃ = R⁻¹·z with z the first p entries of column p (DTRTRS). */
function backSubstitute(ah: Float64Array, al: Float64Array, m: number, p: number) {
  const gh = new Float64Array(p), gl = new Float64Array(p);
  for (let k = p - 1; k >= 0; k--) {
    let sh = ah[k + p * m], sl = al[k + p * m];
    for (let j = k + 1; j < p; j++) {
      K.mul(ah[k + j * m], al[k + j * m], gh[j], gl[j]);
      K.add(sh, sl, -K.OUT[0], -K.OUT[1]);
      sh = K.OUT[0], sl = K.OUT[1];
    }
    if (ah[k + k * m] === 0) {
      throw new RangeError(`Cannot solve least squares: pivot ${k} of R is zero (rank-deficient)`);
    }
    K.div(sh, sl, ah[k + k * m], al[k + k * m]);
    gh[k] = K.OUT[0];
    gl[k] = K.OUT[1];
  }
  return [gh, gl] as const;
}

/** r = y − X·β, fitted = X·β and RSS = Σr², all in double-double. */
function residualsOf(
  columns: readonly DDVector[],
  y: DDVector,
  bh: Float64Array,
  bl: Float64Array,
  m: number,
  w: ArrayLike<number> | null,
) {
  const fitted = new Float64Array(m), fittedLo = new Float64Array(m);
  const residuals = new Float64Array(m), residualsLo = new Float64Array(m);
  const xh = new Float64Array(columns.length), xl = new Float64Array(columns.length);
  let rh = 0, rl = 0;
  for (let i = 0; i < m; i++) {
    columns.forEach((c, j) => {
      xh[j] = c.hi[i];
      xl[j] = c.lo === null ? 0 : c.lo[i];
    });
    K.dot(0, 0, xh, xl, 0, bh, bl, 0, columns.length);
    fitted[i] = K.OUT[0];
    fittedLo[i] = K.OUT[1];
    K.add(y.hi[i], y.lo === null ? 0 : y.lo[i], -K.OUT[0], -K.OUT[1]);
    residuals[i] = K.OUT[0];
    residualsLo[i] = K.OUT[1];
    if (w !== null) K.mul(K.OUT[0], K.OUT[1], w[i], 0);
    K.mul(K.OUT[0], K.OUT[1], K.OUT[0], K.OUT[1]);
    K.add(rh, rl, K.OUT[0], K.OUT[1]);
    rh = K.OUT[0], rl = K.OUT[1];
  }
  return { fitted, fittedLo, residuals, residualsLo, rss: rh, rssLo: rl };
}

/**
 * Σ(vᵢ − v̄)² (centred) or Σvᵢ² in double-double, rounded to a double:
 * the total sum of squares of a fit's R² from the response as printed.
 * The mean is formed in double-double first (two passes, as Chan, Golub &
 * LeVeque 1983, "Algorithms for computing the sample variance", Am. Stat.
 * 37, recommend; from memory), each sum and square carrying its exact
 * rounding error in a second double (Dot2 of Ogita, Rump & Oishi 2005).
 *
 * @param v The values, hi + lo.
 * @param centred Subtract the mean first.
 * @returns The sum of squares (0 for a constant v when centred).
 * @example
 * ```ts
 * import { ddSumOfSquares } from "./dd_least_squares.ts";
 * if (ddSumOfSquares({ hi: [1, 2, 3], lo: null }, true) !== 2) throw new Error("unexpected");
 * ```
 */
export function ddSumOfSquares(v: DDVector, centred: boolean): number {
  const m = v.hi.length, lo = v.lo;
  let mh = 0, ml = 0;
  if (centred && m > 0) {
    let sh = 0, sl = 0; // Σv with every sum's exact error carried (compensated, Ogita, Rump & Oishi 2005)
    for (let i = 0; i < m; i++) {
      const a = v.hi[i], t = sh + a;
      sl += sumError(sh, a, t) + (lo === null ? 0 : lo[i]);
      sh = t;
    }
    K.div(sh, sl, m, 0);
    mh = K.OUT[0], ml = K.OUT[1];
  }
  let sh = 0, sl = 0;
  for (let i = 0; i < m; i++) {
    // d = v − mean in double-double, then d² accumulated with its exact errors (Dot2)
    const a = v.hi[i] - mh;
    const e = sumError(v.hi[i], -mh, a) + ((lo === null ? 0 : lo[i]) - ml);
    const dh = a + e, dl = fastSumError(a, e, dh);
    const q = dh * dh, t = sh + q;
    sl += sumError(sh, q, t) + (productError(dh, dh, q) + 2 * dh * dl);
    sh = t;
  }
  return sh + sl;
}
