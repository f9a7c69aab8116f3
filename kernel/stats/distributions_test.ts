import assert from "node:assert/strict";
import {
  chiSquared,
  fisherF,
  lnGamma,
  regularizedBeta,
  regularizedGamma,
  standardNormal,
  studentT,
} from "./mod.ts";

/** |got − want| ≤ tol·|want|. */
function near(got: number, want: number, tol: number, what = "") {
  assert.ok(
    Math.abs(got - want) <= tol * Math.abs(want),
    `${what}: ${got} vs ${want} (relative ${Math.abs(got - want) / Math.abs(want)})`,
  );
}

Deno.test("quantiles match the printed tables to their digits", () => {
  // NIST/SEMATECH e-Handbook of Statistical Methods §1.3.6.7.1–4 (normal,
  // t, F and χ² critical-value tables), values printed to 3–4 decimals;
  // recalled from memory, and they agree with the brief's t₀.₉₇₅(10) = 2.228,
  // F₀.₉₅(1, 10) = 4.96, χ²₀.₉₅(1) = 3.841.
  const table: [number, number, number][] = [
    [standardNormal.quantile(0.975), 1.960, 5e-4],
    [standardNormal.quantile(0.995), 2.576, 5e-4],
    [studentT(10).quantile(0.975), 2.228, 5e-4],
    [studentT(1).quantile(0.975), 12.706, 5e-4],
    [studentT(30).quantile(0.95), 1.697, 5e-4],
    [studentT(5).quantile(0.995), 4.032, 5e-4],
    [fisherF(1, 10).quantile(0.95), 4.96, 5e-3],
    [fisherF(5, 10).quantile(0.95), 3.33, 5e-3],
    [fisherF(10, 20).quantile(0.95), 2.35, 5e-3],
    [chiSquared(1).quantile(0.95), 3.841, 5e-4],
    [chiSquared(10).quantile(0.95), 18.307, 5e-4],
    [chiSquared(2).quantile(0.99), 9.210, 5e-4],
  ];
  for (const [got, want, tol] of table) assert.ok(Math.abs(got - want) <= tol, `${got} vs ${want}`);
});

Deno.test("lnGamma() gives factorials and Γ(½) = √π", () => {
  // Definition: Γ(n) = (n − 1)!; Γ(½) = √π (A&S 6.1.8).
  let f = 1;
  for (let n = 1; n <= 30; n++) {
    if (n > 1) f *= n - 1;
    if (n > 2) near(lnGamma(n), Math.log(f), 2e-15, `lnGamma(${n})`);
  }
  near(lnGamma(0.5), 0.5 * Math.log(Math.PI), 1e-15, "lnGamma(0.5)");
  near(lnGamma(1.5), Math.log(0.5 * Math.sqrt(Math.PI)), 1e-14, "lnGamma(1.5)");
  assert.throws(() => lnGamma(0), RangeError);
});

Deno.test("studentT(1).upper() is the Cauchy tail atan(1/t)/π down to 1e-300", () => {
  // Identity: t with 1 df is the Cauchy distribution (A&S 26.7.1 with ν = 1).
  for (const t of [0.3, 1, 3, 1e3, 1e8, 1e40, 1e150, 1e200, 1e299]) {
    near(studentT(1).upper(t), Math.atan(1 / t) / Math.PI, 2e-13, `t = ${t}`);
  }
  near(studentT(1).upperQuantile(1e-300), 1 / (Math.PI * 1e-300), 2e-13, "quantile");
});

Deno.test("studentT(2) tails equal the closed form ½(1 − t/√(2 + t²))", () => {
  // Identity: for ν = 2, P(T > t) = ½(1 − t/√(2 + t²)) = 1/(√(2 + t²)(√(2 + t²) + t))
  // (A&S 26.7.1 with ν = 2); the second form has no cancellation.
  for (const t of [0.1, 1, 10, 1e5, 1e100]) {
    const r = Math.sqrt(2 + t * t);
    const want = Number.isFinite(r) ? 1 / (r * (r + t)) : 1 / (2 * t * t);
    near(studentT(2).upper(t), want, 1e-13, `t = ${t}`);
  }
});

Deno.test("chiSquared(2).upper() is exp(−x/2) down to 1e-300 and its quantile inverts it", () => {
  // Identity: χ² with 2 df is exponential with mean 2 (A&S 26.4.21).
  for (const x of [0.01, 1, 10, 100, 700, 1380]) {
    near(chiSquared(2).upper(x), Math.exp(-x / 2), 1e-13, `x = ${x}`);
  }
  near(chiSquared(2).upperQuantile(1e-300), -2 * Math.log(1e-300), 1e-14, "quantile");
});

