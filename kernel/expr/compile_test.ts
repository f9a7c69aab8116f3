import assert from "node:assert/strict";
import {
  compile,
  compileColumns,
  compileScalar,
  derivative,
  ExprError,
  parseExpression,
} from "./mod.ts";
import { evaluate, randomExpr, rng } from "./_testing.ts";

const same = (a: number, b: number) => Object.is(a, b) || (Number.isNaN(a) && Number.isNaN(b));

Deno.test("compile() equals the tree-walking evaluator on random data", () => {
  // Same operations in the same order, so the results agree bit for bit.
  const next = rng(42);
  const n = 40;
  for (let i = 0; i < 1500; i++) {
    const e = randomExpr(next, ["x", "y", "a", "b"], 6);
    const cols = [
      Float64Array.from({ length: n }, () => 8 * next() - 4),
      Array.from({ length: n }, () => 8 * next() - 4),
    ];
    const params = [4 * next() - 2, 4 * next() - 2];
    const f = compile(e, ["x", "y"], ["a", "b"]);
    const out = f(cols, params, n);
    for (let r = 0; r < n; r++) {
      const ref = evaluate(e, { x: cols[0][r], y: cols[1][r], a: params[0], b: params[1] });
      assert.ok(same(out[r], ref), `row ${r}: ${out[r]} vs ${ref}`);
    }
  }
});

Deno.test("compile() evaluates repeated and row-independent subtrees correctly", () => {
  const e = parseExpression("a*exp(-b*x) + c*exp(-b*x) + (a + c)^2*x + exp(-b*x)/(a + c)^2");
  const f = compile(e, ["x"], ["a", "b", "c"]);
  const x = [0, 0.5, 1, 2];
  const out = f([x], [1.5, 0.7, -0.2], x.length);
  x.forEach((v, r) => assert.ok(same(out[r], evaluate(e, { x: v, a: 1.5, b: 0.7, c: -0.2 }))));
});

Deno.test("compileColumns() gives each tree's column bit for bit as compile() does", () => {
  // One row loop sharing subtrees performs the same operations on the same inputs as one loop
  // per tree, so the values are identical (exact arithmetic: IEEE rounding is deterministic).
  const next = rng(7);
  const n = 30;
  for (let i = 0; i < 300; i++) {
    const e = randomExpr(next, ["x", "y", "a", "b"], 6);
    const trees = [e, derivative(e, "a"), derivative(e, "b")];
    const cols = [0, 1].map(() => Float64Array.from({ length: n }, () => 8 * next() - 4));
    const params = [4 * next() - 2, 4 * next() - 2];
    const all = compileColumns(trees, ["x", "y"], ["a", "b"])(cols, params, n);
    assert.equal(all.length, 3 * n);
    trees.forEach((t, j) => {
      const one = compile(t, ["x", "y"], ["a", "b"])(cols, params, n);
      for (let r = 0; r < n; r++) {
        assert.ok(
          same(all[r + j * n], one[r]),
          `tree ${j} row ${r}: ${all[r + j * n]} vs ${one[r]}`,
        );
      }
    });
  }
});

Deno.test("compileColumns() refuses an output shorter than n times the trees", () => {
  const f = compileColumns([parseExpression("x"), parseExpression("a")], ["x"], ["a"]);
  assert.throws(() => f([[1, 2]], [3], 2, new Float64Array(3)), {
    name: "RangeError",
    message: "Output has 3 values: 4 needed",
  });
});

Deno.test("compile() compiles derivatives, including sign and ifpos", () => {
  const e = parseExpression("abs(a*x - 1) + max(a, x) + min(a*x, 1)");
  const d = derivative(e, "a");
  const f = compile(d, ["x"], ["a"]);
  const x = [-2, -0.5, 0.3, 1.7, 3];
  const out = f([x], [0.8], x.length);
  x.forEach((v, r) => assert.ok(same(out[r], evaluate(d, { x: v, a: 0.8 }))));
});

