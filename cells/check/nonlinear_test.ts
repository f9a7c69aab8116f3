/**
 * The check of a nonlinear fit: leverage, VIF and condition number from the
 * Jacobian at the estimates, Breusch–Pagan on the fitted values. Invented
 * data; every value is checked against exact rational arithmetic (BigInt
 * fractions, cells/fit/_rational_test.ts) on the fit's own Jacobian,
 * residuals and fitted values, each double taken as the exact fraction it is.
 *
 * @module
 */
import assert from "node:assert/strict";
import { standardNormal } from "../../kernel/stats/mod.ts";
import { add, inverse, mul, type Q, sub, sum, val } from "../fit/_rational_test.ts";
import { exact } from "../predict/_exact_test.ts";
import { check, fitOf } from "./_fixtures_test.ts";

// Invented: y = exp(−k·tⁿ) with a 10% multiplicative error, so the spread
// grows with the fitted value (a funnel); three decimals.
const T = Array.from({ length: 24 }, (_, i) => i / 4);
const Y = [
  0.961,
  0.897,
  0.757,
  0.643,
  0.552,
  0.446,
  0.388,
  0.308,
  0.266,
  0.191,
  0.159,
  0.121,
  0.088,
  0.066,
  0.068,
  0.049,
  0.039,
  0.031,
  0.027,
  0.022,
  0.017,
  0.014,
  0.013,
  0.008,
];

// Invented: a saturating curve y = vmax·x/(km + x) sampled far above km (≈ 2), three decimals.
const X = [20, 40, 60, 100, 150, 200, 300, 400, 600, 800, 1000, 1500];
const V = [9.079, 9.512, 9.684, 9.781, 9.867, 9.878, 9.945, 9.952, 9.98, 9.97, 9.984, 9.984];

function close(got: number | null, want: number, tol: number, what: string) {
  assert.ok(
    got !== null && Math.abs(got - want) <= tol * Math.abs(want),
    `${what}: ${got} vs ${want}`,
  );
}

/** Σ(a − ā)(b − b̄) in exact arithmetic. */
function centredProduct(a: Q[], b: Q[]): Q {
  const n: Q = [BigInt(a.length), 1n];
  return sub(sum(a.map((v, i) => mul(v, b[i]))), mul(mul(sum(a), sum(b)), inverse([[n]])[0][0]));
}

Deno.test("check of a nonlinear fit: Breusch–Pagan on ŷ finds a funnel (exact rational arithmetic)", () => {
  const fit = fitOf({ t: T, y: Y }, "y = exp(-k*t^n)", { start: { k: 0.6, n: 1.2 } });
  const r = check(fit);
  const b = r.breusch_pagan!;
  assert.equal(b.regressors, "fitted");
  assert.equal(b.df, 1);
  // Auxiliary regression of u = e² on 1 and ŷ, a straight line: R² = Sᵤᵧ²/(Sᵤᵤ·Sᵧᵧ) exactly.
  const u = Array.from(fit.residuals, (e) => mul(exact(e), exact(e)));
  const yh = Array.from(fit.fitted, exact);
  const suy = centredProduct(u, yh), suu = centredProduct(u, u), syy = centredProduct(yh, yh);
  const r2 = mul(mul(suy, suy), inverse([[mul(suu, syy)]])[0][0]);
  const n = u.length;
  // Koenker (1981): n·R². Before, e² was regressed on the Jacobian (−tⁿŷ, −k·tⁿ·ln t·ŷ), which
  // does not follow ŷ: statistic 0.931 on 2 df, p = 0.63, and the check reported only an
  // outlier (row 1), leverage, curvature (RESET) and non-normality; now 7.22 on 1 df, p = 0.0072.
  const koenker = val(mul([BigInt(n), 1n], r2));
  close(b.statistic, koenker, 1e-12, "Koenker statistic");
  // P(χ²₁ > s) = 2·P(Z > √s) (identity; common practice, no source).
  close(b.p_value, 2 * standardNormal.upper(Math.sqrt(koenker)), 1e-12, "p-value");
  assert.ok(b.p_value > 0.006 && b.p_value < 0.008, String(b.p_value));
  const f = r.findings.find((x) => x.code === "non-constant-variance");
  assert.ok(f, JSON.stringify(r.findings.map((x) => x.code)));
  assert.match(f.message, /changes with the fitted values: Breusch–Pagan \(koenker, on ŷ\)/);
  // Breusch & Pagan (1979): ESS/2 of u/(Σu/n) on 1 and ŷ = R²·Sᵤᵤ·(n/Σu)²/2.
  const o = check(fit, { variance_test: "original" }).breusch_pagan!;
  const scale = mul([BigInt(n), 1n], inverse([[sum(u)]])[0][0]);
  close(o.statistic, val(mul(mul(mul(r2, suu), mul(scale, scale)), [1n, 2n])), 1e-12, "original");
});

