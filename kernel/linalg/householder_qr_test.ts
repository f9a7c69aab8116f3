import assert from "node:assert/strict";
import { householderQR, type QRFactorization } from "./householder_qr.ts";
import { applyQ, applyQt } from "./apply_qt.ts";
import { seededRandom } from "../random.ts";

/** Explicit m×m Q, column-major, by applying Q to the unit vectors. */
function formQ(f: QRFactorization): Float64Array {
  const q = new Float64Array(f.m * f.m);
  for (let j = 0; j < f.m; j++) {
    const e = new Float64Array(f.m);
    e[j] = 1;
    q.set(applyQ(f, e), j * f.m);
  }
  return q;
}

/** Max |Q·R − A·P| / max |A| and max |QᵀQ − I|. */
function identities(a: Float64Array, f: QRFactorization): { qr: number; orth: number } {
  const { m, n } = f;
  const q = formQ(f);
  let scale = 0, qrErr = 0, orth = 0;
  for (const v of a) scale = Math.max(scale, Math.abs(v));
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < m; i++) {
      let s = 0;
      for (let l = 0; l <= Math.min(j, m - 1); l++) s += q[i + l * m] * f.qr[l + j * m];
      qrErr = Math.max(qrErr, Math.abs(s - a[i + f.perm[j] * m]));
    }
  }
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < m; j++) {
      let s = 0;
      for (let l = 0; l < m; l++) s += q[l + i * m] * q[l + j * m];
      orth = Math.max(orth, Math.abs(s - (i === j ? 1 : 0)));
    }
  }
  return { qr: qrErr / scale, orth };
}

function randomMatrix(m: number, n: number, seed: number): Float64Array {
  const r = seededRandom(seed);
  return Float64Array.from({ length: m * n }, () => r.normal());
}

// Tolerances: Householder QR is backward stable with error O(m·n·eps) (Golub &
// Van Loan, Matrix Computations, 4th ed., §5.2.2); 1e-13 leaves room for that at these sizes.
for (
  const [m, n, label] of [[40, 6, "tall"], [7, 7, "square"], [25, 1, "n = 1"], [1, 1, "1×1"], [
    3,
    5,
    "wide",
  ]] as const
) {
  Deno.test(`householderQR() satisfies Q·R = A·P and QᵀQ = I (${label} ${m}×${n})`, () => {
    const a = randomMatrix(m, n, 7 + m * n);
    const f = householderQR(a, m, n);
    const e = identities(a, f);
    assert.ok(e.qr < 1e-13, `relative |QR − AP| = ${e.qr}`);
    assert.ok(e.orth < 1e-13, `|QᵀQ − I| = ${e.orth}`);
    assert.equal(f.rank, Math.min(m, n));
  });
}

Deno.test("householderQR() without pivoting keeps the column order and the identities", () => {
  const a = randomMatrix(12, 4, 3);
  const f = householderQR(a, 12, 4, { pivot: false });
  assert.deepEqual(Array.from(f.perm), [0, 1, 2, 3]);
  const e = identities(a, f);
  assert.ok(e.qr < 1e-13 && e.orth < 1e-13, JSON.stringify(e));
});

Deno.test("householderQR() never modifies its input", () => {
  const a = randomMatrix(9, 3, 11);
  const copy = a.slice();
  householderQR(a, 9, 3);
  assert.deepEqual(a, copy);
});

Deno.test("householderQR() pivots orthogonal columns by decreasing norm", () => {
  // Columns 1·e0, 3·e1, 2·e2 are orthogonal, so the pivot order is by norm: 1, 2, 0
  // and |R| = diag(3, 2, 1) (hand computation).
  const a = new Float64Array([1, 0, 0, 0, 0, 3, 0, 0, 0, 0, 2, 0]);
  const f = householderQR(a, 4, 3);
  assert.deepEqual(Array.from(f.perm), [1, 2, 0]);
  assert.deepEqual(Array.from(f.rDiag, Math.abs), [3, 2, 1]);
});

