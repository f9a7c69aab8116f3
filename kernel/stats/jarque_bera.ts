/**
 * Jarque–Bera test of normality from skewness and kurtosis.
 *
 * Method: Jarque & Bera (1987), "A test for normality of observations and
 * regression residuals", International Statistical Review 55:163–172:
 * JB = n/6·(S² + (K − 3)²/4) against χ²(2), with the biased (divide-by-n)
 * central moments S = m₃/m₂^{3/2} and K = m₄/m₂² (K is not the excess).
 *
 * @module
 */
import { chiSquared } from "./chi_squared.ts";

/** The statistic, its p-value, and S and K. */
export interface JarqueBera {
  statistic: number;
  p_value: number;
  skewness: number;
  kurtosis: number;
}

/**
 * Jarque–Bera test of a sample.
 *
 * @param x The sample (residuals; √w-scaled for a weighted fit).
 * @returns The test; null for fewer than 2 values or zero spread.
 * @example
 * ```ts
 * import { jarqueBera } from "./jarque_bera.ts";
 * // (−1, 1) twice: S = 0, K = 1, JB = 4/6·(4/4) = 2/3 (hand computation).
 * const jb = jarqueBera([-1, 1, -1, 1]);
 * if (jb === null || Math.abs(jb.statistic - 2 / 3) > 1e-15) throw new Error();
 * ```
 */
export function jarqueBera(x: ArrayLike<number>): JarqueBera | null {
  const n = x.length;
  if (n < 2) return null;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i];
  mean /= n;
  let m2 = 0, m3 = 0, m4 = 0;
  for (let i = 0; i < n; i++) {
    const d = x[i] - mean, d2 = d * d;
    m2 += d2;
    m3 += d2 * d;
    m4 += d2 * d2;
  }
  m2 /= n;
  m3 /= n;
  m4 /= n;
  if (!(m2 > 0)) return null;
  const skewness = m3 / m2 ** 1.5, kurtosis = m4 / (m2 * m2);
  const statistic = n / 6 * (skewness ** 2 + (kurtosis - 3) ** 2 / 4);
  return { statistic, p_value: chiSquared(2).upper(statistic), skewness, kurtosis };
}
