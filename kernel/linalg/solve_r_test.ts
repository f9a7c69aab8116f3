import assert from "node:assert/strict";
import { householderQR } from "./householder_qr.ts";
import { invertR, solveR } from "./solve_r.ts";
import { singularValues } from "./singular_values.ts";
import { inColumnSpace } from "./column_space.ts";
import { describeAliased, quotedList } from "./describe_aliased.ts";

Deno.test("solveR() back-substitutes an upper triangular system", () => {
  // R = [[2, 1], [0, 4]] given as its own QR (no pivoting, already triangular):
  // R·x = (4, 8) → x = (1, 2) (hand computation). Householder may flip signs of
  // rows of R, so the right-hand side is built from the factored R itself.
  const f = householderQR(new Float64Array([2, 0, 1, 4]), 2, 2, { pivot: false });
  const r01 = f.qr[2], r00 = f.qr[0], r11 = f.qr[3];
  const x = solveR(f, [r00 * 1 + r01 * 2, r11 * 2]);
  assert.ok(Math.abs(x[0] - 1) < 1e-15 && Math.abs(x[1] - 2) < 1e-15, `${x}`);
});

Deno.test("invertR() returns an upper triangular inverse with R·R⁻¹ = I", () => {
  const f = householderQR(new Float64Array([4, 1, 2, 1, 3, 1, 2, 1, 5]), 3, 3);
  const inv = invertR(f);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      let s = 0;
      for (let l = 0; l < 3; l++) s += (l >= i ? f.qr[i + 3 * l] : 0) * inv[l + 3 * j];
      assert.ok(Math.abs(s - (i === j ? 1 : 0)) < 1e-14, `(${i}, ${j}) = ${s}`);
      if (i > j) assert.equal(inv[i + 3 * j], 0);
    }
  }
});

Deno.test("solveR() throws RangeError for a zero diagonal and a bad order", () => {
  const f = householderQR(new Float64Array(4), 2, 2);
  assert.throws(() => solveR(f, [1, 1], 2), {
    name: "RangeError",
    message: "Cannot solve with R: diagonal entry 0 is zero",
  });
  assert.throws(() => invertR(f, 3), {
    name: "RangeError",
    message: 'Cannot use a leading block of order "3": R is 2×2',
  });
});

Deno.test("singularValues() finds the singular values of a diagonal and a Hilbert matrix", () => {
  // diag(1, 5, 3) permuted columns: singular values 5, 3, 1 (hand computation).
  const d = singularValues(new Float64Array([0, 5, 0, 1, 0, 0, 0, 0, 3]), 3, 3);
  assert.deepEqual(Array.from(d), [5, 3, 1]);
  // 3×3 Hilbert matrix: symmetric positive definite, so its singular values are
  // its eigenvalues 1.408318927123654, 0.1223270658539040, 0.002687340355773529
  // (from memory); cross-checked by the exact determinant 1/2160 (common practice,
  // no source: det H_3 = 1/2160).
  const h = new Float64Array(9).map((_, k) => 1 / ((k % 3) + Math.floor(k / 3) + 1));
  const s = singularValues(h, 3, 3);
  assert.ok(Math.abs(s[0] * s[1] * s[2] - 1 / 2160) < 1e-16, `det ${s[0] * s[1] * s[2]}`);
  [1.408318927123654, 0.1223270658539040, 0.002687340355773529].forEach((want, k) =>
    assert.ok(Math.abs(s[k] - want) < 1e-13 * want + 1e-16, `σ${k} = ${s[k]}`)
  );
});

Deno.test("inColumnSpace() sees the constants in span{x, 1 − x} and not in span{x}", () => {
  const x = [0, 1, 2, 3];
  const both = householderQR(new Float64Array([...x, ...x.map((v) => 1 - v)]), 4, 2);
  const one = householderQR(new Float64Array(x), 4, 1);
  assert.equal(inColumnSpace(both, [1, 1, 1, 1]), true);
  assert.equal(inColumnSpace(one, [1, 1, 1, 1]), false);
});

Deno.test("describeAliased() and quotedList() phrase names for messages", () => {
  assert.equal(quotedList([]), "");
  assert.equal(quotedList(["a", "b", "c"]), '"a", "b" and "c"');
  assert.equal(
    describeAliased({ name: "x3", index: 2, of: ["x1", "x2"], coefficients: [1, 2] }, "term"),
    'term "x3" is a linear combination of "x1" and "x2"',
  );
});
