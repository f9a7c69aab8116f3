import assert from "node:assert/strict";
import { assertDigits as close, fitResult as fit, makeTable } from "./_fixtures_test.ts";
import { dec, int, inverse, mul, type Q, sub, sum, times, val } from "./_rational_test.ts";

// A quadratic with known σ: x = 0…6, σ = (1, ½, 1, 2, 1, ½, 1), so w = 1/σ² = (1, 4, 1, ¼, 1, 4, 1).
const X = [0, 1, 2, 3, 4, 5, 6];
const Y = [2.5, 3, 7, 8, 14, 19.5, 27];
const SD = ["1", "0.5", "1", "2", "1", "0.5", "1"];

/**
 * The weighted least-squares quadratic in exact rationals: β = (XᵀWX)⁻¹XᵀWy
 * and Cov = (XᵀWX)⁻¹, not rescaled (known σ; Draper & Smith, *Applied
 * Regression Analysis*, 3rd ed., §9.2, from memory for the section).
 */
function exactQuadratic() {
  const w = SD.map((s) => {
    const sd = dec(s);
    return inverse([[mul(sd, sd)]])[0][0];
  });
  const rows = X.map((x) => [int(1), int(x), int(x * x)]);
  const y = Y.map((v) => dec(String(v)));
  const xtwx = [0, 1, 2].map((j) =>
    [0, 1, 2].map((k) => sum(rows.map((r, i) => mul(w[i], mul(r[j], r[k])))))
  );
  const cov = inverse(xtwx);
  const beta = times(
    cov,
    [0, 1, 2].map((j) => sum(rows.map((r, i) => mul(w[i], mul(r[j], y[i]))))),
  );
  const resid = rows.map((r, i) => sub(y[i], sum(r.map((x, j) => mul(x, beta[j])))));
  const chi2 = sum(resid.map((r, i) => mul(w[i], mul(r, r))));
  // Wald χ² of (b, c): [b c]·(Cov of b and c)⁻¹·[b c]ᵀ, the statistic as defined.
  const slopes: Q[] = [beta[1], beta[2]];
  const covSS = [[cov[1][1], cov[1][2]], [cov[2][1], cov[2][2]]];
  const wald = sum(times(inverse(covSS), slopes).map((v, j) => mul(v, slopes[j])));
  // The old overall F: (ESS/(p − 1))/(RSS/(n − p)) with ESS = Σw(y − ȳ_w)² − RSS.
  const ybar = mul(sum(y.map((v, i) => mul(w[i], v))), inverse([[sum(w)]])[0][0]);
  const tss = sum(y.map((v, i) => mul(w[i], mul(sub(v, ybar), sub(v, ybar)))));
  return { chi2, wald, tss, beta };
}

Deno.test("fitKind.run() with known_sigma gives the Wald χ² and the χ² goodness of fit, not F", () => {
  const ex = exactQuadratic();
  const { result, warnings } = fit(
    "quad",
    "y = a + b*x + c*x^2",
    makeTable({ x: X, y: Y, sd: SD.map(Number) }),
    { known_sigma: "sd" },
  );
  close(result.parameters[2].estimate, val(ex.beta[2]), 13, "c (exact rational arithmetic)");
  // Wald χ² = β̂ₛᵀCov⁻¹β̂ₛ over b and c, on 2 df (exact rational arithmetic, exactQuadratic).
  close(result.wald_chi2, val(ex.wald), 12, "Wald χ²");
  assert.equal(result.wald_df, 2);
  // With 2 df the upper tail is e^(−W/2) (Abramowitz & Stegun 26.4.21 for even ν, from memory
  // for the equation number).
  close(result.wald_p_value, Math.exp(-val(ex.wald) / 2), 12, "Wald p-value");
  // Goodness of fit χ² = Σ((y − ŷ)/σ)² on n − p = 4 df (exact rational arithmetic); its upper
  // tail for ν = 4 is e^(−x/2)(1 + x/2) (Abramowitz & Stegun 26.4.21, from memory as above).
  const chi2 = val(ex.chi2);
  close(result.gof_chi2, chi2, 12, "goodness-of-fit χ²");
  assert.equal(result.gof_df, 4);
  close(result.gof_p_value, Math.exp(-chi2 / 2) * (1 + chi2 / 2), 12, "goodness-of-fit p");
  close(result.reduced_chi2, chi2 / 4, 12, "reduced χ²");
  // The Wald χ² is the drop in Σw r² from the intercept-only fit (Seber & Lee, *Linear
  // Regression Analysis*, 2nd ed., §4.3, from memory for the section): TSS_w − RSS_w.
  close(val(ex.wald), val(sub(ex.tss, ex.chi2)), 14, "W = TSS_w − RSS_w (exact)");
  assert.equal(result.f_statistic, null);
  assert.equal(result.f_p_value, null);
  assert.ok(
    warnings.includes(
      'Overall F test of "quad" is not given: with known standard deviations ("known_sigma") the scale is not estimated, so every term but the intercept is tested together by the Wald χ² (wald_chi2) instead',
    ),
    warnings.join("\n"),
  );
});

Deno.test("fitKind.run() with known_sigma and a nonlinear model gives the goodness of fit only", () => {
  const x = [0, 1, 2, 3, 4, 5], y = [10.2, 6.1, 3.6, 2.3, 1.2, 0.8];
  const { result } = fit("decay", "y = a*exp(-k*x)", makeTable({ x, y, sd: [1, 1, 1, 1, 1, 1] }), {
    known_sigma: "sd",
    start: { a: 10, k: 0.5 },
  });
  assert.equal(result.method, "nonlinear");
  assert.equal(result.wald_chi2, null);
  assert.equal(result.wald_df, null);
  // σ = 1 throughout: χ² is the plain RSS, on n − p = 4 df (definition; common practice, no source).
  assert.equal(result.gof_chi2, result.rss);
  assert.equal(result.gof_df, 4);
  close(result.reduced_chi2, result.rss / 4, 15, "reduced χ²");
});

Deno.test("fitKind.run() gives no χ² tests without known_sigma", () => {
  const t = makeTable({ x: X, y: Y, w: [1, 4, 1, 0.25, 1, 4, 1] });
  for (const extra of [{}, { weights: "w" }]) {
    const { result } = fit("q", "y = a + b*x + c*x^2", t, extra);
    assert.ok(result.f_statistic !== null);
    for (
      const k of [
        "wald_chi2",
        "wald_df",
        "wald_p_value",
        "gof_chi2",
        "gof_df",
        "gof_p_value",
        "reduced_chi2",
      ] as const
    ) assert.equal(result[k], null, k);
  }
});

Deno.test("fitKind view shows the χ² tests in place of F for known σ", async () => {
  const { renderToString } = await import("preact-render-to-string");
  const { FitView } = await import("./view.tsx");
  const { result } = fit(
    "quad",
    "y = a + b*x + c*x^2",
    makeTable({ x: X, y: Y, sd: SD.map(Number) }),
    {
      known_sigma: "sd",
    },
  );
  const html = renderToString(FitView({ name: "quad", result }));
  assert.ok(html.includes("Wald χ²") && html.includes("χ²(2) ="), html);
  assert.ok(html.includes("χ² per degree of freedom") && !html.includes("Joint F test"), html);
});
