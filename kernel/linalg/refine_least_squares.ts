/**
 * Mixed-precision iterative refinement of a linear least-squares solution:
 * the double QR's solution made as accurate as double-double arithmetic on
 * the data as printed, at the cost of a few passes over the data.
 *
 * Method: Björck 1967, "Iterative refinement of linear least squares
 * solutions I", BIT 7:257–278, refining the augmented system
 *
 * ```
 *   ┌ I   A ┐ ┌ r ┐   ┌ b ┐          f = b − r − A·x     (residuals of the system,
 *   └ Aᵀ  0 ┘ └ x ┘ = └ 0 ┘          g = −Aᵀ·r            in double-double)
 * ```
 *
 * with the existing double factorization Ã·P = Q·R̃ of the scaled design
 * Ã = A·S. Each step solves the correction system in double (Björck's
 * formulas, in Ã's coordinates):
 *
 * ```
 *   u = R̃⁻ᵀ·g̃,   d = Qᵀ·f,   δx̃ = R̃⁻¹·(d₁ − u),   δr = Q·(u, d₂)
 *   x ← x + S·P·δx̃,   r ← r + δr                  (both kept in double-double)
 * ```
 *
 * The start is the QR solution with r = Q·(0, (Qᵀb)₂) (Björck's first step:
 * r ⟂ range(Q₁) to working precision). r = b − A·x₀ instead makes the first
 * correction a semi-normal step (Björck 1987, "Stability analysis of the
 * method of seminormal equations", Linear Algebra Appl. 88/89; from
 * memory), whose rate grows with κ², not κ: that start, the double
 * solution's own residual and no product with Q, is taken when κ²·u·c(m)
 * is small enough for one step (Wampler4, Longley; not Filip).
 * f and g are computed in double-double from A and b as hi + lo pairs; each
 * step then reduces the error by about κ·u·c(m), with c(m) the growth of the
 * factorization's backward error with the rows ({@link growth}).
 *
 * Steps stop when the estimated error left, 4·κ·u·c(m) times the last
 * correction (the largest relative change of a coefficient), is below
 * 1e−15; at most {@link MAX_STEPS}. Refinement is not tried when that rate
 * is not below 1/2 (κ beyond about 1e14 at a million rows), and stops when a
 * correction does not halve.
 *
 * Cost: one pass over the rows per step (A·x and Aᵀ·r in double-double) and
 * two products with Q, with three work vectors reused across the steps
 * (fresh million-row arrays cost about 20 ms each to touch on this project's
 * machines). Measured on NIST StRD sets replicated to about 1,000,000 rows:
 * Filip (11 terms, κ 5e9) takes two steps from LRE 7.6 to 14.3; Longley and
 * Wampler4 one step, to 14.6 and 15.
 *
 * @module
 */
import { fastSumError, productError, sumError } from "../dd.ts";
import {
  columnRows,
  type Data,
  type DDRows,
  ROW_BLOCK,
  type State,
  systemResiduals,
} from "./_refine_pass.ts";

export { type DDRows, ROW_BLOCK };
import * as K from "./_dd_kernels.ts";
import { rowArray } from "../arrays.ts";
import { applyQInPlace, applyQtInPlace } from "./apply_qt.ts";
import { solveR } from "./solve_r.ts";
import { scaledConditionNumber } from "./scaled_condition.ts";
import type { DDVector } from "./dd_least_squares.ts";
import type { LeastSquaresFit } from "./least_squares.ts";

/** Most refinement steps taken. */
export const MAX_STEPS = 4;

/** The refined solution; each quantity is hi + lo. */
export interface RefinedLeastSquares {
  coefficients: Float64Array;
  coefficientsLo: Float64Array;
  /** y − A·x, unweighted (the whitened residual divided by the row scale). */
  residuals: Float64Array;
  residualsLo: Float64Array;
  /** Σ (wᵢ·rᵢ)² (Σ rᵢ² without row scales). */
  rss: number;
  rssLo: number;
  /** The relative size of each correction applied (largest |δx̃_k|/|x̃_k|). */
  corrections: number[];
}

