/**
 * The exact null distribution of the Durbin–Watson statistic under the
 * fit's own design, by Imhof's inversion of the characteristic function.
 *
 * Under independent normal errors, d = eᵀAe/eᵀe with e = Mε (M = I − Q₁Q₁ᵀ,
 * Q₁ an orthonormal basis of the design, A the differencing matrix), so
 *
 *   P(d > d₀) = P(εᵀBε > 0),  B = M(A − d₀I)M,
 *
 * a quadratic form Σλₖξₖ² in independent standard normals ξₖ, λₖ the
 * eigenvalues of B. Imhof (1961), "Computing the distribution of quadratic
 * forms in normal variables", Biometrika 48:419–426, eq. 3.2:
 *
 *   P(Σλₖξₖ² > 0) = ½ + (1/π) ∫₀^∞ sin θ(u) / (u ρ(u)) du,
 *   θ(u) = ½ Σ arctan(λₖu),  ρ(u) = Π (1 + λₖ²u²)^¼.
 *
 * Both come from F(u) = det(I + iuB) = Π(1 + iuλₖ): θ = ½ arg F, ρ = |F|^½.
 * No eigenvalue is computed (that would cost O(n³)). Our step, by
 * Sylvester's determinant identity and M² = M, with T = I + iu(A − d₀I):
 *
 *   det(I + iuMCM) = det(I + iuCM) = det(T) · det(Q₁ᵀ T⁻¹ Q₁),
 *
 * T tridiagonal and Q₁ᵀT⁻¹Q₁ only p × p: O(np) a point. The argument is
 * taken as a sum of pivot arguments, which is the continuous arg F without
 * unwrapping: T's pivots dₖ = 1 + iucₖ + u²/dₖ₋₁ keep Re dₖ ≥ 1, and
 * Q₁ᵀT⁻¹Q₁ has a positive definite Hermitian part (wᴴT⁻¹w = |y|² − iu·yᴴCy
 * with y = T⁻¹w), which its Schur complements keep, so every pivot of its
 * elimination without pivoting lies in the right half-plane.
 *
 * The integral: 10-point Gauss–Legendre panels, narrow (1/s, s² = Σλₖ²
 * = tr B²) where the integrand oscillates and decays like exp(−s²u²/4),
 * then widening by a quarter a panel where it decays as a power of u;
 * stopped when 1/ρ(u) (a bound on what is left, relative) is below 1e-15.
 *
 * @module
 */

/** Gauss–Legendre nodes and weights on [−1, 1], 10 points (Abramowitz & Stegun, Table 25.4). */
const GL_X = [
  0.1488743389816312,
  0.4333953941292472,
  0.6794095682990244,
  0.8650633666889845,
  0.9739065285171717,
];
const GL_W = [
  0.2955242247147529,
  0.2692667193099963,
  0.2190863625159820,
  0.1494513491505806,
  0.0666713443086881,
];

/** log|F(u)| and arg F(u) for F(u) = det(I + iu·M(A − d₀I)M). */
export interface Characteristic {
  logAbs: number;
  arg: number;
}

/** Scratch arrays reused across the points of one integral (n-long, complex as re/im). */
interface Work {
  dRe: Float64Array;
  dIm: Float64Array;
  yRe: Float64Array;
  yIm: Float64Array;
}

/**
 * log|det(I + iuB)| and its continuous argument, B = M(A − d₀I)M.
 *
 * @param u The point, u > 0.
 * @param d0 The value of d.
 * @param basis Orthonormal columns Q₁ of the (√w-scaled) design, each n long.
 * @param n Rows.
 * @param work Scratch space (made when absent).
 * @returns log|F(u)| and arg F(u).
 * @example
 * ```ts
 * import { characteristic } from "./durbin_watson_exact.ts";
 * // Mean-only model, n = 3: B has eigenvalues 1 − d₀, 3 − d₀ and 0 (the path
 * // Laplacian's 0, 1, 3 with the constant vector removed; exact arithmetic).
 * const q = new Float64Array(3).fill(1 / Math.sqrt(3));
 * const f = characteristic(0.5, 2, [q], 3);
 * const want = Math.atan(-0.5) + Math.atan(0.5);
 * if (Math.abs(f.arg - want) > 1e-14) throw new Error(String(f.arg));
 * ```
 */
