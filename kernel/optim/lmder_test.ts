/**
 * lmder on published test problems: Moré, Garbow & Hillstrom 1981, "Testing
 * unconstrained optimization software", ACM TOMS 7(1), 17–41 (problem
 * numbers, standard starts and minima as published there; the minima are
 * from memory of that paper's table), and MINPACK-1's test driver (ANL-80-74).
 */
import assert from "node:assert/strict";
import { type LeastSquaresProblem, lmder } from "./lmder.ts";

/** A problem from residual and Jacobian-row functions. */
function problem(
  m: number,
  n: number,
  f: (x: Float64Array, i: number) => number,
  g: (x: Float64Array, i: number, j: number) => number,
): LeastSquaresProblem {
  return {
    m,
    n,
    fcn: (x, out) => {
      for (let i = 0; i < m; i++) out[i] = f(x, i);
    },
    jac: (x, out) => {
      for (let j = 0; j < n; j++) for (let i = 0; i < m; i++) out[i + j * m] = g(x, i, j);
    },
  };
}

const ssq = (fnorm: number) => fnorm * fnorm;

Deno.test("lmder() minimises Rosenbrock (MGH 1) from (-1.2, 1) to (1, 1)", () => {
  const p = problem(
    2,
    2,
    (x, i) => (i === 0 ? 10 * (x[1] - x[0] * x[0]) : 1 - x[0]),
    (x, i, j) => i === 0 ? (j === 0 ? -20 * x[0] : 10) : (j === 0 ? -1 : 0),
  );
  const r = lmder(p, [-1.2, 1]);
  assert.ok(r.converged, r.info);
  // MGH 1981 problem 1: f = 0 at (1, 1).
  assert.ok(Math.abs(r.x[0] - 1) < 1e-12 && Math.abs(r.x[1] - 1) < 1e-12);
});

Deno.test("lmder() reaches the helical valley minimum (MGH 7) at (1, 0, 0)", () => {
  const th = (x: Float64Array) => Math.atan2(x[1], x[0]) / (2 * Math.PI);
  const p: LeastSquaresProblem = {
    m: 3,
    n: 3,
    fcn: (x, f) => {
      // θ by atan2; MGH's branch differs only where x₁ < 0 and x₂ < 0, which this run avoids.
      f[0] = 10 * (x[2] - 10 * th(x));
      f[1] = 10 * (Math.hypot(x[0], x[1]) - 1);
      f[2] = x[2];
    },
    jac: (x, J) => {
      const r2 = x[0] * x[0] + x[1] * x[1], r = Math.sqrt(r2);
      const t1 = 100 / (2 * Math.PI * r2);
      J[0] = t1 * x[1];
      J[3] = -t1 * x[0];
      J[6] = 10;
      J[1] = 10 * x[0] / r;
      J[4] = 10 * x[1] / r;
      J[7] = 0;
      J[2] = 0;
      J[5] = 0;
      J[8] = 1;
    },
  };
  const r = lmder(p, [-1, 0, 0]);
  assert.ok(r.converged, r.info);
  // MGH 1981 problem 7: f = 0 at (1, 0, 0).
  assert.ok(ssq(r.fnorm) < 1e-25, String(ssq(r.fnorm)));
  assert.ok(Math.abs(r.x[0] - 1) < 1e-10);
});

Deno.test("lmder() finds Freudenstein–Roth's local minimum (MGH 2) from (0.5, -2)", () => {
  const p = problem(
    2,
    2,
    (x, i) =>
      i === 0
        ? -13 + x[0] + ((5 - x[1]) * x[1] - 2) * x[1]
        : -29 + x[0] + ((x[1] + 1) * x[1] - 14) * x[1],
    (x, i, j) => j === 0 ? 1 : i === 0 ? (10 - 3 * x[1]) * x[1] - 2 : (3 * x[1] + 2) * x[1] - 14,
  );
  const r = lmder(p, [0.5, -2]);
  assert.ok(r.converged, r.info);
  // MGH 1981 problem 2: local minimum f = 48.9842… at (11.41…, −0.8968…) (from memory).
  assert.ok(Math.abs(ssq(r.fnorm) - 48.98425367924) < 1e-6, String(ssq(r.fnorm)));
});

