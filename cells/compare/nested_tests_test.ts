import assert from "node:assert/strict";
import { fisherF } from "../../kernel/stats/mod.ts";
import { compare, fitOf, makeTable, wiggle } from "./_fixtures_test.ts";

const x = Float64Array.from({ length: 15 }, (_, i) => i + 1);
const noise = wiggle(15, 0.3);
const y = x.map((v, i) => 3 + 0.4 * v + 0.02 * v * v + noise[i]);
const table = makeTable({ x, y });

Deno.test("compare finds nesting by column space, not by parameter names", () => {
  const { result } = compare({
    centred: fitOf("centred", "y = m + s*(x - 8)", table),
    quad: fitOf("quad", "y = polynomial(x, 2)", table),
    logline: fitOf("logline", "y = a + b*log(x)", table),
  });
  // centred ⊂ quad (span{1, x − 8} ⊂ span{1, x, x²}); log x is in neither span.
  assert.deepEqual(result.nested_tests.map((t) => [t.smaller, t.larger]), [["centred", "quad"]]);
  const t = result.nested_tests[0];
  const [s, l] = [result.rows[0], result.rows[1]];
  // F = ((RSS_s − RSS_l)/(p_l − p_s))/(RSS_l/(n − p_l)) (Draper & Smith §6.1, from memory).
  const f = (s.rss - l.rss) / 1 / (l.rss / 12);
  assert.equal(t.df1, 1);
  assert.equal(t.df2, 12);
  assert.ok(Math.abs(t.f! / f - 1) < 1e-12);
  assert.ok(Math.abs(t.p_value! / fisherF(1, 12).upper(f) - 1) < 1e-12);
});

Deno.test("compare tests an offset model inside a larger one and skips nonlinear and transformed fits", () => {
  const { result } = compare({
    fixed: fitOf("fixed", "y = a + 0.4*x", table),
    line: fitOf("line", "y = a + b*x", table),
    decay: fitOf("decay", "y = a*exp(b*x)", table, { start: { a: 3, b: 0.1 } }),
    logged: fitOf("logged", "log(y) = a + b*x + c*x^2", table),
  }, { by: "aic" });
  // fixed: mean space 0.4x + span{1} ⊂ span{1, x}: nested; nothing else qualifies.
  assert.deepEqual(result.nested_tests.map((t) => [t.smaller, t.larger]), [["fixed", "line"]]);
  assert.match(result.verdict, /AIC/);
});

Deno.test("compare does not call equal-size or unrelated linear fits nested", () => {
  const { result } = compare({
    a: fitOf("a", "y = a + b*x", table),
    b: fitOf("b", "y = c + d*(2*x + 1)", table),
    c: fitOf("c", "y = c + d*x^2", table),
  });
  assert.deepEqual(result.nested_tests, []);
});

Deno.test("compare finds nesting through the larger fit's QR with weights, and refuses log x", () => {
  const w = { weights: "1/x" };
  const { result } = compare({
    centred: fitOf("centred", "y = m + s*(x - 8)", table, w),
    quad: fitOf("quad", "y = polynomial(x, 2)", table, w),
    logline: fitOf("logline", "y = a + b*log(x)", table, w),
    rootline: fitOf("rootline", "y = a + b*sqrt(x) + c*x", table, w),
  }, { by: "aic" });
  // √w(x − 8) lies in span √W{1, x, x²}; √w·log x lies in neither √W{1, x, x²} nor
  // √W{1, √x, x}, nor √w·√x in the quadratic's span (exact arithmetic: distinct functions
  // on 15 points leave residuals far above the 1e-8 tolerance).
  assert.deepEqual(result.nested_tests.map((t) => [t.smaller, t.larger]), [["centred", "quad"], [
    "centred",
    "rootline",
  ]]);
});
