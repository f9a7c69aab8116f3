/**
 * singularValues(): robustness on rank-deficient R factors and accuracy on
 * ill-conditioned designs, measured against exact singular values
 * (`_exact_singular_values_test.ts`: exact rational arithmetic, BigInt) and
 * beside ml-matrix's SVD (Golub–Kahan–Reinsch, JAMA lineage), the package the
 * design names: the figures of README.md "Dependencies" come from here.
 */
import assert from "node:assert/strict";
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import { singularValues } from "./singular_values.ts";
import { factorInPlace, householderQR } from "./householder_qr.ts";
import { powerOfTwoScales, scaledDesign } from "./_equilibrate.ts";
import { loadStrd } from "./_strd.ts";
import { exactSingularValues } from "./_exact_singular_values_test.ts";
import { mulberry32 } from "../random.ts";

/** ml-matrix's singular values of a column-major m×n matrix. */
function mlMatrix(a: Float64Array, m: number, n: number): number[] {
  const rows = Array.from(
    { length: m },
    (_, i) => Array.from({ length: n }, (_, j) => a[i + j * m]),
  );
  return new SingularValueDecomposition(new Matrix(rows), {
    computeLeftSingularVectors: false,
    computeRightSingularVectors: false,
    autoTranspose: true,
  }).diagonal;
}

/** The R factor least squares hands to singularValues (R̃·D⁻¹ of the equilibrated pivoted QR). */
function rFactor(cols: Float64Array[]): Float64Array {
  const m = cols[0].length, p = cols.length;
  const scale = powerOfTwoScales(cols);
  const f = factorInPlace(scaledDesign(cols, scale, m), m, p);
  const r = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    for (let i = 0; i <= j; i++) r[i + j * p] = f.qr[i + j * m] / scale[f.perm[j]];
  }
  return r;
}

/** Largest relative error over all singular values, and that of the smallest. */
function errors(ref: ReturnType<typeof exactSingularValues>, s: ArrayLike<number>) {
  const e = Array.from(s, (v, k) => ref.relativeError(v, k));
  return { max: Math.max(...e), min: e[e.length - 1] };
}

Deno.test("singularValues() never fails on the R factor of y = a + b + c*x (1,000 seeded data sets)", () => {
  // Before: "Jacobi rotations did not converge in 60 sweeps" on 180 of these 1,000 (subnormal
  // columns whose squares underflow). Reference: exact rational arithmetic (BigInt) on R as stored.
  let worst = 0, zero = 0;
  for (let seed = 1; seed <= 1000; seed++) {
    const r = mulberry32(seed);
    const n = 5 + Math.floor(r() * 30);
    const x = Float64Array.from({ length: n }, () => r() * 10);
    const one = new Float64Array(n).fill(1);
    const R = rFactor([one, one.slice(), x]);
    const s = singularValues(R, 3, 3);
    const ref = exactSingularValues(R, 3, 3);
    worst = Math.max(worst, ref.relativeError(s[0], 0), ref.relativeError(s[1], 1));
    zero = Math.max(zero, Math.abs(s[2] - ref.sigma[2]) / ref.sigma[0]);
  }
  assert.ok(worst < 2e-15, `σ₁, σ₂ relative error ${worst}`); // measured 7.8e-16
  assert.ok(zero < 1e-30, `σ₃ error relative to σ₁ ${zero}`); // measured 4.5e-32
});

Deno.test("singularValues() returns NaN for non-finite entries and zeros for a zero matrix", () => {
  assert.ok(singularValues(new Float64Array([1, NaN, 0, 1]), 2, 2).every(Number.isNaN));
  assert.deepEqual(Array.from(singularValues(new Float64Array(6), 3, 2)), [0, 0]);
  // A column of subnormal numbers beside a unit column: σ = (1, 2^−1070·√2) would need
  // squares below the smallest double; it counts as 0 (the column is negligible).
  const s = singularValues(new Float64Array([1, 0, 2 ** -1070, 2 ** -1070]), 2, 2);
  assert.equal(s[0], 1);
  assert.ok(s[1] < 1e-300);
  assert.throws(() => singularValues(new Float64Array(3), 2, 2), RangeError);
});

Deno.test("singularValues() on Hilbert matrices agrees with exact arithmetic as far as their condition allows", () => {
  // Exact singular values of the stored Hilbert matrices by exact rational arithmetic. Both
  // methods lose about log10 κ digits on the smallest (κ = 1.5e7 … 1.7e16).
  const bound: Record<number, number> = { 6: 1e-9, 8: 1e-6, 10: 1e-3, 12: 0.5 };
  for (const n of [6, 8, 10, 12]) {
    const h = new Float64Array(n * n).map((_, k) => 1 / ((k % n) + Math.floor(k / n) + 1));
    const ref = exactSingularValues(h, n, n);
    const ours = errors(ref, singularValues(h, n, n));
    const theirs = errors(ref, mlMatrix(h, n, n));
    assert.ok(ours.max < bound[n] && theirs.max < bound[n], `H${n}: ${ours.max}, ${theirs.max}`);
    assert.ok(ref.relativeError(singularValues(h, n, n)[0], 0) < 2e-15, `H${n} σ_max`);
  }
});

