import { equal, ok } from "node:assert/strict";
import { householderQR } from "./householder_qr.ts";
import { scaledConditionNumber } from "./scaled_condition.ts";
import { singularValues } from "./singular_values.ts";

Deno.test("scaledConditionNumber() does not change when a column is rescaled", () => {
  // x and x² on 1..20 with an intercept: collinear in the raw polynomial basis.
  const m = 20, a = new Float64Array(m * 3);
  for (let i = 0; i < m; i++) {
    a[i] = 1;
    a[i + m] = i + 1;
    a[i + 2 * m] = (i + 1) ** 2;
  }
  const k1 = scaledConditionNumber(householderQR(a, m, 3));
  const b = a.slice();
  for (let i = 0; i < m; i++) b[i + 2 * m] *= 1e6;
  const k2 = scaledConditionNumber(householderQR(b, m, 3));
  ok(Math.abs(k1 - k2) / k1 < 1e-10, `${k1} vs ${k2}`);
  ok(k1 > 10);
});

Deno.test("scaledConditionNumber() equals σmax/σmin of the unit-length design", () => {
  // Identity check against the Jacobi singular values of the scaled design itself.
  const m = 6, n = 2;
  const a = new Float64Array([1, 2, 3, 4, 5, 6, 1, 1.5, 2.9, 4.2, 5, 6.1]);
  const u = a.slice();
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < m; i++) s += u[i + j * m] ** 2;
    for (let i = 0; i < m; i++) u[i + j * m] /= Math.sqrt(s);
  }
  const sv = singularValues(u, m, n);
  const want = sv[0] / sv[n - 1];
  const got = scaledConditionNumber(householderQR(a, m, n));
  ok(Math.abs(got - want) / want < 1e-12, `${got} vs ${want}`);
});

Deno.test("scaledConditionNumber() is Infinity for a rank-deficient design", () => {
  equal(scaledConditionNumber(householderQR(new Float64Array([1, 2, 3, 2, 4, 6]), 3, 2)), Infinity);
});
