/**
 * Heteroscedasticity-consistent ("sandwich") covariance of least-squares
 * estimates, HC0–HC3.
 *
 * Method: White (1980), Econometrica 48:817–838 (HC0), and MacKinnon & White
 * (1985), "Some heteroskedasticity-consistent covariance matrix estimators
 * with improved finite sample properties", J. Econometrics 29:305–325
 * (HC1–HC3): Cov = (XᵀX)⁻¹·(Σ ωᵢ xᵢxᵢᵀ)·(XᵀX)⁻¹ with ωᵢ = eᵢ² (HC0),
 * n/(n − p)·eᵢ² (HC1), eᵢ²/(1 − hᵢ) (HC2), eᵢ²/(1 − hᵢ)² (HC3); with
 * bᵢ = (XᵀX)⁻¹xᵢ the sandwich is Σ ωᵢbᵢbᵢᵀ. Weighted fits use x̃ᵢ = √wᵢxᵢ
 * and ẽᵢ = √wᵢeᵢ; nonlinear fits the Jacobian at the solution.
 *
 * Through the fit's own triangular factor ({@link robustCovarianceOfFactor}):
 * with X̃·P = Q₁·R̃ (X̃ = √W·X·S, S the power-of-two column scales; kernel/linalg
 * `TriangularFactor`), bᵢ = S·P·yᵢ where R̃ᵀzᵢ = g̃ᵢ (g̃ᵢ row i of X̃, permuted)
 * and R̃yᵢ = zᵢ: a forward and a back substitution per row (Golub & Van Loan,
 * *Matrix Computations*, 4th ed., §3.1), in double-double when the factor is,
 * and hᵢ = ‖zᵢ‖². The covariance is then Σ ωᵢbᵢbᵢᵀ, its diagonal a sum of
 * terms ≥ 0. The form with the explicit bread multiplies (XᵀX)⁻¹ by the meat
 * Σ ωᵢxᵢxᵢᵀ twice, sums of terms of alternating sign that lose about κ² of
 * the digits: on a degree-3 polynomial in raw calendar years (1900–2020) its
 * HC0 standard errors differ from exact rational arithmetic by 3e−4
 * relative; on degree 5 every HC0 variance comes out negative and the HC3
 * ones 115–207 times too large. Through the factor all are within 1e−15
 * (cells/check/robust_test.ts).
 *
 * @module
 */
import { LEVERAGE_ONE_TOLERANCE } from "./leverage.ts";
import type { DDVector, TriangularFactor } from "../linalg/mod.ts";
import { addDD, divDD, mulDD } from "../dd.ts";

/** Which estimator. */
export type HCType = "hc0" | "hc1" | "hc2" | "hc3";

/** The robust covariance and standard errors. */
export interface RobustCovariance {
  type: HCType;
  /** p×p column-major; NaN where it does not exist. */
  covariance: Float64Array;
  /** √diag, null where not finite (HC2/HC3 with a leverage of 1, a parameter at a bound). */
  stdErrors: (number | null)[];
  /**
   * Through the factor only: the middle M = Σ ωᵢ·zᵢzᵢᵀ in the factor's own
   * orthonormal coordinates (zᵢ = R̃⁻ᵀg̃ᵢ, row i of Q₁; q×q column-major,
   * pivot order), so that the robust variance of gᵀθ̂ is z̃ᵀ·M·z̃ with
   * R̃ᵀz̃ = g̃ (kernel/linalg `inverseGramForms` with `middle`). Its entries
   * are bounded by maxᵢ ωᵢ (‖zᵢ‖² = hᵢ ≤ 1): no (XᵀX)⁻¹ enters.
   */
  middle?: Float64Array;
}

/** ωᵢ of the estimator from ẽᵢ² and hᵢ (NaN for HC2/HC3 at a leverage of 1 with ẽᵢ ≠ 0). */
function omegaOf(type: HCType, e2: number, h: number, n: number, p: number): number {
  const gap = 1 - h;
  return type === "hc0"
    ? e2
    : type === "hc1"
    ? e2 * n / (n - p)
    : gap < LEVERAGE_ONE_TOLERANCE
    ? (e2 === 0 ? 0 : NaN)
    : type === "hc2"
    ? e2 / gap
    : e2 / (gap * gap);
}

/** What {@link robustCovarianceOfFactor} reads. */
export interface FactorSandwich {
  /** R̃ of the (√w-scaled, column-scaled) design, pivot order and scales (kernel/linalg). */
  factor: TriangularFactor;
  /**
   * The design columns by their own index, each n long: hi + lo (lo null
   * for doubles); columns outside the factor's order are not read.
   */
  columns: readonly DDVector[];
  /** eᵢ (unweighted). */
  residuals: Float64Array;
  /** wᵢ per row, or null; √wᵢ is taken as an exact double. */
  weights: Float64Array | null;
  type: HCType;
}

/**
 * HC covariance of the estimates through the fit's triangular factor (see
 * the module notes): no explicit (XᵀX)⁻¹, hᵢ from the same solves.
 *
 * @param s The factor, design columns, residuals, weights and estimator.
 * @returns The covariance over all design columns (NaN rows and columns for
 *   those outside the factor, e.g. a parameter held at a bound) and standard errors.
 * @throws {RangeError} When a column the factor covers is not n long.
 * @example
 * ```ts
 * import { householderQR, factorOfQR } from "../linalg/mod.ts";
 * import { robustCovarianceOfFactor } from "./robust_covariance.ts";
 * // Mean only, e = (1, −1, 2, −2): HC0 var = Σe²/n² = 10/16 (hand computation).
 * const one = new Float64Array(4).fill(1);
 * const factor = factorOfQR(householderQR(one.slice(), 4, 1), Float64Array.of(1));
 * const r = robustCovarianceOfFactor({ factor, columns: [{ hi: one, lo: null }],
 *   residuals: new Float64Array([1, -1, 2, -2]), weights: null, type: "hc0" });
 * if (Math.abs(r.covariance[0] - 10 / 16) > 1e-15) throw new Error(String(r.covariance));
 * ```
 */
