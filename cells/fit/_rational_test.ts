/**
 * Test support: exact rational arithmetic in BigInt fractions, for checks
 * done by hand computation in the tests ("exact rational arithmetic" as a
 * source). A fraction is [numerator, denominator], kept in lowest terms with
 * a positive denominator; every operation is exact, and only `val` rounds
 * (once, to the nearest double).
 *
 * @module
 */

/** A fraction n/d, d > 0, in lowest terms. */
export type Q = [bigint, bigint];

const gcd = (a: bigint, b: bigint): bigint => (b === 0n ? (a < 0n ? -a : a) : gcd(b, a % b));

/** n/d in lowest terms. */
export const q = (n: bigint, d = 1n): Q => {
  const g = gcd(n, d) * (d < 0n ? -1n : 1n);
  return [n / g, d / g];
};
export const add = (a: Q, b: Q): Q => q(a[0] * b[1] + b[0] * a[1], a[1] * b[1]);
export const sub = (a: Q, b: Q): Q => q(a[0] * b[1] - b[0] * a[1], a[1] * b[1]);
export const mul = (a: Q, b: Q): Q => q(a[0] * b[0], a[1] * b[1]);
export const div = (a: Q, b: Q): Q => q(a[0] * b[1], a[1] * b[0]);
/**
 * The double nearest n/d: the quotient is taken to 70 bits in integers, then
 * rounded once by `Number` (round to nearest) and scaled by a power of 2.
 */
export const val = (a: Q): number => {
  if (a[0] === 0n) return 0;
  const bits = (x: bigint) => (x < 0n ? -x : x).toString(2).length;
  const k = 70 - (bits(a[0]) - bits(a[1]));
  const quotient = k >= 0 ? (a[0] << BigInt(k)) / a[1] : a[0] / (a[1] << BigInt(-k));
  return Number(quotient) * 2 ** -k;
};
/** An integer as a fraction. */
export const int = (n: number): Q => q(BigInt(n));
/** A number written in decimal (`"0.25"`, `"-3.5e-2"`) as the exact fraction it denotes. */
export const dec = (s: string): Q => {
  const m = /^(-?)(\d*)(?:\.(\d*))?(?:e([+-]?\d+))?$/i.exec(s);
  if (m === null) throw new RangeError(`Not a decimal number: "${s}"`);
  const frac = m[3] ?? "";
  const exp = Number(m[4] ?? 0) - frac.length;
  const digits = BigInt(`${m[1]}${m[2] || "0"}${frac}`);
  return exp >= 0 ? q(digits * 10n ** BigInt(exp)) : q(digits, 10n ** BigInt(-exp));
};
/** Σ of fractions. */
export const sum = (xs: readonly Q[]): Q => xs.reduce(add, int(0));

/** The inverse of a square matrix of fractions by Gauss–Jordan elimination (exact). */
export function inverse(a: readonly (readonly Q[])[]): Q[][] {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...a.map((_, j) => int(i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    const r = m.findIndex((row, i) => i >= c && row[c][0] !== 0n);
    if (r < 0) throw new RangeError("Singular matrix");
    [m[c], m[r]] = [m[r], m[c]];
    const pivot = m[c][c];
    m[c] = m[c].map((x) => div(x, pivot));
    for (let i = 0; i < n; i++) {
      if (i === c || m[i][c][0] === 0n) continue;
      const f = m[i][c];
      m[i] = m[i].map((x, j) => sub(x, mul(f, m[c][j])));
    }
  }
  return m.map((row) => row.slice(n));
}

/** The product of a matrix of fractions and a vector of fractions. */
export function times(a: readonly (readonly Q[])[], v: readonly Q[]): Q[] {
  return a.map((row) => sum(row.map((x, j) => mul(x, v[j]))));
}

/**
 * Weighted least squares for y = a + b·x by the normal equations in exact
 * rationals (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §9.2:
 * b = (S₀T₁ − S₁T₀)/D, a = (T₀ − bS₁)/S₀, D = S₀S₂ − S₁², Var b = σ²S₀/D,
 * Var a = σ²S₂/D with Sₖ = Σwxᵏ, Tₖ = Σwxᵏy; σ² = Σw r²/(n − 2)). x are
 * integers; y are taken as the decimals they print as (`String(y)`).
 */
export function exactWls(x: number[], y: number[], w: Q[]) {
  let s0 = int(0), s1 = int(0), s2 = int(0), t0 = int(0), t1 = int(0);
  const yq = y.map((v) => dec(String(v)));
  x.forEach((xi, i) => {
    s0 = add(s0, w[i]);
    s1 = add(s1, mul(w[i], int(xi)));
    s2 = add(s2, mul(w[i], int(xi * xi)));
    t0 = add(t0, mul(w[i], yq[i]));
    t1 = add(t1, mul(w[i], mul(int(xi), yq[i])));
  });
  const d = sub(mul(s0, s2), mul(s1, s1));
  const b = div(sub(mul(s0, t1), mul(s1, t0)), d);
  const a = div(sub(t0, mul(b, s1)), s0);
  let rss = int(0);
  x.forEach((xi, i) => {
    const r = sub(yq[i], add(a, mul(b, int(xi))));
    rss = add(rss, mul(w[i], mul(r, r)));
  });
  return { a, b, rss, varA: div(s2, d), varB: div(s0, d) };
}
