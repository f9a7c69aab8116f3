/**
 * Test support: singular values of a matrix of doubles to about 22 digits,
 * by exact integer arithmetic, as the reference the SVD tests measure against.
 *
 * Method ("exact rational arithmetic" as a source, done here):
 *
 * 1. Every double is m·2^e exactly, so X·2^K is an integer matrix Xᵢ for a
 *    large enough K, and G = XᵢᵀXᵢ is formed exactly in BigInt. The singular
 *    values of X are σ = √λ(G)·2^−K, with no rounding so far.
 * 2. How many eigenvalues of G lie below λ is the number of negative
 *    eigenvalues of G − λI (Sylvester's law of inertia), read off the signs
 *    of its leading principal minors D₁ … Dₙ: the number of sign changes in
 *    1, D₁, …, Dₙ (Jacobi's rule for a symmetric matrix whose minors are
 *    non-zero; Gantmacher, *The Theory of Matrices* vol. 1, ch. X §3, from
 *    memory). The minors come exactly from fraction-free Gaussian elimination
 *    (Bareiss 1968, "Sylvester's identity and multistep integer-preserving
 *    Gaussian elimination", Math. Comp. 22), at a dyadic λ = a/2^s.
 * 3. Bisection on λ: first over powers of two to bracket each eigenvalue in
 *    [2^k, 2^(k+1)), then 76 halvings, so each λ is known to 2^−76 relative
 *    and σ to about 7e−24.
 *
 * @module
 */

/** An exact reference for the singular values of one matrix. */
export interface ExactSingularValues {
  /** σ largest first, rounded to double (0 for an exactly zero one). */
  sigma: number[];
  /**
   * |σ̂ − σ_k|/σ_k for a computed σ̂, from the exact λ (to about 1e−22); for σ_k = 0,
   * σ̂/σ_1 (the error relative to the largest).
   */
  relativeError(computed: number, k: number): number;
}

const TWO = 2n;

/** m·2^e for a finite double. */
function dyadic(x: number): { m: bigint; e: number } {
  if (x === 0) return { m: 0n, e: 0 };
  const v = new DataView(new ArrayBuffer(8));
  v.setFloat64(0, x);
  const hi = v.getUint32(0), lo = v.getUint32(4);
  const biased = (hi >>> 20) & 0x7ff;
  const frac = (BigInt(hi & 0xfffff) << 32n) | BigInt(lo);
  const m = biased === 0 ? frac : frac | (1n << 52n);
  return { m: x < 0 ? -m : m, e: (biased === 0 ? 1 : biased) - 1075 };
}

const bitLength = (x: bigint) => (x < 0n ? -x : x).toString(2).length;

/** Number of eigenvalues of G below a/2^s (null when a leading minor of G·2^s − aI is zero). */
function countBelow(g: bigint[][], a: bigint, s: number): number | null {
  const n = g.length, scale = TWO ** BigInt(s);
  const h = g.map((row, i) => row.map((v, j) => v * scale - (i === j ? a : 0n)));
  let prev = 1n, sign = 1, changes = 0;
  for (let k = 0; k < n; k++) {
    const pivot = h[k][k];
    if (pivot === 0n) return null;
    const ps = pivot > 0n ? 1 : -1;
    if (ps !== sign) changes++;
    sign = ps;
    for (let i = k + 1; i < n; i++) {
      for (let j = k + 1; j < n; j++) h[i][j] = (h[i][j] * pivot - h[i][k] * h[k][j]) / prev;
    }
    prev = pivot;
  }
  return changes;
}

/** countBelow at a/2^s, nudging a upward by one unit until no minor is zero. */
function count(g: bigint[][], a: bigint, s: number): number {
  for (let d = 0n;; d++) {
    const c = countBelow(g, a + d, s);
    if (c !== null) return c;
  }
}

/** countBelow at 2^k. */
const countPow = (g: bigint[][], k: number) =>
  k >= 0 ? count(g, TWO ** BigInt(k), 0) : count(g, 1n, -k);

/**
 * The exact reference for the singular values of a column-major m×n matrix (m ≥ n).
 *
 * @param a Column-major entries, all finite.
 * @param m Rows.
 * @param n Columns.
 * @returns The reference.
 */
export function exactSingularValues(a: Float64Array, m: number, n: number): ExactSingularValues {
  const parts = Array.from(a, dyadic);
  const K = Math.max(0, ...parts.filter((p) => p.m !== 0n).map((p) => -p.e));
  const xi = parts.map((p) => p.m * TWO ** BigInt(p.e + K));
  const g: bigint[][] = Array.from({ length: n }, () => new Array<bigint>(n).fill(0n));
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let acc = 0n;
      for (let r = 0; r < m; r++) acc += xi[r + i * m] * xi[r + j * m];
      g[i][j] = g[j][i] = acc;
    }
  }
  let trace = 0n;
  for (let i = 0; i < n; i++) trace += g[i][i];
  const kTop = bitLength(trace);
  // Eigenvalues below 2^k, from the top down to where every one is above (or to 2^−2400 below
  // the trace: those still below are taken as exactly zero).
  const counts = new Map<number, number>();
  let kLow = kTop;
  for (let k = kTop; k > kTop - 2400; k--) {
    kLow = k;
    counts.set(k, countPow(g, k));
    if (counts.get(k) === 0) break;
  }
  // Eigenvalues ascending: λ_j ∈ [lo_j, hi_j]/2^s_j.
  const lam: { lo: bigint; hi: bigint; s: number }[] = [];
  for (let j = 0; j < n; j++) {
    let kj = kTop; // λ_j < 2^kj
    while (kj > kLow && counts.get(kj - 1)! > j) kj--;
    if (kj === kLow) {
      lam.push({ lo: 0n, hi: 0n, s: 0 });
      continue;
    }
    const s = Math.max(0, 90 - kj);
    let lo = TWO ** BigInt(kj - 1 + s), hi = TWO ** BigInt(kj + s);
    for (let it = 0; it < 76; it++) {
      const mid = (lo + hi) / TWO;
      if (count(g, mid, s) > j) hi = mid;
      else lo = mid;
    }
    lam.push({ lo, hi, s });
  }
  lam.reverse();
  const sigmaOf = (l: { lo: bigint; s: number }) =>
    l.lo === 0n ? 0 : Math.sqrt(Number(l.lo) * 2 ** -l.s) * 2 ** -K;
  const sigma = lam.map(sigmaOf);
  return {
    sigma,
    relativeError(computed, kk) {
      const l = lam[kk];
      if (l.lo === 0n) return Math.abs(computed) / sigma[0];
      // |σ̂² − λ|/λ in integers (σ̂ exact as m·2^e), then |σ̂ − σ|/σ = that /(1 + σ̂/σ).
      const c = dyadic(computed);
      const shift = 2 * (c.e + K) + l.s; // σ̂²·2^(2K)·2^s = m²·2^shift
      const mid = (l.lo + l.hi) / TWO;
      let num: bigint, den: bigint;
      if (shift >= 0) [num, den] = [c.m * c.m * TWO ** BigInt(shift) - mid, mid];
      else [num, den] = [c.m * c.m - mid * TWO ** BigInt(-shift), mid * TWO ** BigInt(-shift)];
      if (num < 0n) num = -num;
      const bits = bitLength(den) - 60;
      const ratio = bits > 0
        ? Number(num / TWO ** BigInt(bits)) / Number(den / TWO ** BigInt(bits))
        : Number(num) / Number(den);
      return ratio / (1 + Math.abs(computed) / sigma[kk]);
    },
  };
}
