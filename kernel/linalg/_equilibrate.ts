/**
 * Column equilibration by powers of two.
 *
 * Each column is multiplied by s_j = 2^−e_j with 2^(e_j−1) ≤ ‖x_j‖ < 2^e_j, so
 * every scaled column has a norm in [0.5, 1). Multiplying by a power of two is
 * exact in binary floating point, so the scaled problem carries no new
 * rounding; it makes the rank decision (|R_kk| ≤ tol·|R_00|) and the pivot
 * order independent of the units of the columns (Golub & Van Loan, *Matrix
 * Computations*, 4th ed., §3.5.2 on row and column scaling; the power-of-two
 * choice is common practice, no source).
 *
 * @module
 */
import { columnNorm } from "./_householder.ts";
import { wasmMatrix } from "./_wasm_vectors.ts";

/** Scale factors s_j (a power of two; 1 for a zero column). */
export function powerOfTwoScales(columns: readonly Float64Array[]): Float64Array {
  const s = new Float64Array(columns.length);
  columns.forEach((c, j) => {
    const nrm = columnNorm(c, 0, c.length);
    s[j] = nrm === 0 ? 1 : 2 ** -(Math.floor(Math.log2(nrm)) + 1);
  });
  return s;
}

/** The column-major m×p matrix whose column j is `columns[j]·s[j]`. */
export function scaledDesign(
  columns: readonly Float64Array[],
  s: Float64Array,
  m: number,
): Float64Array {
  // In WebAssembly memory for the QR's kernels, with room for one working vector (apply_qt.ts).
  const a = wasmMatrix(m * columns.length, m);
  columns.forEach((c, j) => {
    const sj = s[j], o = j * m;
    for (let i = 0; i < m; i++) a[o + i] = c[i] * sj;
  });
  return a;
}
