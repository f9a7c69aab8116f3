import assert from "node:assert/strict";
import { polish } from "./polish.ts";

Deno.test("polish() takes linearly converging Gauss–Newton steps to the minimum", () => {
  // f = exp(a·t) on t = 0..3 with y off the curve (large residuals): GN contracts linearly.
  const t = [0, 1, 2, 3], y = [1.5, 2, 4.5, 7];
  const res = (a: number) => t.map((v, i) => y[i] - Math.exp(a * v));
  const p = polish({
    m: 4,
    n: 1,
    residuals: (x, r) => (r.set(res(x[0])), 0),
    jac: (x, j) => t.forEach((v, i) => (j[i] = v * Math.exp(x[0] * v))),
  }, new Float64Array([0.6]));
  // Optimality (common practice, no source): Σ r·∂f/∂a = 0 at the minimum.
  const r = res(p.x[0]);
  const g = t.reduce((s, v, i) => s + r[i] * v * Math.exp(p.x[0] * v), 0);
  assert.ok(Math.abs(g) < 1e-12, String(g));
  assert.ok(p.steps >= 3);
});

Deno.test("polish() keeps a held parameter where it is", () => {
  const p = polish(
    {
      m: 2,
      n: 2,
      residuals: (x, r) => ((r[0] = 1 - x[0]), (r[1] = 2 - x[1]), 0),
      jac: (_x, j) => j.set([1, 0, 0, 1]),
    },
    new Float64Array([0, 0]),
    [false, true],
  );
  assert.deepEqual(Array.from(p.x), [1, 0]);
});

Deno.test("polish() carries the point in double-double (x + xlo)", () => {
  // r = y − a with y = 1 + 2^-60 given in double-double: a lands on 1 with a low part 2^-60.
  const p = polish({
    m: 1,
    n: 1,
    residuals: (x, r, xlo) => ((r[0] = (1 - x[0]) + (2 ** -60 - xlo[0])), 0),
    jac: (_x, j) => (j[0] = 1),
  }, new Float64Array([0.5]));
  assert.equal(p.x[0], 1);
  assert.equal(p.xlo[0], 2 ** -60);
});
