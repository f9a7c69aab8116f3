import assert from "node:assert/strict";
import { covar } from "./covar.ts";

Deno.test("covar() equals (JᵀJ)⁻¹ for a full-rank J", () => {
  // J = [1 1; 1 2; 1 3]: JᵀJ = [3 6; 6 14], det 6, inverse [14 −6; −6 3]/6 (hand computation).
  const c = covar(3, 2, new Float64Array([1, 1, 1, 1, 2, 3]));
  assert.equal(c.rank, 2);
  const want = [14 / 6, -1, -1, 0.5];
  c.unscaled.forEach((v, k) => assert.ok(Math.abs(v - want[k]) < 1e-14, `${k}: ${v}`));
});

Deno.test("covar() is unaffected by the units of a parameter (equilibration)", () => {
  // Column 2 scaled by 1e8: its variance scales by 1e-16, the covariance by 1e-8.
  const c = covar(3, 2, new Float64Array([1, 1, 1, 1e8, 2e8, 3e8]));
  assert.equal(c.rank, 2);
  assert.ok(Math.abs(c.unscaled[3] / 0.5e-16 - 1) < 1e-13);
  assert.ok(Math.abs(c.unscaled[1] / -1e-8 - 1) < 1e-13);
});

Deno.test("covar() names the parameter that is a combination of the others", () => {
  // Column 3 = column 1 + column 2: rank 2, one column not identifiable.
  const c = covar(3, 3, new Float64Array([1, 0, 1, 0, 1, 1, 1, 1, 2]));
  assert.equal(c.rank, 2);
  assert.equal(c.unidentifiable.length, 1);
  assert.ok(c.unscaled.every(Number.isNaN));
});

Deno.test("covar() names a parameter with a zero column", () => {
  const c = covar(2, 2, new Float64Array([1, 2, 0, 0]));
  assert.deepEqual(c.unidentifiable, [1]);
});
