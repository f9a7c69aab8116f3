/**
 * kernel/stats varianceInflation() (auxiliary regressions) and
 * varianceInflationOfFactor() (through the fit's own factor, what the check
 * uses since issue 16) against exact rational arithmetic (BigInt fractions,
 * cells/fit/_rational_test.ts; here because kernel/ tests may not import
 * cells/) on small invented designs and on NIST's Longley set (StRD, read
 * from ../shared/reference; skipped without it):
 * VIF_j = S_j·((XᵀWX)⁻¹)_jj, S_j = (XᵀWX)_jj uncentred (Belsley 1984;
 * Stewart 1987) or the weighted sum of squares about the mean when the
 * design has an intercept (Marquardt 1970; Belsley, Kuh & Welsch 1980, §3.1).
 *
 * @module
 */
import assert from "node:assert/strict";
import { conditionNumber, varianceInflation, vifForm } from "../../kernel/stats/mod.ts";
import { loadStrd } from "../../kernel/linalg/_strd.ts";
import { check, fitOf } from "./_fixtures_test.ts";
import { int, inverse, mul, type Q, sub, sum, val } from "../fit/_rational_test.ts";
import { exact } from "../predict/_exact_test.ts";

const X1 = [1, 2, 3, 4, 5, 6], X2 = [2, 3, 5, 8, 9, 12], X3 = [1, 0, 2, 1, 3, 2];
/** Weights with exact square roots, so √wᵢ·x is exact in doubles too. */
const W = [1, 4, 1, 0.25, 9, 1];

/** (XᵀWX)_jj·((XᵀWX)⁻¹)_jj per column, or with `centred` S_jj about the weighted mean. */
function exactVif(cols: number[][], w: number[] | null, centred = -1): number[] {
  const wq = (i: number): Q => (w === null ? int(1) : exact(w[i]));
  const c = cols.map((col) => col.map(exact));
  const g = c.map((a) => c.map((b) => sum(a.map((v, i) => mul(wq(i), mul(v, b[i]))))));
  const inv = inverse(g);
  return c.map((a, j) => {
    let s = g[j][j];
    if (centred >= 0) {
      // Σw(x − x̄_w)² = Σwx² − (Σwx)²/Σw
      const sw = sum(a.map((_, i) => wq(i))), swx = sum(a.map((v, i) => mul(wq(i), v)));
      s = sub(s, mul(mul(swx, swx), inverse([[sw]])[0][0]));
    }
    return val(mul(s, inv[j][j]));
  });
}

function close(got: number | null, want: number, what: string) {
  assert.ok(got !== null && Math.abs(got - want) <= 1e-13 * want, `${what}: ${got} vs ${want}`);
}

Deno.test("varianceInflation() without an intercept is the uncentred (XᵀX)jj·((XᵀX)⁻¹)jj", () => {
  // Exact rational arithmetic: 222.19, 194.16, 6.848. Before, a column of ones was added to
  // every auxiliary regression and R² centred, answering for a model this one is not: 60.28,
  // 55.13, 1.986 (the variance of the estimate of "a" is inflated 222-fold, not 60-fold).
  const design = [X1, X2, X3].map((c) => Float64Array.from(c));
  const v = varianceInflation(design, ["a", "b", "c"], null);
  const want = exactVif([X1, X2, X3], null);
  ["a", "b", "c"].forEach((k, j) => close(v[k], want[j], `VIF ${k}`));
  assert.equal(vifForm(design), "uncentred");
  // Weighted: (XᵀWX)jj·((XᵀWX)⁻¹)jj (exact rational arithmetic).
  const vw = varianceInflation(design, ["a", "b", "c"], Float64Array.from(W));
  const ww = exactVif([X1, X2, X3], W);
  ["a", "b", "c"].forEach((k, j) => close(vw[k], ww[j], `weighted VIF ${k}`));
});

Deno.test("varianceInflation() with an intercept is centred: S_jj about the mean times ((XᵀX)⁻¹)jj", () => {
  const one = X1.map(() => 1);
  const design = [one, X1, X2, X3].map((c) => Float64Array.from(c));
  assert.equal(vifForm(design), "centred");
  for (const w of [null, W]) {
    const v = varianceInflation(design, ["b0", "a", "b", "c"], w && Float64Array.from(w));
    const want = exactVif([one, X1, X2, X3], w, 0);
    assert.ok(!("b0" in v), "no VIF for the intercept");
    ["a", "b", "c"].forEach((k, j) => close(v[k], want[j + 1], `VIF ${k} (weights ${w})`));
  }
});

Deno.test("varianceInflation() of a single column through the origin is 1", () => {
  assert.deepEqual(varianceInflation([Float64Array.of(1, 2, 4)], ["k"], null), { k: 1 });
});

/** NIST StRD Longley (16 rows, 6 predictors, an ill-conditioned design), or null without it. */
const longley = await loadStrd("Longley");

/** The Longley columns and a fit of y on all six, with an intercept or through the origin. */
function longleyFit(intercept: boolean, weights: number[] | null = null) {
  const set = longley!;
  const cols: Record<string, Float64Array> = {};
  set.columns.forEach((c, j) => (cols[c] = set.data[j]));
  const terms = set.columns.slice(1).map((c, j) => `b${j + 1}*${c}`).join(" + ");
  if (weights) cols.w = Float64Array.from(weights);
  const fit = fitOf(
    cols,
    `y = ${intercept ? "b0 + " : ""}${terms}`,
    weights ? { weights: "w" } : {},
  );
  return { set, fit, x: set.data.slice(1).map((c) => [...c]) };
}

Deno.test({
  name:
    "check VIF through the fit's factor on NIST Longley: exact to 1e-12, the auxiliary route to 1e-10",
  ignore: longley === null,
  fn() {
    // Weights with exact square roots (invented), so √wᵢ·x is exact in doubles too.
    const w16 = Array.from({ length: 16 }, (_, i) => [1, 4, 0.25, 9][i % 4]);
    for (const [intercept, w] of [[true, null], [true, w16], [false, null]] as const) {
      const { fit, x } = longleyFit(intercept, w);
      const r = check(fit);
      const one = x[0].map(() => 1);
      const want = intercept ? exactVif([one, ...x], w, 0).slice(1) : exactVif(x, w);
      const old = varianceInflation(fit.design, fit.parameters, fit.weights);
      assert.equal(r.vif_form, intercept ? "centred" : "uncentred");
      fit.parameters.slice(intercept ? 1 : 0).forEach((name, j) => {
        const got = r.vif[name]!;
        // Exact rational arithmetic on the doubles the fit holds.
        assert.ok(Math.abs(got - want[j]) <= 1e-12 * want[j], `${name}: ${got} vs ${want[j]}`);
        // The auxiliary regressions the check ran before (kept in kernel/stats as the oracle).
        assert.ok(
          Math.abs(got - old[name]!) <= 1e-10 * old[name]!,
          `${name}: ${got} vs ${old[name]}`,
        );
      });
      assert.ok(!("b0" in r.vif));
      // σ_max/σ_min from the fit's factor against a QR of the (√w-scaled) design itself.
      const k = conditionNumber(fit.design, fit.weights)!;
      assert.ok(Math.abs(r.condition_number! - k) <= 1e-10 * k, `${r.condition_number} vs ${k}`);
    }
  },
});
