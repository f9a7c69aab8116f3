import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { parseCompareSpec } from "./spec.ts";
import { SETTINGS } from "./_fixtures_test.ts";
import type { DocSettings } from "../../kernel/contract/mod.ts";

function parse(options: Record<string, unknown>, settings: Partial<DocSettings> = {}) {
  return parseCompareSpec({
    name: "cmp",
    kind: "compare",
    options,
    body: "",
    settings: { ...SETTINGS, ...settings },
    warn() {},
  });
}

function refuses(options: Record<string, unknown>, message: string, path: (string | number)[]) {
  assert.throws(() => parse(options), (e: unknown) => {
    assert.ok(e instanceof CellError, `expected CellError, got ${e}`);
    assert.equal(e.message, message);
    assert.deepEqual(e.path, path);
    return true;
  });
}

Deno.test("parseCompareSpec() takes the criterion from the document's setting by default", () => {
  assert.deepEqual(parse({ fits: ["a", "b"] }), {
    fits: ["a", "b"],
    by: "aicc",
    folds: 10,
    significance: 0.05,
  });
  assert.equal(parse({ fits: ["a", "b"] }, { criterion: "bic" }).by, "bic");
  assert.equal(parse({ fits: ["a", "b"], by: "LOO" }, { criterion: "bic" }).by, "loo");
  assert.equal(parse({ fits: ["a", "b"], folds: 5, significance: 0.01 }).folds, 5);
});

Deno.test("parseCompareSpec() refuses one fit, no fits and a fit listed twice", () => {
  refuses(
    { fits: ["line"] },
    'Compare "cmp" lists one fit, "line": a comparison needs two or more fits (a single fit\'s criteria are in its own result)',
    ["fits"],
  );
  refuses(
    { fits: [] },
    'Compare "cmp" lists no fits: a comparison needs two or more fits (a single fit\'s criteria are in its own result)',
    ["fits"],
  );
  refuses(
    { fits: ["line", "quad", "line"] },
    'Fit "line" is listed twice in compare "cmp": as fits 1 and 3',
    ["fits", 2],
  );
  refuses(
    {},
    'Missing "fits" in compare "cmp": list the fit cells to compare, as in fits: [line, root]',
    [],
  );
});

Deno.test("parseCompareSpec() refuses bad names, criteria, folds, levels and options", () => {
  refuses(
    { fits: "line, quad" },
    'Option "fits" of compare "cmp" is "line, quad": expected a list of fit cell names, as in [line, root]',
    ["fits"],
  );
  refuses(
    { fits: ["line", 3] },
    'Fit 2 of compare "cmp" is "3": expected the name of a fit cell',
    ["fits", 1],
  );
  refuses(
    { fits: ["a", "b"], by: "bick" },
    'Criterion "bick" of compare "cmp" is not known: did you mean "bic"?',
    ["by"],
  );
  refuses(
    { fits: ["a", "b"], folds: 1 },
    'Option "folds" of compare "cmp" is "1": expected a whole number, 2 or more',
    ["folds"],
  );
  refuses(
    { fits: ["a", "b"], significance: 5 },
    'Option "significance" of compare "cmp" is "5": expected a number between 0 and 1, exclusive',
    ["significance"],
  );
  refuses(
    { fits: ["a", "b"], fit: ["c"] },
    'Unknown option "fit" in compare "cmp": did you mean "fits"?',
    ["fit"],
  );
});
