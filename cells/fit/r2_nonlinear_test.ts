import assert from "node:assert/strict";
import { assertDigits as close, fitResult as fit, makeTable } from "./_fixtures_test.ts";
import { dec, div, mul, sub, sum, val } from "./_rational_test.ts";

/** Σwᵢ(yᵢ − ȳ_w)² of decimal data in exact rational arithmetic (wᵢ = 1 when not given). */
function exactTss(y: string[], w?: string[]) {
  const ys = y.map(dec), ws = (w ?? y.map(() => "1")).map(dec);
  const mean = div(sum(ys.map((v, i) => mul(ws[i], v))), sum(ws));
  return val(sum(ys.map((v, i) => mul(ws[i], mul(sub(v, mean), sub(v, mean))))));
}

// Michaelis–Menten rates (invented): no constant lies in the span of the Jacobian
// [x/(km + x), −vmax·x/(km + x)²], so R² used to be the uncentred 1 − RSS/Σy².
const S = ["0.5", "1", "2", "4", "8", "16"];
const V = ["1.9", "3.1", "4.6", "6.0", "6.9", "7.6"];
const table = () => makeTable({ s: S.map(Number), v: V.map(Number), w: [4, 2, 1, 1, 0.5, 0.25] });
const MODEL = "v = vmax*s/(km + s)";
const START = { start: { vmax: 8, km: 1.5 } };

Deno.test("fitKind.run() gives a nonlinear fit the centred R² with its caveat", () => {
  const { result, warnings } = fit("mm", MODEL, table(), START);
  assert.equal(result.r2_kind, "centred");
  // R² = 1 − RSS/Σ(y − ȳ)² (DESIGN.md §5); TSS in exact rational arithmetic from the data as printed.
  const tss = exactTss(V);
  close(result.tss, tss, 14, "TSS");
  close(result.r2, 1 - result.rss / tss, 14, "R² centred");
  // Adjusted with n − 1 as for a fit with an intercept (common practice, no source).
  close(result.adj_r2, 1 - (1 - result.r2!) * 5 / 4, 14, "adjusted R²");
  // The uncentred form it gave before is larger (Σy² ≫ Σ(y − ȳ)²): 0.99993 against 0.99952.
  const uncentred = 1 - result.rss / val(sum(V.map((v) => mul(dec(v), dec(v)))));
  assert.ok(uncentred > result.r2! + 1e-4, `${uncentred} vs ${result.r2}`);
  // The caveat: ESS is Σ(ŷ − ȳ)² computed directly, and TSS ≠ ESS + RSS.
  const ybar = V.reduce((s, v) => s + Number(v), 0) / 6;
  const ess = result.fitted.reduce((s, f) => s + (f - ybar) ** 2, 0);
  close(result.ess, ess, 12, "ESS computed directly");
  assert.ok(Math.abs(result.tss - result.ess - result.rss) > 1e-6 * result.tss);
  assert.ok(
    warnings.includes(
      'R² of "mm" is the centred 1 − RSS/TSS of a nonlinear fit: TSS = ESS + RSS does not hold, so it is neither the share of variance explained nor the squared correlation of observed and fitted values, and no overall F test is given',
    ),
    warnings.join("\n"),
  );
  assert.equal(result.f_statistic, null);
});

Deno.test("fitKind.run() centres a weighted nonlinear fit's R² on the weighted mean", () => {
  const w = ["4", "2", "1", "1", "0.5", "0.25"];
  const { result } = fit("mmw", MODEL, table(), { ...START, weights: "w" });
  assert.equal(result.r2_kind, "centred");
  // TSS = Σwᵢ(yᵢ − ȳ_w)², ȳ_w = Σwy/Σw (exact rational arithmetic); RSS is the weighted Σwr².
  const tss = exactTss(V, w);
  close(result.tss, tss, 14, "weighted TSS");
  close(result.r2, 1 - result.rss / tss, 14, "weighted R²");
});

Deno.test("fitKind.run() keeps a linear fit without an intercept uncentred", () => {
  const { result } = fit("through0", "v = b*s", table());
  assert.equal(result.r2_kind, "uncentred");
  // 1 − RSS/Σy² (as NIST certifies NoInt1/NoInt2; exact rational arithmetic for Σy²).
  close(result.r2, 1 - result.rss / val(sum(V.map((v) => mul(dec(v), dec(v))))), 14, "R²");
});
