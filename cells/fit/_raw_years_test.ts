/**
 * Test support: an ill-conditioned design a practitioner could have, a
 * polynomial in raw calendar years (x = 1900 … 2020, not centred), with
 * invented responses printed to two decimals, and its least-squares fit in
 * exact rational arithmetic (BigInt fractions, `_rational_test.ts`): the
 * normal equations solved exactly, so every derived quantity is exact
 * before the one rounding of `val`.
 *
 * @module
 */
import { div, int, inverse, mul, type Q, q, sub, sum, times, val } from "./_rational_test.ts";

/** x = 1900 … 2020, one row a year. */
export const YEARS = Array.from({ length: 121 }, (_, i) => 1900 + i);

/** Invented responses in hundredths (a slow rise, a cycle and a jitter), printed as 14.05 … */
const HUNDREDTHS = YEARS.map((_, i) =>
  1400 + Math.round(40 * Math.sin(i / 7)) + Math.round(0.01 * i * i) + ((i * 37) % 11) - 5
);

/** The responses as the doubles a table reads from their two-decimal text. */
export const RESPONSES = HUNDREDTHS.map((h) => Number((h / 100).toFixed(2)));

/** The exact least-squares fit of a polynomial of `degree` in {@link YEARS}. */
export interface ExactPolynomial {
  /** Coefficients b0 … b_degree, rounded once. */
  estimates: number[];
  /** Their standard errors √(s²·(XᵀX)⁻¹_jj). */
  stdErrors: number[];
  /** s² = RSS/(n − p). */
  s2: number;
  /** The mean response at x₀ and s²·g₀ᵀ(XᵀX)⁻¹g₀ (g₀ = (1, x₀, … x₀^degree)), each rounded once. */
  at(x0: number): { estimate: number; variance: number };
  /** Leverages hᵢ = xᵢᵀ(XᵀX)⁻¹xᵢ of every row. */
  leverage(): number[];
}

/**
 * Solves the polynomial fit exactly.
 *
 * @param degree The polynomial's degree.
 * @returns The exact fit (see {@link ExactPolynomial}).
 */
export function exactPolynomial(degree: number): ExactPolynomial {
  const p = degree + 1, n = YEARS.length;
  const row = (x: number): Q[] => Array.from({ length: p }, (_, k) => q(BigInt(x) ** BigInt(k)));
  const X = YEARS.map(row);
  const y = HUNDREDTHS.map((h) => q(BigInt(h), 100n));
  const xtx = Array.from(
    { length: p },
    (_, a) => Array.from({ length: p }, (_, b) => sum(X.map((r) => mul(r[a], r[b])))),
  );
  const xty = Array.from({ length: p }, (_, a) => sum(X.map((r, i) => mul(r[a], y[i]))));
  const inv = inverse(xtx);
  const beta = times(inv, xty);
  const rss = sum(X.map((r, i) => {
    const e = sub(y[i], sum(r.map((v, k) => mul(v, beta[k]))));
    return mul(e, e);
  }));
  const s2 = div(rss, int(n - p));
  const form = (g: Q[]) => sum(g.map((v, a) => mul(v, sum(g.map((w, b) => mul(inv[a][b], w))))));
  return {
    estimates: beta.map(val),
    stdErrors: inv.map((r, j) => Math.sqrt(val(mul(s2, r[j])))),
    s2: val(s2),
    at(x0) {
      const g = row(x0);
      return {
        estimate: val(sum(g.map((v, k) => mul(v, beta[k])))),
        variance: val(mul(s2, form(g))),
      };
    },
    leverage: () => X.map((r) => val(form(r))),
  };
}