/**
 * Refines the double QR solution of min ‖W(b − A·x)‖₂ (W = diag(rowScale)).
 *
 * @param ls The double solution of the whitened problem: its pivoted QR of
 *   W·A·S, the scales S, the coefficients, Qᵀ(W·b) and its residuals
 *   (`leastSquares`).
 * @param a A, unweighted, as hi + lo (the data as printed): its columns, or
 *   its rows on demand.
 * @param y b, unweighted, as hi + lo.
 * @param rowScale wᵢ per row (√ of a weight), exact doubles; null for none.
 * @param options Whether the solution's own arrays may be overwritten.
 * @returns The refined solution, or null when refinement cannot converge
 *   (see the module notes) or meets a value that is not finite.
 * @example
 * ```ts
 * import { leastSquares } from "./least_squares.ts";
 * import { refineLeastSquares } from "./refine_least_squares.ts";
 * // y = 0.1 + 0.2x as printed: the doubles of 0.1, 0.3, 0.5 and their decimal corrections.
 * const one = new Float64Array([1, 1, 1]), x = new Float64Array([0, 1, 2]);
 * const y = { hi: [0.1, 0.3, 0.5], lo: [5.551115123125783e-18, -1.1102230246251566e-17, 0] };
 * const ls = leastSquares([one, x], Float64Array.from(y.hi), ["a", "b"]);
 * if (!ls.fullRank) throw new Error("full rank");
 * const r = refineLeastSquares(ls, [{ hi: one, lo: null }, { hi: x, lo: null }], y, null)!;
 * if (Math.abs(r.rss) > 1e-31) throw new Error(`rss ${r.rss}`);
 * ```
 */
export function refineLeastSquares(
  ls: Pick<LeastSquaresFit, "qr" | "scale" | "coefficients" | "qty" | "residuals" | "fitted">,
  a: DDRows | readonly DDVector[],
  y: DDVector,
  rowScale: ArrayLike<number> | null,
  options: RefineOptions = {},
): RefinedLeastSquares | null {
  const { qr } = ls, m = qr.m, p = qr.n;
  const kappa = scaledConditionNumber(qr), uc = SAFETY * 2 ** -53 * growth(m);
  const rate = kappa * uc;
  if (!(rate < 0.5) || qr.rank < p) return null;
  // The solution's own m-long arrays are the work space when offered (already touched: see
  // the module notes), else new ones.
  const own = options.reuse === true;
  const f = own ? ls.fitted : rowArray(m);
  // Start: x₀ from the QR. r₀ = the double residual b − A·x₀ when a first semi-normal step
  // (rate κ²·u·c(m)) converges at once, else Björck's r₀ = Q·(0, (Qᵀb)₂).
  const cheap = kappa * kappa * uc < CHEAP_START;
  let rh: Float64Array;
  if (cheap) rh = own ? ls.residuals : ls.residuals.slice();
  else {
    rh = own ? ls.residuals : rowArray(m);
    rh.set(ls.qty);
    rh.fill(0, 0, p);
    applyQInPlace(qr, rh);
  }
  const rl = own ? ls.qty.fill(0) : new Float64Array(m);
  const s: State = { xh: ls.coefficients.slice(), xl: new Float64Array(p), rh, rl };
  const rows = "block" in a ? a : columnRows(a);
  const data: Data = { rows, y, w: rowScale, p };
  const corrections: number[] = [];
  for (let step = 0; step < MAX_STEPS; step++) {
    const g = systemResiduals(data, s, f);
    if (g === null) return null;
    const c = correct(ls, s, f, g);
    if (!Number.isFinite(c)) return null;
    corrections.push(c);
    if ((step === 0 && cheap ? kappa * rate : rate) * c <= TARGET) break;
    if (step > 0 && c > 0.5 * corrections[step - 1]) break;
  }
  return { ...finish(data, s), coefficients: s.xh, coefficientsLo: s.xl, corrections };
}