Deno.test("compile() follows IEEE semantics without throwing", () => {
  // IEEE 754 arithmetic and ECMAScript Math semantics: common practice, no source.
  const run = (
    text: string,
    x: number[],
  ) => [...compile(parseExpression(text), ["x"], [])([x], [], x.length)];
  const nan = Number.NaN;
  const cases: [string, number[], number[]][] = [
    ["log(x)", [-1, 0, 1], [nan, -Infinity, 0]],
    ["exp(x)", [1000, -1000], [Infinity, 0]],
    ["1/x", [0, -0], [Infinity, -Infinity]],
    ["x/x", [0], [nan]],
    ["sqrt(x)", [-2], [nan]],
    ["x^0.5 + pow(x, 1/3)", [-8], [nan]],
    ["0*exp(x)", [1000], [nan]],
    ["x + 1", [nan, Infinity], [nan, Infinity]],
    ["min(x, 1) + max(x, 1)", [nan], [nan]],
    ["log10(x)", [1000], [3]],
  ];
  for (const [text, x, expected] of cases) {
    const got = run(text, x);
    got.forEach((v, r) => assert.ok(same(v, expected[r]), `${text} at ${x[r]}: ${v}`));
  }
});

Deno.test("compile() writes into a given output array and returns it", () => {
  const f = compile(parseExpression("2*x + a"), ["x"], ["a"]);
  const out = new Float64Array(4).fill(-7);
  const got = f([[1, 2, 3]], [10], 3, out);
  assert.equal(got, out);
  assert.deepEqual([...out], [12, 14, 16, -7]);
});

Deno.test("compile() resolves constants before columns and parameters", () => {
  const f = compile(parseExpression("pi + e + x"), ["x", "pi"], ["e"]);
  assert.equal(f([[1], [100]], [100], 1)[0], Math.PI + Math.E + 1);
});

Deno.test("compile() rejects unknown names and mismatched inputs", () => {
  assert.throws(
    () => compile(parseExpression("a + zz"), ["x"], ["a"]),
    (err: unknown) => {
      assert.ok(err instanceof ExprError);
      assert.equal(err.message, 'Unknown name "zz": it is neither a column nor a parameter');
      assert.equal(err.offset, 4);
      return true;
    },
  );
  const f = compile(parseExpression("a*x"), ["x", "y"], ["a"]);
  assert.throws(() => f([[1]], [1], 1), new RangeError("Expected 2 columns, got 1"));
  assert.throws(() => f([[1], [1]], [], 1), new RangeError("Expected 1 parameters, got 0"));
  assert.throws(() => f([[1], [1]], [1], 2), new RangeError('Column "x" has 1 rows: 2 needed'));
  assert.throws(
    () => f([[1], [1]], [1], 1.5),
    new RangeError('Row count "1.5" is not a whole number'),
  );
  assert.throws(
    () => f([[1], [1]], [1], 1, new Float64Array(0)),
    new RangeError("Output has 0 rows: 1 needed"),
  );
  // An unused column may be shorter: only used columns are read.
  assert.deepEqual([...f([[1, 2], []], [3], 2)], [3, 6]);
});

Deno.test("compileScalar() equals the tree-walking evaluator on random values", () => {
  const next = rng(5);
  for (let i = 0; i < 1500; i++) {
    const e = randomExpr(next, ["x", "a", "b"], 6);
    const f = compileScalar(e, ["b", "x", "a"]);
    const v = [4 * next() - 2, 8 * next() - 4, 4 * next() - 2];
    assert.ok(same(f(v), evaluate(e, { b: v[0], x: v[1], a: v[2] })));
  }
});

Deno.test("compileScalar() rejects a name it was not given", () => {
  assert.throws(
    () => compileScalar(parseExpression("x + y"), ["x"]),
    new ExprError('Unknown name "y": it is not among the names given', 4, 1),
  );
});
