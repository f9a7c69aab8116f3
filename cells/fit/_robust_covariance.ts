/**
 * The covariance of a robust (M-) estimate: Huber's sandwich with its
 * small-sample correction factor.
 *
 * Method (Huber 1967, Proc. 5th Berkeley Symp. 1:221–233, for the sandwich
 * A⁻¹BA⁻¹; Huber, *Robust Statistics*, 1981, §7.6, for the three estimates
 * of it below, from memory; the same three are statsmodels' RLM H1–H3).
 * With uᵢ = √wᵢ·rᵢ/s the scaled residuals, X̃ the design (or the Jacobian
 * at the estimates) with rows scaled by √wᵢ (prior weights), q its columns,
 * m = mean ψ′(uᵢ), K = 1 + (q/n)·var ψ′/m² (var with divisor n) and
 * S = Σψ(uᵢ)²/(n − p):
 *
 * ```
 *  sandwich (Huber 1981 (7.6.7)):  K⁻¹·S·s²·W⁻¹(X̃ᵀX̃)W⁻¹,  W = Σ ψ′(uᵢ)·x̃ᵢx̃ᵢᵀ
 *  scaled   (Huber 1981 (7.6.5)):  K²·S/m²·s²·(X̃ᵀX̃)⁻¹
 * ```
 *
 * The sandwich is used; when W is not positive definite (a redescending
 * loss, bisquare, with many rows where ψ′ < 0) the scaled form is used and
 * the record says so; when m ≤ 0 neither exists and the fit is refused.
 * With ψ′ = 1 on every row (Huber with no residual beyond c·s) K = 1, W =
 * X̃ᵀX̃ and both are s²·Σuᵢ²/(n − p)·(X̃ᵀX̃)⁻¹ = RSS/(n − p)·(X̃ᵀX̃)⁻¹, the
 * least-squares covariance.
 *
 * Computed through the QR of X̃ (never X̃ᵀX̃): X̃P = QR, M = Σ ψ′(uᵢ)qᵢqᵢᵀ
 * (qᵢ row i of Q), so W = PRᵀMRPᵀ and W⁻¹(X̃ᵀX̃)W⁻¹ = P·R⁻¹M⁻²R⁻ᵀ·Pᵀ, with M
 * factored by Cholesky (its failure is W not positive definite). For a
 * nonlinear model the bread drops the second derivatives of the model (the
 * Gauss–Newton form of A), as the least-squares covariance (JᵀJ)⁻¹ does.
 *
 * @module
 */
import { applyQ, householderQR, invertR } from "../../kernel/linalg/mod.ts";
import type { LossFunctions } from "./_robust_loss.ts";

/** The covariance of the estimates and how it was formed. */
export interface RobustCovariance {
  /** q×q column-major, in the order of the columns given. */
  covariance: Float64Array;
  /** (X̃ᵀX̃)⁻¹, q×q column-major (the fit's unscaled covariance). */
  unscaled: Float64Array;
  form: "sandwich" | "scaled";
  /** The correction factor K. */
  k: number;
  /** mean ψ′(uᵢ). */
  meanDpsi: number;
}

/**
 * The covariance of an M-estimate.
 *
 * @param columns The columns of X̃ (rows already scaled by √wᵢ), n each.
 * @param u The scaled residuals √wᵢ·rᵢ/s.
 * @param s The robust scale.
 * @param df The residual degrees of freedom n − p.
 * @param f The loss (ψ, ψ′).
 * @returns The covariance, (X̃ᵀX̃)⁻¹ and the form used; null when mean ψ′ ≤ 0.
 * @example
 * ```ts
 * import { robustCovariance } from "./_robust_covariance.ts";
 * import { lossFunctions } from "./_robust_loss.ts";
 * // A mean of four values, no residual beyond c·s: the least-squares Σr²/(n − 1)/n.
 * const u = Float64Array.of(0.5, -0.5, 1, -1), s = 2;
 * const c = robustCovariance([new Float64Array(4).fill(1)], u, s, 3, lossFunctions("huber", 1.345))!;
 * if (Math.abs(c.covariance[0] - 4 * 2.5 / 3 / 4) > 1e-15 || c.form !== "sandwich") throw new Error();
 * ```
 */
