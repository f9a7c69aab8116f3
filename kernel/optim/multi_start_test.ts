import assert from "node:assert/strict";
import { multiStart } from "./multi_start.ts";
import type { LeastSquaresProblem } from "./lmder.ts";

/** y = b1·(1 − exp(−b2·x)) on BoxBOD's data (NIST StRD BoxBOD, higher difficulty; data from memory). */
const x = [1, 2, 3, 5, 7, 10], y = [109, 149, 149, 191, 213, 224];
const boxbod: LeastSquaresProblem = {
  m: 6,
  n: 2,
  fcn: (b, f) => x.forEach((v, i) => (f[i] = b[0] * (1 - Math.exp(-b[1] * v)) - y[i])),
  jac: (b, j) =>
    x.forEach((v, i) => {
      j[i] = 1 - Math.exp(-b[1] * v);
      j[i + 6] = b[0] * v * Math.exp(-b[1] * v);
    }),
};

Deno.test("multiStart() finds BoxBOD's certified minimum without start values", () => {
  const r = multiStart(boxbod, new Float64Array([NaN, NaN]), { seed: 1 });
  assert.ok(r !== null && r.converged);
  // NIST StRD BoxBOD certified: b1 = 2.1380940889E+02, b2 = 5.4723748542E-01 (from memory).
  assert.ok(Math.abs(r.x[0] / 213.80940889 - 1) < 1e-8, String(r.x[0]));
  assert.ok(Math.abs(r.x[1] / 0.54723748542 - 1) < 1e-8, String(r.x[1]));
});

Deno.test("multiStart() is deterministic for a seed", () => {
  const a = multiStart(boxbod, new Float64Array([NaN, NaN]), { seed: 7 });
  const b = multiStart(boxbod, new Float64Array([NaN, NaN]), { seed: 7 });
  assert.deepEqual(Array.from(a!.start), Array.from(b!.start));
  assert.deepEqual(Array.from(a!.x), Array.from(b!.x));
});

Deno.test("multiStart() keeps a given start value and samples only the missing one", () => {
  const r = multiStart(boxbod, new Float64Array([200, NaN]), { seed: 1 });
  assert.equal(r!.start[0], 200);
});

Deno.test("multiStart() returns null when F is nowhere finite", () => {
  const never: LeastSquaresProblem = {
    m: 1,
    n: 1,
    fcn: (_b, f) => (f[0] = NaN),
    jac: (_b, j) => (j[0] = 1),
  };
  assert.equal(multiStart(never, new Float64Array([NaN]), { seed: 1, samples: 16 }), null);
});

Deno.test("multiStart() samples inside the bounds", () => {
  const r = multiStart(boxbod, new Float64Array([NaN, NaN]), {
    seed: 3,
    lower: Float64Array.from([0, 0]),
    upper: Float64Array.from([1000, 10]),
  });
  assert.ok(r!.start[0] >= 0 && r!.start[1] >= 0 && r!.start[1] <= 10);
});