Deno.test("singularValues() keeps the small singular values of graded NIST designs that ml-matrix loses", async () => {
  // Designs of NIST StRD linear sets (polynomial columns 1, x, …, x^d as doubles), their
  // singular values by exact rational arithmetic. One-sided Jacobi is accurate relative to
  // each σ on column-graded matrices (Demmel & Veselić 1992); bidiagonal QR (ml-matrix) only
  // relative to σ_max. Measured relative errors of σ_min, ours vs ml-matrix:
  // Pontius 2.6e-16 vs 2.2e-6, Wampler1 6.5e-15 vs 6.6e-11, Filip 1.6e-8 vs 7.1e-3.
  const sets = [["Pontius", 2, 1e-15, 1e-8], ["Wampler1", 5, 1e-13, 1e-12], [
    "Filip",
    10,
    1e-7,
    1e-4,
  ]] as const;
  for (const [name, d, oursAtMost, theirsAtLeast] of sets) {
    const set = await loadStrd(name);
    if (set === null) return;
    const x = set.data[1], m = x.length, p = d + 1;
    const a = new Float64Array(m * p);
    for (let j = 0; j < p; j++) for (let i = 0; i < m; i++) a[i + j * m] = x[i] ** j;
    const ref = exactSingularValues(a, m, p);
    const ours = errors(ref, singularValues(a, m, p));
    const theirs = errors(ref, mlMatrix(a, m, p));
    assert.ok(ours.max < oursAtMost, `${name}: ours ${ours.max}`);
    assert.ok(theirs.min > theirsAtLeast, `${name}: ml-matrix ${theirs.min}`);
    // On the R factor of the unit-column design (what the condition estimates factor) both
    // agree with exact arithmetic to about 1e-15.
    const unit = a.slice();
    for (let j = 0; j < p; j++) {
      const norm = Math.hypot(...unit.subarray(j * m, (j + 1) * m));
      for (let i = 0; i < m; i++) unit[i + j * m] /= norm;
    }
    const f = householderQR(unit, m, p);
    const r = new Float64Array(p * p);
    for (let j = 0; j < p; j++) for (let i = 0; i <= j; i++) r[i + j * p] = f.qr[i + j * m];
    const refR = exactSingularValues(r, p, p);
    assert.ok(errors(refR, singularValues(r, p, p)).max < 3e-15, `${name} R`);
    assert.ok(errors(refR, mlMatrix(r, p, p)).max < 3e-15, `${name} R (ml-matrix)`);
  }
});

Deno.test("singularValues() and ml-matrix on unit-column designs stay within κ·ε of exact", async () => {
  // Unit-length columns (Belsley's scaling): both methods' σ_min error is bounded by about
  // κ·ε (Demmel & Veselić 1992 for Jacobi). Measured, ours vs ml-matrix: Filip 1.2e-8 vs 9.5e-8
  // (κ 5.2e9), Longley with intercept 4.1e-13 vs 2.2e-14 (κ 4.3e4). Reference: exact rational
  // arithmetic on the scaled design as stored.
  const cases: [string, (set: Float64Array[]) => Float64Array[], number][] = [
    ["Filip", (d) => Array.from({ length: 11 }, (_, j) => d[1].map((x) => x ** j)), 5.2e9],
    ["Longley", (d) => [d[0].map(() => 1), ...d.slice(1)], 4.3e4],
  ];
  for (const [name, design, kappa] of cases) {
    const set = await loadStrd(name);
    if (set === null) return;
    const cols = design(set.data);
    const m = cols[0].length, p = cols.length;
    const a = new Float64Array(m * p);
    cols.forEach((c, j) => {
      const norm = Math.hypot(...c);
      for (let i = 0; i < m; i++) a[i + j * m] = c[i] / norm;
    });
    const ref = exactSingularValues(a, m, p);
    assert.ok(Math.abs(ref.sigma[0] / ref.sigma[p - 1] / kappa - 1) < 0.05, `${name} κ`);
    const bound = 10 * kappa * Number.EPSILON;
    assert.ok(errors(ref, singularValues(a, m, p)).max < bound, `${name} ours`);
    assert.ok(errors(ref, mlMatrix(a, m, p)).max < bound, `${name} ml-matrix`);
  }
});
