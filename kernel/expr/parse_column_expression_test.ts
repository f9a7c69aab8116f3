import assert from "node:assert/strict";
import { ExprError, format, parseColumnExpression } from "./mod.ts";

const COLUMNS = ["temp", "conc", "signal"];

Deno.test("parseColumnExpression() accepts columns and constants", () => {
  const e = parseColumnExpression("(temp - 273.15) * 1.8 + 32 + 0*pi*log10(conc)", COLUMNS);
  assert.equal(format(e), "(temp - 273.15) * 1.8 + 32 + 0 * pi * log10(conc)");
});

Deno.test("parseColumnExpression() rejects an unknown identifier with did-you-mean", () => {
  const cases: [string, string, number][] = [
    ["tmep * 2", 'Unknown column "tmep": did you mean "temp"?', 0],
    [
      "signal / k",
      'Unknown column "k": a derived column may use only columns and the constants pi and e',
      9,
    ],
    ["sqrt + 1", 'Function "sqrt" needs its argument in parentheses, as in sqrt(x)', 0],
    ["signal / (conc", 'Missing ")" to close "(" at column 10', 9],
  ];
  for (const [text, message, offset] of cases) {
    assert.throws(
      () => parseColumnExpression(text, COLUMNS),
      (err: unknown) => {
        assert.ok(err instanceof ExprError, text);
        assert.equal(err.message, message, text);
        assert.equal(err.offset, offset, text);
        return true;
      },
    );
  }
});