export function robustCovarianceOfFactor(s: FactorSandwich): RobustCovariance {
  const { factor: f, columns, residuals, weights, type } = s;
  const n = residuals.length, q = f.p, p = columns.length;
  for (let k = 0; k < q; k++) {
    const c = columns[f.order[k]];
    if (c === undefined || c.hi.length !== n || (c.lo !== null && c.lo.length !== n)) {
      throw new RangeError(
        `Cannot compute a robust covariance: design column ${f.order[k]} is not ${n} rows long`,
      );
    }
  }
  const solve: RowSolve = f.rLo === null ? rowDouble : rowDD;
  const y = new Float64Array(q), w = new Float64Array(3 * q);
  const acc = new Float64Array(q * q), middle = new Float64Array(q * q);
  for (let i = 0; i < n; i++) {
    const sw = weights ? Math.sqrt(weights[i]) : 1;
    const h = solve(f, columns, i, sw, y, w);
    const omega = omegaOf(type, (sw * residuals[i]) ** 2, h, n, q);
    if (omega === 0) continue;
    for (let b = 0; b < q; b++) {
      const ob = omega * y[b], oz = omega * w[b];
      for (let a = 0; a <= b; a++) {
        acc[a + b * q] += ob * y[a];
        middle[a + b * q] += oz * w[a]; // w[0…q) holds zᵢ (hi parts) after the solve
      }
    }
  }
  for (let b = 0; b < q; b++) for (let a = 0; a < b; a++) middle[b + a * q] = middle[a + b * q];
  const covariance = new Float64Array(p * p).fill(NaN);
  for (let b = 0; b < q; b++) {
    for (let a = 0; a <= b; a++) {
      const j = f.order[a], k = f.order[b];
      covariance[j + k * p] = covariance[k + j * p] = f.scale[j] * f.scale[k] * acc[a + b * q];
    }
  }
  const stdErrors = Array.from({ length: p }, (_, j) => {
    const v = covariance[j + j * p];
    return Number.isFinite(v) && v >= 0 ? Math.sqrt(v) : null;
  });
  return { type, covariance, stdErrors, middle };
}

/**
 * For row i: yᵢ = R̃⁻¹R̃⁻ᵀg̃ᵢ into `y`, g̃ᵢ the row scaled by √wᵢ (`sw`) and
 * the column scales, in pivot order; returns hᵢ = ‖R̃⁻ᵀg̃ᵢ‖². `work` (3p
 * long) holds z and any low parts.
 */
type RowSolve = (
  f: TriangularFactor,
  columns: readonly DDVector[],
  i: number,
  sw: number,
  y: Float64Array,
  work: Float64Array,
) => number;

/** {@link RowSolve} in double. */
const rowDouble: RowSolve = (f, columns, i, sw, y, work) => {
  const { p, r, order, scale } = f;
  let h = 0;
  for (let k = 0; k < p; k++) {
    const c = columns[order[k]];
    let t = (c.hi[i] + (c.lo === null ? 0 : c.lo[i])) * sw * scale[order[k]];
    for (let l = 0; l < k; l++) t -= r[l + k * p] * work[l];
    work[k] = t / r[k + k * p];
    h += work[k] * work[k];
  }
  for (let k = p - 1; k >= 0; k--) {
    let t = work[k];
    for (let l = k + 1; l < p; l++) t -= r[k + l * p] * y[l];
    y[k] = t / r[k + k * p];
  }
  return h;
};

const T = new Float64Array(2);

/**
 * {@link RowSolve} in double-double (R̃ as hi + lo, g̃ᵢ from the design's hi
 * + lo): `work` holds z (hi at 0…p−1, lo at p…2p−1) and y's lo parts.
 */
const rowDD: RowSolve = (f, columns, i, sw, y, work) => {
  const { p, r, order, scale } = f;
  const rl = f.rLo!;
  const zl = p, yl = 2 * p;
  let hh = 0, hl = 0;
  for (let k = 0; k < p; k++) {
    const c = columns[order[k]], s = scale[order[k]];
    mulDD(c.hi[i] * s, c.lo === null ? 0 : c.lo[i] * s, sw, 0, T); // s a power of two: exact
    let th = T[0], tl = T[1];
    for (let l = 0; l < k; l++) {
      mulDD(r[l + k * p], rl[l + k * p], work[l], work[zl + l], T);
      addDD(th, tl, -T[0], -T[1], T);
      th = T[0], tl = T[1];
    }
    divDD(th, tl, r[k + k * p], rl[k + k * p], T);
    work[k] = T[0], work[zl + k] = T[1];
    mulDD(T[0], T[1], T[0], T[1], T);
    addDD(hh, hl, T[0], T[1], T);
    hh = T[0], hl = T[1];
  }
  for (let k = p - 1; k >= 0; k--) {
    let th = work[k], tl = work[zl + k];
    for (let l = k + 1; l < p; l++) {
      mulDD(r[k + l * p], rl[k + l * p], y[l], work[yl + l], T);
      addDD(th, tl, -T[0], -T[1], T);
      th = T[0], tl = T[1];
    }
    divDD(th, tl, r[k + k * p], rl[k + k * p], T);
    y[k] = T[0], work[yl + k] = T[1];
  }
  // The accumulation reads y's hi parts: a diagonal entry's terms are all ≥ 0, so
  // doubles keep its relative accuracy.
  return hh + hl;
};
