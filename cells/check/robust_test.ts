/**
 * The check's robust inference (`robust: hc0 … hc3`) against exact rational
 * arithmetic (BigInt fractions, cells/fit/_rational_test.ts): the sandwich
 * (XᵀWX)⁻¹(Σ ωᵢ x̃ᵢx̃ᵢᵀ)(XᵀWX)⁻¹ with x̃ᵢ = √wᵢxᵢ, ẽᵢ = √wᵢeᵢ and ωᵢ = ẽᵢ²,
 * n/(n − p)·ẽᵢ², ẽᵢ²/(1 − hᵢ), ẽᵢ²/(1 − hᵢ)² (White 1980, Econometrica
 * 48:817–838; MacKinnon & White 1985, J. Econometrics 29:305–325), written
 * without square roots: ωᵢx̃ᵢx̃ᵢᵀ = wᵢ²eᵢ²·(…)xᵢxᵢᵀ, hᵢ = wᵢxᵢᵀ(XᵀWX)⁻¹xᵢ.
 *
 * @module
 */
import assert from "node:assert/strict";
import { studentT } from "../../kernel/stats/mod.ts";
import { inverse, mul, type Q, q, sub, sum, val } from "../fit/_rational_test.ts";
import { dec, exact, exactFit, int } from "../predict/_exact_test.ts";
import { RESPONSES, YEARS } from "../fit/_raw_years_test.ts";
import { check, fitOf } from "./_fixtures_test.ts";
import { renderToString } from "preact-render-to-string";
import { CheckView } from "./view.tsx";

type HC = "hc0" | "hc1" | "hc2" | "hc3";

function close(got: number | null, want: number, tol: number, what: string) {
  assert.ok(
    got !== null && Math.abs(got - want) <= tol * Math.abs(want),
    `${what}: ${got} vs ${want}`,
  );
}

/** The exact HC covariance of a weighted fit of `rows` (w as fractions) and its estimates. */
function exactSandwich(rows: Q[][], y: Q[], w: Q[], type: HC) {
  const f = exactFit(rows, y, w);
  const n = rows.length, p = rows[0].length, ix = [...Array(p).keys()];
  const meat = ix.map(() => ix.map(() => int(0)));
  rows.forEach((r, i) => {
    const gap = sub(int(1), mul(w[i], f.form(f.bread, r)));
    const e2 = mul(mul(w[i], w[i]), mul(f.residuals[i], f.residuals[i]));
    const omega = type === "hc0"
      ? e2
      : type === "hc1"
      ? mul(e2, q(BigInt(n), BigInt(n - p)))
      : mul(e2, inverse([[type === "hc2" ? gap : mul(gap, gap)]])[0][0]);
    for (const j of ix) {
      for (const k of ix) meat[j][k] = sum([meat[j][k], mul(omega, mul(r[j], r[k]))]);
    }
  });
  const prod = (a: Q[][], b: Q[][]) =>
    a.map((row) => ix.map((k) => sum(row.map((v, l) => mul(v, b[l][k])))));
  return { beta: f.beta, cov: prod(prod(f.bread, meat), f.bread) };
}

// Invented: a calibration line whose spread grows with x, weighted 1/x.
const X = [1, 2, 3, 4, 5, 6, 7, 8];
const Y = [2.9, 5.3, 6.8, 9.6, 10.2, 13.9, 13.1, 17.8];

Deno.test("check robust: HC0–HC3 covariance, t, p and intervals of a weighted line (exact)", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x", { weights: "1/x" });
  const w = Array.from(fit.weights!, exact);
  const rows = X.map((x) => [int(1), int(x)]);
  const df = X.length - 2;
  for (const type of ["hc0", "hc1", "hc2", "hc3"] as const) {
    // The document's confidence sets the level: 0.9 here, t(0.95; 6) = 1.943…
    const r = check(fit, { robust: type }, { confidence: 0.9 }).robust!;
    const { beta, cov } = exactSandwich(rows, Y.map((v) => dec(String(v))), w, type);
    assert.equal(r.type, type);
    assert.equal(r.level, 0.9);
    assert.equal(r.df, df);
    const q95 = studentT(df).quantile(0.95);
    ["a", "b"].forEach((k, j) => {
      const se = Math.sqrt(val(cov[j][j])), est = val(beta[j]), t = est / se;
      close(r.std_errors[k], se, 1e-12, `${type} se ${k}`);
      close(r.t[k], t, 1e-12, `${type} t ${k}`);
      close(r.p_value[k], 2 * studentT(df).upper(Math.abs(t)), 1e-10, `${type} p ${k}`);
      close(r.ci[k]![0], est - q95 * se, 1e-12, `${type} ci ${k} lower`);
      close(r.ci[k]![1], est + q95 * se, 1e-12, `${type} ci ${k} upper`);
      [0, 1].forEach((l) =>
        close(r.covariance[j][l], val(cov[j][l]), 1e-12, `${type} cov ${j}${l}`)
      );
    });
  }
  const html = renderToString(
    CheckView({ name: "judge", result: check(fit, { robust: "hc3" }, { confidence: 0.9 }) }),
  );
  assert.match(html, /Robust inference \(HC3; White 1980, MacKinnon &amp; White 1985\), t on 6 df/);
  assert.match(html, /<th scope="col">90% interval<\/th>/);
});

