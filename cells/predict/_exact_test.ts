/**
 * Test support for the predict cell: (weighted) least squares in exact
 * rational arithmetic (BigInt fractions, `cells/fit/_rational_test.ts`) by
 * the normal equations, β = (XᵀWX)⁻¹XᵀWy (Draper & Smith, *Applied
 * Regression Analysis*, 3rd ed., §9.2; from memory for the section), and
 * the exact fraction a double denotes.
 *
 * @module
 */
import {
  add,
  dec,
  int,
  inverse,
  mul,
  type Q,
  q,
  sub,
  sum,
  times,
  val,
} from "../fit/_rational_test.ts";

export { add, dec, int, mul, type Q, sub, sum, val };

/** The exact fraction a finite double denotes (doubling is exact, so the loop ends with an integer). */
export function exact(v: number): Q {
  let m = v, e = 0n;
  while (!Number.isInteger(m)) [m, e] = [m * 2, e + 1n];
  return q(BigInt(m), 2n ** e);
}

/** Exact weighted least squares and what predictions need from it. */
export interface ExactFit {
  beta: Q[];
  /** (XᵀWX)⁻¹, p×p. */
  bread: Q[][];
  residuals: Q[];
  /** Σwᵢeᵢ²/(n − p). */
  s2: Q;
  /** gᵀMg for a p×p matrix of fractions. */
  form(m: Q[][], g: Q[]): Q;
}

/**
 * Fits exactly.
 *
 * @param rows The design rows.
 * @param y The response.
 * @param w The weights (null: all 1).
 * @returns The exact fit.
 */
export function exactFit(rows: Q[][], y: Q[], w: Q[] | null): ExactFit {
  const p = rows[0].length, n = rows.length;
  const wt = (i: number) => (w === null ? int(1) : w[i]);
  const ix = [...Array(p).keys()];
  const xtwx = ix.map((j) => ix.map((k) => sum(rows.map((r, i) => mul(wt(i), mul(r[j], r[k]))))));
  const bread = inverse(xtwx);
  const beta = times(bread, ix.map((j) => sum(rows.map((r, i) => mul(wt(i), mul(r[j], y[i]))))));
  const residuals = rows.map((r, i) => sub(y[i], sum(r.map((x, j) => mul(x, beta[j])))));
  const rss = sum(residuals.map((e, i) => mul(wt(i), mul(e, e))));
  const form = (m: Q[][], g: Q[]) => sum(times(m, g).map((v, j) => mul(v, g[j])));
  return { beta, bread, residuals, s2: mul(rss, [1n, BigInt(n - p)]), form };
}