export function characteristic(
  u: number,
  d0: number,
  basis: readonly Float64Array[],
  n: number,
  work: Work = newWork(n),
): Characteristic {
  const { dRe, dIm } = work;
  let logAbs = 0, arg = 0;
  // The product of the pivots, taken two at a time: each pivot's argument lies
  // in (−π/2, π/2), so a pair's lies in (−π, π) and atan2 of the pair's product
  // is the sum of the two (half the atan2 calls); moduli are multiplied and
  // their log taken every 64 rows (no overflow: |dₖ| ≤ 1 + 4u + u²·… stays modest).
  let pairRe = 1, pairIm = 0, mod2 = 1;
  // T = I + iu(A − d₀I): diagonal 1 + iu(aₖ − d₀), off-diagonal −iu. Pivots dₖ.
  for (let k = 0; k < n; k++) {
    const a = (k === 0 || k === n - 1 ? (n === 1 ? 0 : 1) : 2) - d0;
    let re = 1, im = u * a;
    if (k > 0) {
      // − (−iu)² / dₖ₋₁ = u² / dₖ₋₁
      const pr = dRe[k - 1], pi = dIm[k - 1], m2 = pr * pr + pi * pi;
      re += (u * u * pr) / m2;
      im -= (u * u * pi) / m2;
    }
    dRe[k] = re;
    dIm[k] = im;
    mod2 *= re * re + im * im;
    if ((k & 1) === 0) {
      pairRe = re;
      pairIm = im;
    } else {
      arg += Math.atan2(pairRe * im + pairIm * re, pairRe * re - pairIm * im);
      pairRe = 1;
      pairIm = 0;
    }
    if ((k & 63) === 63) {
      logAbs += 0.5 * Math.log(mod2);
      mod2 = 1;
    }
  }
  if ((n & 1) === 1) arg += Math.atan2(pairIm, pairRe);
  logAbs += 0.5 * Math.log(mod2);
  const p = basis.length;
  if (p === 0) return { logAbs, arg };
  const gRe = new Float64Array(p * p), gIm = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    solveT(u, basis[j], work, n);
    for (let l = 0; l < p; l++) {
      const q = basis[l];
      let sr = 0, si = 0;
      for (let i = 0; i < n; i++) {
        sr += q[i] * work.yRe[i];
        si += q[i] * work.yIm[i];
      }
      gRe[l * p + j] = sr;
      gIm[l * p + j] = si;
    }
  }
  const g = eliminate(gRe, gIm, p);
  return { logAbs: logAbs + g.logAbs, arg: arg + g.arg };
}

function newWork(n: number): Work {
  return {
    dRe: new Float64Array(n),
    dIm: new Float64Array(n),
    yRe: new Float64Array(n),
    yIm: new Float64Array(n),
  };
}

/** y = T⁻¹q with T's pivots in `work` (forward elimination, then back substitution). */
function solveT(u: number, q: Float64Array, work: Work, n: number): void {
  const { dRe, dIm, yRe, yIm } = work;
  // Forward: zₖ = qₖ − lₖ zₖ₋₁ with lₖ = (−iu)/dₖ₋₁.
  yRe[0] = q[0];
  yIm[0] = 0;
  for (let k = 1; k < n; k++) {
    const pr = dRe[k - 1], pi = dIm[k - 1], m2 = pr * pr + pi * pi;
    // l = −iu / d = −iu·conj(d)/|d|² = (−u·pi − iu·pr)/|d|²
    const lr = (-u * pi) / m2, li = (-u * pr) / m2;
    const zr = yRe[k - 1], zi = yIm[k - 1];
    yRe[k] = q[k] - (lr * zr - li * zi);
    yIm[k] = -(lr * zi + li * zr);
  }
  // Back: yₖ = (zₖ − (−iu) yₖ₊₁)/dₖ.
  for (let k = n - 1; k >= 0; k--) {
    let zr = yRe[k], zi = yIm[k];
    if (k < n - 1) {
      zr -= u * yIm[k + 1];
      zi += u * yRe[k + 1];
    }
    const pr = dRe[k], pi = dIm[k], m2 = pr * pr + pi * pi;
    yRe[k] = (zr * pr + zi * pi) / m2;
    yIm[k] = (zi * pr - zr * pi) / m2;
  }
}

