import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { checkKind } from "./mod.ts";
import { parseCheckSpec } from "./spec.ts";
import type { CheckResult } from "./result.ts";

const settings = {
  title: "",
  confidence: 0.95,
  seed: 1,
  criterion: "aicc",
  maxFileBytes: 1,
  extra: {},
};
const ctx = (options: Record<string, unknown>) => ({
  name: "judge",
  kind: "check",
  body: "",
  warn() {},
  options,
  settings,
});

Deno.test("parseCheckSpec() fills defaults and reads our own options", () => {
  assert.deepEqual(parseCheckSpec(ctx({ fit: "line" })), {
    fit: "line",
    varianceTest: "koenker",
    robust: null,
    significance: 0.05,
  });
  const s = parseCheckSpec(
    ctx({ fit: "line", variance_test: "original", robust: "HC3", significance: 0.01 }),
  );
  assert.equal(s.varianceTest, "original");
  assert.equal(s.robust, "hc3");
  assert.deepEqual(checkKind.inputs(s), [{ name: "line", accepts: ["Fit"], path: ["fit"] }]);
});

Deno.test("parseCheckSpec() refuses missing fit, unknown options and bad values", () => {
  assert.throws(() => parseCheckSpec(ctx({})), {
    name: "CellError",
    message: 'Missing "fit" in check "judge": name the fit cell to judge, as in fit: line',
  });
  assert.throws(() => parseCheckSpec(ctx({ fit: "line", robuts: "hc1" })), (e: unknown) => {
    assert.ok(e instanceof CellError);
    assert.match(e.message, /^Unknown option "robuts" in check "judge": did you mean "robust"/);
    return true;
  });
  assert.throws(() => parseCheckSpec(ctx({ fit: "line", robust: "hc7" })), {
    name: "CellError",
    message: 'Option "robust" of check "judge" is "hc7": did you mean "hc0"?',
  });
  assert.throws(() => parseCheckSpec(ctx({ fit: "line", significance: 2 })), {
    name: "CellError",
    message:
      'Option "significance" of check "judge" is "2": expected a number in (0, 0.5], such as 0.05',
  });
});

Deno.test("checkKind.line() names the findings and their rows", () => {
  const r = {
    findings: [
      { code: "high-leverage", rows: [17], message: "" },
      { code: "curvature", rows: [], message: "" },
    ],
  } as unknown as CheckResult;
  assert.equal(checkKind.line(r), "2 findings: high leverage (row 17), curvature");
  assert.equal(checkKind.line({ findings: [] } as unknown as CheckResult), "no findings");
});