Deno.test("lmder() solves Brown's badly scaled function (MGH 4) to (1e6, 2e-6)", () => {
  const p = problem(
    3,
    2,
    (x, i) => (i === 0 ? x[0] - 1e6 : i === 1 ? x[1] - 2e-6 : x[0] * x[1] - 2),
    (
      x,
      i,
      j,
    ) => (i === 0 ? (j === 0 ? 1 : 0) : i === 1 ? (j === 0 ? 0 : 1) : j === 0 ? x[1] : x[0]),
  );
  const r = lmder(p, [1, 1]);
  assert.ok(r.converged, r.info);
  // MGH 1981 problem 4: f = 0 at (1e6, 2e−6).
  assert.ok(Math.abs(r.x[0] / 1e6 - 1) < 1e-12 && Math.abs(r.x[1] / 2e-6 - 1) < 1e-10);
});

Deno.test("lmder() reaches Bard's minimum (MGH 8) 8.21487e-3", () => {
  const y = [
    0.14,
    0.18,
    0.22,
    0.25,
    0.29,
    0.32,
    0.35,
    0.39,
    0.37,
    0.58,
    0.73,
    0.96,
    1.34,
    2.10,
    4.39,
  ];
  const uvw = (i: number) => {
    const u = i + 1, v = 16 - u, w = Math.min(u, v);
    return [u, v, w];
  };
  const p = problem(15, 3, (x, i) => {
    const [u, v, w] = uvw(i);
    return y[i] - (x[0] + u / (v * x[1] + w * x[2]));
  }, (x, i, j) => {
    const [u, v, w] = uvw(i);
    const d = (v * x[1] + w * x[2]) ** 2;
    return j === 0 ? -1 : j === 1 ? u * v / d : u * w / d;
  });
  const r = lmder(p, [1, 1, 1]);
  assert.ok(r.converged, r.info);
  // MGH 1981 problem 8: f = 8.21487…e−3 (from memory).
  assert.ok(Math.abs(ssq(r.fnorm) / 8.21487730657e-3 - 1) < 1e-6, String(ssq(r.fnorm)));
});

Deno.test("lmder() reaches Meyer's minimum (MGH 10) 87.9458 from (0.02, 4000, 250)", () => {
  const y = [
    34780,
    28610,
    23650,
    19630,
    16370,
    13720,
    11540,
    9744,
    8261,
    7030,
    6005,
    5147,
    4427,
    3820,
    3307,
    2872,
  ];
  const t = (i: number) => 45 + 5 * (i + 1);
  const p = problem(16, 3, (x, i) => x[0] * Math.exp(x[1] / (t(i) + x[2])) - y[i], (x, i, j) => {
    const e = Math.exp(x[1] / (t(i) + x[2]));
    return j === 0 ? e : j === 1 ? x[0] * e / (t(i) + x[2]) : -x[0] * e * x[1] / (t(i) + x[2]) ** 2;
  });
  const r = lmder(p, [0.02, 4000, 250]);
  assert.ok(r.converged, r.info);
  // MGH 1981 problem 10: f = 87.9458… (from memory; NIST MGH10 certifies 8.7945855171E+01).
  assert.ok(Math.abs(ssq(r.fnorm) / 87.945855171 - 1) < 1e-9, String(ssq(r.fnorm)));
});

