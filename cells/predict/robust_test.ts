import assert from "node:assert/strict";
import { studentT } from "../../kernel/stats/mod.ts";
import { fitOf, predict } from "./_fixtures_test.ts";
import { add, dec, exact, exactFit, int, mul, type Q, sub, sum, val } from "./_exact_test.ts";
import { inverse, q, times } from "../fit/_rational_test.ts";
import { RESPONSES, YEARS } from "../fit/_raw_years_test.ts";

// Invented data whose spread grows with x.
const X = [1, 2, 3, 4, 5, 6, 7];
const Y = [3.1, 4.8, 7.4, 8.2, 11.9, 11.1, 16.8];

type HC = "hc0" | "hc1" | "hc2" | "hc3";

/**
 * se_fit² at x₀ from the HC covariance (XᵀWX)⁻¹(Σ ωᵢ x̃ᵢx̃ᵢᵀ)(XᵀWX)⁻¹, x̃ᵢ = √wᵢxᵢ,
 * ẽᵢ = √wᵢeᵢ, ωᵢ = ẽᵢ², n/(n − p)·ẽᵢ², ẽᵢ²/(1 − hᵢ), ẽᵢ²/(1 − hᵢ)² (White 1980;
 * MacKinnon & White 1985), in exact rational arithmetic; `root` is √wᵢ (rational here).
 */
function exactRobust(type: HC, x0: number, root: Q[] | null) {
  const rows = X.map((x) => [int(1), int(x)]);
  const w = root && root.map((r) => mul(r, r));
  const f = exactFit(rows, Y.map((v) => dec(String(v))), w);
  const n = X.length, p = 2;
  const meat = [[int(0), int(0)], [int(0), int(0)]];
  rows.forEach((r, i) => {
    const s = root ? root[i] : int(1);
    const xt = r.map((v) => mul(s, v)), e = mul(s, f.residuals[i]);
    const h = f.form(f.bread, xt), gap = sub(int(1), h), e2 = mul(e, e);
    const omega = type === "hc0"
      ? e2
      : type === "hc1"
      ? mul(e2, [BigInt(n), BigInt(n - p)])
      : type === "hc2"
      ? mul(e2, inverse([[gap]])[0][0])
      : mul(e2, inverse([[mul(gap, gap)]])[0][0]);
    for (let j = 0; j < 2; j++) {
      for (let k = 0; k < 2; k++) meat[j][k] = add(meat[j][k], mul(omega, mul(xt[j], xt[k])));
    }
  });
  const prod = (a: Q[][], b: Q[][]) =>
    a.map((row) => [0, 1].map((k) => sum(row.map((v, l) => mul(v, b[l][k])))));
  const v = prod(prod(f.bread, meat), f.bread);
  return val(f.form(v, [int(1), exact(x0)]));
}

function close(got: number, want: number, tol: number, what: string) {
  assert.ok(Math.abs(got - want) <= tol * Math.abs(want), `${what}: ${got} vs ${want}`);
}

Deno.test("predict robust: HC0–HC3 standard errors of the mean response against exact arithmetic", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x");
  const t = studentT(5).quantile(0.975), s = fit.statistics.sigma!;
  for (const type of ["hc0", "hc1", "hc2", "hc3"] as const) {
    const { result } = predict(fit, { at: { x: [1, 4, 9] }, robust: type });
    assert.equal(result.robust, type);
    assert.match(
      result.covariance,
      new RegExp(`^heteroscedasticity-consistent ${type.toUpperCase()} `),
    );
    assert.match(result.new_observation, /s² is the fit's residual variance also with robust/);
    [1, 4, 9].forEach((x0, i) => {
      const p = result.at[i], se2 = exactRobust(type, x0, null);
      close(p.se_fit! ** 2, se2, 1e-12, `${type} se_fit² at ${x0}`);
      close(p.ci![1] - p.estimate!, t * Math.sqrt(se2), 1e-12, `${type} CI at ${x0}`);
      // The PI adds the fit's own s² to the robust se_fit² (common practice, no source).
      close(p.se_prediction! ** 2, se2 + s * s, 1e-12, `${type} se_prediction² at ${x0}`);
    });
  }
  const plain = predict(fit, { at: { x: 4 } }).result;
  assert.equal(plain.robust, null);
  assert.equal(plain.covariance, "the fit's: s²(XᵀX)⁻¹");
});

Deno.test("predict robust: HC3 of a 1/x² weighted line scales rows and residuals by √w = 1/x", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x", { weights: "1/x^2" });
  const root = X.map((x) => [1n, BigInt(x)] as Q);
  const p = predict(fit, { at: { x: 6 }, robust: "hc3" }).result.at[0];
  close(p.se_fit! ** 2, exactRobust("hc3", 6, root), 1e-12, "weighted HC3 se_fit²");
});

Deno.test("predict robust: solve uses the robust covariance in Fieller's interval", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x");
  const own = predict(fit, { solve: { y: 10 } }).result.solve[0];
  const hc = predict(fit, { solve: { y: 10 }, robust: "hc3" }).result.solve[0];
  assert.equal(hc.x.x, own.x.x);
  assert.notEqual(hc.ci![0], own.ci![0]);
  // The ends satisfy (y₀ − a − b·x)² = t²(gᵀV_HC3 g + s²) (Fieller's set; Draper & Smith §3.2).
  const [a, b] = fit.estimates, s = fit.statistics.sigma!, t = studentT(5).quantile(0.975);
  for (const x of hc.ci!) {
    close((10 - a - b * x) ** 2, t * t * (exactRobust("hc3", x, null) + s * s), 1e-9, `end ${x}`);
  }
});

for (const type of ["hc0", "hc3"] as const) {
  Deno.test(`predict robust: ${type} se_fit keeps 12 digits on a degree-5 polynomial in raw calendar years`, () => {
    // Exact rational arithmetic (BigInt fractions): v = (XᵀX)⁻¹g₀, se² = Σ ωᵢ·(xᵢᵀv)²
    // (the sandwich gᵀ(XᵀX)⁻¹(Σ ωᵢxᵢxᵢᵀ)(XᵀX)⁻¹g; White 1980, MacKinnon & White 1985).
    const degree = 5, p = degree + 1;
    const row = (x: number): Q[] => Array.from({ length: p }, (_, k) => q(BigInt(x) ** BigInt(k)));
    const rows = YEARS.map(row), y = RESPONSES.map((v) => dec(String(v)));
    const f = exactFit(rows, y, null);
    const fit = fitOf({ x: YEARS, y: RESPONSES }, `y = polynomial(x, ${degree})`);
    const at = [1950, 2025];
    const got = predict(fit, { at: { x: at }, robust: type }).result.at;
    at.forEach((x0, k) => {
      const v = times(f.bread, row(x0));
      const se2 = sum(rows.map((r, i) => {
        const e2 = mul(f.residuals[i], f.residuals[i]);
        const gap = sub(int(1), f.form(f.bread, r));
        const omega = type === "hc0" ? e2 : mul(e2, inverse([[mul(gap, gap)]])[0][0]);
        const b = sum(r.map((c, j) => mul(c, v[j])));
        return mul(omega, mul(b, b));
      }));
      close(got[k].se_fit! ** 2, val(se2), 1e-12, `${type} se_fit² at ${x0}`);
    });
  });
}