export function robustCovariance(
  columns: readonly Float64Array[],
  u: Float64Array,
  s: number,
  df: number,
  f: Pick<LossFunctions, "psi" | "dpsi">,
): RobustCovariance | null {
  const n = u.length, q = columns.length;
  const d = u.map(f.dpsi);
  let m = 0, ss = 0;
  for (let i = 0; i < n; i++) {
    m += d[i];
    ss += f.psi(u[i]) ** 2;
  }
  m /= n;
  if (!(m > 0)) return null;
  let v = 0;
  for (let i = 0; i < n; i++) v += (d[i] - m) ** 2;
  v /= n;
  const k = 1 + (q / n) * v / (m * m);
  const scale = ss / df * s * s;
  const a = new Float64Array(n * q);
  columns.forEach((c, j) => a.set(c, j * n));
  const qr = householderQR(a, n, q);
  const rinv = invertR(qr, q);
  const middle = cholesky(gramOfQ(qr, d, q));
  const pivoted = middle === null
    ? product(rinv, identity(q), q, k * k * scale / (m * m))
    : product(rinv, inverseSquared(middle, q), q, scale / k);
  return {
    covariance: unpivot(pivoted, qr.perm, q),
    unscaled: unpivot(product(rinv, identity(q), q, 1), qr.perm, q),
    form: middle === null ? "scaled" : "sandwich",
    k,
    meanDpsi: m,
  };
}

/** M = Σ dᵢ·qᵢqᵢᵀ over the rows of the thin Q (q×q column-major). */
function gramOfQ(qr: ReturnType<typeof householderQR>, d: Float64Array, q: number): Float64Array {
  const n = d.length;
  const cols: Float64Array[] = [];
  for (let j = 0; j < q; j++) {
    const e = new Float64Array(n);
    e[j] = 1;
    cols.push(applyQ(qr, e));
  }
  const g = new Float64Array(q * q);
  for (let a = 0; a < q; a++) {
    for (let b = 0; b <= a; b++) {
      let t = 0;
      const ca = cols[a], cb = cols[b];
      for (let i = 0; i < n; i++) t += d[i] * ca[i] * cb[i];
      g[a + b * q] = t;
      g[b + a * q] = t;
    }
  }
  return g;
}

/** The lower Cholesky factor L (LLᵀ = g), or null when g is not positive definite. */
function cholesky(g: Float64Array, q = Math.round(Math.sqrt(g.length))): Float64Array | null {
  const l = new Float64Array(q * q);
  for (let j = 0; j < q; j++) {
    let t = g[j + j * q];
    for (let k = 0; k < j; k++) t -= l[j + k * q] ** 2;
    // Relative to the diagonal entry: a pivot lost to rounding is not positive.
    if (!(t > 1e-12 * Math.abs(g[j + j * q]))) return null;
    const ljj = Math.sqrt(t);
    l[j + j * q] = ljj;
    for (let i = j + 1; i < q; i++) {
      let x = g[i + j * q];
      for (let k = 0; k < j; k++) x -= l[i + k * q] * l[j + k * q];
      l[i + j * q] = x / ljj;
    }
  }
  return l;
}

/** M⁻² = (M⁻¹)² from M's Cholesky factor L: M⁻¹ = L⁻ᵀL⁻¹. */
function inverseSquared(l: Float64Array, q: number): Float64Array {
  const linv = new Float64Array(q * q);
  for (let j = 0; j < q; j++) {
    linv[j + j * q] = 1 / l[j + j * q];
    for (let i = j + 1; i < q; i++) {
      let t = 0;
      for (let k = j; k < i; k++) t += l[i + k * q] * linv[k + j * q];
      linv[i + j * q] = -t / l[i + i * q];
    }
  }
  const minv = new Float64Array(q * q);
  for (let a = 0; a < q; a++) {
    for (let b = 0; b < q; b++) {
      let t = 0;
      for (let k = Math.max(a, b); k < q; k++) t += linv[k + a * q] * linv[k + b * q];
      minv[a + b * q] = t;
    }
  }
  return multiply(minv, minv, q);
}

function identity(q: number): Float64Array {
  const e = new Float64Array(q * q);
  for (let j = 0; j < q; j++) e[j + j * q] = 1;
  return e;
}

function multiply(a: Float64Array, b: Float64Array, q: number): Float64Array {
  const c = new Float64Array(q * q);
  for (let i = 0; i < q; i++) {
    for (let j = 0; j < q; j++) {
      let t = 0;
      for (let k = 0; k < q; k++) t += a[i + k * q] * b[k + j * q];
      c[i + j * q] = t;
    }
  }
  return c;
}

/** factor·R⁻¹·mid·R⁻ᵀ, symmetrised. */
function product(rinv: Float64Array, mid: Float64Array, q: number, factor: number): Float64Array {
  const left = multiply(rinv, mid, q);
  const out = new Float64Array(q * q);
  for (let i = 0; i < q; i++) {
    for (let j = 0; j <= i; j++) {
      let t = 0;
      for (let k = 0; k < q; k++) t += left[i + k * q] * rinv[j + k * q];
      out[i + j * q] = out[j + i * q] = factor * t;
    }
  }
  return out;
}

/** From pivoted order (column k is original column perm[k]) back to the original order. */
function unpivot(c: Float64Array, perm: Int32Array, q: number): Float64Array {
  const out = new Float64Array(q * q);
  for (let a = 0; a < q; a++) {
    for (let b = 0; b < q; b++) out[perm[a] + perm[b] * q] = c[a + b * q];
  }
  return out;
}