/** log|det G| and Σ arg of the pivots of Gaussian elimination without pivoting (G overwritten). */
function eliminate(re: Float64Array, im: Float64Array, p: number): Characteristic {
  let logAbs = 0, arg = 0;
  for (let k = 0; k < p; k++) {
    const pr = re[k * p + k], pi = im[k * p + k], m2 = pr * pr + pi * pi;
    logAbs += 0.5 * Math.log(m2);
    arg += Math.atan2(pi, pr);
    for (let i = k + 1; i < p; i++) {
      // l = G[i][k] / pivot
      const ar = re[i * p + k], ai = im[i * p + k];
      const lr = (ar * pr + ai * pi) / m2, li = (ai * pr - ar * pi) / m2;
      for (let j = k + 1; j < p; j++) {
        const br = re[k * p + j], bi = im[k * p + j];
        re[i * p + j] -= lr * br - li * bi;
        im[i * p + j] -= lr * bi + li * br;
      }
    }
  }
  return { logAbs, arg };
}

/**
 * P(d ≤ d₀) under independent normal errors for this design, by Imhof's integral.
 *
 * @param d0 The value of d.
 * @param basis Orthonormal columns Q₁ of the (√w-scaled) design.
 * @param n Rows (n − p ≥ 2).
 * @param traceB2 tr(B²) = Σλₖ² for this d₀ (sets the panel width).
 * @returns The probability, clamped to [0, 1].
 * @example
 * ```ts
 * import { durbinWatsonCdf } from "./durbin_watson_exact.ts";
 * // Mean-only, n = 3: d = (ξ₁² + 3ξ₂²)/(ξ₁² + ξ₂²), so P(d ≤ 2) = P(ξ₂²/ξ₁² ≤ 1) = ½
 * // (the ratio of two independent standard normals is Cauchy; exact).
 * const q = new Float64Array(3).fill(1 / Math.sqrt(3));
 * const p = durbinWatsonCdf(2, [q], 3, 2);
 * if (Math.abs(p - 0.5) > 1e-10) throw new Error(String(p));
 * ```
 */
export function durbinWatsonCdf(
  d0: number,
  basis: readonly Float64Array[],
  n: number,
  traceB2: number,
): number {
  const work = newWork(n);
  const s = Math.sqrt(Math.max(traceB2, 1e-300));
  // Wider panels serve where many eigenvalues make the integrand a smooth Gaussian
  // (checked against narrower ones to 1e-14); few eigenvalues need the narrow ones.
  let h = (n - basis.length < 50 ? 1 : 2) / s, u0 = 0, sum = 0;
  for (let panel = 0; panel < 4000; panel++) {
    let part = 0;
    let lastRho = 0;
    for (let k = 0; k < 10; k++) {
      const x = k < 5 ? -GL_X[4 - k] : GL_X[k - 5];
      const w = k < 5 ? GL_W[4 - k] : GL_W[k - 5];
      const u = u0 + (h * (x + 1)) / 2;
      const f = characteristic(u, d0, basis, n, work);
      lastRho = 0.5 * f.logAbs;
      part += w * Math.sin(0.5 * f.arg) / (u * Math.exp(lastRho));
    }
    sum += (part * h) / 2;
    u0 += h;
    // Past the Gaussian core (ρ ≥ e), the integrand decays as a power of u: widen.
    if (lastRho > 1) h *= 1.25;
    if (lastRho > 34.5) break; // 1/ρ < 1e-15
  }
  const above = 0.5 + sum / Math.PI;
  return Math.min(1, Math.max(0, 1 - above));
}
