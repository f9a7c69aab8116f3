import { deepEqual, equal, match } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { findingsOf } from "./findings.ts";
import { CheckView } from "./view.tsx";

/** A check result with every test absent, for the per-row findings (invented values). */
function base(leverage: number[], external: number[]) {
  const n = leverage.length;
  return {
    fit: "f",
    n,
    p: 2,
    method: "linear" as const,
    weighted: false,
    significance: 0.05,
    rows: leverage.map((_, i) => i + 1),
    fitted: leverage.map(() => 0),
    residuals: leverage.map(() => 0),
    leverage,
    studentized_internal: external,
    studentized_external: external,
    cooks_distance: leverage.map(() => 0),
    dffits: leverage.map(() => 0),
    vif: {},
    vif_form: "centred" as const,
    condition_number: 1,
    durbin_watson: null,
    durbin_watson_test: null,
    breusch_pagan: null,
    shapiro_wilk: null,
    jarque_bera: null,
    reset: null,
    runs: null,
    lack_of_fit: null,
    press: null,
    loo_rmse: null,
    robust: null,
  };
}

Deno.test("findingsOf() names a few flagged rows with their values", () => {
  const ext = Array.from({ length: 100 }, (_, i) => (i === 16 ? 4.2 : i === 40 ? -3.5 : 0.1));
  const f = findingsOf(base(Array(100).fill(0.02), ext));
  deepEqual(f.map((x) => x.code), ["outlier"]);
  deepEqual(f[0].rows, [17, 41]);
  equal(
    f[0].message,
    "Rows 17 and 41 have externally studentized residuals 4.2, -3.5 (beyond ±3, common practice).",
  );
});

Deno.test("findingsOf() summarises many flagged rows: the count, the rule and the 8 largest", () => {
  // 2p/n = 0.04 for p = 2, n = 100; rows 1–20 lie above it (leverage 0.06 down to 0.0505).
  const lev = Array.from({ length: 100 }, (_, i) => (i < 20 ? 0.06 - i * 0.0005 : 0.01));
  const f = findingsOf(base(lev, Array(100).fill(0)));
  equal(f.length, 1);
  equal(f[0].code, "high-leverage");
  equal(f[0].rows.length, 20, "the finding keeps every row");
  match(
    f[0].message,
    /^20 rows have leverage above 2p\/n = 0\.04 \(common practice\); the 8 largest: /,
  );
  match(f[0].message, /row 1 \(0\.06\), row 2 \(0\.059\), .*row 8 \(0\.056\)\.$/);
});

Deno.test("findingsOf() reports alternation from Durbin–Watson's upper tail and too many runs", () => {
  // Invented values: d = 3.1 with P(d ≥ 3.1) = 0.004 under the exact law; 19 sign runs where
  // 11 are expected (two-sided p 0.003) in row order.
  const r = {
    ...base(Array(20).fill(0.1), Array(20).fill(0)),
    durbin_watson: 3.1,
    durbin_watson_test: {
      expected: 2.05,
      variance: 0.17,
      z: 2.5,
      p_value: 0.996,
      p_value_negative: 0.004,
      distribution: "exact" as const,
    },
    runs: {
      runs: 19,
      expected: 11,
      z: 3,
      p_value: 0.003,
      positive: 10,
      negative: 10,
      order: "rows" as const,
    },
  };
  const f = findingsOf(r);
  deepEqual(f.map((x) => x.code), ["alternation"], "one finding, its two sentences joined");
  match(f[0].message, /too many runs: 19 where 11 are expected/);
  match(f[0].message, /alternate in sign \(negative correlation\): Durbin–Watson 3\.1 .*exact law/);
  // The lower tail alone makes the positive-correlation finding, not alternation.
  const low = {
    ...r,
    runs: null,
    durbin_watson: 1.1,
    durbin_watson_test: { ...r.durbin_watson_test, p_value: 0.004, p_value_negative: 0.996 },
  };
  deepEqual(findingsOf(low).map((x) => x.code), ["autocorrelation"]);
});

Deno.test("findingsOf() and the view say the same of a VIF that is infinite, and what it means for a nonlinear fit", () => {
  // Invented values. Before, the finding said "infinite" and the view's line "—" for one null.
  const r = {
    ...base(Array(20).fill(0.1), Array(20).fill(0)),
    method: "nonlinear" as const,
    vif: { a: null, b: 12.3 },
    vif_form: "uncentred" as const,
  };
  const f = findingsOf(r);
  deepEqual(f.map((x) => x.code), ["collinearity"]);
  equal(
    f[0].message,
    'At the estimates the model\'s derivatives by "a", "b" are nearly combinations of the others: VIF infinite, 12.3 (uncentred, the model has no intercept; from the Jacobian at the estimates, a local, linearised measure; > 10, common practice).',
  );
  const html = renderToString(CheckView({ name: "judge", result: { ...r, findings: f } }));
  match(html, /VIF \(uncentred\) a infinite, b 12\.3/);
  match(html, /come from the Jacobian at the estimates: local, linearised quantities/);
  match(html, /the variance actually inflated/);
});
