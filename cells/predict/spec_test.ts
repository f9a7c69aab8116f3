import { predictPage } from "./view.tsx";
import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { parseContext } from "../fit/_fixtures_test.ts";
import { parsePredictSpec } from "./spec.ts";
import { renderToString } from "preact-render-to-string";
import { predictKind } from "./mod.ts";
import { fitOf, predict, predictContext } from "./_fixtures_test.ts";

const parse = (options: Record<string, unknown>) =>
  parsePredictSpec({ ...parseContext("eol", options), kind: "predict" });

function refuses(run: () => unknown, message: string, path: (string | number)[]) {
  assert.throws(run, (e: unknown) => {
    assert.ok(e instanceof CellError, `expected CellError, got ${e}`);
    assert.equal(e.message, message);
    assert.deepEqual(e.path, path);
    return true;
  });
}

Deno.test("parsePredictSpec() normalises at, solve and the optional settings", () => {
  assert.deepEqual(
    parse({ fit: "power", at: { cycle: [1, 2], temp: 25 }, solve: { capacity: 2000 }, level: 0.9 }),
    {
      fit: "power",
      at: { cycle: [1, 2], temp: [25] },
      solve: { response: "capacity", values: [2000] },
      level: 0.9,
    },
  );
  assert.deepEqual(parse({ fit: "f", solve: { y: [1, 2] }, search: [0, 5], replicates: 3 }), {
    fit: "f",
    at: null,
    solve: { response: "y", values: [1, 2] },
    replicates: 3,
    search: [0, 5],
  });
});

Deno.test("parsePredictSpec() refuses bad options naming the option and value", () => {
  refuses(
    () => parse({ fit: "f", at: { x: 1 }, levle: 0.9 }),
    'Unknown option "levle" in predict "eol": did you mean "level"?',
    ["levle"],
  );
  refuses(
    () => parse({ at: { x: 1 } }),
    'Missing "fit" in predict "eol": name the fit cell to predict from, as in fit: line',
    [],
  );
  refuses(
    () => parse({ fit: "f" }),
    'Predict "eol" has neither "at" nor "solve": give predictor values, as in at: { x: [1, 2] }, or a response to solve for, as in solve: { y: 10 }',
    [],
  );
  refuses(
    () => parse({ fit: "f", at: { x: [1, 2, 3], z: [1, 2] } }),
    'Lists in "at" of predict "eol" differ in length: "x" has 3 values, "z" has 2: lists are paired element by element, so give each column the same number of values (or one value for all points)',
    ["at", "z"],
  );
  refuses(
    () => parse({ fit: "f", at: { x: [1, "two"] } }),
    'Value "two" in "at.x" of predict "eol" is not a finite number',
    ["at", "x", 1],
  );
  refuses(
    () => parse({ fit: "f", solve: { y: 1, z: 2 } }),
    'Option "solve" of predict "eol" is "{ y, z }": expected one response and its value(s), as in solve: { y: 10 }',
    ["solve"],
  );
  refuses(
    () => parse({ fit: "f", at: { x: 1 }, level: 95 }),
    'Option "level" of predict "eol" is "95": expected a level in (0, 1)',
    ["level"],
  );
  refuses(
    () => parse({ fit: "f", at: { x: 1 }, search: [5, 1] }),
    'Option "search" of predict "eol" is "[5, 1]": expected [low, high] with low < high',
    ["search"],
  );
});

Deno.test("predictKind.run() refuses at columns that are not the fit's predictors", () => {
  const fit = fitOf(
    { cycle: [1, 2, 3, 4], temp: [20, 25, 22, 30], q: [9, 8, 8, 6] },
    "q = a + b*cycle + c*temp",
  );
  refuses(
    () => predict(fit, { at: { cylce: 5, temp: 25 } }),
    'Column "cylce" in "at" of predict "p" is not used: fit "model" has predictors "cycle", "temp": did you mean "cycle"?',
    ["at", "cylce"],
  );
  refuses(
    () => predict(fit, { at: { q: 5, cycle: 1, temp: 2 } }),
    'Column "q" in "at" of predict "p" is not used: it is the response of fit "model", not a predictor',
    ["at", "q"],
  );
  refuses(
    () => predict(fit, { at: { cycle: 5 } }),
    'Predict "p" has no value in "at" for predictor column "temp" of fit "model": give one, as in at: { temp: [1, 2] }',
    ["at"],
  );
});

Deno.test("predictKind.run() refuses an input that is not a fit", () => {
  const fit = fitOf({ x: [1, 2, 3], y: [1, 3, 2] }, "y = a + b*x");
  const ctx = predictContext(fit);
  refuses(
    () => predictKind.run(parse({ fit: "other", at: { x: 1 } }), { ...ctx, name: "eol" }),
    'Cannot predict "eol": cell "other" gives no fit',
    ["fit"],
  );
});

Deno.test("predictKind.line() and the view show points and inverse predictions", () => {
  const x = [1, 2, 3, 4, 5], y = [2.1, 3.9, 6.2, 7.8, 10.1];
  const { result } = predict(fitOf({ x, y }, "y = a + b*x"), {
    at: { x: [2, 4] },
    solve: { y: 5 },
  });
  const line = predictKind.line(result);
  assert.match(
    line,
    /^from model at 95% · x = 2: [0-9.]+, PI \[[0-9., ]+\] \(\+1 points\) · y = 5 at x = /,
  );
  const html = renderToString(predictPage.view({ name: "eol", result }));
  assert.ok(html.includes("fieller") && html.includes("new observation"), html);
  assert.equal((html.match(/<tr>/g) ?? []).length, 2 + 3, "two header rows, two points, one solve");
});

Deno.test("the view labels the median, the two means, se_prediction and the weight used", () => {
  const x = [1, 2, 3, 4, 5, 6], y = [2.9, 7.1, 21.5, 52.0, 160.3, 398.0];
  const { result } = predict(fitOf({ x, y }, "log(y) = a + b*x", { weights: "1/x^2" }), {
    at: { x: [2, 4] },
  });
  const html = renderToString(predictPage.view({ name: "eol", result }));
  for (
    const text of [
      "Estimate (median)",
      "Mean, lognormal (95% interval)",
      "Mean, Duan smearing",
      "Standard uncertainty, new observation (model (log(y)))",
      "Weight w₀",
      "its weight: the fit's weights expression &quot;1/x^2&quot; at the point",
      "covariance: the fit's: s²(XᵀWX)⁻¹",
    ]
  ) assert.ok(html.includes(text), `${text} in ${html}`);
  assert.equal((html.match(/<tr>/g) ?? []).length, 1 + 2, "one header row, two points");
});