Deno.test("householderQR() recomputes cancelled partial norms so the pivot order stays right", () => {
  // Column 0 is 1.001·(1, …, 1); column k (1..7) is (1, …, 1) + δ_k·h_k with h_k
  // row k of the order-8 Sylvester–Hadamard matrix (h_k ⊥ ones, h_k ⊥ h_l) and
  // δ = 1e-9, 3e-9, …, 1e-6 increasing. After step 0 what is left of column k is
  // δ_k·h_k, so the pivots must follow decreasing δ and |R_kk| = δ·√8 (hand
  // construction). Downdating alone leaves those partial norms at rounding noise
  // (1 − (r/‖x‖)² cancels below eps) and the order comes out wrong; the √eps
  // recomputation safeguard (Drmač & Bujanović 2008, from memory) fixes it.
  const hadamard = (i: number, j: number) => ((i & j).toString(2).split("1").length % 2 ? 1 : -1);
  const deltas = [1e-9, 3e-9, 1e-8, 3e-8, 1e-7, 3e-7, 1e-6];
  const cols: number[] = Array(8).fill(1.001);
  deltas.forEach((d, k) => {
    for (let i = 0; i < 8; i++) cols.push(1 + d * hadamard(k + 1, i));
  });
  const f = householderQR(new Float64Array(cols), 8, 8);
  assert.deepEqual(Array.from(f.perm), [0, 7, 6, 5, 4, 3, 2, 1]);
  for (let k = 1; k < 8; k++) {
    const want = deltas[7 - k] * Math.sqrt(8);
    // 1e-6 relative: R_kk is a difference of O(1) numbers, absolute error ~10·eps.
    assert.ok(Math.abs(Math.abs(f.rDiag[k]) - want) <= 1e-6 * want, `|R_${k}${k}| = ${f.rDiag[k]}`);
  }
  assert.equal(f.rank, 8);
});

Deno.test("householderQR() reports rank 2 for an exactly duplicated column", () => {
  const x = [1, 2, 3, 4, 5];
  const f = householderQR(new Float64Array([...x, 1, 1, 1, 1, 1, ...x]), 5, 3);
  assert.equal(f.rank, 2);
  assert.ok(Math.abs(f.rDiag[2]) <= f.tol * Math.abs(f.rDiag[0]));
});

Deno.test("householderQR() reports rank 0 for a zero matrix", () => {
  assert.equal(householderQR(new Float64Array(6), 3, 2).rank, 0);
});

Deno.test("householderQR() throws RangeError for an empty matrix", () => {
  assert.throws(() => householderQR(new Float64Array(0), 0, 3), {
    name: "RangeError",
    message: "Cannot factor an empty matrix: size 0×3",
  });
});

Deno.test("householderQR() throws RangeError for a size mismatch and a NaN entry", () => {
  assert.throws(() => householderQR(new Float64Array(5), 2, 3), {
    name: "RangeError",
    message: "Cannot factor a 2×3 matrix: expected 6 entries, got 5",
  });
  assert.throws(() => householderQR(new Float64Array([1, NaN]), 2, 1), {
    name: "RangeError",
    message: 'Cannot factor a matrix with entry (1, 0) = "NaN": entries must be finite',
  });
});

Deno.test("applyQt() and applyQ() are inverse and preserve length", () => {
  const f = householderQR(randomMatrix(10, 3, 5), 10, 3);
  const y = Array.from({ length: 10 }, (_, i) => i - 4.5);
  const z = applyQt(f, y);
  const back = applyQ(f, z);
  const norm = (v: ArrayLike<number>) => Math.hypot(...Array.from(v));
  assert.ok(Math.abs(norm(z) - norm(y)) < 1e-13 * norm(y));
  back.forEach((v, i) => assert.ok(Math.abs(v - y[i]) < 1e-13, `row ${i}`));
  assert.throws(() => applyQt(f, [1, 2]), {
    name: "RangeError",
    message: "Cannot apply Qᵀ: vector has 2 entries, expected 10",
  });
});