Deno.test("standardNormal.upper() follows the Mills-ratio series at z = 37", () => {
  // A&S 26.2.12: Q(z) = φ(z)/z · (1 − 1/z² + 3/z⁴ − 15/z⁶ + 105/z⁸ …); at z = 37
  // the terms after 105/z⁸ are below 1e-15 relative.
  const z = 37, w = 1 / (z * z);
  const series = 1 - w + 3 * w * w - 15 * w ** 3 + 105 * w ** 4 - 945 * w ** 5;
  const want = Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI) / z * series;
  near(standardNormal.upper(z), want, 1e-13, "Q(37)");
  assert.ok(standardNormal.upper(37.5) > 0, "Q(37.5) ≈ 4.6e-308 is not rounded to 0");
  near(standardNormal.cdf(-z), want, 1e-13, "Φ(−37)");
});

Deno.test("tails agree across identities: F(1, ν) = t², χ²(1) = z²", () => {
  // Identities: if T ~ t(ν) then T² ~ F(1, ν); if Z ~ N(0, 1) then Z² ~ χ²(1) (A&S 26.6.2, 26.4).
  for (const [t, nu] of [[2, 10], [30, 18], [99.3, 18], [1e6, 4]]) {
    near(fisherF(1, nu).upper(t * t), 2 * studentT(nu).upper(t), 1e-12, `F vs t at ${t}`);
  }
  for (const z of [0.5, 3, 20, 37]) {
    near(chiSquared(1).upper(z * z), 2 * standardNormal.upper(z), 1e-12, `χ² vs z at ${z}`);
  }
});

Deno.test("tails match values computed at 40 digits far out in both tails", () => {
  // Computed with mpmath 1.3.0 (betainc / gammainc, 40 significant digits).
  near(2 * studentT(18).upper(99.30644704798509), 4.1054640822379087464e-26, 1e-13, "t18");
  near(studentT(5).upper(1e30), 9.4901672455623598361e-150, 1e-12, "t5");
  near(studentT(30).upper(50), 9.3577088296113562982e-31, 1e-12, "t30");
  near(regularizedBeta(0.2, 500, 600).lower, 7.8657535504897295426e-81, 1e-12, "I(500, 600)");
  near(regularizedGamma(300, 700).upper, 8.14045384048253101e-66, 1e-12, "Q(300, 700)");
});

Deno.test("p-values of the reference fits reproduce statsmodels to 1e-12", () => {
  // Source: ../shared/reference/checks/*.json, "computed with statsmodels 0.13.5 / scipy 1.10.1".
  near(2 * studentT(18).upper(3.6250903708935196), 0.0019360483500789317, 1e-12, "intercept");
  near(fisherF(1, 18).upper(9861.770425294268), 4.105464082237902e-26, 1e-12, "F");
  near(2 * studentT(16).upper(168.9507114128912), 1.9057209172698763e-27, 1e-12, "wls slope");
  near(2 * studentT(16).upper(10.934697836028654), 7.81456244017433e-9, 1e-12, "wls intercept");
});

Deno.test("quantile() and cdf() invert each other, including p = 1e-300", () => {
  const ds = [
    standardNormal,
    studentT(3),
    studentT(1e4),
    fisherF(3, 7),
    chiSquared(5),
    chiSquared(1e3),
  ];
  for (const d of ds) {
    for (const p of [1e-300, 1e-20, 0.01, 0.3, 0.5, 0.9]) {
      const x = d.quantile(p);
      near(d.cdf(x), p, 1e-11, `cdf(quantile(${p}))`);
      const xu = d.upperQuantile(p);
      near(d.upper(xu), p, 1e-11, `upper(upperQuantile(${p}))`);
    }
  }
});

Deno.test("density() integrates to the cdf (Simpson's rule)", () => {
  // Fundamental theorem of calculus; composite Simpson with 2000 panels (common practice, no source).
  const cases: [string, (x: number) => number, (x: number) => number, number, number][] = [
    ["t(4)", studentT(4).density, studentT(4).cdf, -3, 2],
    ["F(3, 9)", fisherF(3, 9).density, fisherF(3, 9).cdf, 0.2, 4],
    ["χ²(7)", chiSquared(7).density, chiSquared(7).cdf, 1, 15],
    ["N(0, 1)", standardNormal.density, standardNormal.cdf, -2, 1],
  ];
  for (const [what, f, F, a, b] of cases) {
    const m = 2000, h = (b - a) / m;
    let s = f(a) + f(b);
    for (let i = 1; i < m; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
    near(s * h / 3, F(b) - F(a), 1e-10, what);
  }
});

Deno.test("distributions refuse bad degrees of freedom and probabilities", () => {
  assert.throws(() => studentT(0), (e: unknown) => {
    assert.ok(e instanceof RangeError);
    assert.equal(
      e.message,
      'Degrees of freedom "0" of the t distribution are not a positive number',
    );
    return true;
  });
  assert.throws(() => chiSquared(2).quantile(1.5), (e: unknown) => {
    assert.ok(e instanceof RangeError);
    assert.equal(e.message, 'Probability "1.5" is not a probability in [0, 1]');
    return true;
  });
  assert.equal(studentT(3).quantile(1), Infinity);
  assert.equal(chiSquared(3).quantile(0), 0);
});
