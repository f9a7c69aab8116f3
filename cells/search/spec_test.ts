import { deepEqual, equal, ok, throws } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { parseSearchSpec } from "./spec.ts";
import { parseCtx } from "./_testing.ts";

/** The CellError a parse throws, checked for class, message and option path. */
function refusal(options: Record<string, unknown>, message: RegExp, path: (string | number)[]) {
  throws(() => parseSearchSpec(parseCtx(options)), (e: unknown) => {
    ok(e instanceof CellError, String(e));
    ok(message.test(e.message), e.message);
    deepEqual(e.path, path);
    return true;
  });
}

const BASE = { on: "t", response: "y" };

Deno.test("parseSearchSpec() fills the documented defaults", () => {
  const spec = parseSearchSpec(parseCtx({ ...BASE, candidates: ["x1", " x2 "] }));
  deepEqual(spec, {
    on: "t",
    response: "y",
    candidates: ["x1", "x2"],
    always: [],
    intercept: true,
    by: "bic",
    keep: 5,
    largest: null,
  });
  const all = parseSearchSpec(parseCtx({ ...BASE, count_variance: false, by: "ADJ_R2" }));
  equal(all.candidates, null);
  equal(all.countVariance, false);
  equal(all.by, "adj_r2");
});

Deno.test("parseSearchSpec() refuses an unknown option and criterion with the nearest word", () => {
  refusal({ ...BASE, candidate: ["x"] }, /Unknown option "candidate".*did you mean "candidates"/, [
    "candidate",
  ]);
  refusal({ ...BASE, by: "bci" }, /Option "by" of search "s" is "bci": did you mean "bic"/, ["by"]);
  refusal({ ...BASE, by: "r2" }, /expected one of bic, aic, aicc, adj_r2, loo/, ["by"]);
});

Deno.test("parseSearchSpec() locates bad columns at their entry", () => {
  refusal({ on: "t" }, /Missing "response" in search "s"/, []);
  refusal({ ...BASE, candidates: "x1" }, /expected a list of columns/, ["candidates"]);
  refusal({ ...BASE, candidates: ["x1", "flow rate"] }, /Entry 2 of "candidates".*"flow rate"/, [
    "candidates",
    1,
  ]);
  refusal({ ...BASE, candidates: ["x1", "e"] }, /the constant e/, ["candidates", 1]);
  refusal({ ...BASE, candidates: ["x1", "x2", "x1"] }, /listed twice.*entries 1 and 3/, [
    "candidates",
    2,
  ]);
  refusal({ ...BASE, candidates: ["x1", "y"] }, /"y" .* is the response/, ["candidates", 1]);
  refusal({ ...BASE, always: ["y"] }, /is the response and cannot be in "always"/, ["always", 0]);
  refusal(
    { ...BASE, candidates: ["x1", "x2"], always: ["x2"] },
    /both a candidate and in "always"/,
    [
      "candidates",
      1,
    ],
  );
  refusal({ ...BASE, candidates: [] }, /is empty/, ["candidates"]);
});

Deno.test("parseSearchSpec() refuses more than 25 candidates at the 26th", () => {
  const many = Array.from({ length: 26 }, (_, j) => `x${j}`);
  refusal({ ...BASE, candidates: many }, /lists 26 candidates: at most 25/, ["candidates", 25]);
});

Deno.test("parseSearchSpec() checks keep, largest and the booleans", () => {
  refusal({ ...BASE, keep: 0 }, /Option "keep" .* "0": expected a whole number from 1 to 100/, [
    "keep",
  ]);
  refusal({ ...BASE, keep: 2.5 }, /expected a whole number/, ["keep"]);
  refusal({ ...BASE, largest: 0 }, /Option "largest" .* "0": expected a whole number, 1 or more/, [
    "largest",
  ]);
  refusal({ ...BASE, intercept: "no" }, /Option "intercept" .* expected true or false/, [
    "intercept",
  ]);
  equal(parseSearchSpec(parseCtx({ ...BASE, largest: 3, keep: 2 })).largest, 3);
});
