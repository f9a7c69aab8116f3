/**
 * The agreement kind end to end on invented readings: the verdict finds a
 * difference built into the data and none where there is none, the ratio
 * from replicates equals the pooled variances computed here, the result is
 * plain JSON with every interval labelled; and bad input is refused at its
 * place in plain words.
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { readings, runAgreementCell, table } from "./_fixtures_test.ts";
import { agreementKind } from "./mod.ts";

Deno.test("agreement: a proportional difference built into the data is found by both regressions", () => {
  // Invented: y = 1.08·level, both SDs 0.15, 60 samples (seeded). Common practice, no source:
  // with this spread the 95% intervals of the slope exclude 1 by far.
  const { result: r } = runAgreementCell({}, readings(60, { b: 1.08, sx: 0.15, sy: 0.15 }));
  equal(r.verdict.proportional.deming, true);
  equal(r.verdict.proportional.passing_bablok, true);
  equal(r.verdict.constant.deming, false);
  match(
    r.verdict.sentence,
    /^At the 95% level: no constant difference shown .*; a proportional difference/,
  );
  ok(
    Math.abs(r.deming.slope.estimate - 1.08) < 0.02 &&
      Math.abs(r.passing_bablok.slope.estimate - 1.08) < 0.02,
  );
  // Every interval is labelled with its method and level.
  for (
    const e of [
      r.deming.slope,
      r.deming.intercept,
      r.passing_bablok.slope,
      r.agreement.bias,
      r.agreement.lower,
    ]
  ) {
    equal(e.intervals.length, 1);
    ok(e.intervals[0].method.length > 0 && e.intervals[0].level === 0.95);
  }
  deepEqual(JSON.parse(JSON.stringify(r)), r, "plain JSON");
  equal(r.means.length, 60);
  ok(agreementKind.line(r).includes("proportional difference"));
  ok(agreementKind.details!(r).some((l) => l.startsWith("Passing–Bablok: intercept")));
});

Deno.test("agreement: methods that agree show no constant or proportional difference", () => {
  const { result: r } = runAgreementCell({}, readings(50, { seed: 9 }));
  equal(r.verdict.constant.deming || r.verdict.proportional.deming, false);
  match(r.verdict.sentence, /no constant difference shown.*no proportional difference shown/);
  equal(r.passing_bablok.linearity?.linear, true);
});

Deno.test("agreement: the variance ratio from replicates is the ratio of pooled within-sample variances", () => {
  // Linnet 1990/1993: s² of each method pooled over the samples' replicates; recomputed here.
  const t = readings(30, { sx: 0.1, sy: 0.3, reps: 2, seed: 5 });
  const { result: r, out } = runAgreementCell({ sample: "id", variance_ratio: "replicates" }, t);
  const x = t.columns[1].values as Float64Array, y = t.columns[2].values as Float64Array;
  let sx = 0, sy = 0;
  for (let i = 0; i < x.length; i += 2) {
    sx += (x[i] - x[i + 1]) ** 2 / 2; // Σ over the pair of (v − mean)² = (v₁ − v₂)²/2
    sy += (y[i] - y[i + 1]) ** 2 / 2;
  }
  ok(Math.abs(r.variance_ratio.value - sy / sx) < 1e-12 * (sy / sx));
  equal(r.variance_ratio.source, "replicates");
  equal(r.variance_ratio.df, 30);
  equal(r.n, 30);
  equal(r.rows_used, 60);
  equal(r.replicated, true);
  ok(r.agreement.lower.intervals[0].method.startsWith("bootstrap over samples"));
  equal(out.ratio, r.variance_ratio.value);
  // True ratio 9: the estimate from 30 df lies within a factor of 2.5 of it (χ² spread;
  // common practice, no source).
  ok(r.variance_ratio.value > 9 / 2.5 && r.variance_ratio.value < 9 * 2.5);
});

Deno.test("agreement: proportional errors take the weighted Deming line and percent differences", () => {
  const { result: r } = runAgreementCell(
    { errors: "proportional", differences: "percent" },
    readings(40, { b: 1.0, sx: 0.1, sy: 0.1, seed: 4 }),
  );
  equal(r.deming.weighted, true);
  ok(r.deming.iterations > 0);
  equal(r.agreement.unit, "%");
});

function refused(options: Record<string, unknown>, t = readings(20)): CellError {
  try {
    runAgreementCell(options, t);
  } catch (e) {
    ok(e instanceof CellError, String(e));
    return e;
  }
  throw new Error("not refused");
}

Deno.test("agreement: unpaired samples are refused naming the rows of each method", () => {
  const t = table({
    x: [1, 2, NaN, 4, 5, 6, 7],
    y: [1.1, NaN, 3.2, 4.1, NaN, 6.3, 7.0],
  });
  const e = refused({}, t);
  equal(
    e.message,
    `Cannot compare methods in "meters": unpaired samples: rows 2, 5 of "readings" have "x" but no "y"; row 3 of "readings" has "y" but no "x". Both methods must measure every sample: fill in the reading, or exclude the row in the table with the reason`,
  );
  deepEqual(e.path, ["y"]);
});

Deno.test("agreement: too few samples, a text column, an unknown column", () => {
  const few = refused({}, table({ x: [1, 2, 3, 4], y: [1, 2, 3, 4.1] }));
  equal(
    few.message,
    `Cannot compare methods in "meters": 4 samples with both readings, and a method comparison needs at least 5 (40 or more is common practice)`,
  );
  const text = refused({ y: "who" }, table({ x: [1, 2, 3, 4, 5], who: ["a", "b", "c", "d", "e"] }));
  equal(
    text.message,
    `Cannot compare methods in "meters": column "who" holds text, and the method "y" needs numbers`,
  );
  deepEqual(text.path, ["y"]);
  const unknown = refused({ y: "yy" });
  match(unknown.message, /unknown column "yy": did you mean "y"/);
});

Deno.test("agreement: a ratio from replicates needs replicates, and a sample column", () => {
  const t = table({
    id: ["a", "b", "c", "d", "e", "f"],
    x: [1, 2, 3, 4, 5, 6],
    y: [1, 2.1, 2.9, 4.2, 5, 6.1],
  });
  const e = refused({ sample: "id", variance_ratio: "replicates" }, t);
  equal(
    e.message,
    `Cannot compare methods in "meters": the variance ratio is to be estimated from replicates, but no value of "id" occurs on two rows: give each sample two or more rows (replicates), or give variance_ratio as a number`,
  );
  deepEqual(e.path, ["variance_ratio"]);
  const noSample = refused({ variance_ratio: "replicates" });
  match(noSample.message, /names no "sample" column/);
  deepEqual(noSample.path, ["variance_ratio"]);
});

Deno.test("agreement: a variance ratio that is not a positive number is refused at its option", () => {
  for (const v of [0, -2, "lots"]) {
    const e = refused({ variance_ratio: v });
    equal(
      e.message,
      `Option "variance_ratio" of agreement "meters" is "${v}": expected a positive number (the ratio of y's error variance to x's, such as 1), or replicates`,
    );
    deepEqual(e.path, ["variance_ratio"]);
  }
  const same = refused({ y: "x" });
  match(same.message, /names column "x" as both methods/);
});

Deno.test("agreement: columns in two units are compared with a warning that says so", () => {
  const t = readings(40, { seed: 2 });
  t.columns[0].unit = "mmol/L";
  t.columns[1].unit = "mg/dL";
  const { warnings } = runAgreementCell({}, t);
  ok(
    warnings.some((w) => w.includes(`compares "x" in mmol/L with "y" in mg/dL`)),
    warnings.join("\n"),
  );
});
