import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { compare, fitOf, makeTable } from "./_fixtures_test.ts";
import { exactWls, int, type Q, q, val } from "../fit/_rational_test.ts";
import { assertDigits as close } from "../fit/_fixtures_test.ts";

// A calibration with proportional error (invented): concentrations 1…16, response ≈ 0.3 + 2x
// with scatter growing with x. The classic question: no weights, 1/x or 1/x²?
const X = [1, 2, 4, 8, 16];
const Y = [2.21, 4.42, 8.05, 17.1, 31.4];
const table = () => makeTable({ x: X, y: Y });
const LN_2PI = Math.log(2 * Math.PI);

/**
 * log L of a weighted line by hand: RSS_w in exact rational arithmetic
 * (Draper & Smith §9.2 through `exactWls`), then the Gaussian log-likelihood
 * with ML variance and relative weights, −n/2·(ln 2π + ln(RSS_w/n) + 1) + ½·Σ ln wᵢ
 * (DESIGN.md §5; the statsmodels WLS convention of
 * ../shared/reference/checks/README.md), where ½·Σ ln wᵢ is given by hand.
 */
function logL(w: Q[], halfSumLnW: number): number {
  const rss = val(exactWls(X, Y, w).rss);
  return -2.5 * (LN_2PI + Math.log(rss / 5) + 1) + halfSumLnW;
}

Deno.test("compare ranks a 1/x² calibration against 1/x and no weights by AICc, log L with ½Σ ln w", () => {
  const fits = {
    plain: fitOf("plain", "y = a + b*x", table()),
    inv_x: fitOf("inv_x", "y = a + b*x", table(), { weights: "1/x" }),
    inv_x2: fitOf("inv_x2", "y = a + b*x", table(), { weights: "1/x^2" }),
  };
  const { result } = compare(fits, { by: "aicc" });
  // ½Σ ln wᵢ by hand: 1·2·4·8·16 = 2¹⁰, so −½·10 ln 2 for 1/x and −10 ln 2 for 1/x².
  const want = [
    logL(X.map(() => int(1)), 0),
    logL(X.map((x) => q(1n, BigInt(x))), -5 * Math.LN2),
    logL(X.map((x) => q(1n, BigInt(x * x))), -10 * Math.LN2),
  ];
  result.rows.forEach((r, j) => {
    close(r.log_likelihood, want[j], 13, `${r.fit} log L`);
    // k = p + 1 = 3, n = 5: AIC = 6 − 2 log L, AICc = AIC + 2·3·4/(5 − 3 − 1) = AIC + 24,
    // BIC = 3 ln 5 − 2 log L (DESIGN.md §5).
    close(r.aic, 6 - 2 * want[j], 13, `${r.fit} AIC`);
    close(r.aicc, 30 - 2 * want[j], 13, `${r.fit} AICc`);
    close(r.bic, 3 * Math.log(5) - 2 * want[j], 13, `${r.fit} BIC`);
  });
  const best = want.indexOf(Math.max(...want));
  assert.equal(result.preferred, result.rows[best].fit);
  assert.equal(result.preferred, "inv_x2");
  assert.deepEqual(result.rows.map((r) => r.weights_option), [null, "1/x", "1/x^2"]);
  const basis =
    'The fits differ in their weights ("plain" unweighted, "inv_x" weights 1/x, "inv_x2" weights 1/x^2): each fit\'s weights are read as its model of the variance, yᵢ ~ N(μᵢ, σ²/wᵢ) with one scale σ² estimated, so its Gaussian log-likelihood includes ½·Σ ln wᵢ (unchanged if every weight is multiplied by one constant) and AIC, AICc and BIC compare the weightings on the same rows and the same response; RSS, σ, R² and the leave-one-out RMSE are each on its own fit\'s weighted scale and are not compared';
  assert.equal(result.weighting_basis, basis);
  assert.ok(result.verdict.endsWith(basis), result.verdict);
  assert.ok(result.verdict.startsWith('"inv_x2" is preferred by AICc'), result.verdict);
});

Deno.test("compare: multiplying every weight by one constant leaves log L and the criteria unchanged", () => {
  // −n/2·ln(c·RSS_w/n) + ½·Σ ln(c·wᵢ) = −n/2·ln(RSS_w/n) + ½·Σ ln wᵢ (hand computation).
  const { result } = compare({
    a: fitOf("a", "y = a + b*x", table(), { weights: "1/x^2" }),
    b: fitOf("b", "y = a + b*x", table(), { weights: "100/x^2" }),
  });
  close(result.rows[1].log_likelihood, result.rows[0].log_likelihood!, 13, "log L");
  close(result.rows[1].delta, 0, 13, "Δ");
  // 100/x² and 1/x² are different weights row for row, so the basis is stated.
  assert.ok(result.weighting_basis !== null);
});

Deno.test("compare tests nested fits only among fits of the same weights", () => {
  const { result } = compare({
    line: fitOf("line", "y = a + b*x", table()),
    quad: fitOf("quad", "y = a + b*x + c*x^2", table()),
    line_x2: fitOf("line_x2", "y = a + b*x", table(), { weights: "1/x^2" }),
    quad_x2: fitOf("quad_x2", "y = a + b*x + c*x^2", table(), { weights: "1/x^2" }),
  }, { by: "bic" });
  assert.deepEqual(result.nested_tests.map((t) => [t.smaller, t.larger]), [
    ["line", "quad"],
    ["line_x2", "quad_x2"],
  ]);
});

Deno.test("compare refuses to rank fits weighted differently by leave-one-out RMSE", () => {
  assert.throws(
    () =>
      compare({
        plain: fitOf("plain", "y = a + b*x", table()),
        inv_x2: fitOf("inv_x2", "y = a + b*x", table(), { weights: "1/x^2" }),
      }, { by: "loo" }),
    (e: unknown) => {
      assert.ok(e instanceof CellError, `expected CellError, got ${e}`);
      assert.equal(
        e.message,
        'Cannot compare "cmp" by leave-one-out RMSE: fits "plain" and "inv_x2" are weighted differently, and each RMSE is weighted by its own fit\'s weights: rank them by aic, aicc or bic',
      );
      assert.deepEqual(e.path, ["by"]);
      return true;
    },
  );
});

Deno.test("compare states no weighting basis when the fits are weighted alike", () => {
  const { result } = compare({
    line: fitOf("line", "y = a + b*x", table(), { weights: "1/x" }),
    quad: fitOf("quad", "y = a + b*x + c*x^2", table(), { weights: "1/x" }),
  });
  assert.equal(result.weighting_basis, null);
  assert.ok(!result.verdict.includes("differ in their weights"), result.verdict);
});
