import assert from "node:assert/strict";
import { parseModel } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import type { FitProblem } from "./problem.ts";
import { solveNonlinear } from "./solve_nonlinear.ts";
import {
  readReferenceJson,
  readReferenceText,
  referenceAvailable,
} from "../../test/reference/_reference.ts";

/** A problem over columns x (and y) with the given start values and options. */
function problemOf(
  text: string,
  x: number[],
  y: number[],
  extra: Partial<FitProblem> = {},
): FitProblem & { warnings: string[] } {
  const warnings: string[] = [];
  return {
    name: "f",
    model: parseModel(text, ["x", "y"]),
    n: x.length,
    columns: [Float64Array.from(x)],
    y: Float64Array.from(y),
    rows: Int32Array.from(x, (_, i) => i + 1),
    start: {},
    warn: (m: string) => warnings.push(m),
    warnings,
    ...extra,
  };
}

const xs = [0, 1, 2, 3, 4, 5, 6, 7];
// Invented data: 3·exp(−0.4x) + 0.5 with a fixed wiggle as "noise" (no source needed).
const ys = xs.map((v, i) => 3 * Math.exp(-0.4 * v) + 0.5 + 0.01 * Math.sin(3 * i + 1));

Deno.test("solveNonlinear() refuses a model that overflows at the start, naming the term and rows", () => {
  const p = problemOf("y = a*exp(b*x)", [0, 1, 2, 3], [1, 2, 3, 4], { start: { a: 1, b: 1000 } });
  assert.throws(() => solveNonlinear(p), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.equal(
      e.message,
      'Cannot fit "f": exp(b * x) is not finite at rows 2, 3, 4 (x = 1, 2, 3) for the start values (a = 1, b = 1000): choose other start values',
    );
    return true;
  });
});

Deno.test("solveNonlinear() explains a non-convergence, naming the parameter running away", () => {
  // From growth (b = −1) for data that decay the fit slides along a valley where a·exp(−b·x)
  // and c trade off without end.
  const p = problemOf("y = a*exp(-b*x) + c", xs, ys, { start: { a: 1, b: -1, c: 0 } });
  assert.throws(() => solveNonlinear(p), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.match(
      e.message,
      /^Cannot fit "f": no convergence after \d+ iterations: .*; last RSS [\d.e+-]+, gradient norm [\d.e+-]+; "a" is running away \(a = -?[\d.e+]+\)$/,
    );
    return true;
  });
});

Deno.test("solveNonlinear() names the parameters the Jacobian cannot identify", () => {
  const p = problemOf("y = a*exp(-b*x) + c*exp(-b*x)", xs, ys, { start: { a: 1, b: 0.3, c: 1 } });
  assert.throws(() => solveNonlinear(p), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.match(
      e.message,
      /^Cannot fit "f": the Jacobian is singular at the solution: "(a|c)" is not identifiable/,
    );
    return true;
  });
});

Deno.test("solveNonlinear() holds a parameter on its limit, with NaN covariance and a warning", () => {
  // The unconstrained offset c is about 0.5; limited to c ≤ 0 it ends on 0.
  const p = problemOf("y = a*exp(-b*x) + c", xs, ys, {
    start: { a: 1, b: 0.3, c: -1 },
    limits: { c: [null, 0] },
  });
  const s = solveNonlinear(p);
  assert.deepEqual(s.atBound, [false, false, true]);
  assert.equal(s.estimates[2], 0);
  assert.ok(Number.isNaN(s.unscaledCovariance[2 + 2 * 3]));
  assert.ok(Number.isFinite(s.unscaledCovariance[0]));
  assert.ok(p.warnings.some((w) => w.startsWith('"c" of "f" ended at its upper limit 0:')));
});

Deno.test("solveNonlinear() refuses a start value outside its limits", () => {
  const p = problemOf("y = a*exp(-b*x) + c", xs, ys, {
    start: { a: 1, b: -1, c: 0 },
    limits: { b: [0, null] },
  });
  assert.throws(() => solveNonlinear(p), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.equal(
      e.message,
      'Start value of "b" in fit "f" is -1: outside its limits [0, Infinity]',
    );
    return true;
  });
});

Deno.test("solveNonlinear() refuses limits of a name that is not a parameter", () => {
  const p = problemOf("y = a*exp(-b*x)", xs, ys, { start: { a: 1, b: 1 }, limits: { bb: [0, 1] } });
  assert.throws(() => solveNonlinear(p), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.equal(
      e.message,
      'Limits of "bb" in fit "f": "bb" is not a parameter of the model: did you mean "b"?',
    );
    return true;
  });
});

Deno.test("solveNonlinear() warns about strongly correlated estimates, naming the pair", () => {
  // On a narrow x range a and b of a·exp(−b·x) are nearly confounded.
  const x = [10, 10.2, 10.4, 10.6, 10.8, 11];
  const y = x.map((v, i) => 5 * Math.exp(-0.2 * v) * (1 + 0.001 * Math.cos(i)));
  const p = problemOf("y = a*exp(-b*x)", x, y, { start: { a: 4, b: 0.15 } });
  solveNonlinear(p);
  assert.ok(
    p.warnings.some((w) => w.startsWith('Estimates of "a" and "b" in "f" are strongly correlated')),
    p.warnings.join("\n"),
  );
});

Deno.test("solveNonlinear() finds start values by multi-start and says so", () => {
  const p = problemOf("y = a*exp(-b*x) + c", xs, ys, { seed: 1 });
  const s = solveNonlinear(p);
  assert.ok(Math.abs(s.estimates[1] - 0.4) < 0.01, String(s.estimates));
  assert.ok(p.warnings.some((w) => w.includes("multi-start search (seed 1)")));
});

