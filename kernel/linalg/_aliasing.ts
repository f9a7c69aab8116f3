/**
 * Which columns of a rank-deficient design are linear combinations of which.
 *
 * Method: Householder QR in the caller's column order with deferral (Golub &
 * Van Loan, *Matrix Computations*, 4th ed., §5.2.1 and §5.4.1): column j is
 * reflected onto the kept columns before it; when what remains of it has norm
 * ≤ the rank threshold it is declared aliased, and the solution c of
 * R_KK·c = (Q_Kᵀ x_j)_K gives its combination of the earlier kept columns.
 * This is the R₁₁⁻¹R₁₂ of §5.4.1 for an ordering that keeps earlier columns,
 * so messages name the later column ("x3 is x1 + 2·x2"), which is how people
 * read a design. Should this in-order pass find nothing where the pivoted QR
 * found deficiency (a borderline case), the pivoted factorization's trailing
 * columns and their R₁₁⁻¹R₁₂ entries are reported instead.
 *
 * An entry of c counts as non-zero when its contribution |c_l|·‖x_l‖ exceeds
 * √eps·‖x_j‖ (scale-free; common practice, no source).
 *
 * @module
 */
import { applyReflector, columnNorm, makeReflector } from "./_householder.ts";
import type { QRFactorization } from "./householder_qr.ts";

/** One aliased column and the combination of other columns that reproduces it. */
export interface AliasedColumn {
  /** The aliased column's name. */
  name: string;
  /** Its index in the caller's order. */
  index: number;
  /** Names of the columns it combines, in the caller's order (empty: a zero column). */
  of: string[];
  /** The multipliers, in the original units: x_index ≈ Σ coefficients[l]·x_of[l]. */
  coefficients: number[];
}

const NONZERO = Math.sqrt(Number.EPSILON);

/**
 * The aliased columns of the equilibrated m×p design `a` (column-major), with
 * scale factors `s` (column j of `a` is s_j·x_j) and the pivoted factorization `f`.
 */
export function findAliasing(
  a: Float64Array,
  m: number,
  p: number,
  s: Float64Array,
  names: readonly string[],
  f: QRFactorization,
): AliasedColumn[] {
  const threshold = f.tol * Math.abs(f.rDiag[0]);
  const w = a.slice();
  const kept: number[] = [];
  const out: AliasedColumn[] = [];
  for (let j = 0; j < p; j++) {
    const k = kept.length;
    const rest = k < m ? columnNorm(w, k + j * m, m - k) : 0;
    if (rest <= threshold) {
      const c = backSolveKept(w, m, kept, j);
      out.push(describe(j, kept, c, a, m, s, names));
      continue;
    }
    const tau = makeReflector(w, k + j * m, m - k);
    for (let l = j + 1; l < p; l++) applyReflector(w, k + j * m, tau, w, k + l * m, m - k);
    kept.push(j);
  }
  return out.length > 0 ? out : pivotedAliasing(f, a, m, s, names);
}

/** Solves R_KK·c = w[0:k, j], R_KK's column l being the top of column kept[l]. */
function backSolveKept(w: Float64Array, m: number, kept: number[], j: number): Float64Array {
  const k = kept.length;
  const c = new Float64Array(k);
  for (let i = 0; i < k; i++) c[i] = w[i + j * m];
  for (let l = k - 1; l >= 0; l--) {
    const col = kept[l] * m;
    c[l] /= w[l + col];
    for (let i = 0; i < l; i++) c[i] -= c[l] * w[i + col];
  }
  return c;
}

/** Keeps the non-zero entries of c, converted to original units (x̃ = s·x). */
function describe(
  j: number,
  basis: readonly number[],
  c: Float64Array,
  a: Float64Array,
  m: number,
  s: Float64Array,
  names: readonly string[],
): AliasedColumn {
  const own = columnNorm(a, j * m, m);
  const picked: { l: number; coef: number }[] = [];
  basis.forEach((col, i) => {
    if (Math.abs(c[i]) * columnNorm(a, col * m, m) > NONZERO * own) {
      picked.push({ l: col, coef: (c[i] * s[col]) / s[j] });
    }
  });
  picked.sort((x, y) => x.l - y.l);
  return {
    name: names[j],
    index: j,
    of: picked.map((x) => names[x.l]),
    coefficients: picked.map((x) => x.coef),
  };
}

/** Trailing pivoted columns and the entries of R₁₁⁻¹R₁₂ (GVL §5.4.1). */
function pivotedAliasing(
  f: QRFactorization,
  a: Float64Array,
  m: number,
  s: Float64Array,
  names: readonly string[],
): AliasedColumn[] {
  const basis = Array.from(f.perm.subarray(0, f.rank));
  const out: AliasedColumn[] = [];
  for (let k = f.rank; k < f.n; k++) {
    const c = new Float64Array(f.rank);
    for (let i = 0; i < f.rank; i++) c[i] = f.qr[i + k * m];
    for (let l = f.rank - 1; l >= 0; l--) {
      c[l] /= f.qr[l + l * m];
      for (let i = 0; i < l; i++) c[i] -= c[l] * f.qr[i + l * m];
    }
    out.push(describe(f.perm[k], basis, c, a, m, s, names));
  }
  return out.sort((x, y) => x.index - y.index);
}