/** Options of {@link refineLeastSquares}. */
export interface RefineOptions {
  /**
   * Work in the solution's own m-long arrays (`qty`, `residuals`, `fitted`),
   * overwriting them; without a row scale the residuals returned are two of
   * them. Default false.
   */
  reuse?: boolean;
}

/** Largest estimated rate κ²·u·c(m) of a semi-normal first step for which r₀ is the double residual. */
const CHEAP_START = 1e-3;

/** Estimated error left after a step, relative to the coefficient, below which steps stop. */
const TARGET = 1e-15;
/** Margin on the estimated rate κ·u·c(m). */
const SAFETY = 4;

/**
 * c(m): the growth of rounding errors in the factorization's sums over m
 * rows, √128 + √256 + √(m/65536) for the two-level blocked sums of
 * `_householder.ts` (random-walk growth of each level; common practice, no
 * source for the form). Measured on Filip at 1,000,000 rows: step 2's
 * correction was 3.7e−5 of step 1's, against κ·u·c(m) = 1.8e−5.
 */
function growth(m: number): number {
  return Math.sqrt(128) + 16 + Math.sqrt(m / 65536);
}

/**
 * Solves the correction system with the double factorization and applies it
 * (Björck's formulas; see the module notes). f is overwritten. Returns the
 * largest relative change of a scaled coefficient.
 */
function correct(
  ls: Pick<LeastSquaresFit, "qr" | "scale">,
  s: State,
  f: Float64Array,
  g: Float64Array,
): number {
  const { qr, scale } = ls, m = qr.m, p = qr.n, perm = qr.perm;
  // u = R̃⁻ᵀ·g̃ (forward substitution), g̃_k = s_π(k)·g_π(k)
  const u = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    let t = g[perm[k]] * scale[perm[k]];
    for (let l = 0; l < k; l++) t -= qr.qr[l + k * m] * u[l];
    u[k] = t / qr.qr[k + k * m];
  }
  // d = Qᵀf; δx̃ = R̃⁻¹(d₁ − u); δr = Q·(u, d₂), all in f's buffer
  const d = applyQtInPlace(qr, f);
  for (let k = 0; k < p; k++) d[k] -= u[k];
  const dx = solveR(qr, d, p);
  d.set(u);
  const dr = applyQInPlace(qr, d);
  let change = 0, size = 0;
  for (let k = 0; k < p; k++) {
    const j = perm[k];
    K.add(s.xh[j], s.xl[j], dx[k] * scale[j], 0);
    s.xh[j] = K.OUT[0];
    s.xl[j] = K.OUT[1];
    size = Math.max(size, Math.abs(s.xh[j] / scale[j]));
  }
  for (let k = 0; k < p; k++) {
    const xk = Math.abs(s.xh[perm[k]] / scale[perm[k]]);
    change = Math.max(change, Math.abs(dx[k]) / Math.max(xk, 1e-10 * size));
  }
  const { rh, rl } = s;
  for (let i = 0; i < m; i++) {
    const t = rh[i] + dr[i];
    const e = sumError(rh[i], dr[i], t) + rl[i];
    rh[i] = t + e;
    rl[i] = fastSumError(t, e, rh[i]);
  }
  return change;
}

/** Unweighted residuals r/w and RSS = Σr² (Dot2: the exact errors of squares and sums carried). */
function finish(d: Data, s: State) {
  const m = s.rh.length, { rh, rl } = s, w = d.w;
  let sh = 0, sl = 0;
  for (let i = 0; i < m; i++) {
    const a = rh[i], q = a * a, t = sh + q;
    sl += sumError(sh, q, t) + (productError(a, a, q) + 2 * a * rl[i]);
    sh = t;
  }
  const rss = sh + sl, rssLo = fastSumError(sh, sl, rss);
  if (w === null) return { residuals: rh, residualsLo: rl, rss, rssLo };
  const residuals = rowArray(m), residualsLo = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    K.div(rh[i], rl[i], w[i], 0);
    residuals[i] = K.OUT[0];
    residualsLo[i] = K.OUT[1];
  }
  return { residuals, residualsLo, rss, rssLo };
}