Deno.test("check of a nonlinear fit: VIF, leverage and condition number of the Jacobian at the estimates", () => {
  const fit = fitOf({ x: X, y: V }, "y = vmax*x/(km + x)", { start: { vmax: 10, km: 2 } });
  const r = check(fit);
  // J = (x/(km + x), −vmax·x/(km + x)²) at the estimates, as the fit keeps it; G = JᵀJ exactly.
  const J = fit.design.map((c) => Array.from(c, exact));
  const G = J.map((a) => J.map((b) => sum(a.map((v, i) => mul(v, b[i])))));
  const inv = inverse(G);
  // Uncentred VIF (no intercept in the model): G_jj·(G⁻¹)_jj. Before, R² was centred about a
  // column of ones the model does not have; ∂f/∂vmax is nearly constant this far above km, so
  // both VIFs came out 1200 and a collinearity finding was made, with a condition number of 8.4.
  assert.equal(r.vif_form, "uncentred");
  for (const [j, k] of ["vmax", "km"].entries()) {
    close(r.vif[k], val(mul(G[j][j], inv[j][j])), 1e-12, `VIF ${k}`);
  }
  assert.ok(r.vif.vmax! < 2, String(r.vif.vmax));
  assert.ok(!r.findings.some((x) => x.code === "collinearity"), JSON.stringify(r.findings));
  // Leverage hᵢ = Jᵢᵀ G⁻¹ Jᵢ.
  r.leverage.forEach((h, i) => {
    const row = J.map((c) => c[i]);
    const form = sum(row.map((a, j) => mul(a, sum(row.map((b, k) => mul(inv[j][k], b))))));
    close(h, val(form), 1e-12, `leverage ${i + 1}`);
  });
  // κ = σ_max/σ_min = λ_max/√det G, λ_max = (tr G + √(tr² − 4 det))/2: exact up to the roots.
  const tr = add(G[0][0], G[1][1]), det = sub(mul(G[0][0], G[1][1]), mul(G[0][1], G[1][0]));
  const lmax = (val(tr) + Math.sqrt(val(sub(mul(tr, tr), mul([4n, 1n], det))))) / 2;
  close(r.condition_number, lmax / Math.sqrt(val(det)), 1e-12, "condition number");
  const lev = r.findings.find((x) => x.code === "high-leverage");
  assert.ok(
    lev && /from the Jacobian at the estimates, a local, linearised measure/.test(lev.message),
  );
});

Deno.test("check of a nonlinear fit: a parameter held at a bound has no VIF and no robust variance", () => {
  // Invented data; b ends on its upper limit 0.01, so only "a" varies (its column alone: VIF 1).
  const fit = fitOf({ x: X.slice(0, 8), y: V.slice(0, 8) }, "y = a*x^b", {
    start: { a: 9, b: 0.005 },
    within: { b: [null, 0.01] },
  });
  assert.deepEqual(fit.atBound, [false, true]);
  const r = check(fit, { robust: "hc3" });
  assert.deepEqual(r.vif, { a: 1 });
  const b = r.robust!;
  assert.equal(b.std_errors.b, null);
  assert.equal(b.ci.b, null);
  assert.deepEqual(b.covariance[1], [null, null]);
  assert.ok(b.std_errors.a! > 0);
});
