import assert from "node:assert/strict";
import { parseModel } from "../../kernel/expr/mod.ts";
import { responseScale } from "./response_scale.ts";
import { fitOf, predict } from "./_fixtures_test.ts";

Deno.test("responseScale() back-transforms by the one response inverse, null outside the range", () => {
  const inv = (text: string, z: number) => responseScale(parseModel(text, ["x", "y"])).inverse(z);
  // The cases of kernel/expr/response_inverse_test.ts, through predict's entry point:
  assert.equal(inv("y^3 = a*x", -8), -2); // exact arithmetic: (−2)³ = −8
  assert.equal(inv("sqrt(y) = a*x", -2), null, "exact arithmetic: no y has a negative square root");
  assert.equal(inv("atan(y) = a*x", 1), Math.tan(1)); // exact arithmetic: atan(tan 1) = 1
  assert.equal(inv("atan(y) = a*x", 2), null, "exact arithmetic: |atan y| < π/2");
  assert.equal(inv("y^2 = a*x", 4), 2, "even powers: y ≥ 0 assumed (common practice, no source)");
  assert.equal(inv("log(y) = a*x", 800), null, "exact arithmetic: e^800 overflows a double");
  assert.equal(inv("y = a*x", 4), 4);
  assert.equal(responseScale(parseModel("y = a*x", ["x", "y"])).transformed, false);
  const abs = responseScale(parseModel("abs(y) = a*x", ["x", "y"]));
  assert.equal(abs.inverse(1), null);
  assert.equal(abs.noInverse, "abs() of the response is not one-to-one");
});

Deno.test("predictKind.run() back-transforms a log response and keeps the model scale", () => {
  const x = [1, 2, 3, 4, 5, 6, 7, 8];
  const y = x.map((v, i) => Math.exp(0.5 + 0.3 * v + 0.05 * Math.sin(4 * i)));
  const logFit = fitOf({ x, y }, "log(y) = a + b*x");
  // The same fit on the log column itself: the model-scale values must agree with it.
  const direct = fitOf({ x, ly: y.map(Math.log) }, "ly = a + b*x");
  const at = { at: { x: [2.5, 9] }, solve: { y: 5 } };
  const t = predict(logFit, at), d = predict(direct, { at: at.at, solve: { ly: Math.log(5) } });
  assert.equal(t.result.scale, "original (back-transformed from log(y))");
  assert.equal(t.result.se_scale, "model (log(y))");
  t.result.at.forEach((p, i) => {
    const q = d.result.at[i];
    // Equal to rounding: the fits evaluate log y in different ways (common practice, no source).
    const near = (u: number, v: number) => Math.abs(u - v) <= 1e-12 * Math.abs(v);
    const m = p.model_scale!;
    assert.ok(near(p.se_fit!, q.se_fit!), "se_fit on the model scale");
    assert.ok(
      near(m.estimate!, q.estimate!) && near(m.ci![0], q.ci![0]) && near(m.pi![1], q.pi![1]),
    );
    // exp of the model-scale values (the inverse of log; common practice, no source).
    const rel = (u: number, v: number) => Math.abs(u / v - 1) < 1e-15;
    assert.ok(rel(p.estimate!, Math.exp(m.estimate!)));
    assert.ok(rel(p.ci![0], Math.exp(m.ci![0])) && rel(p.ci![1], Math.exp(m.ci![1])));
    assert.ok(rel(p.pi![0], Math.exp(m.pi![0])) && rel(p.pi![1], Math.exp(m.pi![1])));
  });
  // solve: y₀ = 5 on the original scale is log 5 on the model scale.
  assert.deepEqual(t.result.solve[0].y, { y: 5 });
  const [ts, ds] = [t.result.solve[0], d.result.solve[0]];
  assert.ok(Math.abs(ts.x.x - ds.x.x) < 1e-12 * ds.x.x);
  assert.ok(Math.abs(ts.ci![0] - ds.ci![0]) < 1e-12 * ds.ci![0]);
  assert.ok(Math.abs(ts.ci![1] - ds.ci![1]) < 1e-12 * ds.ci![1]);
});

Deno.test("predictKind.run() swaps interval ends for a decreasing transform", () => {
  const x = [1, 2, 3, 4, 5, 6];
  const y = x.map((v, i) => 1 / (0.2 + 0.1 * v + 0.01 * (i % 2)));
  const p = predict(fitOf({ x, y }, "1/y = a + b*x"), { at: { x: 3 } }).result.at[0];
  assert.ok(p.ci![0] < p.estimate! && p.estimate! < p.ci![1]);
  assert.ok(Math.abs(p.ci![0] - 1 / p.model_scale!.ci![1]) < 1e-15 * p.ci![0]);
});