interface NistSet {
  name: string;
  file: string;
  data: { first_line: number };
  parameters: { name: string; estimate: number }[];
  residual_sum_of_squares: number;
}

for (
  const [set, model] of [
    ["Misra1a", "y = b1*(1-exp(-b2*x))"],
    ["DanWood", "y = b1*x^b2"],
    ["Chwirut2", "y = exp(-b1*x)/(b2+b3*x)"],
    ["Misra1d", "y = b1*b2*x*((1+b2*x)^(-1))"],
  ]
) {
  Deno.test(`solveNonlinear() finds NIST ${set}'s certified minimum without start values`, async () => {
    if (!referenceAvailable(`multi-start ${set}`)) return;
    const manifest = await readReferenceJson<{ sets: NistSet[] }>("strd/manifest.json");
    const s = manifest.sets.find((x) => x.name === set)!;
    const lines = (await readReferenceText(`strd/${s.file}`)).split("\n")
      .slice(s.data.first_line - 1).filter((l) => l.trim() !== "")
      .map((l) => l.trim().split(/\s+/).map(Number));
    const p = problemOf(model, lines.map((r) => r[1]), lines.map((r) => r[0]), { seed: 1 });
    const sol = solveNonlinear(p);
    // Certified values: NIST StRD, set `set` (manifest.json); 6 digits asked.
    s.parameters.forEach((c) => {
      const got = sol.estimates[p.model.parameters.indexOf(c.name)];
      assert.ok(Math.abs(got / c.estimate - 1) < 1e-6, `${c.name}: ${got} vs ${c.estimate}`);
    });
    assert.ok(Math.abs(sol.rss / s.residual_sum_of_squares - 1) < 1e-6);
  });
}

// Invented data with two rows at t = 0 (rows 1 and 12): a stretched exponential and a noise-free
// copy, for issue 10 item 3 (power laws in a predictor that includes zero).
const ts = [0, 0.5, 1, 1.5, 2, 3, 4, 5, 6, 8, 10, 0];
const decay = ts.map((v, i) => Math.exp(-0.7 * v ** 1.5) + 0.002 * Math.sin(3 * i + 1));

Deno.test("solveNonlinear() fits y = exp(-k*t^n) from the true parameters with t = 0 rows", () => {
  // Before: "the model's derivatives are not finite at the start values (k = 0.7, n = 1.5)",
  // since ∂/∂n = −k·tⁿ·ln t·e^(−k tⁿ) was 0·(−∞) = NaN at t = 0; its limit is 0 (tⁿ ln t → 0
  // for n > 0, L'Hôpital), which the derivative now takes.
  for (const n of [1.5, 0.6]) {
    const y = ts.map((v) => Math.exp(-0.7 * v ** n));
    const p = problemOf("y = exp(-k*x^n)", ts, y, { start: { k: 0.7, n } });
    const s = solveNonlinear(p);
    // Noise-free data: the true parameters are the exact solution (RSS 0).
    assert.ok(Math.abs(s.estimates[0] - 0.7) < 1e-12 && Math.abs(s.estimates[1] - n) < 1e-12);
    // Column of J at the t = 0 rows: 0 for both parameters (0ⁿ = 0; tⁿ ln t → 0).
    assert.ok(s.design[0][0] === 0 && s.design[1][0] === 0 && s.design[1][11] === 0);
  }
  const noisy = solveNonlinear(
    problemOf("y = exp(-k*x^n)", ts, decay, { start: { k: 0.7, n: 1.5 } }),
  );
  assert.ok(noisy.converged && Math.abs(noisy.estimates[1] - 1.5) < 0.05, `${noisy.estimates}`);
  // Without start values the multi-start search reaches the same fit.
  const found = solveNonlinear(problemOf("y = exp(-k*x^n)", ts, decay));
  assert.ok(Math.abs(found.estimates[1] - noisy.estimates[1]) < 1e-8, `${found.estimates}`);
});

Deno.test("solveNonlinear() names the term and rows that are not finite, not the start values", () => {
  const p = problemOf("y = a*exp(-k*x) + b*log(x)", ts, decay, { start: { a: 1, k: 1, b: 0 } });
  assert.throws(() => solveNonlinear(p), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.equal(
      e.message,
      'Cannot fit "f": log(x) is not finite at rows 1, 12 (x = 0): leave those rows out or change the model',
    );
    assert.deepEqual(e.path, ["model"]);
    assert.equal(e.offset, "y = a*exp(-k*x) + b*".length);
    return true;
  });
  // The same without start values (every multi-start sample fails on those rows).
  assert.throws(
    () => solveNonlinear(problemOf("y = a*exp(-k*x) + b*log(x)", ts, decay)),
    { message: /^Cannot fit "f": log\(x\) is not finite at rows 1, 12 \(x = 0\)/ },
  );
  // A derivative: ∂/∂c of a·√(x − c) is infinite where x = c; other start values can help.
  const q = problemOf("y = a*sqrt(x - c)", [1, 2, 3, 4, 5], [0, 1, 1.4, 1.7, 2], {
    start: { a: 1, c: 1 },
  });
  assert.throws(() => solveNonlinear(q), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.equal(
      e.message,
      'Cannot fit "f": the model\'s derivative by "c" is not finite for the start values (a = 1, c = 1): 1 / (2 * sqrt(x - c)) is not finite at row 1 (x = 1): choose other start values',
    );
    assert.deepEqual(e.path, ["start"]);
    return true;
  });
});