Deno.test("lmder() reaches Kowalik–Osborne's minimum (MGH 15) 3.07505e-4", () => {
  const y = [
    0.1957,
    0.1947,
    0.1735,
    0.1600,
    0.0844,
    0.0627,
    0.0456,
    0.0342,
    0.0323,
    0.0235,
    0.0246,
  ];
  const u = [4, 2, 1, 0.5, 0.25, 0.167, 0.125, 0.1, 0.0833, 0.0714, 0.0625];
  const p = problem(11, 4, (x, i) => {
    const d = u[i] * u[i] + u[i] * x[2] + x[3];
    return y[i] - x[0] * (u[i] * u[i] + u[i] * x[1]) / d;
  }, (x, i, j) => {
    const a = u[i] * u[i] + u[i] * x[1], d = u[i] * u[i] + u[i] * x[2] + x[3];
    return j === 0
      ? -a / d
      : j === 1
      ? -x[0] * u[i] / d
      : j === 2
      ? x[0] * a * u[i] / (d * d)
      : x[0] * a / (d * d);
  });
  const r = lmder(p, [0.25, 0.39, 0.415, 0.39]);
  assert.ok(r.converged, r.info);
  // MGH 1981 problem 15: f = 3.07505…e−4 (from memory; NIST MGH09 certifies 3.0750560385E−04).
  assert.ok(Math.abs(ssq(r.fnorm) / 3.0750560385e-4 - 1) < 1e-9, String(ssq(r.fnorm)));
});

Deno.test("lmder() treats a non-finite trial point as a failed step and shrinks the radius", () => {
  // F = log(x) from x = 10: the first Gauss–Newton step goes to x < 0 where log is NaN.
  const p = problem(1, 1, (x) => Math.log(x[0]), (x) => 1 / x[0]);
  const r = lmder(p, [10]);
  assert.ok(r.converged, r.info);
  assert.ok(Math.abs(r.x[0] - 1) < 1e-12, String(r.x[0]));
});

Deno.test("lmder() reports a start where F is not finite", () => {
  const p = problem(1, 1, (x) => Math.exp(x[0]), (x) => Math.exp(x[0]));
  const r = lmder(p, [1000]);
  assert.equal(r.info, "start-not-finite");
  assert.equal(r.converged, false);
});

Deno.test("lmder() stops at maxfev and says so", () => {
  const p = problem(
    2,
    2,
    (x, i) => (i === 0 ? 10 * (x[1] - x[0] * x[0]) : 1 - x[0]),
    (x, i, j) => i === 0 ? (j === 0 ? -20 * x[0] : 10) : (j === 0 ? -1 : 0),
  );
  const r = lmder(p, [-1.2, 1], { maxfev: 3 });
  assert.equal(r.info, "maxfev");
  assert.equal(r.converged, false);
});

Deno.test("lmder() keeps Rosenbrock inside x₁ ≤ 0.5 and ends on the bound at (0.5, 0.25)", () => {
  const p = problem(
    2,
    2,
    (x, i) => (i === 0 ? 10 * (x[1] - x[0] * x[0]) : 1 - x[0]),
    (x, i, j) => i === 0 ? (j === 0 ? -20 * x[0] : 10) : (j === 0 ? -1 : 0),
  );
  const r = lmder(p, [-1.2, 1], {
    upper: Float64Array.from([0.5, Infinity]),
  });
  assert.ok(r.converged, r.info);
  // Hand computation: with x₁ fixed at 0.5 the best x₂ is x₁² = 0.25, f = (1 − 0.5)² = 0.25.
  assert.equal(r.x[0], 0.5);
  assert.ok(Math.abs(r.x[1] - 0.25) < 1e-12);
  assert.ok(Math.abs(ssq(r.fnorm) - 0.25) < 1e-14);
});

Deno.test("lmder() frees a parameter from its bound when the gradient points inside", () => {
  // min (x − 3)² with x ≥ 0 from the bound x = 0: the optimum 3 is interior.
  const p = problem(1, 1, (x) => x[0] - 3, () => 1);
  const r = lmder(p, [0], { lower: Float64Array.from([0]) });
  assert.ok(Math.abs(r.x[0] - 3) < 1e-12, String(r.x[0]));
});