/**
 * HC0 and HC3 variances of a polynomial in the raw years, exact, in integers:
 * with d the common denominator of (XᵀX)⁻¹ (Adj = d·(XᵀX)⁻¹), Y = D·y and
 * Eᵢ = d·Yᵢ − xᵢᵀAdj·XᵀY (so eᵢ = Eᵢ/(dD)), Bᵢ = Adj·xᵢ and Gᵢ = d − xᵢᵀBᵢ
 * (1 − hᵢ = Gᵢ/d): var_j = ΣEᵢ²B²ᵢⱼ/(d⁴D²) (HC0), Σ(EᵢBᵢⱼ/Gᵢ)²/(d²D²) (HC3).
 */
function exactRawYears(degree: number): { hc0: number[]; hc3: number[] } {
  const p = degree + 1, ix = [...Array(p).keys()];
  const X = YEARS.map((x) => ix.map((k) => BigInt(x) ** BigInt(k)));
  const yq = RESPONSES.map(exact);
  const D = yq.reduce((m, v) => (v[1] > m ? v[1] : m), 1n); // powers of two: the largest is the lcm
  const Y = yq.map((v) => v[0] * (D / v[1]));
  const inv = inverse(ix.map((a) => ix.map((b) => q(X.reduce((s, r) => s + r[a] * r[b], 0n)))));
  const d = inv.flat().reduce((m, v) => (m * v[1]) / gcd(m, v[1]), 1n);
  const adj = inv.map((r) => r.map((v) => (v[0] * d) / v[1]));
  const xty = ix.map((a) => X.reduce((s, r, i) => s + r[a] * Y[i], 0n));
  const bnum = adj.map((r) => r.reduce((s, v, l) => s + v * xty[l], 0n));
  const hc0 = ix.map(() => 0n), hc3: Q[][] = ix.map(() => []);
  X.forEach((r, i) => {
    const E = d * Y[i] - r.reduce((s, v, l) => s + v * bnum[l], 0n);
    const B = adj.map((a) => a.reduce((s, v, l) => s + v * r[l], 0n));
    const G = d - r.reduce((s, v, l) => s + v * B[l], 0n);
    ix.forEach((j) => {
      hc0[j] += (E * B[j]) ** 2n;
      hc3[j].push([(E * B[j]) ** 2n, G * G]);
    });
  });
  return {
    hc0: hc0.map((v) => val(q(v, d ** 4n * D * D))),
    hc3: hc3.map((t) => val(mul(sumOver(t), q(1n, d * d * D * D)))),
  };
}

function gcd(a: bigint, b: bigint): bigint {
  return b === 0n ? (a < 0n ? -a : a) : gcd(b, a % b);
}

/** Σ nᵢ/dᵢ over one common denominator (one reduction at the end). */
function sumOver(t: Q[]): Q {
  const den = t.reduce((m, v) => (m * v[1]) / gcd(m, v[1]), 1n);
  return q(t.reduce((s, v) => s + v[0] * (den / v[1]), 0n), den);
}

Deno.test("check robust: a degree-5 polynomial in raw years keeps every digit of HC0 and HC3", () => {
  // Through the explicit bread, (XᵀX)⁻¹·meat·(XᵀX)⁻¹ lost them all: at degree 5 every HC0
  // variance came out negative (no standard error at all) and HC3's were 115 to 207 times too
  // large; at degree 3 both were off by 1.2e−4 to 3e−4. Through the fit's own double-double
  // factor every one is within 1e−15 of exact rational arithmetic.
  for (const degree of [3, 5]) {
    const terms = [...Array(degree + 1).keys()].map((k) => (k === 0 ? "b0" : `b${k}*x^${k}`));
    const fit = fitOf({ x: YEARS, y: RESPONSES }, `y = ${terms.join(" + ")}`);
    const want = exactRawYears(degree);
    for (const type of ["hc0", "hc3"] as const) {
      const r = check(fit, { robust: type }).robust!;
      fit.parameters.forEach((k, j) =>
        close(r.std_errors[k], Math.sqrt(want[type][j]), 1e-13, `degree ${degree} ${type} ${k}`)
      );
    }
  }
});
