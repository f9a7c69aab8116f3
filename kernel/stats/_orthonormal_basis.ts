/**
 * An orthonormal basis Q₁ of the column space of √W·X, from the pivoted
 * Householder QR of kernel/linalg (Golub & Van Loan, *Matrix Computations*,
 * 4th ed., §5.2: the first r columns of Q span range(X) when rank(X) = r).
 * Columns are scaled to unit length first so the rank decision does not
 * depend on units; the span does not change.
 *
 * @module
 */
import { applyQ, householderQR } from "../linalg/mod.ts";

/**
 * The first `rank` columns of Q for the (√w-scaled) design.
 *
 * @param design Columns, each n long (checked by the caller).
 * @param weights wᵢ per row, or null.
 * @returns Orthonormal columns spanning the design's column space.
 */
export function orthonormalBasis(
  design: readonly Float64Array[],
  weights: Float64Array | null,
): Float64Array[] {
  const n = design[0].length, p = design.length;
  const a = new Float64Array(n * p);
  for (let j = 0; j < p; j++) {
    const c = design[j], o = j * n;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      a[o + i] = weights ? c[i] * Math.sqrt(weights[i]) : c[i];
      ss += a[o + i] * a[o + i];
    }
    const norm = Math.sqrt(ss);
    if (norm > 0 && Number.isFinite(norm)) { for (let i = 0; i < n; i++) a[o + i] /= norm; }
  }
  const f = householderQR(a, n, p);
  const e = new Float64Array(n);
  const out: Float64Array[] = [];
  for (let k = 0; k < Math.min(f.rank, n); k++) {
    e.fill(0);
    e[k] = 1;
    out.push(applyQ(f, e));
  }
  return out;
}
