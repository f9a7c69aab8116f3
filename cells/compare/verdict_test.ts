import assert from "node:assert/strict";
import { verdict } from "./verdict.ts";
import type { Criterion } from "./spec.ts";

const two = (by: Criterion, delta: number) =>
  verdict({
    by,
    ranked: [{ fit: "root", value: 10, delta: 0, weight: 0.9 }, {
      fit: "power",
      value: 10 + delta,
      delta,
      weight: 0.1,
    }],
    unranked: [],
    nested: [],
    significance: 0.05,
  });

Deno.test("verdict() reads ΔBIC on the Kass & Raftery 1995 scale", () => {
  // Kass & Raftery 1995, §3.2: 0–2 bare mention, 2–6 positive, 6–10 strong, > 10 very strong.
  assert.match(two("bic", 1), /No clear winner.*not worth more than a bare mention/);
  assert.match(
    two("bic", 4),
    /evidence against "power" is positive, on the scale of Kass & Raftery 1995/,
  );
  assert.match(two("bic", 8), /is strong/);
  assert.match(two("bic", 12), /is very strong/);
});

Deno.test("verdict() reads ΔAIC on the Burnham & Anderson 2002 scale", () => {
  // Burnham & Anderson 2002, §2.6: 0–2 substantial, 4–7 considerably less, > 10 essentially none.
  assert.equal(
    two("aicc", 5.2),
    '"root" is preferred by AICc (Akaike weight 0.9) over "power" (ΔAICc 5.2); "power" has considerably less support, on the scale of Burnham & Anderson 2002: Δ 0–2 substantial support, 4–7 considerably less, > 10 essentially none',
  );
  assert.match(two("aic", 1.5), /^No clear winner: "root" and "power" are within 2 by AIC/);
  assert.match(two("aic", 3), /between substantial and considerably less/);
  assert.match(two("aic", 11), /essentially no support/);
});

Deno.test("verdict() says when nothing can be ranked and names nested tests of the preferred fit", () => {
  assert.equal(
    verdict({ by: "aicc", ranked: [], unranked: ["a", "b"], nested: [], significance: 0.05 }),
    "No fit can be ranked by AICc: it does not exist for any of them (see the warnings)",
  );
  const s = verdict({
    by: "aic",
    ranked: [{ fit: "quad", value: 1, delta: 0, weight: 1 }, {
      fit: "line",
      value: 30,
      delta: 29,
      weight: 0,
    }],
    unranked: [],
    nested: [{
      smaller: "line",
      larger: "quad",
      f: 421.4,
      df1: 1,
      df2: 21,
      p_value: 2.2e-15,
      ss_extra: 1,
    }],
    significance: 0.05,
  });
  assert.match(
    s,
    /Nested F tests: "quad" over "line" F\(1, 21\) = 421\.4, p 2\.2e-15, significant at 0\.05$/,
  );
});

Deno.test("compareLine() says no clear winner when the verdict does", async () => {
  const { compareLine } = await import("./line.ts");
  const row = (fit: string, rank: number, delta: number, weight: number) => ({
    fit,
    rank,
    delta,
    weight,
  });
  const r = {
    by: "aicc",
    criterion: "AICc",
    preferred: "root",
    rows: [row("root", 1, 0, 0.46), row("root-linear", 2, 0.884, 0.3)],
    verdict: 'No clear winner: "root" and "root-linear" are within 2 by AICc (ΔAICc 0.884)',
  } as unknown as Parameters<typeof compareLine>[0];
  assert.equal(
    compareLine(r),
    "no clear winner by AICc: root ahead (weight 0.46), root-linear within Δ 0.88",
  );
  const clear = { ...r, verdict: '"root" is preferred by AICc' };
  assert.equal(
    compareLine(clear),
    "root preferred by AICc (weight 0.46) over root-linear (Δ 0.88)",
  );
});
