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

Deno.test("solveNonlinear() refuses a model that overflows at the start, naming the rows", () => {
  const p = problemOf("y = a*exp(b*x)", [0, 1, 2, 3], [1, 2, 3, 4], { start: { a: 1, b: 1000 } });
  assert.throws(() => solveNonlinear(p), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.equal(
      e.message,
      'Cannot fit "f": the model is not finite at the start values (a = 1, b = 1000) in rows 2, 3, 4: choose other start values',
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
